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
 * The sweep solves every case as a rank-one change (Sherman–Morrison) of one factorization through the
 * solver's lean sweep (`linearSweep`): one triangular solve pair per case, only the fuses' and cables'
 * currents. When the load case's loads are all constant-power loads or current sinks (they are not in
 * the nodal matrix), the load case's own prepared factorization is the fault network's, and nothing is
 * factorized again. A single case shown in full goes through the solver's variant API
 * (`solvePrepared`), which the tests check the sweep against.
 */
import { internalShort, withShunt, type NetworkChange } from '../network/changes';
import { linearSweep, prepareNetwork, type LinearSweep, type PreparedNetwork } from '../network/fast';
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
  const byId = new Map(net.elements.map((e) => [e.id, e]));
  for (const u of ctx.units) {
    u.elements.forEach((el, i) => {
      const bat = byId.get(el);
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

export interface PreparedFaults {
  net: Network;
  /** The lean sweep on the fault network's factorization; null when the fault network does not solve. */
  fn: LinearSweep | null;
  specs: FaultCaseSpec[];
}

/**
 * The fault network's sweep. `loadCase`: the load case's prepared network; when every element it has
 * beyond the fault network is a constant-power load or a current sink (neither is in the nodal
 * matrix), its factorization is reused with those left out.
 */
export function prepareFaults(ctx: AnalysisContext, fault_ohm = DEFAULT_FAULT_OHM, loadCase?: PreparedNetwork | null): PreparedFaults {
  const net = faultNetwork(ctx);
  let fn: LinearSweep | null = null;
  if (loadCase && reusable(ctx, loadCase)) {
    const sweep = linearSweep(loadCase, { omit: (el) => ctx.loadElements.has(el.id) });
    if (!('ok' in sweep)) fn = sweep;
  }
  if (!fn) {
    const prep = prepareNetwork(net);
    if (!('ok' in prep) && prep.base.ok) {
      const sweep = linearSweep(prep);
      if (!('ok' in sweep)) fn = sweep;
    }
  }
  const sweep = fn;
  const specs = sweep ? faultCases(ctx, net, fault_ohm, (node) => sweep.voltage(node)) : [];
  return { net, fn, specs };
}

/** True when the load case's network is the fault network plus loads that are not in the matrix. */
function reusable(ctx: AnalysisContext, loadCase: PreparedNetwork): boolean {
  if (!loadCase.base.ok) return false;
  for (const el of loadCase.network.elements) {
    if (ctx.chargerElements.has(el.id) || el.kind === 'voltage_source') return false;
    if (ctx.loadElements.has(el.id) && el.kind !== 'constant_power' && el.kind !== 'current_source') return false;
  }
  return true;
}

/** The sweep over every fault case: the largest prospective current at each fuse and cable. */
export function faultSweep(ctx: AnalysisContext, prepared: PreparedFaults, fault_ohm = DEFAULT_FAULT_OHM): FaultSweep {
  const { fn, specs } = prepared;
  const out: FaultSweep = { fault_ohm, cases: [], maxByFuse: {}, maxByCable: {}, worstFault_A: 0 };
  if (!fn) return out;
  // Watched: each fuse's element and each cable's conductor.
  const watch: string[] = [];
  const owners: { kind: 'fuse' | 'cable'; id: string }[] = [];
  const inNetwork = new Set<string>();
  for (const e of prepared.net.elements) inNetwork.add(e.id);
  for (const f of ctx.topo.fuses) {
    const el = ctx.map.parts[f.id]?.elements[0];
    if (el !== undefined && inNetwork.has(el)) {
      watch.push(el);
      owners.push({ kind: 'fuse', id: f.id });
    }
  }
  for (const c of ctx.doc.cables) {
    if (inNetwork.has(c.id)) {
      watch.push(c.id);
      owners.push({ kind: 'cable', id: c.id });
    }
  }
  const max = new Float64Array(watch.length);
  const arg = new Int32Array(watch.length).fill(-1);
  const faultCurrents = new Float64Array(specs.length);
  // Cases whose two ends are one node move nothing: no fault current, left out of the maxima.
  const live: NetworkChange[] = [];
  const caseOf: number[] = [];
  for (let i = 0; i < specs.length; i++) {
    if (specs[i].a === specs[i].b) continue;
    live.push(specs[i].change);
    caseOf.push(i);
  }
  const err = fn.run(
    live,
    watch,
    (v, currents, changeCurrent) => {
      const s = caseOf[v];
      faultCurrents[s] = Math.abs(changeCurrent);
      for (let j = 0; j < currents.length; j++) {
        const i = currents[j];
        const mag = i < 0 ? -i : i;
        if (mag > max[j]) {
          max[j] = mag;
          arg[j] = s;
        }
      }
    },
  );
  if (err) return out;
  out.cases = specs.map((s, i) => ({ ...s.case, faultCurrent_A: faultCurrents[i] }));
  out.worstFault_A = faultCurrents.reduce((a, b) => Math.max(a, b), 0);
  owners.forEach((o, j) => {
    (o.kind === 'fuse' ? out.maxByFuse : out.maxByCable)[o.id] = { current_A: max[j], case: arg[j] };
  });
  return out;
}
