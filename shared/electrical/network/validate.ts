/**
 * Checks a network before it is solved: ids, node references, values and topology (every node has a DC
 * path to ground; ideal voltage sources form no loop). Shared by the file parser and both solver paths,
 * so a network built in code (e.g. from a diagram) gets the same errors as one read from a file.
 */
import type { Network, NetworkElement, SolveError, SolveErrorCode } from './types';

/** The node names and their indices; `ground` is always index 0. */
export interface NetworkTopology {
  nodes: string[];
  index: Map<string, number>;
}

export function solveError(
  code: SolveErrorCode,
  message: string,
  parts: { nodes?: string[]; elements?: string[] } = {},
): SolveError {
  const error: SolveError['error'] = { code, message };
  if (parts.nodes && parts.nodes.length) error.nodes = parts.nodes;
  if (parts.elements && parts.elements.length) error.elements = parts.elements;
  return { ok: false, error };
}

/** The two terminals of an element, in the order of its sign convention (current positive from the first
 * through the element to the second, except a battery / voltage source whose current leaves `pos`). */
export function terminals(el: NetworkElement): [string, string] {
  switch (el.kind) {
    case 'resistor':
    case 'load_resistor':
      return [el.a, el.b];
    case 'current_source':
      return [el.from, el.to];
    default:
      return [el.pos, el.neg];
  }
}

/** An ideal voltage source: no series resistance, so it is a constraint, not a conductance. */
export function isIdealVoltageSource(el: NetworkElement): el is Extract<NetworkElement, { kind: 'voltage_source' }> {
  return el.kind === 'voltage_source' && el.r_ohm === undefined;
}

/** Elements that give a DC path between their terminals (current and constant-power loads do not). */
export function conducts(el: NetworkElement): boolean {
  return el.kind === 'battery' || el.kind === 'resistor' || el.kind === 'load_resistor' || el.kind === 'voltage_source';
}

class UnionFind {
  parent: Int32Array;
  constructor(n: number) {
    this.parent = new Int32Array(n);
    for (let i = 0; i < n; i++) this.parent[i] = i;
  }
  find(x: number): number {
    const p = this.parent;
    while (p[x] !== x) {
      p[x] = p[p[x]];
      x = p[x];
    }
    return x;
  }
  union(a: number, b: number): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    this.parent[ra] = rb;
    return true;
  }
}

const finite = (v: number) => typeof v === 'number' && Number.isFinite(v);

/**
 * Physical bounds on element values. Engineering limits set far beyond any battery bank or DC plant
 * (the largest are grid-scale: hundreds of kV, megawatts), so a value outside them is a typing or file
 * error, not a design: without them a finite but absurd value (an EMF of 1e301 V) solves into Infinity.
 * Resistances from 1 pΩ (below any bolted joint) to 1 TΩ (an open switch is 10 MΩ). Chosen here, not
 * taken from a standard.
 */
export const VALUE_BOUNDS = {
  /** |ocv_V|, |volts|, v_min_V: 100 kV. */
  maxVolts: 1e5,
  /** r_ohm of every element. */
  minOhm: 1e-12,
  maxOhm: 1e12,
  /** |amps| of a current source, i_max_A of a charger: 10 MA. */
  maxAmps: 1e7,
  /** |watts| of a constant-power load: 1 GW. */
  maxWatts: 1e9,
} as const;

function badValue(el: NetworkElement, field: string, rule: string): SolveError {
  return solveError('invalid_value', `element '${el.id}': ${field} must be ${rule} (got ${String((el as Record<string, unknown>)[field])})`, {
    elements: [el.id],
  });
}
const B = VALUE_BOUNDS;
const inMagnitude = (v: number, max: number) => finite(v) && Math.abs(v) <= max;
const positiveUpTo = (v: number | undefined, max: number) => v === undefined || (finite(v) && v > 0 && v <= max);
const resistance = (v: number | undefined) => v === undefined || (finite(v) && v >= B.minOhm && v <= B.maxOhm);
const VOLTS = `a finite number of at most ${B.maxVolts} V in magnitude`;
const OHMS = `a finite number from ${B.minOhm} to ${B.maxOhm} Ω`;
const POSITIVE_VOLTS = `a finite number > 0 and at most ${B.maxVolts} V`;
const POSITIVE_AMPS = `a finite number > 0 and at most ${B.maxAmps} A`;

function checkValues(el: NetworkElement): SolveError | null {
  switch (el.kind) {
    case 'battery':
      if (!inMagnitude(el.ocv_V, B.maxVolts)) return badValue(el, 'ocv_V', VOLTS);
      return el.r_ohm !== undefined && resistance(el.r_ohm) ? null : badValue(el, 'r_ohm', OHMS);
    case 'resistor':
    case 'load_resistor':
      return el.r_ohm !== undefined && resistance(el.r_ohm) ? null : badValue(el, 'r_ohm', OHMS);
    case 'current_source':
      return inMagnitude(el.amps, B.maxAmps) ? null : badValue(el, 'amps', `a finite number of at most ${B.maxAmps} A in magnitude`);
    case 'constant_power':
      if (!inMagnitude(el.watts, B.maxWatts)) return badValue(el, 'watts', `a finite number of at most ${B.maxWatts} W in magnitude`);
      return positiveUpTo(el.v_min_V, B.maxVolts) ? null : badValue(el, 'v_min_V', POSITIVE_VOLTS);
    case 'voltage_source':
      if (!inMagnitude(el.volts, B.maxVolts)) return badValue(el, 'volts', VOLTS);
      if (!resistance(el.r_ohm)) return badValue(el, 'r_ohm', OHMS);
      return positiveUpTo(el.i_max_A, B.maxAmps) ? null : badValue(el, 'i_max_A', POSITIVE_AMPS);
  }
}

/** Names of the nodes with no DC path to ground through elements accepted by `conductive`. */
export function findFloatingNodes(
  net: Network,
  topo: NetworkTopology,
  conductive: (el: NetworkElement) => boolean = conducts,
): string[] {
  const uf = new UnionFind(topo.nodes.length);
  for (const el of net.elements) {
    if (!conductive(el)) continue;
    const [x, y] = terminals(el);
    uf.union(topo.index.get(x)!, topo.index.get(y)!);
  }
  const g = uf.find(0);
  const floating: string[] = [];
  for (let i = 1; i < topo.nodes.length; i++) if (uf.find(i) !== g) floating.push(topo.nodes[i]);
  return floating;
}

export function floatingError(floating: string[]): SolveError {
  const shown = floating.length > 20 ? `${floating.slice(0, 20).join(', ')} and ${floating.length - 20} more` : floating.join(', ');
  return solveError(
    'floating_node',
    `${floating.length === 1 ? 'node' : 'nodes'} ${shown} ${floating.length === 1 ? 'has' : 'have'} no DC path to ground`,
    { nodes: floating },
  );
}

/** First terminal of an element (see `terminals`), without building an array. */
export function firstTerminal(el: NetworkElement): string {
  switch (el.kind) {
    case 'resistor':
    case 'load_resistor':
      return el.a;
    case 'current_source':
      return el.from;
    default:
      return el.pos;
  }
}

/** Second terminal of an element (see `terminals`). */
export function secondTerminal(el: NetworkElement): string {
  switch (el.kind) {
    case 'resistor':
    case 'load_resistor':
      return el.b;
    case 'current_source':
      return el.to;
    default:
      return el.neg;
  }
}

/** A network that passed validation: its nodes, and each element's terminal node indices. */
export interface ValidNetwork {
  ok: true;
  topology: NetworkTopology;
  /** Terminal node indices of element e: ends[2e], ends[2e + 1] (order of `terminals`). */
  ends: Int32Array;
}

/**
 * Validates ids, values, node references and topology. Returns the node list (ground first, then the
 * declared order, or the order of first use when `nodes` is absent) and the elements' terminal indices.
 * Checks run in this order, so a network with several faults reports the first kind: duplicate ids,
 * node references, values, loops of ideal sources, floating nodes.
 */
export function validateNetwork(net: Network): ValidNetwork | SolveError {
  const els = net.elements;
  const seen = new Set<string>();
  for (let e = 0; e < els.length; e++) {
    const id = els[e].id;
    if (seen.has(id)) return solveError('duplicate_id', `element id '${id}' is used more than once`, { elements: [id] });
    seen.add(id);
  }
  const nodes: string[] = [net.ground];
  const index = new Map<string, number>([[net.ground, 0]]);
  const ends = new Int32Array(2 * els.length);
  if (net.nodes) {
    const declared = new Set<string>();
    for (const n of net.nodes) {
      if (declared.has(n)) return solveError('duplicate_id', `node '${n}' is listed more than once`, { nodes: [n] });
      declared.add(n);
      if (!index.has(n)) {
        index.set(n, nodes.length);
        nodes.push(n);
      }
    }
    for (let e = 0; e < els.length; e++) {
      const el = els[e];
      const t1 = firstTerminal(el);
      const i1 = index.get(t1);
      if (i1 === undefined) return solveError('unknown_node', `element '${el.id}' refers to node '${t1}', which is not in nodes`, { nodes: [t1], elements: [el.id] });
      const t2 = secondTerminal(el);
      const i2 = index.get(t2);
      if (i2 === undefined) return solveError('unknown_node', `element '${el.id}' refers to node '${t2}', which is not in nodes`, { nodes: [t2], elements: [el.id] });
      ends[2 * e] = i1;
      ends[2 * e + 1] = i2;
    }
  } else {
    for (let e = 0; e < els.length; e++) {
      const el = els[e];
      const t1 = firstTerminal(el);
      let i1 = index.get(t1);
      if (i1 === undefined) {
        index.set(t1, (i1 = nodes.length));
        nodes.push(t1);
      }
      const t2 = secondTerminal(el);
      let i2 = index.get(t2);
      if (i2 === undefined) {
        index.set(t2, (i2 = nodes.length));
        nodes.push(t2);
      }
      ends[2 * e] = i1;
      ends[2 * e + 1] = i2;
    }
  }
  for (const el of els) {
    const err = checkValues(el);
    if (err) return err;
  }
  const topology = { nodes, index };

  // Ideal voltage sources must form a forest: a loop of them has no resistance to share its current.
  let uf: UnionFind | null = null;
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    if (!isIdealVoltageSource(el)) continue;
    uf ??= new UnionFind(nodes.length);
    if (!uf.union(ends[2 * e], ends[2 * e + 1])) {
      const loop = [el.id, ...forestPath(idealForest(els, ends, nodes.length, e), ends[2 * e], ends[2 * e + 1])];
      return solveError(
        'zero_resistance_loop',
        `ideal voltage sources ${loop.map((id) => `'${id}'`).join(', ')} form a loop with no resistance (give chargers their r_ohm)`,
        { elements: loop, nodes: [el.pos, el.neg] },
      );
    }
  }

  // Every node needs a DC path to ground.
  const conn = new UnionFind(nodes.length);
  let joined = 0;
  for (let e = 0; e < els.length; e++) if (conducts(els[e]) && conn.union(ends[2 * e], ends[2 * e + 1])) joined++;
  if (joined < nodes.length - 1) {
    const g = conn.find(0);
    const floating: string[] = [];
    for (let i = 1; i < nodes.length; i++) if (conn.find(i) !== g) floating.push(nodes[i]);
    return floatingError(floating);
  }
  return { ok: true, topology, ends };
}

/** The forest of the ideal sources before element `upTo` (for naming a loop). */
function idealForest(els: NetworkElement[], ends: Int32Array, n: number, upTo: number): { el: string; a: number; b: number }[][] {
  const forest: { el: string; a: number; b: number }[][] = Array.from({ length: n }, () => []);
  for (let e = 0; e < upTo; e++) {
    const el = els[e];
    if (!isIdealVoltageSource(el)) continue;
    const a = ends[2 * e];
    const b = ends[2 * e + 1];
    forest[a].push({ el: el.id, a, b });
    forest[b].push({ el: el.id, a: b, b: a });
  }
  return forest;
}

/** Element ids on the path from a to b in a forest (breadth-first search). */
function forestPath(forest: { el: string; a: number; b: number }[][], from: number, to: number): string[] {
  if (from === to) return [];
  const via = new Map<number, { prev: number; el: string }>([[from, { prev: -1, el: '' }]]);
  const queue = [from];
  while (queue.length) {
    const x = queue.shift()!;
    if (x === to) break;
    for (const e of forest[x]) {
      if (!via.has(e.b)) {
        via.set(e.b, { prev: x, el: e.el });
        queue.push(e.b);
      }
    }
  }
  const path: string[] = [];
  for (let x = to; x !== from; ) {
    const v = via.get(x)!;
    path.push(v.el);
    x = v.prev;
  }
  return path.reverse();
}
