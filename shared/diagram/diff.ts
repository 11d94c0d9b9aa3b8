/**
 * Differences between two diagram documents (A = before, B = after), for the side-by-side compare view,
 * and between two results summaries.
 *
 * - Parts, cables and annotations are matched by id. A part whose type changed under the same id is
 *   reported as removed and added (a different part).
 * - A part is "moved" when only its position or rotation changed; a cable when only its waypoints did.
 *   A part or cable that also changed otherwise is "changed" and carries `moved` / `waypointsChanged`.
 * - Changed fields are listed with dotted paths (`props.capacity_Ah`, `props.members.1.soc`,
 *   `props.conductor` — a conductor size is one value) and a summary in trade terms and the team's
 *   units ("Capacity 100 Ah → 200 Ah", "Conductor 2 AWG → 2/0 AWG").
 * - A cable end that moved to another terminal is a reconnection ("Reconnected bat1.pos → bat4.pos").
 *   A cable drawn again in the other direction between the same two terminals is not a reconnection.
 * - Ordering is stable: added, changed and moved in B's document order; removed in A's. Changed fields
 *   in schema order.
 *
 * Linear in the size of the documents (maps by id; values compared once).
 */
import { z } from 'zod';
import { AMPACITY_TABLES, type AmpacityTableId } from '../electrical/tables/ampacity';
import { CHEMISTRIES, type ChemistryId } from '../electrical/tables/batteries';
import { FUSE_CLASSES, type FuseClassId } from '../electrical/tables/fuses';
import type { ConductorSize } from '../units/conductor';
import { type UnitSystem, formatArea, formatConductor, formatLength, formatTemperature } from '../units/format';
import { mToIn } from '../units/length';
import type { DiagramAnnotation, DiagramCable, DiagramDocument, DiagramPart, TerminalRef } from '../electrical/document/schema';

export interface FieldChange {
  /** Dotted path from the part, cable, annotation or document root, e.g. "props.capacity_Ah", "settings.ambient_C". */
  path: string;
  /** Values before and after in SI (as stored); absent when the field was not set on that side. */
  from?: unknown;
  to?: unknown;
  /** In trade terms and the team's units, e.g. "Length 1.20 m → 0.80 m". */
  summary: string;
}

export interface Placement {
  position: { x: number; y: number };
  rotation: 0 | 90 | 180 | 270;
}

export interface PartMove {
  id: string;
  type: DiagramPart['type'];
  label: string;
  from: Placement;
  to: Placement;
}

export interface PartChange {
  id: string;
  type: DiagramPart['type'];
  label: string;
  changes: FieldChange[];
  /** The summaries of `changes`, in order. */
  summary: string[];
  /** Set when the part also moved or turned. */
  moved?: { from: Placement; to: Placement };
}

export interface CableReconnection {
  /** Which end of the cable (as named in B) now lands elsewhere. */
  end: 'from' | 'to';
  from: TerminalRef;
  to: TerminalRef;
  /** e.g. "Reconnected bat1.pos → bat4.pos". */
  summary: string;
}

export interface CableMove {
  id: string;
  label: string;
}

export interface CableChange {
  id: string;
  label: string;
  /** Ends moved to another terminal — the take-off changes a reviewer looks for first. */
  reconnections: CableReconnection[];
  changes: FieldChange[];
  /** Reconnections' summaries, then the field changes'. */
  summary: string[];
  waypointsChanged: boolean;
}

export interface AnnotationChange {
  id: string;
  kind: string;
  changes: FieldChange[];
}

export interface DiffSummary {
  identical: boolean;
  partsAdded: number;
  partsRemoved: number;
  partsMoved: number;
  partsChanged: number;
  cablesAdded: number;
  cablesRemoved: number;
  cablesMoved: number;
  cablesChanged: number;
  /** Changed cables with at least one reconnection (counted in cablesChanged too). */
  cablesReconnected: number;
  settingsChanged: number;
  annotationsAdded: number;
  annotationsRemoved: number;
  annotationsChanged: number;
}

export interface DiagramDiff {
  /** The document's name, when it changed. */
  name?: FieldChange;
  settings: FieldChange[];
  parts: { added: DiagramPart[]; removed: DiagramPart[]; moved: PartMove[]; changed: PartChange[] };
  cables: { added: DiagramCable[]; removed: DiagramCable[]; moved: CableMove[]; changed: CableChange[] };
  annotations: { added: DiagramAnnotation[]; removed: DiagramAnnotation[]; changed: AnnotationChange[] };
  summary: DiffSummary;
}

export interface DiffOptions {
  /** Units of the human summaries (default metric). */
  unitSystem?: UnitSystem;
}

// Plain-JSON comparison ----------------------------------------------------------------------------------

type Json = unknown;

function isPlainObject(v: Json): v is Record<string, Json> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export function deepEqual(a: Json, b: Json): boolean {
  if (a === b) return true;
  if (typeof a !== typeof b || a === null || b === null || typeof a !== 'object') return false;
  if (Array.isArray(a)) {
    if (!Array.isArray(b) || a.length !== b.length) return false;
    for (let i = 0; i < a.length; i++) if (!deepEqual(a[i], b[i])) return false;
    return true;
  }
  if (Array.isArray(b)) return false;
  const ao = a as Record<string, Json>;
  const bo = b as Record<string, Json>;
  // Keys whose value is undefined count as absent.
  let na = 0;
  for (const k in ao) {
    if (ao[k] === undefined) continue;
    na++;
    if (!deepEqual(ao[k], bo[k])) return false;
  }
  let nb = 0;
  for (const k in bo) if (bo[k] !== undefined) nb++;
  return na === nb;
}

const isConductor = (v: Json): v is ConductorSize =>
  isPlainObject(v) && typeof v.system === 'string' && 'size' in v && Object.keys(v).length === 2;

interface RawChange {
  path: string[];
  from: Json;
  to: Json;
}

/** Leaf differences between two plain-JSON values; conductor sizes and unequal-length arrays are leaves. */
function diffValues(a: Json, b: Json, path: string[], out: RawChange[]) {
  if (deepEqual(a, b)) return;
  if (isPlainObject(a) && isPlainObject(b) && !isConductor(a) && !isConductor(b)) {
    const keys = [...Object.keys(a), ...Object.keys(b).filter((k) => !(k in a))];
    for (const k of keys) diffValues(a[k], b[k], [...path, k], out);
    return;
  }
  if (Array.isArray(a) && Array.isArray(b) && a.length === b.length) {
    for (let i = 0; i < a.length; i++) diffValues(a[i], b[i], [...path, String(i)], out);
    return;
  }
  out.push({ path, from: a, to: b });
}

// Trade wording ------------------------------------------------------------------------------------------

const num = (x: number) => String(Number(x.toPrecision(4)));

function ohms(v: number) {
  if (v === 0) return '0 Ω';
  if (v < 1e-3) return `${num(v * 1e6)} µΩ`;
  if (v < 1) return `${num(v * 1e3)} mΩ`;
  return `${num(v)} Ω`;
}

function smallLength_mm(mm: number, us: UnitSystem) {
  return us === 'metric' ? `${num(mm)} mm` : `${mToIn(mm / 1000).toFixed(2)} in`;
}

type Fmt = (v: Json, us: UnitSystem) => string;
const unit = (u: string): Fmt => (v) => `${num(v as number)} ${u}`;
const plain: Fmt = (v) => (typeof v === 'number' ? num(v) : String(v));
const words: Fmt = (v) => String(v).replace(/_/g, ' ');
const pct: Fmt = (v) => `${num(v as number)} %`;
const fraction: Fmt = (v) => `${num((v as number) * 100)} %`;
const ohm: Fmt = (v) => ohms(v as number);
const length: Fmt = (v, us) => formatLength(v as number, us);
const temperature: Fmt = (v, us) => formatTemperature(v as number, us);
const quoted: Fmt = (v) => `"${String(v)}"`;

/** Field labels and value formats, by field name (shared by all part types, cables and settings). */
const FIELDS: Record<string, { label: string; fmt: Fmt }> = {
  // Battery
  chemistry: { label: 'Chemistry', fmt: (v) => CHEMISTRIES[v as ChemistryId]?.name ?? String(v) },
  model: { label: 'Model', fmt: quoted },
  nominal_V: { label: 'Nominal voltage', fmt: unit('V') },
  capacity_Ah: { label: 'Capacity', fmt: unit('Ah') },
  r_internal_ohm: { label: 'Internal resistance', fmt: ohm },
  max_continuous_A: { label: 'Continuous current limit', fmt: unit('A') },
  max_c_rate: { label: 'C-rate limit', fmt: (v) => `${num(v as number)}C` },
  short_circuit_A: { label: 'Short-circuit current', fmt: unit('A') },
  soc: { label: 'State of charge', fmt: fraction },
  restingVoltage_V: { label: 'Resting voltage', fmt: unit('V') },
  installDate: { label: 'Install date', fmt: plain },
  age_years: { label: 'Age', fmt: unit('years') },
  cells_in_series: { label: 'Cells in series', fmt: plain },
  // Series string
  count: { label: 'Batteries in series', fmt: plain },
  members: { label: 'Members', fmt: (v) => `${(v as unknown[]).length} batteries listed one by one` },
  interconnect: {
    label: 'Interconnect',
    fmt: (v, us) => {
      const ic = v as { conductor: ConductorSize; length_m: number };
      return `${formatConductor(ic.conductor, us).text}, ${formatLength(ic.length_m, us)}`;
    },
  },
  // Cable run
  conductor: { label: 'Conductor', fmt: (v, us) => formatConductor(v as ConductorSize, us).text },
  length_m: { label: 'Length', fmt: length },
  material: { label: 'Material', fmt: plain },
  stranding: { label: 'Stranding', fmt: plain },
  resistanceBasis: { label: 'Resistance basis', fmt: (v) => (v === 'table' ? 'table value' : 'computed') },
  // Insulation ratings are marked in °C on the cable in both unit systems.
  insulation_C: { label: 'Insulation rating', fmt: (v) => `${num(v as number)} °C` },
  installation: { label: 'Installation', fmt: words },
  bundledConductors: { label: 'Conductors in bundle', fmt: plain },
  ambient_C: { label: 'Ambient', fmt: temperature },
  role: { label: 'Role', fmt: plain },
  lugFrom_ohm: { label: 'Lug contact resistance (from end)', fmt: ohm },
  lugTo_ohm: { label: 'Lug contact resistance (to end)', fmt: ohm },
  // Lug, busbar, fuse, switch, shunt
  contact_ohm: { label: 'Contact resistance', fmt: ohm },
  stud: { label: 'Stud', fmt: plain },
  width_mm: { label: 'Width', fmt: (v, us) => smallLength_mm(v as number, us) },
  thickness_mm: { label: 'Thickness', fmt: (v, us) => smallLength_mm(v as number, us) },
  area_mm2: { label: 'Cross-section', fmt: (v, us) => formatArea(v as number, us).text },
  tapCount: { label: 'Taps', fmt: plain },
  tapSpacing_m: { label: 'Tap spacing', fmt: (v, us) => smallLength_mm((v as number) * 1000, us) },
  segmentLengths_m: { label: 'Segment lengths', fmt: (v, us) => (v as number[]).map((x) => smallLength_mm(x * 1000, us)).join(', ') },
  rating_A: { label: 'Rating', fmt: unit('A') },
  fuseClass: { label: 'Fuse class', fmt: (v) => FUSE_CLASSES[v as FuseClassId]?.name ?? String(v) },
  voltage_rating_V: { label: 'Voltage rating', fmt: unit('V') },
  interrupting_A: { label: 'Interrupting rating', fmt: unit('A') },
  cold_r_ohm: { label: 'Cold resistance', fmt: ohm },
  closed: { label: 'Switch', fmt: (v) => (v ? 'closed' : 'open') },
  drop_mV: { label: 'Drop at rating', fmt: unit('mV') },
  // Loads and chargers
  power_W: { label: 'Power', fmt: unit('W') },
  rated_W: { label: 'Rated power', fmt: unit('W') },
  efficiency: { label: 'Efficiency', fmt: fraction },
  cutoff_V: { label: 'Low-voltage cut-off', fmt: unit('V') },
  mode: { label: 'Load mode', fmt: plain },
  current_A: { label: 'Current', fmt: unit('A') },
  r_ohm: { label: 'Resistance', fmt: ohm },
  voltage_setpoint_V: { label: 'Voltage set point', fmt: unit('V') },
  current_limit_A: { label: 'Current limit', fmt: unit('A') },
  enabled: { label: 'Charger', fmt: (v) => (v ? 'on' : 'off') },
  // Settings
  systemVoltage_V: { label: 'System voltage', fmt: unit('V') },
  designMargin: { label: 'Design margin', fmt: (v) => `× ${num(v as number)}` },
  voltageDropLimit_pct: { label: 'Voltage drop limit', fmt: pct },
  ampacityTable: { label: 'Ampacity table', fmt: (v) => AMPACITY_TABLES[v as AmpacityTableId]?.name ?? String(v) },
  maxPostToPost: { label: 'Most batteries post to post', fmt: plain },
  busbarLengthTolerance_pct: { label: 'Equal-length tolerance', fmt: pct },
  imbalanceThreshold_pct: { label: 'Imbalance threshold', fmt: pct },
  // Document, parts, cables
  label: { label: 'Label', fmt: quoted },
  name: { label: 'Name', fmt: quoted },
  text: { label: 'Text', fmt: quoted },
};

const lowerFirst = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

function describe(path: string[], from: Json, to: Json, us: UnitSystem): string {
  // Words for the containers along the path, e.g. props.members.1.soc → "Member 2 state of charge".
  const segs = path[0] === 'props' || path[0] === 'settings' ? path.slice(1) : path;
  const prefix: string[] = [];
  let field: string | undefined;
  let index: number | undefined;
  for (let i = 0; i < segs.length; i++) {
    const s = segs[i];
    const last = i === segs.length - 1;
    if (s === 'members' && i + 1 < segs.length && /^\d+$/.test(segs[i + 1])) {
      prefix.push(`Member ${Number(segs[i + 1]) + 1}`);
      i++;
    } else if (s === 'member' && !last) prefix.push('Member');
    else if (s === 'interconnect' && !last) prefix.push('Interconnect');
    else if (/^\d+$/.test(s) && last) index = Number(s);
    else if (last || (i === segs.length - 2 && /^\d+$/.test(segs[i + 1]))) field = s;
    else prefix.push(s);
  }
  const def = field ? FIELDS[field] : undefined;
  let label = def?.label ?? field ?? 'Value';
  let fmt: Fmt = def?.fmt ?? ((v) => (typeof v === 'string' ? `"${v}"` : JSON.stringify(v)));
  if (index !== undefined) {
    label = field === 'segmentLengths_m' ? `Segment ${index + 1} length` : `${label} ${index + 1}`;
    if (field === 'segmentLengths_m') fmt = (v, u) => smallLength_mm((v as number) * 1000, u);
  }
  const head = prefix.length ? `${prefix.join(' ')} ${lowerFirst(label)}` : label;
  if (field === 'text' && (String(from ?? '').length > 40 || String(to ?? '').length > 40)) return `${head} changed`;
  const show = (v: Json) => {
    if (v === undefined) return 'not set';
    try {
      return fmt(v, us);
    } catch {
      return JSON.stringify(v);
    }
  };
  return `${head} ${show(from)} → ${show(to)}`;
}

function fieldChanges(a: Json, b: Json, root: string[], us: UnitSystem): FieldChange[] {
  const raw: RawChange[] = [];
  diffValues(a, b, root, raw);
  return raw.map((r) => ({
    path: r.path.join('.'),
    ...(r.from !== undefined ? { from: r.from } : {}),
    ...(r.to !== undefined ? { to: r.to } : {}),
    summary: describe(r.path, r.from, r.to, us),
  }));
}

// Matching -----------------------------------------------------------------------------------------------

const placement = (p: DiagramPart): Placement => ({ position: { x: p.position.x, y: p.position.y }, rotation: p.rotation });
const sameRef = (x: TerminalRef, y: TerminalRef) => x.part === y.part && x.terminal === y.terminal;
const refText = (r: TerminalRef) => `${r.part}.${r.terminal}`;

const NONE: CableReconnection[] = [];

function reconnections(a: DiagramCable, b: DiagramCable): CableReconnection[] {
  if (sameRef(a.from, b.from) && sameRef(a.to, b.to)) return NONE;
  const out: CableReconnection[] = [];
  const push = (end: 'from' | 'to', from: TerminalRef, to: TerminalRef) =>
    out.push({ end, from: { ...from }, to: { ...to }, summary: `Reconnected ${refText(from)} → ${refText(to)}` });
  if (sameRef(a.from, b.from) && sameRef(a.to, b.to)) return out;
  if (sameRef(a.from, b.to) && sameRef(a.to, b.from)) return out; // drawn the other way: same connection
  if (sameRef(a.from, b.from)) push('to', a.to, b.to);
  else if (sameRef(a.to, b.to)) push('from', a.from, b.from);
  else if (sameRef(a.from, b.to)) push('from', a.to, b.from);
  else if (sameRef(a.to, b.from)) push('to', a.from, b.to);
  else {
    push('from', a.from, b.from);
    push('to', a.to, b.to);
  }
  return out;
}

function matchById<T extends { id: string }>(a: readonly T[], b: readonly T[]) {
  const inA = new Map(a.map((x) => [x.id, x]));
  const inB = new Set(b.map((x) => x.id));
  return {
    removed: a.filter((x) => !inB.has(x.id)),
    pairs: b.map((x) => [inA.get(x.id), x] as const),
  };
}

/** The differences from document A (before) to document B (after). */
export function diffDiagrams(a: DiagramDocument, b: DiagramDocument, opts: DiffOptions = {}): DiagramDiff {
  const us = opts.unitSystem ?? 'metric';

  // Parts.
  const parts: DiagramDiff['parts'] = { added: [], removed: [], moved: [], changed: [] };
  {
    const { removed, pairs } = matchById(a.parts, b.parts);
    parts.removed.push(...removed);
    for (const [pa, pb] of pairs) {
      if (!pa) {
        parts.added.push(pb);
        continue;
      }
      if (pa.type !== pb.type) {
        // A different part under the same id; keep A's order for the removal.
        parts.added.push(pb);
        parts.removed.push(pa);
        continue;
      }
      const moved = pa.position.x !== pb.position.x || pa.position.y !== pb.position.y || pa.rotation !== pb.rotation;
      const changes = [
        ...(pa.label !== pb.label ? fieldChanges(pa.label, pb.label, ['label'], us) : []),
        ...(deepEqual(pa.props, pb.props) ? [] : fieldChanges(pa.props, pb.props, ['props'], us)),
      ];
      if (changes.length) {
        parts.changed.push({
          id: pb.id, type: pb.type, label: pb.label, changes, summary: changes.map((c) => c.summary),
          ...(moved ? { moved: { from: placement(pa), to: placement(pb) } } : {}),
        });
      } else if (moved) {
        parts.moved.push({ id: pb.id, type: pb.type, label: pb.label, from: placement(pa), to: placement(pb) });
      }
    }
    if (parts.removed.length > removed.length) {
      const order = new Map(a.parts.map((p, i) => [p.id, i]));
      parts.removed.sort((x, y) => order.get(x.id)! - order.get(y.id)!);
    }
  }

  // Cables.
  const cables: DiagramDiff['cables'] = { added: [], removed: [], moved: [], changed: [] };
  {
    const { removed, pairs } = matchById(a.cables, b.cables);
    cables.removed.push(...removed);
    for (const [ca, cb] of pairs) {
      if (!ca) {
        cables.added.push(cb);
        continue;
      }
      const label = cb.label ?? '';
      const rec = reconnections(ca, cb);
      const changes = [
        ...((ca.label ?? '') !== label ? fieldChanges(ca.label, cb.label, ['label'], us) : []),
        ...(deepEqual(ca.props, cb.props) ? [] : fieldChanges(ca.props, cb.props, ['props'], us)),
      ];
      const waypointsChanged = (ca.waypoints !== undefined || cb.waypoints !== undefined) && !deepEqual(ca.waypoints ?? [], cb.waypoints ?? []);
      if (rec.length || changes.length) {
        cables.changed.push({
          id: cb.id, label, reconnections: rec === NONE ? [] : rec, changes, summary: [...rec.map((r) => r.summary), ...changes.map((c) => c.summary)], waypointsChanged,
        });
      } else if (waypointsChanged) {
        cables.moved.push({ id: cb.id, label });
      }
    }
  }

  // Annotations.
  const annotations: DiagramDiff['annotations'] = { added: [], removed: [], changed: [] };
  {
    const { removed, pairs } = matchById(a.annotations, b.annotations);
    annotations.removed.push(...removed);
    for (const [xa, xb] of pairs) {
      if (!xa) {
        annotations.added.push(xb);
        continue;
      }
      const { id: _ia, ...restA } = xa;
      const { id: _ib, ...restB } = xb;
      const changes = fieldChanges(restA, restB, [], us);
      if (changes.length) annotations.changed.push({ id: xb.id, kind: xb.kind, changes });
    }
  }

  const settings = fieldChanges(a.settings, b.settings, ['settings'], us);
  const nameChanges = (a.name ?? '') !== (b.name ?? '') ? fieldChanges(a.name, b.name, ['name'], us) : [];

  const summary: DiffSummary = {
    identical: false,
    partsAdded: parts.added.length,
    partsRemoved: parts.removed.length,
    partsMoved: parts.moved.length,
    partsChanged: parts.changed.length,
    cablesAdded: cables.added.length,
    cablesRemoved: cables.removed.length,
    cablesMoved: cables.moved.length,
    cablesChanged: cables.changed.length,
    cablesReconnected: cables.changed.filter((c) => c.reconnections.length).length,
    settingsChanged: settings.length,
    annotationsAdded: annotations.added.length,
    annotationsRemoved: annotations.removed.length,
    annotationsChanged: annotations.changed.length,
  };
  summary.identical = nameChanges.length === 0 && Object.entries(summary).every(([k, v]) => k === 'identical' || v === 0);
  return { ...(nameChanges.length ? { name: nameChanges[0] } : {}), settings, parts, cables, annotations, summary };
}

// Results summaries ----------------------------------------------------------------------------------------

export const FINDING_SEVERITIES = ['error', 'warning', 'note'] as const;

/** What a revision stores of its analysis, to compare revisions without solving them again. */
export const resultsSummarySchema = z.object({
  batteries: z.array(z.object({
    id: z.string(),
    label: z.string(),
    /** Discharge current of this battery (or string), A; negative while charging. */
    current_A: z.number(),
    /** Fraction 0..1 of the bank's total discharge current. */
    share: z.number(),
  })),
  /** Spread of the batteries' currents, % (as the analysis defines it). */
  imbalance_pct: z.number(),
  /** Voltage at the load terminals, V. */
  loadVoltage_V: z.number().optional(),
  /** Voltage drop bank to load, % of system voltage. */
  drop_pct: z.number().optional(),
  /** Resistive losses in cables, busbars, fuses and joints, W. */
  losses_W: z.number(),
  findings: z.array(z.object({
    id: z.string(),
    /** Rule id, e.g. "fuse-near-battery". */
    rule: z.string(),
    severity: z.enum(FINDING_SEVERITIES),
    /** Diagram ids the finding names. */
    parts: z.array(z.string()),
    message: z.string(),
  })),
});
export type ResultsSummary = z.infer<typeof resultsSummarySchema>;
export type ResultsFinding = ResultsSummary['findings'][number];

export interface NumberDelta {
  a: number;
  b: number;
  /** b − a. */
  delta: number;
}
export interface OptionalNumberDelta {
  a?: number;
  b?: number;
  /** b − a when both are given. */
  delta?: number;
}

export interface BatteryShareDelta {
  id: string;
  /** B's label, else A's. */
  label: string;
  /** Absent on the side where the battery does not exist. */
  a?: { current_A: number; share: number };
  b?: { current_A: number; share: number };
  /** b − a, when the battery is on both sides. */
  delta_current_A?: number;
  delta_share?: number;
}

export interface ResultsDiff {
  /** A's batteries in A's order, then those only in B in B's order. */
  batteries: BatteryShareDelta[];
  imbalance_pct: NumberDelta;
  loadVoltage_V: OptionalNumberDelta;
  drop_pct: OptionalNumberDelta;
  losses_W: NumberDelta;
  /** Findings in B with no match in A (matched by rule and the sorted part ids), in B's order. */
  findingsAdded: ResultsFinding[];
  /** Findings in A with no match in B, in A's order. */
  findingsResolved: ResultsFinding[];
  /** Findings on both sides (B's copy). */
  findingsKept: ResultsFinding[];
}

const delta = (a: number, b: number): NumberDelta => ({ a, b, delta: b - a });
function optionalDelta(a: number | undefined, b: number | undefined): OptionalNumberDelta {
  return { ...(a !== undefined ? { a } : {}), ...(b !== undefined ? { b } : {}), ...(a !== undefined && b !== undefined ? { delta: b - a } : {}) };
}

/** Identity of a finding across revisions: its rule and the parts it names, order ignored. */
export const findingKey = (f: Pick<ResultsFinding, 'rule' | 'parts'>) => `${f.rule}\u0000${[...f.parts].sort().join('\u0000')}`;

/** The differences from results summary A (before) to B (after). */
export function diffResultsSummaries(a: ResultsSummary, b: ResultsSummary): ResultsDiff {
  const bById = new Map(b.batteries.map((x) => [x.id, x]));
  const aIds = new Set(a.batteries.map((x) => x.id));
  const batteries: BatteryShareDelta[] = [];
  for (const x of a.batteries) {
    const y = bById.get(x.id);
    batteries.push({
      id: x.id, label: y?.label ?? x.label, a: { current_A: x.current_A, share: x.share },
      ...(y ? { b: { current_A: y.current_A, share: y.share }, delta_current_A: y.current_A - x.current_A, delta_share: y.share - x.share } : {}),
    });
  }
  for (const y of b.batteries) {
    if (!aIds.has(y.id)) batteries.push({ id: y.id, label: y.label, b: { current_A: y.current_A, share: y.share } });
  }

  // Multiset match, first to first: two identical findings in A and one in B leave A's second resolved.
  const count = (fs: readonly ResultsFinding[]) => {
    const m = new Map<string, number>();
    for (const f of fs) m.set(findingKey(f), (m.get(findingKey(f)) ?? 0) + 1);
    return m;
  };
  const unmatched = (fs: readonly ResultsFinding[], other: Map<string, number>) => {
    const out: ResultsFinding[] = [];
    const kept: ResultsFinding[] = [];
    for (const f of fs) {
      const k = findingKey(f);
      const left = other.get(k) ?? 0;
      if (left > 0) {
        other.set(k, left - 1);
        kept.push(f);
      } else out.push(f);
    }
    return { out, kept };
  };
  const added = unmatched(b.findings, count(a.findings));
  const findingsAdded = added.out;
  const findingsKept = added.kept;
  const findingsResolved = unmatched(a.findings, count(b.findings)).out;
  return {
    batteries,
    imbalance_pct: delta(a.imbalance_pct, b.imbalance_pct),
    loadVoltage_V: optionalDelta(a.loadVoltage_V, b.loadVoltage_V),
    drop_pct: optionalDelta(a.drop_pct, b.drop_pct),
    losses_W: delta(a.losses_W, b.losses_W),
    findingsAdded,
    findingsResolved,
    findingsKept,
  };
}
