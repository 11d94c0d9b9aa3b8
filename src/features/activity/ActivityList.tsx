/** Who did what, when, in a project: revisions, reviews, comments, diagrams. */
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { useQuery } from '@tanstack/react-query';
import { ErrorState, Skeleton } from '@/components/States';
import { formatDateTime } from '@/lib/format';
import { activityKeys } from '@/features/revisions/hooks';
import { fetchActivity, type ActivityEntry } from './api';

const str = (v: unknown) => (typeof v === 'string' ? v : '');
const num = (v: unknown) => (typeof v === 'number' ? v : null);

/** The sentence for one entry, after the person's name; links go to the diagram's revision or compare view. */
export function describeActivity(e: ActivityEntry): ReactNode {
  const d = e.detail ?? {};
  const diagramId = str(d.diagramId);
  const name = str(d.name) || 'a diagram';
  const n = num(d.number);
  const diagramLink = diagramId ? <Link className="font-medium underline-offset-2 hover:underline" to={`/diagrams/${diagramId}`}>{name}</Link> : <span className="font-medium">{name}</span>;
  const rev = (label = `revision ${n}`) =>
    diagramId && n ? <Link className="font-medium underline-offset-2 hover:underline" to={`/diagrams/${diagramId}/revisions/${n}`}>{label}</Link> : <span>{label}</span>;
  switch (e.action) {
    case 'project.created': return <>created the project</>;
    case 'project.updated': return <>edited the project details</>;
    case 'diagram.created': return <>created the diagram {diagramLink}</>;
    case 'diagram.duplicated': return <>duplicated {str(d.sourceName) || 'a diagram'}{num(d.sourceRevision) ? ` (r${num(d.sourceRevision)})` : ''} as {diagramLink}</>;
    case 'diagram.renamed': return <>renamed a diagram to {diagramLink}</>;
    case 'diagram.moved_in': return <>moved {diagramLink} here from {str(d.fromProjectName) || 'another project'}</>;
    case 'diagram.moved_out': return <>moved {diagramLink} to {str(d.toProjectName) || 'another project'}</>;
    case 'diagram.copied': return <>copied {str(d.sourceName) || 'a diagram'}{str(d.sourceProjectName) ? ` from ${str(d.sourceProjectName)}` : ''} as {diagramLink}</>;
    case 'diagram.updated': return <>edited the description of {diagramLink}</>;
    case 'diagram.deleted': return <>deleted the diagram <span className="font-medium">{name}</span></>;
    case 'revision.saved': return <>saved {rev()} of {diagramLink}{str(d.message) ? <> — “{str(d.message)}”</> : null}</>;
    case 'revision.restored': return <>restored r{num(d.restoredFrom)} of {diagramLink} as {rev()}</>;
    case 'review.requested': return <>asked for a review of {rev()} of {diagramLink}</>;
    case 'review.commented': return <>commented on {rev()} of {diagramLink}{str(d.partId) ? ` at ${str(d.partId)}` : ''}</>;
    case 'review.comment_resolved': return <>resolved a comment on {rev()} of {diagramLink}</>;
    case 'review.comment_reopened': return <>reopened a comment on {rev()} of {diagramLink}</>;
    case 'review.decided':
      return d.decision === 'approve'
        ? <><span className="font-semibold text-ok-700">✓ approved</span> {rev()} of {diagramLink}</>
        : <><span className="font-semibold text-caution-700">△ requested changes</span> to {rev()} of {diagramLink}{str(d.note) ? <> — “{str(d.note)}”</> : null}</>;
    default: return <>{e.action.replace(/[._]/g, ' ')}</>;
  }
}

export function ActivityList({ projectId }: { projectId: string }) {
  const q = useQuery({ queryKey: activityKeys.project(projectId), queryFn: ({ signal }) => fetchActivity(projectId, signal) });
  if (q.isPending) return <Skeleton className="h-24 w-full" />;
  if (q.isError) return <ErrorState title="Could not load the activity" error={q.error} onRetry={() => q.refetch()} retrying={q.isFetching} />;
  if (q.data.length === 0) return <p className="text-[13px] text-graphite-500">Nothing has happened in this project yet.</p>;
  return (
    <ol aria-label="Activity" className="divide-y divide-graphite-100 rounded-lg border border-graphite-200 bg-white">
      {q.data.map((e) => (
        <li key={e.id} className="flex flex-wrap items-baseline justify-between gap-x-3 px-3 py-2 text-[13px]">
          <span className="min-w-0">
            <span className="font-semibold text-graphite-900">{e.user?.name ?? 'A former member'}</span> {describeActivity(e)}
          </span>
          <time dateTime={e.createdAt} className="shrink-0 text-[12px] text-graphite-500">{formatDateTime(e.createdAt)}</time>
        </li>
      ))}
    </ol>
  );
}
