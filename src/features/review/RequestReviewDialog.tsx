/** Ask one or more team members who may approve (review.decide) to review a revision. */
import { useState } from 'react';
import { can } from '@shared/roles';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { CheckboxField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { RoleBadge } from '@/components/RoleBadge';
import { Skeleton } from '@/components/States';
import { errorMessage, isApiError } from '@/lib/api';
import { useMembers } from '@/features/teams/hooks';
import { useRequestReview } from '@/features/revisions/hooks';

export function RequestReviewDialog({
  open, onClose, diagramId, projectId, teamId, revision, meId, alreadyRequested,
}: {
  open: boolean;
  onClose: () => void;
  diagramId: string;
  projectId: string;
  teamId: string;
  revision: number;
  meId: string;
  alreadyRequested: string[];
}) {
  const members = useMembers(teamId);
  const [chosen, setChosen] = useState<string[]>([]);
  const request = useRequestReview(diagramId, revision, projectId);
  const reviewers = (members.data?.members ?? []).filter((m) => can(m.role, 'review.decide') && m.userId !== meId);
  const close = () => {
    request.reset();
    setChosen([]);
    onClose();
  };
  const fieldErrors = isApiError(request.error) ? Object.values(request.error.fieldErrors).flat() : [];
  return (
    <Dialog open={open} onClose={close} title={`Request review of revision ${revision}`} description="Reviewers get an e-mail with a link to compare this revision with the one before it." width="max-w-lg">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          if (chosen.length === 0) return;
          request.mutate(chosen, { onSuccess: close });
        }}
      >
        <fieldset>
          <legend className="mb-2 text-[13px] font-medium text-graphite-800">Reviewers (members who may approve or request changes)</legend>
          {members.isPending ? <Skeleton className="h-16 w-full" /> : null}
          {members.isError ? <Notice signal="error">{errorMessage(members.error)}</Notice> : null}
          {members.data && reviewers.length === 0 ? (
            <p className="text-[13px] text-graphite-600">Nobody else in the team may approve. An owner can give a member the Reviewer role.</p>
          ) : null}
          <ul className="space-y-1.5">
            {reviewers.map((m) => (
              <li key={m.userId} className="flex items-center justify-between gap-2">
                <CheckboxField
                  label={`${m.name} (${m.email})${alreadyRequested.includes(m.userId) ? ' — already asked' : ''}`}
                  checked={chosen.includes(m.userId)}
                  onChange={(e) => setChosen((c) => (e.target.checked ? [...c, m.userId] : c.filter((x) => x !== m.userId)))}
                />
                <RoleBadge role={m.role} />
              </li>
            ))}
          </ul>
        </fieldset>
        {request.error ? (
          <Notice signal="error" className="mt-3">
            {fieldErrors.length ? fieldErrors.join(' ') : errorMessage(request.error)}
          </Notice>
        ) : null}
        <DialogActions>
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="primary" disabled={chosen.length === 0} pending={request.isPending}>
            Send review request{chosen.length > 1 ? 's' : ''}
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
