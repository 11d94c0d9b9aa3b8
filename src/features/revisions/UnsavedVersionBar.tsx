/** On the compare view of the user's unsaved version: save it on top of the latest revision, as a copy, or discard it. */
import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Button } from '@/components/Button';
import { ConfirmDialog } from '@/components/ConfirmDialog';
import { Notice } from '@/components/Notice';
import { errorMessage, isApiError } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import type { RevisionMeta } from './api';
import { revisionKeys, useSaveRevision } from './hooks';
import { SaveAsCopyForm } from './SaveAsCopyForm';
import { clearUnsaved, readUnsaved } from './stash';

export function UnsavedVersionBar({ diagramId, projectId, diagramName, latest, onSaved, onCopied, onDiscarded }: {
  diagramId: string;
  projectId: string;
  diagramName: string;
  latest: RevisionMeta | null;
  onSaved: (n: number) => void;
  onCopied: (diagramId: string) => void;
  onDiscarded: () => void;
}) {
  const unsaved = readUnsaved(diagramId);
  const save = useSaveRevision(diagramId, projectId);
  const qc = useQueryClient();
  const [copying, setCopying] = useState(false);
  const [discarding, setDiscarding] = useState(false);
  if (!unsaved) return null;
  const next = (latest?.number ?? 0) + 1;
  return (
    <div className="space-y-2 rounded-md border border-caution-200 bg-caution-50 px-3 py-2" role="region" aria-label="Your unsaved version">
      <p className="text-[13px] text-caution-700">
        <strong>Your version is not saved as a revision.</strong> It is kept in this browser (since {formatDateTime(unsaved.savedAt)}).
        {latest ? ` The latest revision is r${latest.number}${latest.author ? ` by ${latest.author.name}` : ''}.` : ''} Review the differences, then:
      </p>
      <div className="flex flex-wrap gap-2">
        <Button
          size="sm"
          variant="primary"
          pending={save.isPending}
          onClick={() =>
            save.mutate(
              { baseRevision: latest?.number ?? null, message: unsaved.message, content: unsaved.content },
              {
                onSuccess: (r) => { clearUnsaved(diagramId); onSaved(r.number); },
                onError: () => void qc.invalidateQueries({ queryKey: revisionKeys.list(diagramId), exact: true }),
              },
            )
          }
        >
          Save mine on top as revision {next}
        </Button>
        <Button size="sm" onClick={() => setCopying((v) => !v)} aria-expanded={copying}>Save as a copy…</Button>
        <Button size="sm" variant="danger-outline" onClick={() => setDiscarding(true)}>Discard my version…</Button>
      </div>
      {save.error ? (
        <Notice signal="error">
          {isApiError(save.error) && save.error.code === 'revision_conflict' ? 'Another revision was saved meanwhile; the comparison has been refreshed. ' : ''}
          {errorMessage(save.error)}
        </Notice>
      ) : null}
      {copying ? (
        <SaveAsCopyForm
          projectId={projectId}
          diagramName={diagramName}
          content={unsaved.content}
          message={unsaved.message}
          onCancel={() => setCopying(false)}
          onCopied={(id) => { clearUnsaved(diagramId); onCopied(id); }}
        />
      ) : null}
      <ConfirmDialog
        open={discarding}
        onClose={() => setDiscarding(false)}
        onConfirm={() => { clearUnsaved(diagramId); setDiscarding(false); onDiscarded(); }}
        title="Discard your version?"
        confirmLabel="Discard my version"
        pending={false}
      >
        <p>The version kept in this browser will be deleted. The saved revisions and the working copy are not affected.</p>
      </ConfirmDialog>
    </div>
  );
}
