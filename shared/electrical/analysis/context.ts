/**
 * One compile of a diagram and everything the analyses and rules look up from it: the network, which
 * element belongs to which part, the bank's units and their nominal figures, cable ampacities, and the
 * sub-networks of each mode (loads on / chargers on / neither). Built once per `analyzeDiagram` call.
 */
import type { DiagramDocument } from '../document/schema';
import { type CompileIssue, type CompileMap, compileDiagram } from '../compile/compile';
import type { Network, NetworkElement } from '../network/types';
import { batteryMaxContinuous_A, batteryOcv_V, stringMembers, type BatteryProps } from '../parts/battery';
import { type AmpacityDerating, ampacity } from '../tables/ampacity';
import type { CableRunProps } from '../parts/cable';
import type { DiagramSettings } from '../document/schema';
import { type DiagramTopology, type SourcePart, diagramTopology, ownFuses } from './topology';
import type { AnalysisIssue } from './types';

export interface SourceUnit {
  id: string;
  type: 'battery' | 'series_string';
  members: BatteryProps[];
  /** Battery element ids in member order (bottom first). */
  elements: string[];
  nominal_V: number;
  /** Smallest member capacity, Ah. */
  capacity_Ah: number;
  /** Smallest member continuous limit, A. */
  maxContinuous_A: number;
  ocv_V: number;
  posNode: string;
  negNode: string;
  fuses: string[];
}

export interface AnalysisContext {
  doc: DiagramDocument;
  settings: DiagramSettings;
  topo: DiagramTopology;
  network: Network;
  map: CompileMap;
  compileNotes: CompileIssue[];
  units: SourceUnit[];
  unitById: Map<string, SourceUnit>;
  /** Nominal voltage of every battery element, V. */
  elementNominal_V: Map<string, number>;
  /** Bank nominal voltage across the load (or charger) terminals, V. */
  bankNominal_V: number;
  /** Corrected ampacity of each cable, A (null: zero-length joint or size not in the table). */
  ampacity_A: Map<string, number | null>;
  /** How each cable's ampacity was read (column, and whether its insulation limited it). */
  ampacity: Map<string, CableAmpacity | null>;
  /** Elements owned by loads / chargers. */
  loadElements: Set<string>;
  chargerElements: Set<string>;
}

export type ContextResult = { ok: true; ctx: AnalysisContext } | { ok: false; errors: AnalysisIssue[] };

/** A cable run's corrected ampacity and how it was read. */
export interface CableAmpacity {
  amps: number;
  /** Temperature column read, °C. */
  column_C: number;
  /** 'insulation' when the run's insulation is rated below the selected table, so its own column was read. */
  limitedBy: 'table' | 'insulation';
  /** Plain-language note when the insulation rating changed the column or was not credited. */
  note?: string;
  /** The derating chain, factor by factor: ambient, bundling, engine space, termination temperature. */
  derating: AmpacityDerating;
}

/**
 * Corrected ampacity of a cable run: settings.ampacityTable read at the column of the run's insulation
 * rating when that is below the table's temperature (never credited above it), at the run's ambient (or
 * the bank's), with the bundling adjustment, the engine-space column where the run is in one, and capped
 * at the column of its lowest-rated termination when that is given (NEC 110.14(C)). Null for a
 * zero-length bolted joint or a size (or insulation rating) the table does not list.
 */
export function cableAmpacity(props: CableRunProps, settings: DiagramSettings): CableAmpacity | null {
  if (props.length_m === 0) return null;
  const r = ampacity({
    size: props.conductor,
    table: settings.ampacityTable,
    insulation_C: props.insulation_C,
    ambient_C: props.ambient_C ?? settings.ambient_C,
    bundledConductors: props.installation === 'bundled' ? props.bundledConductors ?? 4 : 1,
    engineSpace: props.installation === 'engine_space',
    ...(props.terminal_C !== undefined ? { terminal_C: props.terminal_C } : {}),
  });
  if (!r.ok) return null;
  return { amps: r.amps, column_C: r.column_C, limitedBy: r.limitedBy, ...(r.note ? { note: r.note } : {}), derating: r.derating };
}

/** Corrected ampacity of a cable run, A (see `cableAmpacity`). */
export function cableAmpacity_A(props: CableRunProps, settings: DiagramSettings): number | null {
  return cableAmpacity(props, settings)?.amps ?? null;
}

function unitOf(p: SourcePart, map: CompileMap, topo: DiagramTopology, batteryIds: Set<string>): SourceUnit {
  const members = p.type === 'battery' ? [p.props] : stringMembers(p.props);
  // The compiled battery elements in model order (a one-element part uses the part id itself).
  const elements = map.parts[p.id].elements.filter((e) => batteryIds.has(e));
  const nodes = map.parts[p.id].nodes;
  return {
    id: p.id,
    type: p.type,
    members,
    elements,
    nominal_V: members.reduce((s, b) => s + b.nominal_V, 0),
    capacity_Ah: Math.min(...members.map((b) => b.capacity_Ah)),
    maxContinuous_A: Math.min(...members.map((b) => batteryMaxContinuous_A(b))),
    ocv_V: members.reduce((s, b) => s + batteryOcv_V(b), 0),
    posNode: nodes.pos,
    negNode: nodes.neg,
    fuses: ownFuses(topo, p.id),
  };
}

/**
 * Bank nominal voltage: nodes joined by conductors share a potential; each battery element adds its
 * nominal voltage; the bank's voltage is the difference across the first load (else the first charger,
 * else the largest spread). Series adds volts, parallel does not (first principles).
 */
function nominalAcross(network: Network, nominal: Map<string, number>, terminals: [string, string] | null): number {
  const parent = new Map<string, string>();
  const find = (x: string): string => {
    if (!parent.has(x)) parent.set(x, x);
    let r = x;
    while (parent.get(r) !== r) r = parent.get(r)!;
    parent.set(x, r);
    return r;
  };
  const adj = new Map<string, { to: string; dv: number }[]>();
  for (const el of network.elements) if (el.kind === 'resistor' && el.role !== 'switch_open') parent.set(find(el.a), find(el.b));
  const link = (a: string, b: string, dv: number) => {
    if (!adj.has(a)) adj.set(a, []);
    adj.get(a)!.push({ to: b, dv });
  };
  for (const el of network.elements) {
    if (el.kind !== 'battery') continue;
    const v = nominal.get(el.id) ?? 0;
    link(find(el.neg), find(el.pos), v);
    link(find(el.pos), find(el.neg), -v);
  }
  const pot = new Map<string, number>();
  for (const start of adj.keys()) {
    if (pot.has(start)) continue;
    pot.set(start, 0);
    const queue = [start];
    for (let h = 0; h < queue.length; h++) {
      const u = queue[h];
      for (const { to, dv } of adj.get(u)!) {
        if (!pot.has(to)) {
          pot.set(to, pot.get(u)! + dv);
          queue.push(to);
        }
      }
    }
  }
  if (terminals) {
    const a = pot.get(find(terminals[0]));
    const b = pot.get(find(terminals[1]));
    if (a !== undefined && b !== undefined && Math.abs(a - b) > 0) return Math.abs(a - b);
  }
  const values = [...pot.values()];
  return values.length ? Math.max(...values) - Math.min(...values) : 0;
}

export function buildContext(doc: DiagramDocument): ContextResult {
  const compiled = compileDiagram(doc);
  if (!compiled.ok) return { ok: false, errors: compiled.errors.map((e) => ({ code: e.code, message: e.message, parts: e.parts })) };
  const topo = diagramTopology(doc);
  const { network, map } = compiled;
  const batteryIds = new Set(network.elements.filter((e) => e.kind === 'battery').map((e) => e.id));
  const units = topo.sources.map((p) => unitOf(p, map, topo, batteryIds));
  const elementNominal_V = new Map<string, number>();
  for (const u of units) u.elements.forEach((id, i) => elementNominal_V.set(id, u.members[i].nominal_V));
  const loadElements = new Set<string>();
  const chargerElements = new Set<string>();
  for (const p of [...topo.loads]) for (const e of map.parts[p.id]?.elements ?? []) loadElements.add(e);
  for (const p of topo.chargers) for (const e of map.parts[p.id]?.elements ?? []) chargerElements.add(e);
  const across = topo.loads[0] ?? topo.chargers.find((c) => c.props.enabled) ?? null;
  const terminals: [string, string] | null = across ? [map.parts[across.id].nodes.pos, map.parts[across.id].nodes.neg] : null;
  const cableAmp = new Map<string, CableAmpacity | null>();
  const ampacity_A = new Map<string, number | null>();
  for (const c of doc.cables) {
    const a = cableAmpacity(c.props, doc.settings);
    cableAmp.set(c.id, a);
    ampacity_A.set(c.id, a?.amps ?? null);
  }
  return {
    ok: true,
    ctx: {
      doc,
      settings: doc.settings,
      topo,
      network,
      map,
      compileNotes: compiled.notes,
      units,
      unitById: new Map(units.map((u) => [u.id, u])),
      elementNominal_V,
      bankNominal_V: nominalAcross(network, elementNominal_V, terminals),
      ampacity_A,
      ampacity: cableAmp,
      loadElements,
      chargerElements,
    },
  };
}

/** The network with some elements left out (e.g. loads and chargers for a fault study). */
export function without(network: Network, drop: (el: NetworkElement) => boolean): Network {
  return { ground: network.ground, elements: network.elements.filter((el) => !drop(el)) };
}

/** Network of a mode: 'load' has the loads and no chargers; 'charge' the chargers and no loads; 'idle' neither. */
export function modeNetwork(ctx: AnalysisContext, kind: 'load' | 'charge' | 'idle'): Network {
  return without(ctx.network, (el) =>
    kind === 'load' ? ctx.chargerElements.has(el.id) : kind === 'charge' ? ctx.loadElements.has(el.id) : ctx.loadElements.has(el.id) || ctx.chargerElements.has(el.id),
  );
}
