/**
 * Builders for common bank layouts and for large generated networks (tests, benchmarks, examples).
 * Every value is SI; node names follow the physical terminal ("b3+" is battery 3's positive post).
 */
import type { Network, NetworkElement } from './types';

export type LoadSpec =
  | { kind: 'load_resistor'; r_ohm: number }
  | { kind: 'constant_power'; watts: number; v_min_V?: number }
  | { kind: 'current_source'; amps: number };

function loadElement(id: string, pos: string, neg: string, load: LoadSpec): NetworkElement {
  switch (load.kind) {
    case 'load_resistor':
      return { id, kind: 'load_resistor', a: pos, b: neg, r_ohm: load.r_ohm };
    case 'constant_power':
      return { id, kind: 'constant_power', pos, neg, watts: load.watts, ...(load.v_min_V !== undefined ? { v_min_V: load.v_min_V } : {}) };
    case 'current_source':
      return { id, kind: 'current_source', from: pos, to: neg, amps: load.amps };
  }
}

const pick = (v: number | number[], i: number) => (Array.isArray(v) ? v[i] : v);

export interface PostToPostOptions {
  /** Number of batteries in parallel. */
  count: number;
  ocv_V?: number | number[];
  r_internal_ohm?: number | number[];
  /** Interconnect between neighbouring posts (each polarity). */
  link_ohm?: number | number[];
  /** Main lead from the take-off post to the load (each polarity). */
  lead_ohm?: number;
  /** 1-based battery whose positive / negative post the main leads leave from. */
  posTap: number;
  negTap: number;
  load: LoadSpec;
}

/** Batteries in parallel joined post to post, main leads taken from chosen posts. Ground: the load's
 * negative terminal. Elements: b<k>, link+<k>, link-<k> (between battery k and k+1), lead+, lead-, load. */
export function postToPostBank(o: PostToPostOptions): Network {
  const els: NetworkElement[] = [];
  for (let k = 1; k <= o.count; k++) {
    els.push({ id: `b${k}`, kind: 'battery', pos: `b${k}+`, neg: `b${k}-`, ocv_V: pick(o.ocv_V ?? 13.2, k - 1), r_ohm: pick(o.r_internal_ohm ?? 0.004, k - 1) });
  }
  for (let k = 1; k < o.count; k++) {
    const r = pick(o.link_ohm ?? 0.0005, k - 1);
    els.push({ id: `link+${k}`, kind: 'resistor', a: `b${k}+`, b: `b${k + 1}+`, r_ohm: r, role: 'cable' });
    els.push({ id: `link-${k}`, kind: 'resistor', a: `b${k}-`, b: `b${k + 1}-`, r_ohm: r, role: 'cable' });
  }
  const lead = o.lead_ohm ?? 0.002;
  els.push({ id: 'lead+', kind: 'resistor', a: `b${o.posTap}+`, b: 'load+', r_ohm: lead, role: 'cable' });
  els.push({ id: 'lead-', kind: 'resistor', a: 'load-', b: `b${o.negTap}-`, r_ohm: lead, role: 'cable' });
  els.push(loadElement('load', 'load+', 'load-', o.load));
  return { ground: 'load-', elements: els };
}

export interface BusbarOptions {
  count: number;
  ocv_V?: number | number[];
  r_internal_ohm?: number | number[];
  /** Cable from each battery post to its busbar (each polarity). */
  cable_ohm?: number | number[];
  load: LoadSpec;
  /** Optional charger on the busbars: ideal setpoint with series resistance and current limit. */
  charger?: { volts: number; r_ohm: number; i_max_A?: number };
}

/** Batteries each cabled to a positive and a negative busbar (a star), load on the busbars. Ground: "bus-". */
export function busbarBank(o: BusbarOptions): Network {
  const els: NetworkElement[] = [];
  for (let k = 1; k <= o.count; k++) {
    const c = pick(o.cable_ohm ?? 0.001, k - 1);
    els.push({ id: `b${k}`, kind: 'battery', pos: `b${k}+`, neg: `b${k}-`, ocv_V: pick(o.ocv_V ?? 13.2, k - 1), r_ohm: pick(o.r_internal_ohm ?? 0.004, k - 1) });
    els.push({ id: `cable+${k}`, kind: 'resistor', a: `b${k}+`, b: 'bus+', r_ohm: c, role: 'cable' });
    els.push({ id: `cable-${k}`, kind: 'resistor', a: 'bus-', b: `b${k}-`, r_ohm: c, role: 'cable' });
  }
  els.push(loadElement('load', 'bus+', 'bus-', o.load));
  if (o.charger) {
    els.push({ id: 'charger', kind: 'voltage_source', pos: 'bus+', neg: 'bus-', volts: o.charger.volts, r_ohm: o.charger.r_ohm, ...(o.charger.i_max_A !== undefined ? { i_max_A: o.charger.i_max_A } : {}) });
  }
  return { ground: 'bus-', elements: els };
}

export interface SeriesParallelOptions {
  series: number;
  parallel: number;
  ocv_V?: number;
  r_internal_ohm?: number;
  /** Link between batteries in series within a string. */
  link_ohm?: number;
  /** Cable from each string's ends to the busbars. */
  string_cable_ohm?: number;
  load: LoadSpec;
}

/** `parallel` strings of `series` batteries between two busbars. Battery s of string p is "s<p>.<s>". */
export function seriesParallelBank(o: SeriesParallelOptions): Network {
  const els: NetworkElement[] = [];
  for (let p = 1; p <= o.parallel; p++) {
    for (let s = 1; s <= o.series; s++) {
      els.push({ id: `s${p}.${s}`, kind: 'battery', pos: `s${p}.${s}+`, neg: `s${p}.${s}-`, ocv_V: o.ocv_V ?? 12.8, r_ohm: o.r_internal_ohm ?? 0.005 });
      if (s < o.series) els.push({ id: `link${p}.${s}`, kind: 'resistor', a: `s${p}.${s}+`, b: `s${p}.${s + 1}-`, r_ohm: o.link_ohm ?? 0.0003, role: 'cable' });
    }
    els.push({ id: `str+${p}`, kind: 'resistor', a: `s${p}.${o.series}+`, b: 'bus+', r_ohm: o.string_cable_ohm ?? 0.002, role: 'cable' });
    els.push({ id: `str-${p}`, kind: 'resistor', a: 'bus-', b: `s${p}.1-`, r_ohm: o.string_cable_ohm ?? 0.002, role: 'cable' });
  }
  els.push(loadElement('load', 'bus+', 'bus-', o.load));
  return { ground: 'bus-', elements: els };
}

/** Small deterministic PRNG (mulberry32) so generated networks are reproducible from a seed. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface MeshOptions {
  /** Approximate number of elements wanted. */
  elements: number;
  /** Width of the mesh in nodes (a long ladder when small). */
  width?: number;
  seed?: number;
  /** Add an ideal voltage source and a charger with series resistance. */
  sources?: boolean;
  /** Number of constant-power loads. */
  constantPower?: number;
}

/**
 * A random resistive mesh the shape of a DC distribution plant: a long strip `width` nodes wide of
 * cable and busbar resistances (0.1 mohm .. 0.5 ohm) on the positive side, batteries from about one
 * node in five to the return (ground, node m0.0), load resistors and current sinks to the return, and a
 * few random cross-links.
 */
export function randomMesh(o: MeshOptions): Network {
  const rnd = prng(o.seed ?? 1);
  const width = o.width ?? 8;
  // Each node brings about 2 mesh resistors + 0.45 other elements.
  const rows = Math.max(2, Math.round(o.elements / (width * 2.45)));
  const els: NetworkElement[] = [];
  const node = (r: number, c: number) => `m${r}.${c}`;
  const res = () => 1e-4 * Math.pow(5000, rnd());
  let k = 0;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < width; c++) {
      if (c + 1 < width) els.push({ id: `h${k++}`, kind: 'resistor', a: node(r, c), b: node(r, c + 1), r_ohm: res() });
      if (r + 1 < rows) els.push({ id: `v${k++}`, kind: 'resistor', a: node(r, c), b: node(r + 1, c), r_ohm: res() });
      const u = rnd();
      if (u < 0.2 && (r > 0 || c > 0)) {
        els.push({ id: `bat${k++}`, kind: 'battery', pos: node(r, c), neg: node(0, 0), ocv_V: 12 + rnd() * 1.4, r_ohm: 0.002 + rnd() * 0.02 });
      } else if (u < 0.3) {
        els.push({ id: `ld${k++}`, kind: 'load_resistor', a: node(r, c), b: node(0, 0), r_ohm: 0.5 + rnd() * 20 });
      } else if (u < 0.35) {
        els.push({ id: `is${k++}`, kind: 'current_source', from: node(r, c), to: node(0, 0), amps: rnd() * 5 });
      } else if (u < 0.45 && r > 2) {
        const r2 = r - 1 - Math.floor(rnd() * 2);
        const c2 = Math.floor(rnd() * width);
        els.push({ id: `x${k++}`, kind: 'resistor', a: node(r, c), b: node(r2, c2), r_ohm: res() });
      }
    }
  }
  if (o.sources) {
    els.push({ id: 'vref', kind: 'voltage_source', pos: node(1, 0), neg: node(0, 0), volts: 12.6 });
    els.push({ id: 'charger', kind: 'voltage_source', pos: node(rows - 1, width - 1), neg: node(0, 0), volts: 14.2, r_ohm: 0.02, i_max_A: 50 });
  }
  for (let j = 0; j < (o.constantPower ?? 0); j++) {
    const r = 1 + Math.floor(rnd() * (rows - 1));
    els.push({ id: `cp${j}`, kind: 'constant_power', pos: node(r, Math.floor(rnd() * width)), neg: node(0, 0), watts: 5 + rnd() * 50, v_min_V: 1 });
  }
  return { ground: node(0, 0), elements: els };
}
