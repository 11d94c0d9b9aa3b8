/**
 * /diagrams/:diagramId/print — the briefing sheet with the bill of materials and the findings, laid out
 * for the browser's print to PDF. The diagram is drawn off screen by the editor's own canvas (read only)
 * and captured like an image export, so the printed drawing is the exported one.
 */
import '@xyflow/react/dist/style.css';
import '@/features/editor/editor.css';
import './print.css';
import { useEffect, useMemo, useRef, useState } from 'react';
import { Link, useParams, useSearchParams } from 'react-router';
import { useQuery } from '@tanstack/react-query';
import { ReactFlowProvider, useNodesInitialized, useReactFlow } from '@xyflow/react';
import { billOfMaterials } from '@shared/diagram/bom';
import { localizeUnitsInText } from '@shared/units';
import { PART_TYPES } from '@shared/electrical/parts';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { SafetyCaution } from '@/components/SafetyCaution';
import { ErrorState, PageLoading } from '@/components/States';
import { errorMessage, isApiError } from '@/lib/api';
import { NotFoundPage } from '@/app/NotFound';
import { useSignedInMe } from '@/features/auth/hooks';
import { diagramKeys, fetchDiagram, type DiagramRecord } from '@/features/editor/api';
import { Canvas } from '@/features/editor/canvas/Canvas';
import { parseStoredDiagram } from '@/features/editor/loadDocument';
import { useLiveResults } from '@/features/editor/results/useLiveResults';
import { useEditorStore } from '@/features/editor/store';
import { useAnnotationUi } from '@/features/annotations/state';
import { BomTable } from '@/features/bom/BomTable';
import { BriefingSheet } from './BriefingSheet';
import { captureDiagram, nextPaint, type DiagramImage } from './capture';
import { sheetSize } from './layout';
import { useSheetMeta } from './meta';
import { analysisLabel, annotationKindsIn, partTypesIn, stepsOf, unitLabel } from './sheetProps';
import { effectiveUnitSystem } from '@/features/account/units';

/** Printable width of an A4 / Letter landscape page at 96 px per inch, less 10 mm margins (about 1040 px). */
const PRINT_WIDTH_PX = 1040;
const SEVERITY_WORD = { error: 'Error', warning: 'Warning', note: 'Note' } as const;

function Capture({ withAnnotations, onImage, onError }: { withAnnotations: boolean; onImage: (img: DiagramImage) => void; onError: (e: string) => void }) {
  const rf = useReactFlow();
  const initialized = useNodesInitialized();
  const status = useEditorStore((s) => s.resultsStatus);
  const nParts = useEditorStore((s) => s.doc.parts.length);
  const done = useRef(false);
  useEffect(() => {
    const ready = (nParts === 0 || initialized) && (status === 'ready' || status === 'error');
    if (!ready || done.current) return;
    done.current = true;
    void (async () => {
      await nextPaint();
      const el = document.querySelector<HTMLElement>('.bw-print-capture .react-flow__viewport');
      if (!el) return onError('The drawing did not render.');
      try {
        onImage(await captureDiagram(rf, el, { format: 'png', pixelRatio: 2, includeAnnotations: withAnnotations }));
      } catch (e) {
        onError(errorMessage(e));
      }
    })();
  }, [initialized, status, nParts, rf, withAnnotations, onImage, onError]);
  return null;
}

function PrintSheet({ diagram, withAnnotations }: { diagram: DiagramRecord; withAnnotations: boolean }) {
  const me = useSignedInMe();
  const doc = useEditorStore((s) => s.doc);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const results = useEditorStore((s) => s.results);
  const mode = useEditorStore((s) => s.analysis.mode);
  const [image, setImage] = useState<DiagramImage | null>(null);
  const [error, setError] = useState<string | null>(null);
  useLiveResults(true);
  useEffect(() => {
    useAnnotationUi.setState({ forceVisible: withAnnotations, forceHidden: !withAnnotations });
    return () => useAnnotationUi.setState({ forceVisible: false, forceHidden: false });
  }, [withAnnotations]);
  const { meta } = useSheetMeta({ diagramId: diagram.id, projectName: diagram.projectName, diagramName: diagram.name, doc, workingCopyAuthor: diagram.updatedBy?.name ?? me.user.name });
  const bom = useMemo(() => billOfMaterials(doc, { unitSystem }), [doc, unitSystem]);
  const labelOf = useMemo(() => {
    const m = new Map<string, string>([...doc.parts.map((p) => [p.id, p.label || PART_TYPES[p.type].name] as const), ...doc.cables.map((c) => [c.id, c.label || c.id] as const)]);
    return (id: string) => m.get(id) ?? id;
  }, [doc]);
  const findings = results?.canvas.findings ?? [];
  const fit = image ? Math.min(1, PRINT_WIDTH_PX / sheetSize(image).width) : 1;

  return (
    <div className="bw-print">
      <div className="bw-print-bar print:hidden">
        <Link to={`/diagrams/${diagram.id}`} className="text-[13px] text-graphite-600 hover:underline">← Back to the editor</Link>
        <span className="flex-1 text-[13px] text-graphite-600">Print view: use Print and choose “Save as PDF”. Landscape pages.</span>
        <Button variant="primary" disabled={!image || !meta} onClick={() => window.print()}>
          Print…
        </Button>
      </div>
      {/* Off-screen source of the printed image: hidden from assistive technology and out of the tab order. */}
      <div className="bw-print-capture" aria-hidden="true" inert>
        <Canvas />
        <Capture withAnnotations={withAnnotations} onImage={setImage} onError={setError} />
      </div>
      {error ? <Notice signal="error">The drawing could not be captured: {error}</Notice> : null}
      {image && meta ? (
        <>
          <div className="bw-print-fit" style={{ zoom: fit }}>
            <BriefingSheet
              meta={meta} image={{ ...image }} partTypes={partTypesIn(doc)} steps={withAnnotations ? stepsOf(doc) : []}
              annotationKinds={withAnnotations ? annotationKindsIn(doc) : []} analysisLabel={analysisLabel(mode)} unitLabel={unitLabel(unitSystem)}
            />
          </div>
          <section className="bw-print-page" aria-labelledby="print-bom">
            <h2 id="print-bom" className="bw-print-h2">Bill of materials — {diagram.name}</h2>
            <BomTable bom={bom} sortable={false} />
          </section>
          <section className="bw-print-section" aria-labelledby="print-findings">
            <h2 id="print-findings" className="bw-print-h2">Findings</h2>
            {!results ? (
              <p>The checks did not run.</p>
            ) : findings.length === 0 ? (
              <p>No findings for the diagram as drawn.</p>
            ) : (
              <ul className="bw-print-findings" aria-label="Findings">
                {findings.map((f, i) => (
                  <li key={`${f.code}:${i}`} data-severity={f.severity}>
                    <strong>{SEVERITY_WORD[f.severity]}:</strong> {localizeUnitsInText(f.message, unitSystem)}
                    {f.parts.length ? <span className="text-graphite-500"> ({f.parts.map(labelOf).join(', ')})</span> : null}
                  </li>
                ))}
              </ul>
            )}
            <SafetyCaution className="mt-4" />
          </section>
        </>
      ) : !error ? (
        <PageLoading label="Drawing the sheet…" />
      ) : null}
    </div>
  );
}

export default function PrintRoute() {
  const { diagramId = '' } = useParams();
  const [search] = useSearchParams();
  const withAnnotations = search.get('annotations') !== '0';
  const me = useSignedInMe();
  const query = useQuery({
    queryKey: diagramKeys.detail(diagramId),
    queryFn: ({ signal }) => fetchDiagram(diagramId, signal),
    staleTime: Infinity,
    retry: (n, err) => !(isApiError(err) && err.status >= 400 && err.status < 500) && n < 2,
  });
  const [loaded, setLoaded] = useState<string | null>(null);
  const [parseErrors, setParseErrors] = useState<string[] | null>(null);

  useEffect(() => {
    const data = query.data;
    if (!data || loaded === diagramId) return;
    const parsed = parseStoredDiagram(data.diagram.content);
    if (!parsed.ok) {
      setParseErrors(parsed.errors.map((e) => `${e.path}: ${e.message}`));
      return;
    }
    const unitSystem = effectiveUnitSystem(me, data.diagram.teamId);
    useEditorStore.getState().load(parsed.doc, { diagramId, readOnly: true, unitSystem });
    setLoaded(diagramId);
  }, [query.data, diagramId, loaded, me.teams]);

  useEffect(() => {
    if (query.data) document.title = `${query.data.diagram.name} — print — Bankwright`;
  }, [query.data]);

  if (query.isError) {
    if (isApiError(query.error) && query.error.status === 404) return <NotFoundPage what="diagram" />;
    return <ErrorState title="Could not open this diagram" error={query.error} onRetry={() => query.refetch()} retrying={query.isFetching} />;
  }
  if (parseErrors) return <Notice signal="error">This diagram could not be read: {parseErrors.join('; ')}</Notice>;
  if (!query.data || loaded !== diagramId) return <PageLoading label="Opening the diagram…" />;
  return (
    <ReactFlowProvider>
      <PrintSheet diagram={query.data.diagram} withAnnotations={withAnnotations} />
    </ReactFlowProvider>
  );
}
