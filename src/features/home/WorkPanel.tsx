/**
 * The work that waits for the signed-in user across their teams — revisions waiting for their review,
 * changes requested on their own designs, recent approvals — on top of the landing page.
 */
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { can } from '@shared/roles';
import type { RevisionState } from '@shared/schemas/diagrams';
import { LoadingRegion, Skeleton } from '@/components/States';
import { errorMessage } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import { useSignedInMe } from '@/features/auth/hooks';
import { RevisionStateBadge } from '@/features/revisions/RevisionStateBadge';
import type { WorkItem } from './api';
import { useWork } from './hooks';

/** The work waiting for the user, shown on top of the landing page (the team's projects). */
export function WorkPanel() {
  const me = useSignedInMe();
  const work = useWork();
  const reviews = me.teams.some((t) => can(t.role, 'review.decide'));
  const designs = me.teams.some((t) => can(t.role, 'diagram.edit'));
  return (
    <section aria-labelledby="work-heading" className="mb-6">
      <h2 id="work-heading" className="mb-2 text-sm font-semibold text-graphite-900">
        Waiting for you
      </h2>
      {work.isPending ? (
        <LoadingRegion label="Loading your work">
          <div className="grid gap-4 lg:grid-cols-3">
            {[0, 1, 2].map((i) => (
              <Skeleton key={i} className="h-24 w-full" />
            ))}
          </div>
        </LoadingRegion>
      ) : work.isError ? (
        // A side panel: its failure is said quietly, without taking the page's alert.
        <p className="text-[13px] text-graphite-700">
          Could not load your work: {errorMessage(work.error)}{' '}
          <button type="button" className="font-medium text-copper-700 underline underline-offset-2" onClick={() => work.refetch()}>
            Try again
          </button>
        </p>
      ) : (
        <div className="grid items-start gap-4 lg:grid-cols-3">
          <WorkList
            title="Waiting for your review"
            empty={reviews ? 'No revision is waiting for your review.' : 'Your role does not review designs; reviewers and owners do.'}
            items={work.data.waitingForReview.map((w) => ({ ...w, when: `Asked ${formatDateTime(w.requestedAt)}` }))}
          />
          <WorkList
            title="Changes requested on your designs"
            empty={designs ? 'No changes requested on your revisions.' : 'Your role does not edit designs.'}
            items={work.data.changesRequested.map((w) => ({ ...w, when: `Saved ${formatDateTime(w.createdAt)}` }))}
          />
          <WorkList
            title="Recent approvals"
            empty="No approved revisions yet."
            items={work.data.recentApprovals.map((w) => ({
              ...w,
              when: `${w.approvedBy ? `Approved by ${w.approvedBy}` : 'Approved'}${w.approvedAt ? ` ${formatDateTime(w.approvedAt)}` : ''}`,
            }))}
          />
        </div>
      )}
    </section>
  );
}

function WorkList({ title, empty, items }: { title: string; empty: string; items: (WorkItem & { when: string })[] }) {
  const id = `work-${title.toLowerCase().replace(/[^a-z]+/g, '-')}`;
  return (
    <section aria-labelledby={id} className="rounded-lg border border-graphite-200 bg-white shadow-xs">
      <h3 id={id} className="flex items-center justify-between border-b border-graphite-100 px-4 py-2.5 text-sm font-semibold text-graphite-950">
        {title}
        <span className="rounded bg-graphite-100 px-1.5 text-xs font-medium text-graphite-700">{items.length}</span>
      </h3>
      {items.length === 0 ? (
        <p className="px-4 py-5 text-[13px] text-graphite-600">{empty}</p>
      ) : (
        <ul className="divide-y divide-graphite-100">
          {items.map((w) => (
            <Row key={`${w.diagram.id}-${w.revision}`} w={w} />
          ))}
        </ul>
      )}
    </section>
  );
}

function Row({ w }: { w: WorkItem & { when: string } }): ReactNode {
  return (
    <li className="px-4 py-2.5">
      <div className="flex items-center gap-2">
        <Link to={w.path} className="min-w-0 truncate text-[13px] font-medium text-copper-700 underline-offset-2 hover:underline">
          {w.diagram.name} · revision {w.revision}
        </Link>
        <RevisionStateBadge state={w.state as RevisionState} className="ml-auto" />
      </div>
      <div className="truncate text-xs text-graphite-600">
        {w.project.name} · {w.team.name}
      </div>
      {w.message ? <div className="truncate text-xs text-graphite-700">“{w.message}”</div> : null}
      <div className="text-[11px] text-graphite-600">{w.when}</div>
    </li>
  );
}
