/**
 * Fault studies. The fault network is the bank with its loads and chargers disconnected (the batteries
 * alone feed the fault; a charger would add at most its current limit), so it is linear: batteries are
 * EMFs behind their internal resistance, everything else a resistance.
 *
 * Cases (fault resistance `fault_ohm`, default 1 mΩ — a bolted-fault allowance):
 * - battery: each battery element in turn internally shorted (its EMF gone, its internal resistance
 *   replaced by fault_ohm), fed by every other battery in parallel with it;
 * - cable: each cable's load end (the end fewer conductor hops from a load) joined through fault_ohm to
 *   the opposite pole at that load (the load's other terminal).
 *
 * Prospective current I_sc = V_oc / (R_int + R_path) (first principles) falls out of the nodal solution.
 *
 * The sweep factorizes the fault network once (the solver's sparse LDLᵀ) and solves every case as a
 * rank-one change of it (Sherman–Morrison): one triangular solve pair per case. A single case shown in
 * full goes through the solver's own variant API (`solvePrepared`), which the tests check the sweep against.
 */
import { LdlFactor } from '../network/ldl';
import { internalShort, withShunt, type NetworkChange } from '../network/changes';
import type { Network } from '../network/types';
import { type AnalysisContext, modeNetwork } from './context';
import type { FaultCase, FaultSweep } from './types';

export const DEFAULT_FAULT_OHM = 1e-3;

export interface FaultCaseSpec {
  case: FaultCase;
  change: NetworkChange;
  /** Node indices for the sweep: the two ends of the rank-one change. */
  a: string;
  b: string;
}

/** The fault network: loads and chargers disconnected. */
export function faultNetwork(ctx: AnalysisContext): Network {
  return modeNetwork(ctx, 'idle');
}

/** Hop distance from every node to the nearest load terminal, and that load's pos/neg nodes. */
function nearestLoad(ctx: AnalysisContext, net: Network): Map<string, { d: number; pos: string; neg: string }> {
  const adj = new Map<string, string[]>();
  const link = (a: string, b: string) => {
    if (!adj.has(a)) adj.set(a, []);
    adj.get(a)!.push(b);
  };
  for (const el of net.elements) {
    if (el.kind === 'resistor') {
      link(el.a, el.b);
      link(el.b, el.a);
    }
  }
  const ends = ctx.topo.loads.length ? ctx.topo.loads : ctx.topo.chargers.filter((c) => c.props.enabled);
  const out = new Map<string, { d: number; pos: string; neg: string }>();
  const queue: string[] = [];
  for (const p of ends) {
    const n = ctx.map.parts[p.id].nodes;
    for (const node of [n.pos, n.neg]) {
      if (!out.has(node)) {
        out.set(node, { d: 0, pos: n.pos, neg: n.neg });
        queue.push(node);
      }
    }
  }
  for (let h = 0; h < queue.length; h++) {
    const u = queue[h];
    const here = out.get(u)!;
    for (const v of adj.get(u) ?? []) {
      if (out.has(v)) continue;
      out.set(v, { d: here.d + 1, pos: here.pos, neg: here.neg });
      queue.push(v);
    }
  }
  return out;
}

/** Every fault case of the diagram. `polarity(node)` tells the positive side (true) from the negative. */
export function faultCases(ctx: AnalysisContext, net: Network, fault_ohm: number, volts: (node: string) => number): FaultCaseSpec[] {
  const specs: FaultCaseSpec[] = [];
  for (const u of ctx.units) {
    u.elements.forEach((el, i) => {
      const bat = net.elements.find((e) => e.id === el);
      if (!bat || bat.kind !== 'battery') return;
      specs.push({
        case: { kind: 'battery', id: el, part: u.id, label: u.elements.length > 1 ? `${u.id} battery ${i + 1} internally shorted` : `${u.id} internally shorted`, faultCurrent_A: 0 },
        change: internalShort(el, fault_ohm),
        a: bat.pos,
        b: bat.neg,
      });
    });
  }
  const near = nearestLoad(ctx, net);
  for (const c of ctx.doc.cables) {
    const m = ctx.map.cables[c.id];
    if (!m || m.from_node === m.to_node) continue;
    const nf = near.get(m.from_node);
    const nt = near.get(m.to_node);
    if (!nf && !nt) continue;
    const loadEnd = nf && (!nt || nf.d < nt.d) ? m.from_node : m.to_node;
    const ref = (loadEnd === m.from_node ? nf : nt)!;
    const v = volts(loadEnd);
    const positive = Math.abs(v - volts(ref.pos)) <= Math.abs(v - volts(ref.neg));
    const other = positive ? ref.neg : ref.pos;
    if (other === loadEnd) continue;
    specs.push({
      case: { kind: 'cable', id: c.id, part: c.id, label: `${c.label || c.id} shorted at its load end`, faultCurrent_A: 0 },
      change: withShunt(loadEnd, other, fault_ohm, `fault:${c.id}`),
      a: loadEnd,
      b: other,
    });
  }
  return specs;
}

/** The linear fault network assembled and factorized once. */
export class FaultNetwork {
  readonly m: number;
  readonly index: Map<string, number>;
  readonly factor: LdlFactor | null;
  /** Node potentials of the unfaulted network (loads and chargers off), by index (ground excluded). */
  readonly y0: Float64Array;
  private readonly ra: Int32Array;
  private readonly rb: Int32Array;
  private readonly g: Float64Array;
  private readonly emf: Float64Array;
  private readonly isBattery: Uint8Array;
  readonly ids: string[];

  private constructor(net: Network, index: Map<string, number>, factor: LdlFactor | null, y0: Float64Array) {
    this.index = index;
    this.m = index.size;
    this.factor = factor;
    this.y0 = y0;
    const els = net.elements.filter((e) => e.kind === 'battery' || e.kind === 'resistor' || e.kind === 'load_resistor');
    const k = els.length;
    this.ids = els.map((e) => e.id);
    this.ra = new Int32Array(k);
    this.rb = new Int32Array(k);
    this.g = new Float64Array(k);
    this.emf = new Float64Array(k);
    this.isBattery = new Uint8Array(k);
    els.forEach((e, j) => {
      const [a, b] = e.kind === 'battery' ? [e.pos, e.neg] : [e.a, e.b];
      this.ra[j] = index.get(a) ?? -1;
      this.rb[j] = index.get(b) ?? -1;
      this.g[j] = 1 / e.r_ohm;
      if (e.kind === 'battery') {
        this.emf[j] = e.ocv_V;
        this.isBattery[j] = 1;
      }
    });
  }

  /** Assembles K (ground row and column removed) and factorizes it; null when it is singular. */
  static build(net: Network): FaultNetwork | null {
    const index = new Map<string, number>();
    const idx = (n: string) => {
      if (n === net.ground) return -1;
      let i = index.get(n);
      if (i === undefined) index.set(n, (i = index.size));
      return i;
    };
    const stamps: [number, number, number, number][] = []; // a, b, g, J (a → b)
    for (const e of net.elements) {
      if (e.kind === 'battery') stamps.push([idx(e.pos), idx(e.neg), 1 / e.r_ohm, e.ocv_V / e.r_ohm]);
      else if (e.kind === 'resistor' || e.kind === 'load_resistor') stamps.push([idx(e.a), idx(e.b), 1 / e.r_ohm, 0]);
      else return null; // only linear elements in a fault network
    }
    const m = index.size;
    if (m === 0) return new FaultNetwork(net, index, null, new Float64Array(0));
    // Column lists, both triangles, diagonal first.
    const cols: Map<number, number>[] = Array.from({ length: m }, (_, j) => new Map([[j, 0]]));
    const b = new Float64Array(m);
    const add = (i: number, j: number, v: number) => cols[j].set(i, (cols[j].get(i) ?? 0) + v);
    for (const [ra, rb, g, J] of stamps) {
      if (ra === rb) continue;
      if (ra >= 0) {
        add(ra, ra, g);
        b[ra] += J;
      }
      if (rb >= 0) {
        add(rb, rb, g);
        b[rb] -= J;
      }
      if (ra >= 0 && rb >= 0) {
        add(ra, rb, -g);
        add(rb, ra, -g);
      }
    }
    const colPtr = new Int32Array(m + 1);
    for (let j = 0; j < m; j++) colPtr[j + 1] = colPtr[j] + cols[j].size;
    const rowIdx = new Int32Array(colPtr[m]);
    const ax = new Float64Array(colPtr[m]);
    for (let j = 0, p = 0; j < m; j++) for (const [i, v] of cols[j]) (rowIdx[p] = i), (ax[p++] = v);
    const factor = new LdlFactor({ n: m, colPtr, rowIdx });
    if (factor.factor(ax) >= 0) return null;
    return new FaultNetwork(net, index, factor, factor.solve(b));
  }

  /** Potential of a node in a solution vector (ground 0). */
  volts(y: Float64Array, node: string): number {
    const i = this.index.get(node);
    return i === undefined ? 0 : y[i];
  }

  /**
   * Solves every case and keeps, for each element, the largest current magnitude and its case.
   * Returns per-element maxima (by element index, as in `ids`) and each case's fault current.
   */
  sweep(specs: FaultCaseSpec[], fault_ohm: number): { max: Float64Array; arg: Int32Array; faultCurrents: Float64Array } {
    const k = this.ids.length;
    const max = new Float64Array(k);
    const arg = new Int32Array(k).fill(-1);
    const faultCurrents = new Float64Array(specs.length);
    const factor = this.factor;
    if (!factor) return { max, arg, faultCurrents };
    const { m, y0, g, emf, isBattery } = this;
    // Ground is slot m (always 0 V), so no element needs a branch for it.
    const G = m;
    const ra = this.ra.map((i) => (i < 0 ? G : i));
    const rb = this.rb.map((i) => (i < 0 ? G : i));
    const u = new Float64Array(m);
    const z = new Float64Array(m + 1);
    const y = new Float64Array(m + 1);
    const base = new Float64Array(m + 1);
    base.set(y0);
    const elementIndex = new Map(this.ids.map((id, j) => [id, j]));
    const gf = 1 / fault_ohm;
    for (let s = 0; s < specs.length; s++) {
      const spec = specs[s];
      const ia = this.index.get(spec.a) ?? G;
      const ib = this.index.get(spec.b) ?? G;
      if (ia === ib) continue;
      u.fill(0);
      if (ia < G) u[ia] = 1;
      if (ib < G) u[ib] = -1;
      factor.solve(u, z);
      z[G] = 0;
      const uz = z[ia] - z[ib];
      const uy0 = base[ia] - base[ib];
      // Battery short: conductance g_k → g_f and its EMF removed (Norton source −e·g_k on u).
      // Shunt: conductance g_f added. Either way y = y0 + α z (Sherman–Morrison).
      let dg = gf;
      let shift = 0;
      let shorted = -1;
      if (spec.change.kind === 'short_element') {
        shorted = elementIndex.get(spec.change.element) ?? -1;
        if (shorted < 0) continue;
        dg = gf - g[shorted];
        shift = -emf[shorted] * g[shorted];
      }
      const alpha = shift - (dg * (uy0 + shift * uz)) / (1 + dg * uz);
      for (let i = 0; i <= m; i++) y[i] = base[i] + alpha * z[i];
      faultCurrents[s] = Math.abs((y[ia] - y[ib]) * gf);
      const keepMax = shorted >= 0 ? max[shorted] : 0;
      const keepArg = shorted >= 0 ? arg[shorted] : -1;
      for (let j = 0; j < k; j++) {
        const v = y[ra[j]] - y[rb[j]];
        const i = isBattery[j] === 1 ? (emf[j] - v) * g[j] : v * g[j];
        const mag = i < 0 ? -i : i;
        if (mag > max[j]) {
          max[j] = mag;
          arg[j] = s;
        }
      }
      if (shorted >= 0) {
        // The shorted battery itself carries the fault current (EMF gone, fault resistance in place).
        max[shorted] = keepMax;
        arg[shorted] = keepArg;
        if (faultCurrents[s] > keepMax) {
          max[shorted] = faultCurrents[s];
          arg[shorted] = s;
        }
      }
    }
    return { max, arg, faultCurrents };
  }
}

export interface PreparedFaults {
  net: Network;
  fn: FaultNetwork | null;
  specs: FaultCaseSpec[];
}

export function prepareFaults(ctx: AnalysisContext, fault_ohm = DEFAULT_FAULT_OHM): PreparedFaults {
  const net = faultNetwork(ctx);
  const fn = FaultNetwork.build(net);
  const specs = fn ? faultCases(ctx, net, fault_ohm, (node) => fn.volts(fn.y0, node)) : [];
  return { net, fn, specs };
}

/** The sweep over every fault case: the largest prospective current at each fuse and cable. */
export function faultSweep(ctx: AnalysisContext, prepared: PreparedFaults, fault_ohm = DEFAULT_FAULT_OHM): FaultSweep {
  const { fn, specs } = prepared;
  const out: FaultSweep = { fault_ohm, cases: [], maxByFuse: {}, maxByCable: {}, worstFault_A: 0 };
  if (!fn) return out;
  const { max, arg, faultCurrents } = fn.sweep(specs, fault_ohm);
  out.cases = specs.map((s, i) => ({ ...s.case, faultCurrent_A: faultCurrents[i] }));
  out.worstFault_A = faultCurrents.reduce((a, b) => Math.max(a, b), 0);
  const byId = new Map(fn.ids.map((id, j) => [id, j]));
  for (const f of ctx.topo.fuses) {
    const el = ctx.map.parts[f.id]?.elements[0];
    const j = el === undefined ? undefined : byId.get(el);
    if (j !== undefined) out.maxByFuse[f.id] = { current_A: max[j], case: arg[j] };
  }
  for (const c of ctx.doc.cables) {
    const j = byId.get(c.id);
    if (j !== undefined) out.maxByCable[c.id] = { current_A: max[j], case: arg[j] };
  }
  return out;
}
