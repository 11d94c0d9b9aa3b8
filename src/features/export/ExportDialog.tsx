/**
 * Export for a crew briefing: PNG at 1×, 2× or 4×, or SVG, of the whole drawing on the briefing sheet,
 * with or without the annotation layer; and a link to the print view (sheet, bill of materials and
 * findings, for the browser's print to PDF).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { createPortal, flushSync } from 'react-dom';
import { useReactFlow } from '@xyflow/react';
import { emptyDiagram } from '@shared/diagram';
import { Button, buttonClass } from '@/components/Button';
import { Dialog } from '@/components/Dialog';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';
import { useSignedInMe } from '@/features/auth/hooks';
import type { DiagramRecord } from '@/features/editor/api';
import { useEditorStore } from '@/features/editor/store';
import { workingCopyActions } from '@/features/editor/workingCopy';
import { useAnnotationUi } from '@/features/annotations/state';
import { BriefingSheet, type BriefingSheetProps } from './BriefingSheet';
import { captureDiagram, captureSheet, dataUrlToBlob, diagramImageSize, downloadBlob, drawingBounds, nextPaint, slug, type ImageFormat } from './capture';
import { MAX_CANVAS_SIDE, PIXEL_RATIOS, sheetSize, type PixelRatio } from './layout';
import { revisionText, useSheetMeta } from './meta';
import { analysisLabel, annotationKindsIn, partTypesIn, stepsOf, unitLabel } from './sheetProps';

type Choice = `png${PixelRatio}` | 'svg';
const CHOICES: { id: Choice; label: string; format: ImageFormat; ratio: PixelRatio }[] = [
  ...PIXEL_RATIOS.map((r) => ({ id: `png${r}` as Choice, label: `PNG ${r}×`, format: 'png' as const, ratio: r })),
  { id: 'svg', label: 'SVG (vector)', format: 'svg', ratio: 1 },
];

/** Stands in for the document while the dialog is closed. */
const CLOSED_DOC = emptyDiagram();

function viewportElement(): HTMLElement | null {
  return document.querySelector<HTMLElement>('.bw-canvas .react-flow__viewport');
}

export function ExportDialog({ open, onClose, diagram }: { open: boolean; onClose: () => void; diagram: DiagramRecord }) {
  const rf = useReactFlow();
  const me = useSignedInMe();
  // The document only while open: closed, an edit does not re-render the dialog (nor compare it with
  // the latest revision's content).
  const doc = useEditorStore((s) => (open ? s.doc : CLOSED_DOC));
  const mode = useEditorStore((s) => s.analysis.mode);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const layerVisible = useAnnotationUi((s) => s.visible);
  const [choice, setChoice] = useState<Choice>('png2');
  const [withAnnotations, setWithAnnotations] = useState(layerVisible);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [staged, setStaged] = useState<BriefingSheetProps | null>(null);
  const sheetRef = useRef<HTMLDivElement>(null);
  const { meta, loading } = useSheetMeta(
    { diagramId: diagram.id, projectName: diagram.projectName, diagramName: diagram.name, doc, workingCopyAuthor: diagram.updatedBy?.name ?? me.user.name },
    open,
  );

  useEffect(() => {
    if (open) {
      setWithAnnotations(useAnnotationUi.getState().visible);
      setError(null);
      setDone(null);
    }
  }, [open]);

  // Sheet size per choice, from the drawing's bounds now (the layer is measured only when shown).
  const size = useMemo(() => {
    if (!open) return null;
    const el = viewportElement();
    const b = el ? drawingBounds(rf, el, withAnnotations && layerVisible) : null;
    return b ? sheetSize(diagramImageSize(b)) : null;
  }, [open, rf, withAnnotations, layerVisible, doc]);

  const run = async () => {
    const el = viewportElement();
    const c = CHOICES.find((x) => x.id === choice)!;
    if (!el || !meta) return;
    setBusy(true);
    setError(null);
    setDone(null);
    const store = useEditorStore.getState();
    const selection = store.selection;
    try {
      // Selection outlines stay out of the picture; the layer is drawn (or not) as chosen.
      store.clearSelection();
      useAnnotationUi.setState({ forceVisible: withAnnotations, forceHidden: !withAnnotations, activeId: null });
      await nextPaint();
      const image = await captureDiagram(rf, el, { format: c.format, pixelRatio: c.ratio, includeAnnotations: withAnnotations });
      useAnnotationUi.setState({ forceVisible: false, forceHidden: false });
      if (selection.length) useEditorStore.getState().select(selection);
      flushSync(() =>
        setStaged({
          meta, image, partTypes: partTypesIn(doc), steps: withAnnotations ? stepsOf(doc) : [], annotationKinds: withAnnotations ? annotationKindsIn(doc) : [],
          analysisLabel: analysisLabel(mode), unitLabel: unitLabel(unitSystem),
        }),
      );
      const url = await captureSheet(sheetRef.current!, c.format, c.ratio);
      const name = `${slug(diagram.projectName)}-${slug(diagram.name)}-${meta.revision ? `r${meta.revision.number}` : 'working-copy'}`;
      const file = c.format === 'png' ? `${name}${c.ratio === 1 ? '' : `@${c.ratio}x`}.png` : `${name}.svg`;
      downloadBlob(dataUrlToBlob(url), file);
      setDone(file);
    } catch (e) {
      setError(errorMessage(e));
    } finally {
      useAnnotationUi.setState({ forceVisible: false, forceHidden: false });
      setStaged(null);
      setBusy(false);
    }
  };

  const printHref = `/diagrams/${encodeURIComponent(diagram.id)}/print${withAnnotations ? '' : '?annotations=0'}`;
  return (
    <>
      <Dialog open={open} onClose={onClose} title="Export for a crew briefing" width="max-w-lg">
        <div className="space-y-4 text-[13px]">
          <p className="text-graphite-600">
            The whole diagram on one sheet with its title block, legend of symbols and the safety caution. Minimap and zoom controls are left out.
          </p>
          <fieldset>
            <legend className="mb-1 font-medium text-graphite-800">Format</legend>
            <div className="grid grid-cols-2 gap-1.5">
              {CHOICES.map((c) => {
                const px = size ? { w: size.width * c.ratio, h: size.height * c.ratio } : null;
                const tooBig = c.format === 'png' && !!px && (px.w > MAX_CANVAS_SIDE || px.h > MAX_CANVAS_SIDE);
                return (
                  <label key={c.id} className={`bw-choice ${choice === c.id ? 'bw-choice-on' : ''} ${tooBig ? 'opacity-50' : ''}`}>
                    <input type="radio" name="export-format" className="sr-only" value={c.id} checked={choice === c.id} disabled={tooBig} onChange={() => setChoice(c.id)} />
                    <span className="block font-medium">{c.label}</span>
                    <span className="block font-mono text-[11px] text-graphite-500">
                      {px ? (c.format === 'svg' ? `${size!.width} × ${size!.height} (scales)` : `${px.w} × ${px.h} px${tooBig ? ' — too large' : ''}`) : '—'}
                    </span>
                  </label>
                );
              })}
            </div>
          </fieldset>
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={withAnnotations} onChange={(e) => setWithAnnotations(e.target.checked)} />
            Include annotations (callouts, steps, notes, highlights)
          </label>
          <div className="rounded-md border border-graphite-200 bg-graphite-50 px-3 py-2 text-xs">
            {loading || !meta ? (
              'Reading the revision history…'
            ) : (
              <>
                <span className="font-medium">{revisionText(meta)}</span>
                {meta.notReviewed ? <span className="ml-2 font-semibold text-fault-700">Marked NOT REVIEWED</span> : <span className="ml-2 text-ok-700">Approved revision</span>}
              </>
            )}
          </div>
          {error ? <Notice signal="error">The export failed: {error}</Notice> : null}
          {done ? <Notice signal="success">Saved {done}.</Notice> : null}
          <div className="flex flex-wrap items-center justify-between gap-2">
            <a href={printHref} target="_blank" rel="noopener" className={buttonClass('secondary', 'md')} onClick={() => workingCopyActions.saveNow()}>
              Print view…
            </a>
            <div className="flex gap-2">
              <Button variant="ghost" onClick={onClose}>
                Close
              </Button>
              <Button variant="primary" pending={busy} disabled={!meta || busy} onClick={() => void run()}>
                Export
              </Button>
            </div>
          </div>
        </div>
      </Dialog>
      {staged
        ? createPortal(
            <div aria-hidden="true" style={{ position: 'fixed', left: -100000, top: 0, pointerEvents: 'none' }}>
              <BriefingSheet ref={sheetRef} {...staged} />
            </div>,
            document.body,
          )
        : null}
    </>
  );
}
