/**
 * The canvas side of a layout preview (preview.ts): ghost cables drawn over the drawing where a
 * candidate would put a cable, and the bar that says a preview is showing, with Apply and Cancel.
 * Nothing here changes the document; the ghosts are not selectable and take no pointer events.
 */
import { memo, useEffect } from 'react';
import { BaseEdge, EdgeLabelRenderer, getSmoothStepPath, Panel, type Edge, type EdgeProps } from '@xyflow/react';
import type { DiagramDocument, TerminalRef } from '@shared/diagram';
import type { UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { useEditorStore } from '../store';
import { lengthText } from '../units';
import type { CableFlowEdge } from './CableEdge';
import { applyPreview, clearPreview, usePreviewStore, type CanvasPreview } from './preview';

export interface PreviewEdgeData extends Record<string, unknown> {
  /** The cable this ghost stands for. */
  cable: string;
  /** What the ghost's tag says ("to Battery 3 +", "1.2 m → 2.4 m"). */
  text: string;
}
export type PreviewFlowEdge = Edge<PreviewEdgeData, 'preview'>;

const GHOST = 'var(--color-note-600)';

function PreviewEdgeView({ data, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition }: EdgeProps<PreviewFlowEdge>) {
  const [path, midX, midY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 8, offset: 18 });
  if (!data) return null;
  return (
    <>
      <BaseEdge path={path} interactionWidth={0} style={{ stroke: GHOST, strokeWidth: 3.5, strokeDasharray: '7 4', strokeLinecap: 'round', opacity: 0.9, pointerEvents: 'none' }} />
      <EdgeLabelRenderer>
        <div
          className="pointer-events-none absolute rounded px-1 text-[10px] leading-4 font-semibold whitespace-nowrap text-white shadow-sm"
          style={{ background: GHOST, transform: `translate(-50%, -50%) translate(${midX}px, ${midY + 20}px)`, zIndex: 2 }}
          data-testid={`preview-ghost-${data.cable}`}
        >
          {data.text}
        </div>
      </EdgeLabelRenderer>
    </>
  );
}

export const PreviewEdge = memo(PreviewEdgeView);

/** "Battery 3 +", "Positive busbar tap t3", "Fuse 1 bank side". */
function endText(doc: DiagramDocument, end: TerminalRef): string {
  const part = doc.parts.find((p) => p.id === end.part);
  const name = part?.label || end.part;
  if (end.terminal === 'pos') return `${name} +`;
  if (end.terminal === 'neg') return `${name} −`;
  if (part?.type === 'busbar') return `${name} tap ${end.terminal}`;
  return `${name} ${end.terminal}`;
}

/**
 * The canvas's edges with a preview drawn over them: each cable the candidate changes is faded as
 * drawn and gets a ghost where the candidate puts it (moved ends) or over it (a new length).
 */
export function withPreviewEdges(edges: CableFlowEdge[], preview: CanvasPreview | null, unitSystem: UnitSystem): (CableFlowEdge | PreviewFlowEdge)[] {
  if (!preview) return edges;
  const ghosts: PreviewFlowEdge[] = [];
  const out: (CableFlowEdge | PreviewFlowEdge)[] = edges.map((e) => {
    const change = preview.cables[e.id];
    const cable = e.data?.cable;
    if (!change || !cable) return e;
    const from = change.from ?? cable.from;
    const to = change.to ?? cable.to;
    const moved = change.from ? change.from : change.to;
    const text = moved
      ? `${cable.label ? `${cable.label}: ` : ''}moves to ${endText(preview.doc, moved)}`
      : change.length_m
        ? `${cable.label ? `${cable.label}: ` : ''}${lengthText(change.length_m.was, unitSystem)} → ${lengthText(change.length_m.now, unitSystem)}`
        : '';
    ghosts.push({
      id: `preview:${e.id}`, type: 'preview', source: from.part, sourceHandle: from.terminal, target: to.part, targetHandle: to.terminal,
      data: { cable: e.id, text }, selectable: false, focusable: false, deletable: false, reconnectable: false, zIndex: 5,
    });
    // A moved cable fades where it is drawn now; a lengthened one stays, under its ghost.
    return moved ? { ...e, className: 'bw-preview-old opacity-30' } : e;
  });
  return [...out, ...ghosts];
}

/** The bar over the canvas while a preview shows: what it is, Apply, Cancel (also Escape). */
export function PreviewBar() {
  const preview = usePreviewStore((s) => s.preview);
  const readOnly = useEditorStore((s) => s.readOnly);
  useEffect(() => {
    if (!preview) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') clearPreview();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [preview]);
  if (!preview) return null;
  const n = Object.keys(preview.cables).length;
  return (
    <Panel position="top-center">
      <div role="region" aria-label="Preview on the canvas" data-testid="canvas-preview" className="flex max-w-[36rem] items-center gap-2 rounded-md border border-note-200 bg-note-50 px-2.5 py-1.5 text-[12px] text-graphite-900 shadow-sm">
        <span className="h-0 w-5 shrink-0 border-t-[3px] border-dashed" style={{ borderColor: GHOST }} aria-hidden="true" />
        <span className="min-w-0">
          <span className="font-semibold">Preview, not applied:</span> {preview.title}
          <span className="block text-[11px] text-graphite-600">
            {n === 0 ? 'Nothing changes: this is the layout as drawn.' : `${n === 1 ? 'One cable changes' : `${n} cables change`}, drawn dashed in blue.`} Esc cancels.
          </span>
        </span>
        {preview.apply && !readOnly ? (
          <Button size="sm" variant="primary" onClick={() => applyPreview()}>
            Apply
          </Button>
        ) : null}
        <Button size="sm" variant="ghost" onClick={() => clearPreview()}>
          Cancel preview
        </Button>
      </div>
    </Panel>
  );
}
