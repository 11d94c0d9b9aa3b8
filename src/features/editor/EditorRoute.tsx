// Placeholder until the diagram editor is built; this file is replaced then.
import { useParams } from 'react-router';
import { ButtonLink } from '@/components/Button';
import { ArrowLeftIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';

export default function EditorRoute() {
  const { diagramId = '' } = useParams();
  return (
    <div className="max-w-xl">
      <h1 className="text-xl font-semibold">
        Diagram <span className="font-mono">{diagramId}</span>
      </h1>
      <Notice signal="note" className="my-4">
        The diagram editor is not built yet.
      </Notice>
      <ButtonLink to="/">
        <ArrowLeftIcon size={14} /> Back to projects
      </ButtonLink>
    </div>
  );
}
