/**
 * One memoised React Flow node component per part type, defined at module scope. Each draws its
 * symbol, its label and its terminals (handles marked + / − by shape and text), and subscribes only
 * to its own slice of the live results.
 *
 * In the editor a node reads its part from the store (LivePartsContext): a props or label edit then
 * re-renders that one node without handing React Flow a new node object, which would make it
 * re-adopt every node and re-run every node's and cable's store selector. Views of stored revisions
 * read the part from the node's data.
 */
import { createContext, memo, useContext, useRef, type ReactNode } from 'react';
import { Handle, useConnection, type Node, type NodeProps } from '@xyflow/react';
import type { DiagramPart } from '@shared/diagram';
import { PART_TYPES, type PartType } from '@shared/electrical/parts';
import { ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';
import { useCanvasFigure, useCanvasView, useEditorStore, useResultsText, type CanvasView } from '../store';
import type { CanvasMark, CanvasSummary } from '../results/types';
import { baseBox, FUSE_TERMINAL_NAMES, partBox, POSITION, rotatePlacement, terminalName, terminalPlacements, type TerminalPlacement } from './geometry';
import { PartSymbol } from './symbols';
import { fmtAmps, fmtPct, fmtVolts } from '../units';

export interface PartNodeData extends Record<string, unknown> {
  part: DiagramPart;
  tapSide: 'top' | 'bottom';
  readOnly: boolean;
}
export type PartNode = Node<PartNodeData>;

/** True under the editor's canvas: node components read their part from the editor store by id. */
export const LivePartsContext = createContext(false);

const partIndexes = new WeakMap<readonly DiagramPart[], Map<string, DiagramPart>>();
/** Parts by id, built once per parts array (immer gives a new array on every change). */
function partIndex(parts: readonly DiagramPart[]): Map<string, DiagramPart> {
  let index = partIndexes.get(parts);
  if (!index) {
    index = new Map(parts.map((p) => [p.id, p]));
    partIndexes.set(parts, index);
  }
  return index;
}

/** The node's part: the store's current one in the editor, else the node's data. */
function usePart(id: string, data: PartNodeData): DiagramPart {
  const live = useContext(LivePartsContext);
  const current = useEditorStore((s) => (live ? partIndex(s.doc.parts).get(id) : undefined));
  return current ?? data.part;
}

/** Polarity of a terminal of a part, for connection hints. */
export function terminalPolarity(part: DiagramPart | undefined, terminal: string): '+' | '−' | null {
  if (!part) return null;
  return terminalPlacements(part).find((t) => t.terminal === terminal)?.polarity ?? null;
}

function TerminalHandle({ nodeId, partType, placement, readOnly, label }: { nodeId: string; partType: PartType; placement: TerminalPlacement; readOnly: boolean; label: string }) {
  // A primitive key so handles re-render only when a connection starts or ends.
  const from = useConnection((c) => (c.inProgress && c.fromHandle ? `${c.fromHandle.nodeId}\u0000${c.fromHandle.id ?? ''}` : ''));
  const [fromNode, fromTerminal] = from ? from.split('\u0000') : ['', ''];
  // Read once, not listened to: it matters only while a connection is drawn (and `from` re-renders this then).
  const fromPolarity = fromNode ? terminalPolarity(useEditorStore.getState().doc.parts.find((p) => p.id === fromNode), fromTerminal) : null;
  const isSource = from !== '' && fromNode === nodeId && fromTerminal === placement.terminal;
  const allowed = from !== '' && fromNode !== nodeId;
  const crossesPolarity = allowed && !!fromPolarity && !!placement.polarity && fromPolarity !== placement.polarity;
  const style: React.CSSProperties =
    placement.side === 'top' || placement.side === 'bottom' ? { left: `${placement.at * 100}%` } : { top: `${placement.at * 100}%` };
  const kind = placement.polarity === '+' ? 'pos' : placement.polarity === '−' ? 'neg' : 'pass';
  const hint = crossesPolarity ? `; joins ${fromPolarity} to ${placement.polarity} directly` : '';
  // A fuse's terminals are named for what they face (battery side, bank side), with a small mark beside each.
  const name = terminalName({ type: partType }, placement.terminal);
  const side = partType === 'fuse' ? FUSE_TERMINAL_NAMES[placement.terminal] : undefined;
  return (
    <>
    <Handle
      type="source"
      id={placement.terminal}
      position={POSITION[placement.side]}
      style={style}
      isConnectable={!readOnly}
      className={`bw-terminal bw-terminal-${kind}${allowed ? (crossesPolarity ? ' bw-target-caution' : ' bw-target') : ''}${isSource ? ' bw-terminal-from' : ''}`}
      role="img"
      title={`${label} ${name}${side ? ` (terminal ${placement.terminal})` : ''}${hint}`}
      aria-label={`${label} ${name}`}
    >
      {placement.polarity ? <span aria-hidden="true" className="bw-terminal-mark">{placement.polarity}</span> : null}
    </Handle>
    {side ? <SideMark placement={placement} text={side === 'battery side' ? 'batt' : 'bank'} /> : null}
    </>
  );
}

/**
 * A small word beside a terminal ("batt", "bank"), off the cable's path and clear of the label and the
 * findings badge (right and top-right): to the left of a top or bottom terminal, below a side one.
 */
function SideMark({ placement, text }: { placement: TerminalPlacement; text: string }) {
  const style: React.CSSProperties =
    placement.side === 'top' || placement.side === 'bottom'
      ? { right: `calc(${(1 - placement.at) * 100}% + 9px)`, [placement.side]: '-3px' }
      : { top: `calc(${placement.at * 100}% + 9px)`, [placement.side]: '1px' };
  return (
    <span aria-hidden="true" className="bw-terminal-side pointer-events-none absolute text-[8.5px] leading-none font-semibold tracking-wide text-graphite-500 uppercase" style={style}>
      {text}
    </span>
  );
}

function FindingsBadge({ id }: { id: string }) {
  const badge = useCanvasFigure((s) => s.results?.canvas.badges[id] ?? null);
  if (!badge) return null;
  const Icon = badge.severity === 'error' ? ErrorIcon : badge.severity === 'warning' ? WarningIcon : NoteIcon;
  const word = badge.severity === 'error' ? 'error' : badge.severity === 'warning' ? 'warning' : 'note';
  return (
    <span className={`bw-badge bw-badge-${badge.severity}`} title={`${badge.count} finding${badge.count === 1 ? '' : 's'}, worst: ${word}`}>
      <Icon size={12} />
      <span>{badge.count}</span>
      <span className="sr-only"> {word}{badge.count === 1 ? '' : 's'}</span>
    </span>
  );
}

/** Frame shared by every part: rotated symbol, label, handles, findings badge, and a results strip below. */
function PartShell({ id, part, data, selected, caption, inside, children }: { id: string; part: DiagramPart; data: PartNodeData; selected: boolean; caption?: ReactNode; inside?: ReactNode; children?: ReactNode }) {
  const { tapSide, readOnly } = data;
  const base = baseBox(part);
  const box = partBox(part);
  const label = part.label || PART_TYPES[part.type].name;
  const closed = part.type === 'switch' ? part.props.closed : true;
  const look = useCanvasView((s) => resultsLook(s, id));
  return (
    <div
      className={`bw-part bw-part-${part.type}${selected ? ' bw-selected' : ''}${look}`}
      style={{ width: box.w, height: box.h }}
      data-part-id={id}
      role="group"
      aria-label={`${PART_TYPES[part.type].name}: ${label}`}
    >
      <svg width={box.w} height={box.h} viewBox={`0 0 ${box.w} ${box.h}`} className="bw-symbol" aria-hidden="true" focusable="false">
        <g transform={`translate(${box.w / 2} ${box.h / 2}) rotate(${part.rotation}) translate(${-base.w / 2} ${-base.h / 2})`}>
          <PartSymbol type={part.type} w={base.w} h={base.h} closed={closed} />
        </g>
      </svg>
      {part.type !== 'note' ? (
        <div className={`bw-part-label bw-label-${part.type}`}>
          <span className="bw-part-name">{label}</span>
          {caption ? <span className="bw-part-caption">{caption}</span> : null}
          {inside}
        </div>
      ) : null}
      {terminalPlacements(part, tapSide).map((t) => (
        <TerminalHandle key={t.terminal} nodeId={id} partType={part.type} placement={rotatePlacement(t, part.rotation)} readOnly={readOnly} label={label} />
      ))}
      <FindingsBadge id={id} />
      <MarkTag id={id} />
      {children}
    </div>
  );
}

/** Amperes, in kA from 1000 A (fault currents). */
const fmtCurrent = (a: number) => (Math.abs(a) >= 1000 ? `${(a / 1000).toFixed(2)} kA` : fmtAmps(a));

const MARK_TEXT: Record<CanvasMark, string> = {
  faulted: 'Fault here',
  'worst-fault': 'Worst fault',
  'first-empty': 'Empties first',
  'largest-exchange': 'Largest exchange',
  'not-connected': 'Not connected',
  'open-circuit': 'Open circuit',
  short: 'Short circuit',
};

/** A part left out of the figures (not connected) is dimmed; figures kept from before an unsolved change are greyed. */
function resultsLook(s: CanvasView, id: string): string {
  const c = s.results?.canvas;
  const m = c?.marks[id];
  if (m === 'not-connected' || m === 'open-circuit') return ' bw-left-out';
  // A short's conductors carry its current now; everything else (its batteries too) shows the last figures.
  return c?.stale && !(c.shorts && id in c.shorts) ? ' bw-figures-stale' : '';
}

/** The mode's mark on a part: the faulted battery, the one that empties first, the pair exchanging most. */
function MarkTag({ id }: { id: string }) {
  const m = useCanvasView((s) => s.results?.canvas.marks[id]);
  if (!m) return null;
  return (
    <span className={`bw-mark bw-mark-${m} absolute -top-2.5 left-1 rounded px-1 text-[9.5px] leading-4 font-bold whitespace-nowrap uppercase tracking-wide ${m === 'faulted' || m === 'worst-fault' || m === 'short' ? 'bg-fault-700 text-white' : m === 'not-connected' || m === 'open-circuit' ? 'bg-graphite-600 text-white' : 'bg-caution-700 text-white'}`} data-testid={`mark-${id}`}>
      {MARK_TEXT[m]}
    </span>
  );
}

interface BatteryFigure {
  mode: CanvasSummary['mode'];
  i: number;
  share: number;
  selectedFault: boolean;
}

/** A battery's figure in the live results, rounded as shown (0.1 A, 0.1 %). */
function batteryFigureOf(s: CanvasView, id: string): BatteryFigure | null {
  const c = s.results?.canvas;
  const b = c?.batteries[id];
  return b && c ? { mode: c.mode, i: Math.round(b.current_A * 10) / 10, share: Math.round(b.share * 1000) / 1000, selectedFault: c.modeSummary.mode === 'fault' && !!c.modeSummary.selected } : null;
}

/** Whether the battery's strip has a share bar: where the batteries share one load or charger. */
const hasShareBar = (r: BatteryFigure) => (r.mode === 'charge' ? r.i < 0 : r.mode !== 'equalize' && r.mode !== 'fault');

/**
 * What the battery's strip shows in each mode: the share bar's fill (a CSS width; '0%' without a bar),
 * a direction arrow (read aloud as the words after it, so hidden from assistive technology), the text,
 * and its figure in bold.
 */
function batteryTexts(r: BatteryFigure): [fill: string, arrow: string, text: string, strong: string] {
  const fill = hasShareBar(r) ? `${Math.max(0, Math.min(1, r.share)) * 100}%` : '0%';
  switch (r.mode) {
    case 'charge':
      return r.i < 0 ? [fill, '', `charging ${fmtAmps(-r.i)} · `, fmtPct(r.share * 100)] : [fill, '', `discharging ${fmtAmps(r.i)}`, ''];
    case 'equalize':
      // Positive out of the battery: it gives current to the others; negative: it takes.
      if (Math.abs(r.i) < 0.05) return [fill, '', 'no exchange', ''];
      return [fill, r.i > 0 ? '↑ ' : '↓ ', `${r.i > 0 ? 'gives' : 'takes'} `, fmtAmps(Math.abs(r.i))];
    case 'fault':
      return [fill, '', r.selectedFault ? 'feeds ' : 'short: ', fmtCurrent(Math.abs(r.i))];
    default:
      return [fill, '', `${fmtAmps(r.i)} · `, fmtPct(r.share * 100)];
  }
}

/**
 * The battery's current and share. React renders the strip's shape (mode, whether it has a share
 * bar); the texts and the bar's fill follow each result straight from the store (useResultsText):
 * every battery's figure changes when a load or a shared path changes.
 */
function BatteryResult({ id }: { id: string }) {
  const shape = useCanvasFigure((s) => {
    const r = batteryFigureOf(s, id);
    return r ? { mode: r.mode, withBar: hasShareBar(r) } : null;
  });
  const fill = useRef<HTMLDivElement>(null);
  const arrow = useRef<HTMLSpanElement>(null);
  const text = useRef<HTMLSpanElement>(null);
  const strong = useRef<HTMLElement>(null);
  useResultsText(
    (s) => {
      const r = batteryFigureOf(s, id);
      return r ? batteryTexts(r) : ['0%', '', '', ''];
    },
    ([width, a, t, b]) => {
      if (fill.current) fill.current.style.width = width;
      if (arrow.current) arrow.current.textContent = a;
      if (text.current) text.current.textContent = t;
      if (strong.current) strong.current.textContent = b;
    },
    [id],
  );
  if (!shape) return null;
  return (
    <div className="bw-result-inside" data-testid={`share-${id}`} data-mode={shape.mode}>
      {shape.withBar ? (
        <div className="bw-share-bar" aria-hidden="true">
          <div ref={fill} />
        </div>
      ) : null}
      <span className="bw-result-text">
        <span aria-hidden="true" ref={arrow} />
        <span ref={text} />
        <strong ref={strong} />
      </span>
    </div>
  );
}

interface FuseFigure {
  i: number;
  loading: number;
  aic: number | null;
  aicLoading: number | null;
}

/** A fuse's figure in the live results, rounded as shown. */
function fuseFigureOf(s: CanvasView, id: string): FuseFigure | null {
  const f = s.results?.canvas.fuses[id];
  if (!f) return null;
  return {
    i: Math.round(f.current_A * 10) / 10, loading: Math.round(f.loading * 1000) / 1000,
    aic: f.interrupting_A ?? null, aicLoading: f.interruptingLoading === undefined ? null : Math.round(f.interruptingLoading * 1000) / 1000,
  };
}

/** The fuse's two lines: current, then loading against its rating (or, in a fault, against its interrupting rating). */
function fuseLines(r: FuseFigure): [string, string] {
  if (r.aic !== null && r.aicLoading !== null) {
    return [`${fmtCurrent(Math.abs(r.i))} prospective`, `${r.aicLoading > 1 ? '▲ above ' : ''}${fmtPct(r.aicLoading * 100)} of ${fmtCurrent(r.aic)} interrupting`];
  }
  return [fmtAmps(Math.abs(r.i)), `${r.loading > 1 ? '▲ ' : ''}${fmtPct(r.loading * 100)} of rating`];
}

/**
 * The fuse's current and loading. React renders the box and its over-rating styling; the two lines of
 * text follow each result straight from the store (useResultsText): every fuse's figure changes on
 * nearly every solve.
 */
function FuseResult({ id }: { id: string }) {
  const over = useCanvasFigure((s) => {
    const r = fuseFigureOf(s, id);
    return r ? { over: r.aic !== null && r.aicLoading !== null ? r.aicLoading > 1 : r.loading > 1 } : null;
  });
  const first = useRef<HTMLSpanElement>(null);
  const second = useRef<HTMLSpanElement>(null);
  useResultsText(
    (s) => {
      const r = fuseFigureOf(s, id);
      return r ? fuseLines(r) : ['', ''];
    },
    ([a, b]) => {
      if (first.current) first.current.textContent = a;
      if (second.current) second.current.textContent = b;
    },
    [id],
  );
  if (!over) return null;
  return (
    <div className={`bw-result bw-result-side${over.over ? ' bw-over' : ''}`} data-testid={`fuse-${id}`}>
      <span className="bw-result-text">
        <span ref={first} />
        <br />
        <span ref={second} />
      </span>
    </div>
  );
}

function LoadResult({ id }: { id: string }) {
  const r = useCanvasFigure((s) => {
    const l = s.results?.canvas.loads[id];
    return l ? { v: Math.round(l.voltage_V * 100) / 100, drop: Math.round(l.drop_pct * 100) / 100 } : null;
  });
  if (!r) return null;
  return (
    <div className="bw-result-inside">
      <span className="bw-result-text">
        {fmtVolts(r.v)} · drop {fmtPct(r.drop, 1)}
      </span>
    </div>
  );
}

type P = NodeProps<PartNode>;

function caption(part: DiagramPart): string | undefined {
  switch (part.type) {
    case 'battery': return `${part.props.nominal_V} V ${part.props.capacity_Ah} Ah`;
    case 'series_string': return `${part.props.count}S · ${part.props.member.capacity_Ah} Ah`;
    case 'fuse': return `${part.props.rating_A} A`;
    case 'switch': return part.props.closed ? 'closed' : 'OPEN';
    case 'shunt': return `${part.props.rating_A} A`;
    case 'inverter': return `${part.props.power_W} W`;
    case 'dc_load':
      return part.props.mode === 'current' ? `${part.props.current_A} A` : part.props.mode === 'power' ? `${part.props.power_W} W` : `${part.props.r_ohm} Ω`;
    case 'charger': return part.props.enabled ? `${part.props.voltage_setpoint_V} V ${part.props.current_limit_A} A` : 'off';
    case 'busbar': return `${part.props.tapCount} taps`;
    default: return undefined;
  }
}

const BatteryNode = memo(function BatteryNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} inside={<BatteryResult id={id} />} />;
});
const SeriesStringNode = memo(function SeriesStringNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} inside={<BatteryResult id={id} />} />;
});
const LugNode = memo(function LugNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} />;
});
const BusbarNode = memo(function BusbarNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} />;
});
const FuseNode = memo(function FuseNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return (
    <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)}>
      <FuseResult id={id} />
    </PartShell>
  );
});
const SwitchNode = memo(function SwitchNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} />;
});
const ShuntNode = memo(function ShuntNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} />;
});
const InverterNode = memo(function InverterNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} inside={<LoadResult id={id} />} />;
});
const DcLoadNode = memo(function DcLoadNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} inside={<LoadResult id={id} />} />;
});
const ChargerNode = memo(function ChargerNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  return <PartShell id={id} part={part} data={data} selected={selected} caption={caption(part)} />;
});
const NoteNode = memo(function NoteNode({ id, data, selected }: P) {
  const part = usePart(id, data);
  const text = part.type === 'note' ? part.props.text : '';
  return (
    <PartShell id={id} part={part} data={data} selected={selected}>
      <div className="bw-note-text">{text || part.label || 'Note'}</div>
    </PartShell>
  );
});

/** React Flow node types, one per part type (module scope: a stable object). */
export const nodeTypes: Record<PartType, React.ComponentType<P>> = {
  battery: BatteryNode,
  series_string: SeriesStringNode,
  lug: LugNode,
  busbar: BusbarNode,
  fuse: FuseNode,
  switch: SwitchNode,
  shunt: ShuntNode,
  inverter: InverterNode,
  dc_load: DcLoadNode,
  charger: ChargerNode,
  note: NoteNode,
};
