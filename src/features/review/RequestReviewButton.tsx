/** "Request review…" in the editor's toolbar: the latest saved revision, through the same dialog as History. */
import { useState } from 'react';
import { can, type Role } from '@shared/roles';
import { Button } from '@/components/Button';
import { useSignedInMe } from '@/features/auth/hooks';
import type { DiagramRecord } from '@/features/editor/api';
import { useRevision } from '@/features/revisions/hooks';
import { RequestReviewDialog } from './RequestReviewDialog';

export function RequestReviewButton({ diagram, role }: { diagram: DiagramRecord; role: Role }) {
  const me = useSignedInMe();
  const [open, setOpen] = useState(false);
  const latest = diagram.latestRevision ?? null;
  const revision = useRevision(diagram.id, open && latest ? latest.number : null);
  if (!can(role, 'diagram.edit')) return null;
  const locked = latest?.state === 'approved';
  const title = !latest
    ? 'Save a revision first: a review is of a saved revision'
    : locked
      ? `Revision ${latest.number} is approved; save a new revision to ask for another review`
      : `Ask a reviewer to review revision ${latest.number}`;
  return (
    <>
      <Button size="sm" variant="ghost" disabled={!latest || locked} onClick={() => setOpen(true)} title={title}>
        Request review…
      </Button>
      {latest && !locked ? (
        <RequestReviewDialog
          open={open}
          onClose={() => setOpen(false)}
          diagramId={diagram.id}
          projectId={diagram.projectId}
          teamId={diagram.teamId}
          revision={latest.number}
          meId={me.user.id}
          alreadyRequested={revision.data?.review.reviewers.map((r) => r.id) ?? []}
        />
      ) : null}
    </>
  );
}
