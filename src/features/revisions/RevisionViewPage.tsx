/**
 * /diagrams/:diagramId/revisions/:n — one revision, read-only: the drawing, the results stored with it,
 * its review (state, request, decision) and comments pinned to its parts. Lazy-loaded (default export).
 */
import '@xyflow/react/dist/style.css';
import '@/features/editor/editor.css';
import '@/features/compare/compare.css';
import { useMemo, useState } from 'react';
import { Link, useParams } from 'react-router';
import { can } from '@shared/roles';
import type { UnitSystem } from '@shared/units';
import { NotFoundPage } from '@/app/NotFound';
import { ButtonLink } from '@/components/Button';
import { ChevronRightIcon, ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { ErrorState, PageLoading } from '@/components/States';
import { isApiError } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import { useSignedInMe } from '@/features/auth/hooks';
import { DiagramCanvas, partsBounds } from '@/features/compare/DiagramCanvas';
import { useSharedViewport, useViewOnlyEditorStore } from '@/features/compare/viewport';
import { CommentsPanel, openPins } from '@/features/review/CommentsPanel';
import { ReviewPanel } from '@/features/review/ReviewPanel';
import type { Revision } from './api';
import { useComments, useDiagramInfo, useRevision, useRevisions } from './hooks';
import { RevisionStateBadge } from './RevisionStateBadge';
import { effectiveUnitSystem } from '@/features/account/units';
import { useEditorStore } from '@/features/editor/store';
import { localizeUnitsInText } from '@shared/units';

export default function RevisionViewPage() {
  const { diagramId = '', n: raw = '' } = useParams();
  const n = /^[1-9][0-9]{0,8}$/.test(raw) ? Number(raw) : null;
  const info = useDiagramInfo(diagramId);
  const revision = useRevision(diagramId, n);
  if (n === null) return <NotFoundPage what="revision" />;
  const err = info.error ?? revision.error;
  if (err) {
    if (isApiError(err) && err.status === 404) return <NotFoundPage what={info.isError ? 'diagram' : 'revision'} />;
    return <ErrorState title="Could not open this revision" error={err} onRetry={() => { void info.refetch(); void revision.refetch(); }} />;
  }
  if (!info.data || !revision.data) return <PageLoading label="Opening the revision…" />;
  return <RevisionView diagramId={diagramId} revision={revision.data} />;
}

function RevisionView({ diagramId, revision }: { diagramId: string; revision: Revision }) {
  const me = useSignedInMe();
  const info = useDiagramInfo(diagramId);
  const revisions = useRevisions(diagramId);
  const { diagram, role } = info.data!;
  const unitSystem: UnitSystem = effectiveUnitSystem(me, diagram.teamId);
  useViewOnlyEditorStore(unitSystem);
  const doc = revision.content;
  const bounds = useMemo(() => partsBounds(doc), [doc]);
  const { viewport, setViewport, frame, boxRef } = useSharedViewport(bounds);
  const [picked, setPicked] = useState<string | null>(null);
  const comments = useComments(diagramId, revision.number);
  const pins = useMemo(() => openPins(comments.data), [comments.data]);
  const latest = revisions.data?.[0]?.number ?? null;
  const s = revision.resultsSummary;

  const show = (id: string) => {
    const c = doc.cables.find((x) => x.id === id);
    frame(partsBounds(doc, c ? [c.from.part, c.to.part] : [id]), 1.4);
    setPicked(id);
  };

  return (
    <div className="bw-wide space-y-3 pb-6">
      <nav aria-label="Breadcrumb" className="flex min-w-0 items-center gap-1 text-[13px]">
        <Link to={`/projects/${diagram.projectId}`} className="truncate text-graphite-600 hover:underline">{diagram.projectName}</Link>
        <ChevronRightIcon size={13} className="shrink-0 text-graphite-400" />
        <Link to={`/diagrams/${diagramId}/history`} className="truncate text-graphite-600 hover:underline">{diagram.name}</Link>
        <ChevronRightIcon size={13} className="shrink-0 text-graphite-400" />
        <span aria-current="page" className="font-semibold text-graphite-900">Revision {revision.number}</span>
      </nav>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-2">
        <h1 className="text-lg font-semibold tracking-tight text-graphite-950">
          {diagram.name}, revision {revision.number}
        </h1>
        <RevisionStateBadge state={revision.state} />
        <span className="rounded border border-graphite-300 px-1.5 py-0.5 text-[11px] font-medium text-graphite-600">Read only</span>
        <div className="ml-auto flex flex-wrap gap-2">
          {revision.number > 1 ? <ButtonLink size="sm" to={`/diagrams/${diagramId}/compare?a=${revision.number - 1}&b=${revision.number}`}>Compare with r{revision.number - 1}</ButtonLink> : null}
          {latest && latest !== revision.number ? <ButtonLink size="sm" to={`/diagrams/${diagramId}/compare?a=${revision.number}&b=${latest}`}>Compare with latest (r{latest})</ButtonLink> : null}
          <ButtonLink size="sm" to={`/diagrams/${diagramId}/history`}>History</ButtonLink>
          {can(role, 'diagram.edit') ? <ButtonLink size="sm" to={`/diagrams/${diagramId}`}>Open editor</ButtonLink> : null}
        </div>
      </div>
      <p className="text-[13px] text-graphite-600">
        Saved by {revision.author?.name ?? 'a former member'} on {formatDateTime(revision.createdAt)}
        {revision.message ? <> — “{revision.message}”</> : null}
        <span className="ml-2 font-mono text-[11px] text-graphite-600" title="Content hash (SHA-256)">{revision.contentHash.slice(0, 16)}</span>
      </p>

      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_380px]">
        <div className="space-y-3">
          <div ref={boxRef} className="bw-pane h-[62dvh] min-h-[360px]">
            <DiagramCanvas
              doc={doc}
              pins={pins}
              picked={picked}
              viewport={viewport}
              onViewportChange={setViewport}
              onPick={can(role, 'review.comment') ? (id) => setPicked((p) => (p === id ? null : id)) : undefined}
              label={`Revision ${revision.number} (read only)`}
            />
          </div>
          <StoredResults s={s} />
        </div>
        <aside aria-label="Review" className="space-y-5">
          <ReviewPanel diagramId={diagramId} projectId={diagram.projectId} teamId={diagram.teamId} revision={revision} role={role} meId={me.user.id} />
          <CommentsPanel
            diagramId={diagramId}
            projectId={diagram.projectId}
            revision={revision.number}
            doc={doc}
            role={role}
            meId={me.user.id}
            picked={picked}
            onPick={setPicked}
            onShow={show}
          />
        </aside>
      </div>
    </div>
  );
}

function StoredResults({ s }: { s: Revision['resultsSummary'] }) {
  // Set by useViewOnlyEditorStore from the user's effective unit system.
  const unitSystem = useEditorStore((st) => st.unitSystem);
  if (!s) return null;
  const sevIcon = (sev: string) => (sev === 'error' ? <ErrorIcon size={12} /> : sev === 'warning' ? <WarningIcon size={12} /> : <NoteIcon size={12} />);
  return (
    <section aria-labelledby="stored-results" className="rounded-md border border-graphite-200 bg-white p-3">
      <h2 id="stored-results" className="mb-2 text-[13px] font-semibold text-graphite-800">Results stored with this revision (load case)</h2>
      {s.status && s.status !== 'solved' ? <Notice signal="error" className="mb-2">This revision could not be solved; see its findings.</Notice> : null}
      <div className="flex flex-wrap gap-x-6 gap-y-1 text-[13px]">
        {s.batteries.map((b) => (
          <span key={b.id}>
            {b.label}: <span className="font-mono">{b.current_A.toFixed(1)} A · {(b.share * 100).toFixed(1)} %</span>
          </span>
        ))}
      </div>
      <p className="mt-1 text-[13px] text-graphite-700">
        Imbalance <span className="font-mono">{s.imbalance_pct.toFixed(1)} %</span>
        {s.drop_pct !== undefined ? <> · drop to load <span className="font-mono">{s.drop_pct.toFixed(2)} %</span></> : null}
        {' '}· wiring losses <span className="font-mono">{s.losses_W.toFixed(1)} W</span>
      </p>
      {s.findings.length ? (
        <ul className="mt-2 space-y-0.5 text-[12px]">
          {s.findings.map((f) => (
            <li key={f.id} className="flex items-start gap-1">
              <span className={`mt-0.5 ${f.severity === 'error' ? 'text-fault-700' : f.severity === 'warning' ? 'text-caution-700' : 'text-note-700'}`}>{sevIcon(f.severity)}</span>
              {localizeUnitsInText(f.message, unitSystem)}
            </li>
          ))}
        </ul>
      ) : null}
      <p className="mt-2 text-[11px] text-graphite-500">Design-check figures; not approval to install.</p>
    </section>
  );
}
