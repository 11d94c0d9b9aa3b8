/**
 * /diagrams/:diagramId/compare?a=N&b=M — two versions side by side on one shared viewport (pan and zoom
 * together), their differences marked on both canvases, a legend, a change list that frames each change,
 * the results table, and the review of B when B is a revision. `a`/`b` are revision numbers, `working`
 * (the server working copy) or `unsaved` (a version whose save was refused, kept in this browser).
 * Lazy-loaded by the router (default export).
 */
import '@xyflow/react/dist/style.css';
import '@/features/editor/editor.css';
import './compare.css';
import { useCallback, useMemo, useState } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router';
import { diffDiagrams } from '@shared/diagram/diff';
import type { Role } from '@shared/roles';
import type { UnitSystem } from '@shared/units';
import { NotFoundPage } from '@/app/NotFound';
import { ButtonLink } from '@/components/Button';
import { ChevronRightIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { ErrorState, PageLoading } from '@/components/States';
import { isApiError } from '@/lib/api';
import { useSignedInMe } from '@/features/auth/hooks';
import type { RevisionMeta } from '@/features/revisions/api';
import { useDiagramInfo, useRevisions } from '@/features/revisions/hooks';
import { RevisionStateBadge } from '@/features/revisions/RevisionStateBadge';
import { UnsavedVersionBar } from '@/features/revisions/UnsavedVersionBar';
import { readUnsaved } from '@/features/revisions/stash';
import { CommentsPanel, openPins } from '@/features/review/CommentsPanel';
import { ReviewPanel } from '@/features/review/ReviewPanel';
import { useComments } from '@/features/revisions/hooks';
import { bomChanges } from './bomDiff';
import { ChangeList, Legend } from './ChangeList';
import { DiagramCanvas, partsBounds, unionBounds } from './DiagramCanvas';
import { compareMarks, type ChangeItem } from './marks';
import { ResultsTable } from './ResultsTable';
import { parseSide, sideLabel, sideParam, useSide, type SideData, type SideSpec } from './sides';
import { asResultsSummary, summarizeDocument } from './summary';
import { useSharedViewport, useViewOnlyEditorStore } from './viewport';
import { effectiveUnitSystem } from '@/features/account/units';

export default function ComparePage() {
  const { diagramId = '' } = useParams();
  const [params] = useSearchParams();
  const info = useDiagramInfo(diagramId);
  const revisions = useRevisions(diagramId);

  if (info.isError) {
    if (isApiError(info.error) && info.error.status === 404) return <NotFoundPage what="diagram" />;
    return <ErrorState title="Could not open this diagram" error={info.error} onRetry={() => info.refetch()} />;
  }
  if (revisions.isError) return <ErrorState title="Could not load the revisions" error={revisions.error} onRetry={() => revisions.refetch()} />;
  if (info.isPending || revisions.isPending) return <PageLoading label="Opening the comparison…" />;

  // Defaults: the latest revision against the one before it (or the working copy when there is one revision).
  const latest = revisions.data[0]?.number ?? null;
  const b = parseSide(params.get('b')) ?? (latest ? { kind: 'revision' as const, n: latest } : { kind: 'working' as const });
  const a = parseSide(params.get('a')) ?? (latest && latest > 1 ? { kind: 'revision' as const, n: latest - 1 } : { kind: 'working' as const });
  return <Compare key={`${sideParam(a)}|${sideParam(b)}`} diagramId={diagramId} a={a} b={b} revisions={revisions.data} role={info.data.role} />;
}

function SidePicker({ id, label, value, revisions, hasUnsaved, onChange }: { id: string; label: string; value: SideSpec; revisions: RevisionMeta[]; hasUnsaved: boolean; onChange: (s: SideSpec) => void }) {
  return (
    <label className="flex items-center gap-1.5 text-[13px]" htmlFor={id}>
      <span className="font-semibold text-graphite-700">{label}</span>
      <select
        id={id}
        value={sideParam(value)}
        onChange={(e) => onChange(parseSide(e.target.value)!)}
        className="h-8 max-w-64 truncate rounded-md border border-graphite-300 bg-white px-2 text-[13px]"
      >
        {revisions.map((r) => (
          <option key={r.number} value={String(r.number)}>
            r{r.number} — {r.message || 'no message'}
          </option>
        ))}
        <option value="working">Working copy (latest edits)</option>
        {hasUnsaved || value.kind === 'unsaved' ? <option value="unsaved">Your unsaved version</option> : null}
      </select>
    </label>
  );
}

function Compare({ diagramId, a, b, revisions, role }: { diagramId: string; a: SideSpec; b: SideSpec; revisions: RevisionMeta[]; role: Role }) {
  const me = useSignedInMe();
  const navigate = useNavigate();
  const [, setParams] = useSearchParams();
  const info = useDiagramInfo(diagramId);
  const diagram = info.data!.diagram;
  const unitSystem: UnitSystem = effectiveUnitSystem(me, diagram.teamId);
  useViewOnlyEditorStore(unitSystem);
  const sideA = useSide(diagramId, a);
  const sideB = useSide(diagramId, b);
  const hasUnsaved = useMemo(() => readUnsaved(diagramId) !== null, [diagramId]);

  const setSides = (na: SideSpec, nb: SideSpec) => setParams({ a: sideParam(na), b: sideParam(nb) }, { replace: false });

  return (
    <div className="bw-wide space-y-3 pb-6">
      <nav aria-label="Breadcrumb" className="flex min-w-0 items-center gap-1 text-[13px]">
        <Link to={`/projects/${diagram.projectId}`} className="truncate text-graphite-600 hover:underline">{diagram.projectName}</Link>
        <ChevronRightIcon size={13} className="shrink-0 text-graphite-400" />
        <Link to={`/diagrams/${diagramId}/history`} className="truncate text-graphite-600 hover:underline">{diagram.name}</Link>
        <ChevronRightIcon size={13} className="shrink-0 text-graphite-400" />
        <span aria-current="page" className="font-semibold text-graphite-900">Compare</span>
      </nav>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <h1 className="text-lg font-semibold tracking-tight text-graphite-950">
          Compare {sideLabel(a)} with {sideLabel(b)}
        </h1>
        <SidePicker id="side-a" label="A (before)" value={a} revisions={revisions} hasUnsaved={hasUnsaved} onChange={(s) => setSides(s, b)} />
        <SidePicker id="side-b" label="B (after)" value={b} revisions={revisions} hasUnsaved={hasUnsaved} onChange={(s) => setSides(a, s)} />
        <div className="ml-auto flex gap-2">
          <ButtonLink size="sm" to={`/diagrams/${diagramId}/history`}>History</ButtonLink>
          <ButtonLink size="sm" to={`/diagrams/${diagramId}`}>Open editor</ButtonLink>
        </div>
      </div>
      {b.kind === 'unsaved' && sideB.status === 'ready' ? (
        <UnsavedVersionBar
          diagramId={diagramId}
          projectId={diagram.projectId}
          diagramName={diagram.name}
          latest={revisions[0] ?? null}
          onSaved={(n) => navigate(`/diagrams/${diagramId}/compare?a=${revisions[0]?.number ?? n - 1}&b=${n}`, { replace: true })}
          onCopied={(id) => navigate(`/diagrams/${id}`)}
          onDiscarded={() => navigate(`/diagrams/${diagramId}/history`)}
        />
      ) : null}
      {sideA.status === 'error' || sideB.status === 'error' ? (
        <ErrorState title="Could not load a side of the comparison" error={sideA.status === 'error' ? sideA.error : sideB.error} />
      ) : sideA.status !== 'ready' || sideB.status !== 'ready' ? (
        <PageLoading label="Loading both versions…" />
      ) : (
        <CompareReady diagramId={diagramId} projectId={diagram.projectId} teamId={diagram.teamId} a={sideA} b={sideB} unitSystem={unitSystem} role={role} meId={me.user.id} />
      )}
    </div>
  );
}

function CompareReady({ diagramId, projectId, teamId, a, b, unitSystem, role, meId }: {
  diagramId: string; projectId: string; teamId: string; a: SideData; b: SideData; unitSystem: UnitSystem; role: Role; meId: string;
}) {
  const docA = a.doc!;
  const docB = b.doc!;
  const diff = useMemo(() => diffDiagrams(docA, docB, { unitSystem }), [docA, docB, unitSystem]);
  const marks = useMemo(() => compareMarks(diff, docA, docB), [diff, docA, docB]);
  const bounds = useMemo(() => unionBounds(partsBounds(docA), partsBounds(docB)), [docA, docB]);
  const { viewport, setViewport, frame, boxRef } = useSharedViewport(bounds);
  const [active, setActive] = useState<string | null>(null);
  const [picked, setPicked] = useState<string | null>(null);

  // Both stored: the summaries saved with the revisions. Otherwise both computed here, so the two agree in method.
  const bothStored = !!a.stored && !!b.stored;
  const summaries = useMemo(() => {
    const sa = bothStored ? a.stored! : summarizeDocument(docA);
    const sb = bothStored ? b.stored! : summarizeDocument(docB);
    return { sa, sb, ra: asResultsSummary(sa), rb: asResultsSummary(sb) };
  }, [bothStored, a.stored, b.stored, docA, docB]);
  const bom = useMemo(() => bomChanges(docA, docB, unitSystem), [docA, docB, unitSystem]);

  const comments = useComments(diagramId, b.revision ? b.revision.number : null);
  const pins = useMemo(() => openPins(comments.data), [comments.data]);

  const frameIds = useCallback(
    (ids: string[]) => {
      const partIds = ids.flatMap((id) => {
        const c = docB.cables.find((x) => x.id === id) ?? docA.cables.find((x) => x.id === id);
        return c ? [c.from.part, c.to.part] : [id];
      });
      frame(unionBounds(partsBounds(docA, partIds), partsBounds(docB, partIds)), 1.4);
    },
    [docA, docB, frame],
  );

  const onSelect = (item: ChangeItem) => {
    setActive(item.key);
    if (item.frame.length) frameIds(item.frame);
  };

  return (
    <>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <Legend items={marks.items} />
        <button type="button" className="text-[12px] text-graphite-600 underline hover:text-graphite-900" onClick={() => frame(bounds, 1)}>
          Fit both
        </button>
      </div>
      <div className="flex h-[52dvh] min-h-[340px] gap-2" data-testid="compare-canvases">
        <div ref={boxRef} className="bw-pane" data-testid="canvas-a">
          <span className="bw-pane-title">A · {a.label}{a.revision ? <RevisionStateBadge state={a.revision.state} /> : null}</span>
          <DiagramCanvas doc={docA} marks={marks.a} viewport={viewport} onViewportChange={setViewport} label={`Version A (${a.label})`} />
        </div>
        <div className="bw-pane" data-testid="canvas-b">
          <span className="bw-pane-title">B · {b.label}{b.revision ? <RevisionStateBadge state={b.revision.state} /> : null}</span>
          <DiagramCanvas
            doc={docB}
            marks={marks.b}
            pins={pins}
            picked={picked}
            viewport={viewport}
            onViewportChange={setViewport}
            onPick={b.revision ? (id) => setPicked((p) => (p === id ? null : id)) : undefined}
            label={`Version B (${b.label})`}
          />
        </div>
      </div>
      <p className="text-[11px] text-graphite-500">Both canvases share one view: pan or zoom either one. Parts are matched by their ids.</p>

      <div className="grid gap-4 lg:grid-cols-[minmax(260px,1fr)_minmax(420px,1.5fr)_minmax(280px,1fr)]">
        <section aria-labelledby="changes-heading" className="min-w-0">
          <h2 id="changes-heading" className="mb-2 text-[13px] font-semibold text-graphite-800">
            Changes <span className="font-mono text-graphite-500">({marks.items.length})</span>
          </h2>
          <ChangeList items={marks.items} activeKey={active} onSelect={onSelect} />
        </section>
        <section aria-labelledby="results-heading" className="min-w-0">
          <h2 id="results-heading" className="mb-2 text-[13px] font-semibold text-graphite-800">Results, A and B</h2>
          <ResultsTable
            a={summaries.ra}
            b={summaries.rb}
            labelA={a.label}
            labelB={b.label}
            statusA={summaries.sa.status}
            statusB={summaries.sb.status}
            source={bothStored ? 'Figures stored with each revision when it was saved.' : 'Figures computed in this browser with the same core.'}
            bom={bom}
          />
          <Notice signal="warning" title="Caution:" className="mt-3">
            Figures check the design as drawn; they are not approval to install. Fit a fuse close to each battery and follow local codes.
          </Notice>
        </section>
        <aside aria-label="Review" className="min-w-0 space-y-5">
          {b.revision ? (
            <>
              <ReviewPanel diagramId={diagramId} projectId={projectId} teamId={teamId} revision={b.revision} role={role} meId={meId} />
              <CommentsPanel
                diagramId={diagramId}
                projectId={projectId}
                revision={b.revision.number}
                doc={docB}
                role={role}
                meId={meId}
                picked={picked}
                onPick={setPicked}
                onShow={(id) => frameIds([id])}
              />
            </>
          ) : (
            <p className="text-[13px] text-graphite-600">B is not a saved revision, so it cannot be reviewed yet. Save it as a revision first.</p>
          )}
        </aside>
      </div>
    </>
  );
}
