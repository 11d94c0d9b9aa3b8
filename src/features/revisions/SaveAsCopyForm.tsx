/** Save a version as a new diagram in the same project (its first revision), e.g. after a refused save. */
import { useState } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import { Button } from '@/components/Button';
import { TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';
import { useSaveAsCopy } from './hooks';

export function SaveAsCopyForm({ projectId, diagramName, content, message, onCopied, onCancel }: {
  projectId: string;
  diagramName: string;
  content: DiagramDocument;
  message: string;
  onCopied: (diagramId: string) => void;
  onCancel: () => void;
}) {
  const [name, setName] = useState(`${diagramName} (copy)`.slice(0, 120));
  const copy = useSaveAsCopy(projectId);
  return (
    <form
      aria-label="Save as a copy"
      className="space-y-2 rounded-md border border-graphite-200 bg-graphite-50 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        if (!name.trim()) return;
        copy.mutate({ name: name.trim(), content, message: message || `Copy of ${diagramName}` }, { onSuccess: (r) => onCopied(r.diagram.id) });
      }}
    >
      <TextField label="Name of the copy" value={name} maxLength={120} onChange={(e) => setName(e.target.value)} />
      {copy.error ? <Notice signal="error">{errorMessage(copy.error)}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" size="sm" variant="primary" pending={copy.isPending} disabled={!name.trim()}>
          Save as a new diagram
        </Button>
        <Button size="sm" onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
