/**
 * A revision's review: its state, who was asked, the decisions so far, "Request review" (diagram.edit)
 * and "Approve" / "Request changes" with a note (review.decide). An approved revision is locked.
 */
import { useState } from 'react';
import { can, type Role } from '@shared/roles';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import type { Revision } from '@/features/revisions/api';
import { useDecide } from '@/features/revisions/hooks';
import { RevisionStateBadge } from '@/features/revisions/RevisionStateBadge';
import { RequestReviewDialog } from './RequestReviewDialog';

export interface ReviewPanelProps {
  diagramId: string;
  projectId: string;
  teamId: string;
  revision: Revision;
  role: Role;
  meId: string;
}

export function ReviewPanel({ diagramId, projectId, teamId, revision, role, meId }: ReviewPanelProps) {
  const [asking, setAsking] = useState(false);
  const [note, setNote] = useState('');
  const decide = useDecide(diagramId, revision.number, projectId);
  const { state } = revision;
  const locked = state === 'approved';
  const mayRequest = can(role, 'diagram.edit') && !locked;
  // Deciding needs review.decide; a designer never decides on a revision (their own or not).
  const mayDecide = can(role, 'review.decide') && (state === 'in_review' || state === 'changes_requested');
  const reviewers = revision.review?.reviewers ?? [];
  const decisions = revision.review?.decisions ?? [];

  return (
    <section aria-labelledby="review-heading" className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 id="review-heading" className="flex items-center gap-2 text-[13px] font-semibold text-graphite-800">
          Review of revision {revision.number} <RevisionStateBadge state={state} />
        </h3>
        {mayRequest ? (
          <Button size="sm" onClick={() => setAsking(true)}>
            Request review…
          </Button>
        ) : null}
      </div>

      {reviewers.length ? (
        <p className="text-[12px] text-graphite-600">
          Asked: {reviewers.map((r) => r.name).join(', ')}
        </p>
      ) : (
        <p className="text-[12px] text-graphite-600">No review requested yet.</p>
      )}

      {decisions.length ? (
        <ol aria-label="Decisions" className="space-y-1.5">
          {decisions.map((dcs, i) => (
            <li key={i} className="rounded border border-graphite-200 bg-graphite-50 px-2 py-1.5 text-[12px]">
              <span className={`font-semibold ${dcs.decision === 'approve' ? 'text-ok-700' : 'text-caution-700'}`}>
                {dcs.decision === 'approve' ? '✓ Approved' : '△ Changes requested'}
              </span>{' '}
              by {dcs.reviewer?.name ?? 'a former member'} · {formatDateTime(dcs.createdAt)}
              {dcs.note ? <p className="mt-0.5 whitespace-pre-line text-graphite-700">{dcs.note}</p> : null}
            </li>
          ))}
        </ol>
      ) : null}

      {locked ? (
        <Notice signal="success" title="Approved and locked.">
          {revision.approvedBy ? `${revision.approvedBy.name}, ${revision.approvedAt ? formatDateTime(revision.approvedAt) : ''}. ` : ''}
          Editing continues in a new revision. A design review is not approval to install.
        </Notice>
      ) : null}

      {mayDecide ? (
        <form
          className="space-y-2 rounded-md border border-graphite-200 bg-white p-3"
          onSubmit={(e) => e.preventDefault()}
          aria-label="Decision"
        >
          <label className="block text-[12px] font-medium text-graphite-700" htmlFor="decision-note">
            Note to the designer (optional)
          </label>
          <textarea
            id="decision-note"
            value={note}
            onChange={(e) => setNote(e.target.value)}
            maxLength={2000}
            rows={2}
            className="w-full rounded-md border border-graphite-300 px-2 py-1.5 text-[13px]"
          />
          {decide.error ? <Notice signal="error">{errorMessage(decide.error)}</Notice> : null}
          <div className="flex flex-wrap gap-2">
            <Button
              variant="primary"
              size="sm"
              pending={decide.isPending && decide.variables?.decision === 'approve'}
              disabled={decide.isPending}
              onClick={() => decide.mutate({ decision: 'approve', note }, { onSuccess: () => setNote('') })}
            >
              ✓ Approve revision {revision.number}
            </Button>
            <Button
              size="sm"
              pending={decide.isPending && decide.variables?.decision === 'request_changes'}
              disabled={decide.isPending}
              onClick={() => decide.mutate({ decision: 'request_changes', note }, { onSuccess: () => setNote('') })}
            >
              △ Request changes
            </Button>
          </div>
          <p className="text-[11px] text-graphite-500">Approving signs off the design check of this revision and locks it; it is not approval to install.</p>
        </form>
      ) : can(role, 'review.decide') && state === 'draft' ? (
        <p className="text-[12px] text-graphite-600">A designer has not sent this revision for review yet.</p>
      ) : null}

      {mayRequest ? (
        <RequestReviewDialog
          open={asking}
          onClose={() => setAsking(false)}
          diagramId={diagramId}
          projectId={projectId}
          teamId={teamId}
          revision={revision.number}
          meId={meId}
          alreadyRequested={reviewers.map((r) => r.id)}
        />
      ) : null}
    </section>
  );
}
