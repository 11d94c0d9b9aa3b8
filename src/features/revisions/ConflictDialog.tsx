/**
 * A revision save refused because someone saved a newer revision (409 revision_conflict). The user's
 * version is already kept in this browser (stash.ts); the dialog lists what differs from the newer
 * revision and offers: compare side by side, save mine on top (after reading the differences), or save
 * it as a copy. Closing keeps the user's version: nothing is lost.
 */
import { useMemo, useState } from 'react';
import { useNavigate } from 'react-router';
import type { DiagramDocument } from '@shared/diagram';
import { diffDiagrams } from '@shared/diagram/diff';
import type { UnitSystem } from '@shared/units';
import { Button, ButtonLink } from '@/components/Button';
import { Dialog } from '@/components/Dialog';
import { Notice } from '@/components/Notice';
import { Skeleton } from '@/components/States';
import { errorMessage } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import { compareMarks, STATUS_TEXT } from '@/features/compare/marks';
import type { Revision, RevisionConflict } from './api';
import { useRevision, useSaveRevision } from './hooks';
import { SaveAsCopyForm } from './SaveAsCopyForm';
import { clearUnsaved } from './stash';

export interface ConflictDialogProps {
  open: boolean;
  onClose: () => void;
  diagramId: string;
  projectId: string;
  diagramName: string;
  unitSystem: UnitSystem;
  /** The user's version (also kept in localStorage). */
  content: DiagramDocument;
  message: string;
  latest: NonNullable<RevisionConflict['latest']>;
  onSavedOnTop: (revision: Revision) => void;
  onCopied?: (diagramId: string) => void;
}

const MAX_LISTED = 8;

export function ConflictDialog({ open, onClose, diagramId, projectId, diagramName, unitSystem, content, message, latest, onSavedOnTop, onCopied }: ConflictDialogProps) {
  const navigate = useNavigate();
  const newer = useRevision(diagramId, latest.number);
  const save = useSaveRevision(diagramId, projectId);
  const [copying, setCopying] = useState(false);
  const items = useMemo(() => {
    if (!newer.data) return null;
    return compareMarks(diffDiagrams(newer.data.content, content, { unitSystem }), newer.data.content, content).items;
  }, [newer.data, content, unitSystem]);
  const compareUrl = `/diagrams/${encodeURIComponent(diagramId)}/compare?a=${latest.number}&b=unsaved`;

  return (
    <Dialog open={open} onClose={onClose} title="A newer revision was saved" width="max-w-xl"
      description={`Revision ${latest.number}${latest.author ? ` by ${latest.author.name}` : ''} (${formatDateTime(latest.createdAt)}${latest.message ? `, “${latest.message}”` : ''}) was saved after the revision you started from.`}
    >
      <div className="space-y-3">
        <Notice signal="note" title="Your version is kept.">
          It stays in this browser until you save it on top, save it as a copy or discard it.
        </Notice>
        <section aria-labelledby="conflict-diff">
          <h3 id="conflict-diff" className="mb-1 text-[13px] font-semibold text-graphite-800">
            Your version compared with revision {latest.number}
          </h3>
          {newer.isPending ? <Skeleton className="h-14 w-full" /> : null}
          {newer.isError ? <Notice signal="error">{errorMessage(newer.error)}</Notice> : null}
          {items && items.length === 0 ? <p className="text-[13px] text-graphite-600">Your version is the same as revision {latest.number}.</p> : null}
          {items && items.length ? (
            <ul aria-label="Differences" className="max-h-48 space-y-1 overflow-y-auto text-[12px]">
              {items.slice(0, MAX_LISTED).map((i) => (
                <li key={i.key} className="flex gap-1.5">
                  <span className={`bw-diff-tag bw-diff-tag-${i.status}`}>{STATUS_TEXT[i.status].glyph} {STATUS_TEXT[i.status].word}</span>
                  <span><span className="font-medium">{i.title}</span>{i.details.length ? `: ${i.details.join('; ')}` : ''}</span>
                </li>
              ))}
              {items.length > MAX_LISTED ? <li className="text-graphite-500">…and {items.length - MAX_LISTED} more in the side-by-side view.</li> : null}
            </ul>
          ) : null}
        </section>
        {save.error ? <Notice signal="error">{errorMessage(save.error)}</Notice> : null}
        <div className="flex flex-wrap gap-2">
          <ButtonLink variant="primary" to={compareUrl} onClick={onClose}>Compare side by side</ButtonLink>
          <Button
            pending={save.isPending}
            disabled={!items}
            onClick={() =>
              save.mutate(
                { baseRevision: latest.number, message, content },
                { onSuccess: (r) => { clearUnsaved(diagramId); onSavedOnTop(r); } },
              )
            }
          >
            Save mine on top as revision {latest.number + 1}
          </Button>
          <Button onClick={() => setCopying((v) => !v)} aria-expanded={copying}>Save as a copy…</Button>
        </div>
        {copying ? (
          <SaveAsCopyForm
            projectId={projectId}
            diagramName={diagramName}
            content={content}
            message={message}
            onCancel={() => setCopying(false)}
            onCopied={(id) => {
              clearUnsaved(diagramId);
              onClose();
              if (onCopied) onCopied(id);
              else navigate(`/diagrams/${encodeURIComponent(id)}`);
            }}
          />
        ) : null}
      </div>
    </Dialog>
  );
}
