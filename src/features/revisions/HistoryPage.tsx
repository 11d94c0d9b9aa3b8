/**
 * /diagrams/:diagramId/history — the diagram's revisions, newest first: open one read-only, compare any
 * two, restore an old one as a new revision, duplicate the diagram. Lazy-loaded (default export).
 */
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { can } from '@shared/roles';
import { NotFoundPage } from '@/app/NotFound';
import { Button, ButtonLink } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { TextField } from '@/components/Field';
import { ChevronRightIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { EmptyState, ErrorState, PageLoading } from '@/components/States';
import { errorMessage, isApiError } from '@/lib/api';
import { formatDateTime, plural } from '@/lib/format';
import type { RevisionMeta } from './api';
import { useDiagramInfo, useDuplicateDiagram, useRestoreRevision, useRevisions } from './hooks';
import { RevisionStateBadge } from './RevisionStateBadge';
import { readUnsaved } from './stash';

function ResultsCell({ r }: { r: RevisionMeta }) {
  const res = r.results;
  if (!res) return <span className="text-graphite-600">—</span>;
  if (res.status !== 'solved') return <span className="font-semibold text-fault-700">✕ Not solved</span>;
  const c = res.findingCounts ?? {};
  const errors = c.error ?? 0;
  const warnings = c.warning ?? 0;
  const notes = (c.note ?? 0) + (c.info ?? 0);
  return (
    <span className="font-mono text-[12px]">
      {errors ? <span className="text-fault-700">{plural(errors, 'error')}</span> : null}
      {errors && warnings ? ', ' : null}
      {warnings ? <span className="text-caution-700">{plural(warnings, 'warning')}</span> : null}
      {!errors && !warnings ? <span className="text-ok-700">no errors or warnings</span> : null}
      {notes ? <span className="text-graphite-500">, {plural(notes, 'note')}</span> : null}
    </span>
  );
}

export default function HistoryPage() {
  const { diagramId = '' } = useParams();
  const info = useDiagramInfo(diagramId);
  const revisions = useRevisions(diagramId);
  const navigate = useNavigate();
  const [selected, setSelected] = useState<number[]>([]);
  const [restoring, setRestoring] = useState<number | null>(null);
  const [duplicating, setDuplicating] = useState(false);
  const projectId = info.data?.diagram.projectId;
  const restore = useRestoreRevision(diagramId, projectId);

  if (info.isError) {
    if (isApiError(info.error) && info.error.status === 404) return <NotFoundPage what="diagram" />;
    return <ErrorState title="Could not open this diagram" error={info.error} onRetry={() => info.refetch()} />;
  }
  if (info.isPending) return <PageLoading label="Loading the history…" />;
  const { diagram, role } = info.data;
  const mayEdit = can(role, 'diagram.edit');
  const list = revisions.data ?? [];
  const latest = list[0]?.number ?? null;
  const unsaved = readUnsaved(diagramId);
  const toggle = (n: number) => setSelected((s) => (s.includes(n) ? s.filter((x) => x !== n) : [...s, n].slice(-2)));
  const pair = [...selected].sort((x, y) => x - y);

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-1 flex items-center gap-1 text-xs text-graphite-500">
        <Link to={`/projects/${diagram.projectId}`} className="hover:text-graphite-800 hover:underline">{diagram.projectName}</Link>
        <ChevronRightIcon size={12} />
        <Link to={`/diagrams/${diagramId}`} className="hover:text-graphite-800 hover:underline">{diagram.name}</Link>
        <ChevronRightIcon size={12} />
        <span aria-current="page">History</span>
      </nav>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-xl font-semibold tracking-tight text-graphite-950">History of {diagram.name}</h1>
          <p className="mt-1 text-sm text-graphite-600">Each revision is a saved snapshot that never changes; approved revisions are locked.</p>
        </div>
        <div className="flex flex-wrap gap-2">
          <ButtonLink to={`/diagrams/${diagramId}`}>Open editor</ButtonLink>
          {latest ? <ButtonLink to={`/diagrams/${diagramId}/compare?a=${latest}&b=working`}>Compare r{latest} with the working copy</ButtonLink> : null}
          {mayEdit ? <Button onClick={() => setDuplicating(true)}>Duplicate diagram…</Button> : null}
        </div>
      </div>

      {unsaved ? (
        <Notice signal="warning" title="Your unsaved version is kept in this browser." className="mb-3">
          A save was refused because a newer revision exists.{' '}
          <Link className="font-semibold underline" to={`/diagrams/${diagramId}/compare?a=${latest ?? 'working'}&b=unsaved`}>
            Compare it with {latest ? `r${latest}` : 'the working copy'}
          </Link>{' '}
          to save it on top or as a copy.
        </Notice>
      ) : null}

      {restore.error ? <Notice signal="error" className="mb-3">{errorMessage(restore.error)}</Notice> : null}

      {revisions.isPending ? <PageLoading label="Loading revisions…" /> : null}
      {revisions.isError ? <ErrorState title="Could not load the revisions" error={revisions.error} onRetry={() => revisions.refetch()} /> : null}
      {revisions.data && list.length === 0 ? (
        <EmptyState title="No revisions yet">
          {mayEdit ? 'Save a revision from the editor to start the history.' : 'A designer has not saved a revision of this diagram yet.'}
        </EmptyState>
      ) : null}
      {list.length ? (
        <>
          <div className="mb-2 flex items-center gap-2 text-[13px] text-graphite-600">
            <span>Tick two revisions to compare them.</span>
            <ButtonLink
              size="sm"
              variant={pair.length === 2 ? 'primary' : 'secondary'}
              to={pair.length === 2 ? `/diagrams/${diagramId}/compare?a=${pair[0]}&b=${pair[1]}` : '#'}
              aria-disabled={pair.length !== 2}
              onClick={(e) => pair.length !== 2 && e.preventDefault()}
              className={pair.length !== 2 ? 'pointer-events-none opacity-55' : ''}
            >
              Compare selected{pair.length === 2 ? ` (r${pair[0]} → r${pair[1]})` : ''}
            </ButtonLink>
          </div>
          <div className="overflow-x-auto rounded-lg border border-graphite-200 bg-white">
            <table className="w-full text-[13px]" aria-label="Revisions">
              <thead className="border-b border-graphite-200 text-left text-[11px] tracking-wide text-graphite-500 uppercase">
                <tr>
                  <th className="w-8 px-3 py-2"><span className="sr-only">Select</span></th>
                  <th className="px-2 py-2">Revision</th>
                  <th className="px-2 py-2">Message</th>
                  <th className="px-2 py-2">Saved by</th>
                  <th className="px-2 py-2">State</th>
                  <th className="px-2 py-2">Checks</th>
                  <th className="px-2 py-2 text-right">Actions</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-graphite-100">
                {list.map((r) => (
                  <tr key={r.number} data-testid={`revision-${r.number}`}>
                    <td className="px-3 py-2">
                      <input type="checkbox" aria-label={`Select revision ${r.number}`} checked={selected.includes(r.number)} onChange={() => toggle(r.number)} className="accent-copper-600" />
                    </td>
                    <td className="px-2 py-2 font-mono font-semibold">
                      <Link className="hover:underline" to={`/diagrams/${diagramId}/revisions/${r.number}`}>r{r.number}</Link>
                      {r.number === latest ? <span className="ml-1 font-sans text-[11px] font-normal text-graphite-500">latest</span> : null}
                    </td>
                    <td className="max-w-xs px-2 py-2">
                      {r.message || <span className="text-graphite-600">No message</span>}
                      {r.restoredFrom ? <span className="ml-1 text-[11px] text-graphite-500">(restored from r{r.restoredFrom})</span> : null}
                      <div className="font-mono text-[11px] text-graphite-600" title={`Content hash ${r.contentHash}`}>{r.contentHash.slice(0, 12)}</div>
                    </td>
                    <td className="px-2 py-2 whitespace-nowrap">
                      {r.author?.name ?? 'A former member'}
                      <div className="text-[12px] text-graphite-500">{formatDateTime(r.createdAt)}</div>
                    </td>
                    <td className="px-2 py-2"><RevisionStateBadge state={r.state} /></td>
                    <td className="px-2 py-2"><ResultsCell r={r} /></td>
                    <td className="px-2 py-2">
                      <div className="flex justify-end gap-1.5">
                        <ButtonLink size="sm" to={`/diagrams/${diagramId}/revisions/${r.number}`}>Open</ButtonLink>
                        {r.number > 1 ? <ButtonLink size="sm" to={`/diagrams/${diagramId}/compare?a=${r.number - 1}&b=${r.number}`}>Compare with r{r.number - 1}</ButtonLink> : null}
                        {mayEdit && r.number !== latest ? (
                          <Button size="sm" onClick={() => setRestoring(r.number)}>Restore…</Button>
                        ) : null}
                      </div>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      ) : null}

      <Dialog open={restoring !== null} onClose={() => setRestoring(null)} title={`Restore revision ${restoring ?? ''}?`}>
        <p className="text-sm text-graphite-700">
          Its content is saved as a new revision {latest ? latest + 1 : ''} on top of the history; nothing is deleted. The working copy in the editor is not changed.
        </p>
        <DialogActions>
          <Button onClick={() => setRestoring(null)} data-autofocus>Cancel</Button>
          <Button
            variant="primary"
            pending={restore.isPending}
            onClick={() => restoring !== null && restore.mutate({ n: restoring }, { onSuccess: () => setRestoring(null) })}
          >
            Restore as a new revision
          </Button>
        </DialogActions>
      </Dialog>

      {mayEdit ? (
        <DuplicateDialog
          open={duplicating}
          onClose={() => setDuplicating(false)}
          diagramId={diagramId}
          projectId={diagram.projectId}
          name={diagram.name}
          latest={latest}
          onDone={(id) => navigate(`/diagrams/${id}`)}
        />
      ) : null}
    </>
  );
}

function DuplicateDialog({ open, onClose, diagramId, projectId, name, latest, onDone }: {
  open: boolean; onClose: () => void; diagramId: string; projectId: string; name: string; latest: number | null; onDone: (id: string) => void;
}) {
  const [value, setValue] = useState(`${name} (copy)`.slice(0, 120));
  const dup = useDuplicateDiagram(diagramId, projectId);
  return (
    <Dialog open={open} onClose={() => { dup.reset(); onClose(); }} title="Duplicate diagram"
      description={latest ? `A new diagram in this project from revision ${latest} (the latest).` : 'A new diagram in this project from the working copy.'}
    >
      <form onSubmit={(e) => { e.preventDefault(); if (value.trim()) dup.mutate({ name: value.trim() }, { onSuccess: (d) => onDone(d.id) }); }}>
        <TextField label="Name" value={value} maxLength={120} onChange={(e) => setValue(e.target.value)} data-autofocus errors={isApiError(dup.error) ? dup.error.fieldErrors.name : undefined} />
        {dup.error && !(isApiError(dup.error) && dup.error.fieldErrors.name) ? <Notice signal="error" className="mt-3">{errorMessage(dup.error)}</Notice> : null}
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" pending={dup.isPending} disabled={!value.trim()}>Duplicate</Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
