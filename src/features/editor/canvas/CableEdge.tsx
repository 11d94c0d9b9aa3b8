/**
 * The cable-run edge: conductor size and length in the team's units, the live current of the chosen
 * analysis mode and its loading against ampacity, and the current's direction where it matters
 * (equalize, a chosen fault).
 *
 * Labels stay legible when zoomed out: below DETAIL_ZOOM a label shows its figure only, and below
 * JUMPER_ZOOM a jumper's label is hidden (a jumper sits between two posts, right beside the lead's
 * label) unless the jumper is selected, hovered, over its ampacity, marked or has a finding. A jumper's
 * label sits a third of the way along its run rather than at the midpoint, so it clears a lead that
 * takes off from the same posts.
 */
import { memo, useRef, useState, type ReactNode } from 'react';
import { createPortal } from 'react-dom';
import { BaseEdge, getSmoothStepPath, useStore, type Edge, type EdgeProps, type ReactFlowState } from '@xyflow/react';
import type { DiagramCable } from '@shared/diagram';
import { ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';
import type { UnitSystem } from '@shared/units';
import { useCanvasFigure, useCanvasView, useEditorStore, useResultsText, type CanvasView } from '../store';
import type { CanvasSummary } from '../results/types';
import { fmtAmps, fmtPct, lengthText, shortConductor } from '../units';
import { PreviewEdge } from './PreviewEdge';

export interface CableEdgeData extends Record<string, unknown> {
  cable: DiagramCable;
}
export type CableFlowEdge = Edge<CableEdgeData>;

/** Below this zoom a label shows its figure only. */
export const DETAIL_ZOOM = 0.75;
/** Below this zoom a jumper's label is hidden unless it needs attention. */
export const JUMPER_ZOOM = 0.55;

type Detail = 'full' | 'compact' | 'minimal';
const detailOf = (s: ReactFlowState): Detail => {
  const z = s.transform[2];
  return z >= DETAIL_ZOOM ? 'full' : z >= JUMPER_ZOOM ? 'compact' : 'minimal';
};

/**
 * React Flow's edge-label layer, found once per flow. React Flow's own EdgeLabelRenderer looks the layer
 * up with querySelector in a store selector, which runs for every edge on every store update (each drag
 * frame): with a few hundred cables that was the largest single cost of a drag.
 */
const labelLayers = new WeakMap<HTMLElement, Element | null>();
const selectDomNode = (s: ReactFlowState) => s.domNode;
function EdgeLabel({ children }: { children: ReactNode }) {
  const dom = useStore(selectDomNode);
  if (!dom) return null;
  let layer = labelLayers.get(dom);
  if (!layer) {
    layer = dom.querySelector('.react-flow__edgelabel-renderer');
    if (layer) labelLayers.set(dom, layer);
  }
  return layer ? createPortal(children, layer) : null;
}

const fmtCurrent = (a: number) => (Math.abs(a) >= 1000 ? `${(a / 1000).toFixed(2)} kA` : fmtAmps(a));

/** The point a fraction `t` along a polyline given as an SVG path of M/L/Q commands (React Flow's smooth-step). */
function pointAlong(path: string, t: number): [number, number] | null {
  const nums = path.match(/-?\d+(?:\.\d+)?(?:e-?\d+)?/g)?.map(Number);
  if (!nums || nums.length < 4) return null;
  const pts: [number, number][] = [];
  for (let i = 0; i + 1 < nums.length; i += 2) pts.push([nums[i], nums[i + 1]]);
  let total = 0;
  const seg: number[] = [];
  for (let i = 1; i < pts.length; i++) {
    const d = Math.hypot(pts[i][0] - pts[i - 1][0], pts[i][1] - pts[i - 1][1]);
    seg.push(d);
    total += d;
  }
  if (total === 0) return pts[0];
  let left = total * t;
  for (let i = 0; i < seg.length; i++) {
    if (left <= seg[i] || i === seg.length - 1) {
      const f = seg[i] ? Math.min(1, left / seg[i]) : 0;
      return [pts[i][0] + (pts[i + 1][0] - pts[i][0]) * f, pts[i][1] + (pts[i + 1][1] - pts[i][1]) * f];
    }
    left -= seg[i];
  }
  return null;
}

/**
 * The edge itself: its path and where its label sits. It does not read the results, so new figures
 * (every solve) re-render only the stroke and the label below, not the path geometry.
 */
function CableEdgeView({ id, data, selected, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition }: EdgeProps<CableFlowEdge>) {
  const [path, midX, midY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 8, offset: 18 });
  if (!data) return null;
  const { cable } = data;
  const jumper = cable.props.role === 'jumper';
  const [labelX, labelY] = (jumper && pointAlong(path, 1 / 3)) || [midX, midY];
  return (
    <>
      <CableStroke id={id} path={path} selected={!!selected} jumper={jumper} />
      <EdgeLabel>
        <CableLabel id={id} cable={cable} selected={!!selected} x={labelX} y={labelY} />
      </EdgeLabel>
    </>
  );
}

/** The run's stroke: width after its loading (in quarter-pixel steps), over-ampacity and fault styling, direction arrow. */
const CableStroke = memo(function CableStroke({ id, path, selected, jumper }: { id: string; path: string; selected: boolean; jumper: boolean }) {
  const s = useCanvasFigure((st) => {
    const canvas = st.results?.canvas;
    const c = canvas?.cables[id];
    const mark = canvas?.marks[id];
    // Left out of the figures (it leads only to a part that is not connected): dashed and grey.
    if (!c && (mark === 'open-circuit' || mark === 'not-connected')) return { fault: false, width: 1.8, over: false, faulted: false, dir: 0, look: 'left-out' };
    if (!c || !canvas) return null;
    const fault = canvas.mode === 'fault';
    const directed = canvas.mode === 'equalize' || (canvas.modeSummary.mode === 'fault' && !!canvas.modeSummary.selected);
    return {
      // A conductor of a drawn short stands out; figures kept from before an unsolved change are greyed.
      look: mark === 'short' ? 'short' : canvas.stale ? 'stale' : '',
      fault,
      width: fault ? 1.8 : Math.round(Math.min(6, 1.6 + (c.loading ?? 0) * 2.5) * 4) / 4,
      over: c.loading !== null && Math.round(c.loading * 1000) / 1000 > 1,
      faulted: mark === 'faulted' || mark === 'worst-fault',
      // Direction of the current along the drawn run: 1 from → to, −1 to → from, 0 unshown.
      dir: directed && Math.round(Math.abs(c.current_A) * 10) / 10 >= 0.05 ? Math.sign(c.current_A) : 0,
    };
  });
  const width = s?.width ?? 1.8;
  const arrow = s?.dir ? `bw-arrow-${id}` : null;
  return (
    <>
      {arrow ? (
        <defs>
          <marker id={arrow} viewBox="0 0 10 10" refX="8" refY="5" markerWidth="5" markerHeight="5" orient="auto-start-reverse" markerUnits="strokeWidth">
            <path d="M0 0L10 5L0 10z" fill={s!.faulted || s!.fault ? 'var(--color-fault-600)' : 'var(--color-copper-600)'} />
          </marker>
        </defs>
      ) : null}
      <BaseEdge
        id={id}
        path={path}
        className={`bw-cable${selected ? ' bw-cable-selected' : ''}${s?.over ? ' bw-cable-over' : ''}${jumper ? ' bw-cable-jumper' : ''}${s?.look ? ` bw-cable-${s.look}` : ''}`}
        style={{ strokeWidth: selected ? width + 1 : width, ...(s?.faulted ? { stroke: 'var(--color-fault-600)', strokeDasharray: '2 3' } : {}) }}
        interactionWidth={16}
        {...(arrow ? (s!.dir > 0 ? { markerEnd: `url(#${arrow})` } : { markerStart: `url(#${arrow})` }) : {})}
      />
    </>
  );
});

interface CableFigure {
  mode: CanvasSummary['mode'];
  i: number;
  loading: number | null;
  mark: string | null;
  stale: boolean;
}

/** A cable's figure in the live results, rounded as shown (0.1 A, 0.1 %). */
function cableFigureOf(s: CanvasView, id: string): CableFigure | null {
  const canvas = s.results?.canvas;
  const c = canvas?.cables[id];
  if (!c || !canvas) return null;
  return {
    mode: canvas.mode,
    i: Math.round(Math.abs(c.current_A) * 10) / 10,
    loading: c.loading === null ? null : Math.round(c.loading * 1000) / 1000,
    mark: canvas.marks[id] ?? null,
    stale: !!canvas.stale,
  };
}

const isFaulted = (r: CableFigure | null) => r?.mark === 'faulted' || r?.mark === 'worst-fault';

function figureText(r: CableFigure | null): string {
  if (!r) return '';
  if (r.mark === 'short') return `${fmtCurrent(r.i)} short circuit`;
  if (r.mode === 'fault') return `${fmtCurrent(r.i)}${isFaulted(r) ? '' : ' prospective'}`;
  const over = r.loading !== null && r.loading > 1;
  return `${fmtAmps(r.i)}${r.loading !== null ? ` · ${over ? '▲ over ' : ''}${fmtPct(r.loading * 100)}` : ''}`;
}

function titleText(cable: DiagramCable, unitSystem: UnitSystem, r: CableFigure | null): string {
  const jumper = cable.props.role === 'jumper';
  return `${cable.label ? `${cable.label}: ` : ''}${jumper ? 'jumper' : 'cable'}, ${shortConductor(cable.props.conductor, unitSystem)}, ${lengthText(cable.props.length_m, unitSystem)}, ${cable.props.material}${
    r ? `; ${r.mode === 'fault' ? `${fmtCurrent(r.i)} prospective` : fmtAmps(r.i)}${r.loading != null ? `, ${fmtPct(r.loading * 100)} of ampacity` : ''}` : ''}`;
}

/**
 * The run's label: conductor and length, the live figure, its findings badge.
 *
 * React renders what shapes the label (mode, over-ampacity and fault styling, the mark, the badge,
 * the zoom's detail); the figure's text and the tooltip follow each new result straight from the
 * store (a subscription writing the DOM), because every cable's figure changes on nearly every solve
 * and re-rendering a few hundred labels was the largest part of applying one. React never renders
 * children into the figure span nor a title on the label, so the two never fight over them; the
 * title (conductor, length, material, figure) is written while the pointer is on the label.
 */
const CableLabel = memo(function CableLabel({ id, cable, selected, x, y }: { id: string; cable: DiagramCable; selected: boolean; x: number; y: number }) {
  const unitSystem = useCanvasView((s) => s.unitSystem);
  const detail = useStore(detailOf);
  const [hover, setHover] = useState(false);
  const shape = useCanvasFigure((s) => {
    const r = cableFigureOf(s, id);
    return r ? { mode: r.mode, over: (r.loading !== null && r.loading > 1) || r.mark === 'short', mark: r.mark, stale: r.stale && r.mark !== 'short' } : null;
  });
  const badge = useCanvasFigure((s) => s.results?.canvas.badges[id] ?? null);
  const labelRef = useRef<HTMLDivElement>(null);
  const figureRef = useRef<HTMLSpanElement>(null);
  // The tooltip is written only while the pointer is on the label (on entering, and with each result
  // then): a few hundred title writes per solve cost more than the figures themselves.
  const hovered = useRef(false);
  const writeTitle = (s: CanvasView = useCanvasView.getState()) => {
    if (labelRef.current) labelRef.current.title = titleText(cable, s.unitSystem, cableFigureOf(s, id));
  };
  useResultsText(
    (s) => [figureText(cableFigureOf(s, id))],
    ([figure], s) => {
      if (figureRef.current) figureRef.current.textContent = figure;
      if (hovered.current) writeTitle(s);
    },
    [id, cable],
  );

  const over = !!shape?.over;
  const jumper = cable.props.role === 'jumper';
  const faulted = shape?.mark === 'faulted' || shape?.mark === 'worst-fault';
  const BadgeIcon = badge ? (badge.severity === 'error' ? ErrorIcon : badge.severity === 'warning' ? WarningIcon : NoteIcon) : null;
  const needsAttention = selected || hover || over || faulted || !!badge;
  if (jumper && detail === 'minimal' && !needsAttention) return null;
  const shown: Detail = needsAttention && (selected || hover) ? 'full' : detail;
  return (
    <div
      ref={labelRef}
      className={`bw-cable-label nodrag nopan${selected ? ' bw-cable-label-selected' : ''}${over || faulted ? ' bw-over' : ''}${shape?.stale ? ' bw-figures-stale' : ''}`}
      style={{ transform: `translate(-50%, -50%) translate(${x}px, ${y}px)`, zIndex: selected || hover ? 1 : undefined }}
      data-cable-id={id}
      data-detail={shown}
      onClick={(e) => useEditorStore.getState().select([id], { additive: e.shiftKey || e.metaKey || e.ctrlKey })}
      onMouseEnter={() => {
        hovered.current = true;
        writeTitle();
        setHover(true);
      }}
      onMouseLeave={() => {
        hovered.current = false;
        setHover(false);
      }}
    >
      {faulted ? <span className="font-bold text-fault-700 uppercase">{shape?.mark === 'faulted' ? 'Fault here' : 'Worst fault'}</span> : null}
      {shown === 'full' ? (
        <span>
          {shortConductor(cable.props.conductor, unitSystem)} · {lengthText(cable.props.length_m, unitSystem)}
        </span>
      ) : null}
      {shape ? <span ref={figureRef} className="bw-cable-figures" /> : null}
      {badge && BadgeIcon ? (
        <span className={`bw-badge-inline bw-badge-${badge.severity}`} title={`${badge.count} finding(s)`}>
          <BadgeIcon size={11} /> {badge.count}
        </span>
      ) : null}
    </div>
  );
});

export const CableEdge = memo(CableEdgeView);

/** React Flow edge types (module scope): cable runs, and the ghosts of a layout preview. */
export const edgeTypes = { cable: CableEdge, preview: PreviewEdge };
