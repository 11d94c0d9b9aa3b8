/**
 * "Save revision" for the editor's toolbar: asks for a message, saves a snapshot on top of
 * `baseRevision`, and handles a refused save (409 revision_conflict) with the conflict dialog. On a
 * conflict the user's version goes to localStorage first, so nothing is lost whatever they choose next.
 */
import { useState } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import type { UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { isApiError } from '@/lib/api';
import { useSignedInMe } from '@/features/auth/hooks';
import type { Revision, RevisionConflict } from './api';
import { ConflictDialog } from './ConflictDialog';
import { useDiagramInfo, useSaveRevision } from './hooks';
import { SaveRevisionDialog } from './SaveRevisionDialog';
import { clearUnsaved, stashUnsaved } from './stash';

export interface SaveRevisionButtonProps {
  diagramId: string;
  /** The document to save, read when the user confirms. */
  getContent: () => DiagramDocument;
  /** The revision the edit started from; null when the diagram has none. */
  baseRevision: number | null;
  /** After a revision is saved (directly or on top after a conflict): the new base revision. */
  onSaved: (revision: Revision) => void;
  disabled?: boolean;
}

export function SaveRevisionButton({ diagramId, getContent, baseRevision, onSaved, disabled }: SaveRevisionButtonProps) {
  const me = useSignedInMe();
  const info = useDiagramInfo(diagramId);
  const diagram = info.data?.diagram;
  const save = useSaveRevision(diagramId, diagram?.projectId);
  const [open, setOpen] = useState(false);
  const [conflict, setConflict] = useState<{ latest: NonNullable<RevisionConflict['latest']>; content: DiagramDocument; message: string } | null>(null);
  const unitSystem: UnitSystem = (me.teams.find((t) => t.id === diagram?.teamId)?.unitSystem as UnitSystem | undefined) ?? 'metric';

  const onSave = (message: string) => {
    const content = getContent();
    save.mutate(
      { baseRevision, message, content },
      {
        onSuccess: (r) => {
          clearUnsaved(diagramId);
          setOpen(false);
          onSaved(r);
        },
        onError: (err) => {
          if (!isApiError(err) || err.code !== 'revision_conflict') return;
          const latest = (err.details as RevisionConflict | undefined)?.latest;
          if (!latest) return;
          stashUnsaved(diagramId, { content, baseRevision, latestRevision: latest.number, message, savedAt: Date.now() });
          save.reset();
          setOpen(false);
          setConflict({ latest, content, message });
        },
      },
    );
  };

  return (
    <>
      <Button size="sm" variant="primary" disabled={disabled} onClick={() => { save.reset(); setOpen(true); }}>
        Save revision…
      </Button>
      <SaveRevisionDialog
        open={open}
        onClose={() => setOpen(false)}
        nextNumber={(baseRevision ?? 0) + 1}
        pending={save.isPending}
        error={save.error}
        onSave={onSave}
      />
      {conflict && diagram ? (
        <ConflictDialog
          open
          onClose={() => setConflict(null)}
          diagramId={diagramId}
          projectId={diagram.projectId}
          diagramName={diagram.name}
          unitSystem={unitSystem}
          content={conflict.content}
          message={conflict.message}
          latest={conflict.latest}
          onSavedOnTop={(r) => {
            setConflict(null);
            onSaved(r);
          }}
        />
      ) : null}
    </>
  );
}
