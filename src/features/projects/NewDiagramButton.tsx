/** "New diagram…": opens the new-diagram dialog, loaded on first use (it brings the templates and the file checks). */
import { lazy, Suspense, useState } from 'react';
import { Button } from '@/components/Button';
import { PlusIcon } from '@/components/icons';

const NewDiagramDialog = lazy(() => import('./NewDiagramDialog').then((m) => ({ default: m.NewDiagramDialog })));

export function NewDiagramButton({ projectId, variant = 'primary' }: { projectId: string; variant?: 'primary' | 'secondary' }) {
  const [open, setOpen] = useState(false);
  const [used, setUsed] = useState(false);
  return (
    <>
      <Button
        variant={variant}
        onClick={() => {
          setUsed(true);
          setOpen(true);
        }}
      >
        <PlusIcon size={14} /> New diagram…
      </Button>
      {used ? (
        <Suspense fallback={null}>
          <NewDiagramDialog projectId={projectId} open={open} onClose={() => setOpen(false)} />
        </Suspense>
      ) : null}
    </>
  );
}
