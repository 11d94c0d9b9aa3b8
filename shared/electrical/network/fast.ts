/**
 * Fast nodal solver (docs/decisions/001-sparse-nodal-fast-path.md).
 *
 * 1. Ideal voltage sources holding their voltage are eliminated, not added as MNA rows: the nodes they
 *    join form a tree whose voltages are fixed offsets from one node (or from ground). Each such tree is
 *    one unknown, so the conductance matrix K stays symmetric positive definite.
 * 2. K is factorized once by sparse LDLᵀ with a minimum-degree ordering (ldl.ts).
 * 3. Constant-power loads are not stamped into K. With y0 = K⁻¹b and Z = K⁻¹U (U: the loads' incidence
 *    columns), the load voltages obey v = v_oc - W i(v) with W = UᵀZ, the Thevenin resistance matrix
 *    seen by the loads. Newton runs on that k x k system; nothing is refactorized.
 * 4. Changes (fault shunts, shorted batteries) are low-rank updates: K' = K + U_f D U_fᵀ is applied by
 *    the Woodbury identity on top of the same factorization, one triangular solve pair per change.
 * 5. Currents of the eliminated sources follow from Kirchhoff's current law along their trees.
 * Charger modes (CV / current limit) are checked after each solve and the system rebuilt on a change.
 */
import { applyChanges, type NetworkChange } from './changes';
import { LdlFactor, denseSolve, type SymmetricCsc } from './ldl';
import {
  MAX_MODE_PASSES,
  MAX_NEWTON_ITERATIONS,
  buildResultAt,
  collapseError,
  constantPowerCollapsed,
  constantPowerCurrent,
  constantPowerSlope,
  initialModes,
  isConstraintSource,
  nextModes,
  singularError,
  type ChargerModes,
} from './model';
import type { Network, NetworkElement, SolveError, SolveOutcome } from './types';
import { firstTerminal, secondTerminal, solveError, validateNetwork, type NetworkTopology } from './validate';

type ConstantPower = Extract<NetworkElement, { kind: 'constant_power' }>;

/** How each node maps onto the unknowns: V[node] = (rep < 0 ? 0 : y[rep]) + off. */
interface Reduction {
  rep: Int32Array;
  off: Float64Array;
  m: number;
  /** Tree edges of the eliminated sources, children before parents: node, element index, parent node. */
  tree: { node: number; el: number; parent: number }[];
}

interface LoadColumn {
  el: ConstantPower;
  ra: number;
  rb: number;
  /** Fixed part of the load voltage: off[pos] - off[neg]. */
  c: number;
}

interface Core {
  red: Reduction;
  /** Terminal node indices of element e: ends[2e], ends[2e + 1] (order of `terminals`). */
  ends: Int32Array;
  /** Which sources were eliminated; the same key means the same matrix pattern. */
  key: string;
  factor: LdlFactor | null;
  /** K⁻¹ b of the network without its constant-power loads. */
  y0: Float64Array;
  loads: LoadColumn[];
  /** K⁻¹ u for each load (null when its terminals share an unknown). */
  zLoads: (Float64Array | null)[];
}

/** A network analysed and factorized once, ready for repeated solves with small changes. */
export interface PreparedNetwork {
  readonly network: Network;
  readonly topology: NetworkTopology;
  /** Charger modes of the unchanged network's solution. */
  readonly modes: ChargerModes;
  /** Solution of the unchanged network. */
  readonly base: SolveOutcome;
  /** Unknowns of the reduced system and non-zeros of its factor (for diagnostics and benchmarks). */
  readonly stats: { unknowns: number; nnzL: number };
  /** @internal */
  readonly core: Core;
}

function reduce(net: Network, topo: NetworkTopology, modes: ChargerModes): Reduction {
  const n = topo.nodes.length;
  const edges: { el: number; to: number }[][] = Array.from({ length: n }, () => []);
  net.elements.forEach((el, i) => {
    if (!isConstraintSource(modes, el)) return;
    const src = el as Extract<NetworkElement, { kind: 'voltage_source' }>;
    const p = topo.index.get(src.pos)!;
    const q = topo.index.get(src.neg)!;
    edges[p].push({ el: i, to: q });
    edges[q].push({ el: i, to: p });
  });
  const rep = new Int32Array(n).fill(-2);
  const off = new Float64Array(n);
  const tree: Reduction['tree'] = [];
  let m = 0;
  const walk = (root: number, unknown: number) => {
    rep[root] = unknown;
    off[root] = 0;
    if (edges[root].length === 0) return;
    const queue = [root];
    const order: Reduction['tree'] = [];
    for (let h = 0; h < queue.length; h++) {
      const x = queue[h];
      for (const e of edges[x]) {
        if (rep[e.to] !== -2) continue;
        const src = net.elements[e.el] as Extract<NetworkElement, { kind: 'voltage_source' }>;
        const fromPos = topo.index.get(src.pos) === x;
        rep[e.to] = unknown;
        off[e.to] = off[x] + (fromPos ? -src.volts : src.volts);
        order.push({ node: e.to, el: e.el, parent: x });
        queue.push(e.to);
      }
    }
    for (let i = order.length - 1; i >= 0; i--) tree.push(order[i]);
  };
  walk(0, -1);
  for (let i = 1; i < n; i++) if (rep[i] === -2) walk(i, m++);
  return { rep, off, m, tree };
}

/** Sums duplicate (row, col) entries of the triplets into a symmetric CSC matrix. */
function assemble(m: number, rows: Int32Array, cols: Int32Array, vals: Float64Array, count: number): { csc: SymmetricCsc; ax: Float64Array } {
  const cnt = new Int32Array(m + 1);
  for (let t = 0; t < count; t++) cnt[cols[t] + 1]++;
  for (let j = 0; j < m; j++) cnt[j + 1] += cnt[j];
  const fillAt = cnt.slice(0, m);
  const r = new Int32Array(count);
  const v = new Float64Array(count);
  for (let t = 0; t < count; t++) {
    const p = fillAt[cols[t]]++;
    r[p] = rows[t];
    v[p] = vals[t];
  }
  const colPtr = new Int32Array(m + 1);
  const where = new Int32Array(m).fill(-1);
  let nz = 0;
  for (let j = 0; j < m; j++) {
    const start = nz;
    for (let p = cnt[j]; p < cnt[j + 1]; p++) {
      const i = r[p];
      if (where[i] >= start) v[where[i]] += v[p];
      else {
        where[i] = nz;
        r[nz] = i;
        v[nz] = v[p];
        nz++;
      }
    }
    colPtr[j + 1] = nz;
  }
  return { csc: { n: m, colPtr, rowIdx: r.slice(0, nz) }, ax: v.slice(0, nz) };
}

/**
 * Right-hand side b of the reduced system K y = b: each Norton branch's source current (less its
 * conductance times the fixed offsets of the eliminated sources) and the current sources' injections.
 */
function rightHandSide(net: Network, modes: ChargerModes, ends: Int32Array, red: Reduction): Float64Array {
  const { rep, off, m } = red;
  const b = new Float64Array(m);
  // Norton branch between nodes na, nb: current na -> nb = g (V[na] - V[nb]) - J.
  const branch = (na: number, nb: number, g: number, J: number) => {
    const ra = rep[na];
    const rb = rep[nb];
    if (ra === rb) return;
    const jeff = J - g * (off[na] - off[nb]);
    if (ra >= 0) b[ra] += jeff;
    if (rb >= 0) b[rb] -= jeff;
  };
  const inject = (into: number, outOf: number, amps: number) => {
    const ri = rep[into];
    const ro = rep[outOf];
    if (ri >= 0) b[ri] += amps;
    if (ro >= 0) b[ro] -= amps;
  };
  const els = net.elements;
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    const n1 = ends[2 * e];
    const n2 = ends[2 * e + 1];
    switch (el.kind) {
      case 'battery':
        branch(n1, n2, 1 / el.r_ohm, el.ocv_V / el.r_ohm);
        break;
      case 'resistor':
      case 'load_resistor':
        branch(n1, n2, 1 / el.r_ohm, 0);
        break;
      case 'current_source':
        inject(n2, n1, el.amps);
        break;
      case 'voltage_source':
        if (isConstraintSource(modes, el)) break;
        if (modes.get(el.id) === 'cc') inject(n1, n2, el.i_max_A!);
        else branch(n1, n2, 1 / el.r_ohm!, el.volts / el.r_ohm!);
        break;
    }
  }
  return b;
}

/**
 * Reduced system K y = b, factorized. `reuse` is a factor of an earlier pass with the same eliminated
 * sources: its ordering and symbolic analysis are kept, only the values are refactorized.
 */
function buildCore(net: Network, topo: NetworkTopology, modes: ChargerModes, ends: Int32Array, reuse: Core | null): Core | SolveError {
  let key = '';
  for (let e = 0; e < net.elements.length; e++) if (isConstraintSource(modes, net.elements[e])) key += `${e},`;
  const red = reuse && reuse.key === key ? reuse.red : reduce(net, topo, modes);
  const { rep, off, m } = red;
  const cap = m + 4 * net.elements.length;
  const rows = new Int32Array(cap);
  const cols = new Int32Array(cap);
  const vals = new Float64Array(cap);
  let t = 0;
  for (let j = 0; j < m; j++) {
    rows[t] = j;
    cols[t] = j;
    vals[t++] = 0;
  }
  const loads: LoadColumn[] = [];
  // Norton branch between nodes na, nb: conductance g (its source current goes in rightHandSide).
  const branch = (na: number, nb: number, g: number) => {
    const ra = rep[na];
    const rb = rep[nb];
    if (ra === rb) return;
    if (ra >= 0) {
      rows[t] = ra; cols[t] = ra; vals[t++] = g;
    }
    if (rb >= 0) {
      rows[t] = rb; cols[t] = rb; vals[t++] = g;
    }
    if (ra >= 0 && rb >= 0) {
      rows[t] = ra; cols[t] = rb; vals[t++] = -g;
      rows[t] = rb; cols[t] = ra; vals[t++] = -g;
    }
  };
  const els = net.elements;
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    const n1 = ends[2 * e];
    const n2 = ends[2 * e + 1];
    switch (el.kind) {
      case 'battery':
      case 'resistor':
      case 'load_resistor':
        branch(n1, n2, 1 / el.r_ohm);
        break;
      case 'constant_power':
        loads.push({ el, ra: rep[n1], rb: rep[n2], c: off[n1] - off[n2] });
        break;
      case 'voltage_source':
        if (isConstraintSource(modes, el)) break;
        // In current limit the branch stays in the pattern (value 0) so a mode change keeps the
        // symbolic analysis.
        if (modes.get(el.id) === 'cc') {
          if (el.r_ohm !== undefined) branch(n1, n2, 0);
        } else branch(n1, n2, 1 / el.r_ohm!);
        break;
    }
  }
  const b = rightHandSide(net, modes, ends, red);
  let factor: LdlFactor | null = null;
  let y0: Float64Array = new Float64Array(0);
  if (m > 0) {
    const { csc, ax } = assemble(m, rows, cols, vals, t);
    factor = reuse && reuse.key === key && reuse.factor ? reuse.factor : new LdlFactor(csc);
    const bad = factor.factor(ax);
    if (bad >= 0) {
      const nodes = topo.nodes.filter((_, i) => rep[i] === bad);
      return singularError(net, topo, modes, `no independent voltage at node ${nodes.join(', ')}`);
    }
    y0 = factor.solve(b);
  }
  const zLoads = loads.map((l) => (l.ra === l.rb ? null : factor!.solve(unitColumn(m, l.ra, l.rb))));
  return { red, ends, key, factor, y0, loads, zLoads };
}

function unitColumn(m: number, ra: number, rb: number): Float64Array {
  const u = new Float64Array(m);
  if (ra >= 0) u[ra] += 1;
  if (rb >= 0) u[rb] -= 1;
  return u;
}

const across = (x: Float64Array, ra: number, rb: number) => (ra >= 0 ? x[ra] : 0) - (rb >= 0 ? x[rb] : 0);

/**
 * Newton on the loads' voltages: F(v) = v - v_oc + W i(v) = 0, J = I + W diag(di/dv), with a
 * backtracking line search. Returns the load currents, or an error when the loads collapse.
 */
function solveLoads(loads: LoadColumn[], voc: Float64Array, W: Float64Array, warm?: Float64Array): { i: Float64Array; v: Float64Array; iterations: number } | SolveError {
  const ids = loads.map((l) => l.el.id);
  const collapsed = loads.filter((l, j) => constantPowerCollapsed(l.el, voc[j]));
  if (collapsed.length) return collapseError(collapsed.map((l) => l.el.id));
  if (warm && warm.length === loads.length) {
    // Start from an earlier solution (e.g. the previous step of a discharge run); kept only when every
    // load lands on its upper operating point (above half its open-circuit voltage), where a cold
    // start ends too.
    const hot = newton(loads, voc, W, warm);
    if (hot && hot.v.every((v, j) => v > voc[j] / 2 && !(loads[j].el.v_min_V !== undefined && v < loads[j].el.v_min_V!))) return hot;
  }
  const first = newton(loads, voc, W, voc);
  if (first) return first;
  // Past the fold of P = v i there is no upper operating point; a load with v_min_V then settles on
  // its resistive branch, which Newton reaches from below v_min_V.
  if (loads.some((l) => l.el.v_min_V !== undefined)) {
    const start = voc.map((v, j) => (loads[j].el.v_min_V !== undefined ? loads[j].el.v_min_V! / 2 : v));
    const second = newton(loads, voc, W, start);
    if (second) return second;
  }
  return collapseError(ids);
}

function newton(loads: LoadColumn[], voc: Float64Array, W: Float64Array, start: Float64Array): { i: Float64Array; v: Float64Array; iterations: number } | null {
  const k = loads.length;
  const v = Float64Array.from(start);
  const i = new Float64Array(k);
  const F = new Float64Array(k);
  let scale = 1;
  for (let j = 0; j < k; j++) scale = Math.max(scale, Math.abs(voc[j]));
  const tol = 1e-11 * scale;
  const residual = (vv: Float64Array, out: Float64Array): number => {
    for (let j = 0; j < k; j++) i[j] = constantPowerCurrent(loads[j].el, vv[j]);
    let worst = 0;
    for (let r = 0; r < k; r++) {
      let s = vv[r] - voc[r];
      for (let c = 0; c < k; c++) s += W[r * k + c] * i[c];
      out[r] = s;
      worst = Math.max(worst, Math.abs(s));
    }
    return worst;
  };
  let norm = residual(v, F);
  const J = new Float64Array(k * k);
  const trial = new Float64Array(k);
  const Ft = new Float64Array(k);
  for (let it = 1; it <= MAX_NEWTON_ITERATIONS; it++) {
    if (norm <= tol) {
      residual(v, F);
      return { i, v, iterations: it };
    }
    for (let r = 0; r < k; r++) for (let c = 0; c < k; c++) J[r * k + c] = (r === c ? 1 : 0) + W[r * k + c] * constantPowerSlope(loads[c].el, v[c]);
    const step = denseSolve(J, F.map((x) => -x), k);
    if (!step) return null;
    let alpha = 1;
    let accepted = false;
    for (let h = 0; h < 40; h++, alpha /= 2) {
      let ok = true;
      for (let j = 0; j < k; j++) {
        trial[j] = v[j] + alpha * step[j];
        if (constantPowerCollapsed(loads[j].el, trial[j])) ok = false;
      }
      if (!ok) continue;
      const nt = residual(trial, Ft);
      if (nt < norm || nt <= tol) {
        v.set(trial);
        F.set(Ft);
        norm = nt;
        accepted = true;
        break;
      }
    }
    if (!accepted) return null;
  }
  return null;
}

/**
 * From the reduced solution parts to the full result: load Newton, node voltages, currents of the
 * eliminated sources by KCL along their trees. Returns the next modes when a charger must change mode.
 */
function finish(
  net: Network,
  topo: NetworkTopology,
  modes: ChargerModes,
  core: Core,
  y0: Float64Array,
  zLoads: (Float64Array | null)[],
  ends: Int32Array = core.ends,
  warm?: Float64Array,
): SolveOutcome | { nextModes: ChargerModes } {
  const { red, loads } = core;
  const k = loads.length;
  let y = y0;
  let iterations = 1;
  if (k > 0) {
    const voc = new Float64Array(k);
    const W = new Float64Array(k * k);
    for (let r = 0; r < k; r++) {
      voc[r] = loads[r].c + across(y0, loads[r].ra, loads[r].rb);
      for (let c = 0; c < k; c++) {
        const z = zLoads[c];
        W[r * k + c] = z ? across(z, loads[r].ra, loads[r].rb) : 0;
      }
    }
    const sol = solveLoads(loads, voc, W, warm);
    if (!('i' in sol)) return sol;
    iterations = sol.iterations;
    y = Float64Array.from(y0);
    for (let c = 0; c < k; c++) {
      const z = zLoads[c];
      const ic = sol.i[c];
      if (z && ic !== 0) for (let j = 0; j < y.length; j++) y[j] -= z[j] * ic;
    }
  }
  const n = topo.nodes.length;
  const V = new Float64Array(n);
  for (let i = 0; i < n; i++) V[i] = (red.rep[i] >= 0 ? y[red.rep[i]] : 0) + red.off[i];
  const idx = topo.index;
  const Vof = (node: string) => V[idx.get(node)!];

  // Current leaving each node into the elements that are not eliminated sources.
  const out = new Float64Array(n);
  const els = net.elements;
  const currents = new Float64Array(els.length);
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    const n1 = ends[2 * e];
    const n2 = ends[2 * e + 1];
    const v12 = V[n1] - V[n2];
    let I: number;
    let through: number; // from n1 into the element towards n2
    switch (el.kind) {
      case 'battery':
        I = (el.ocv_V - v12) / el.r_ohm;
        through = -I;
        break;
      case 'resistor':
      case 'load_resistor':
        I = through = v12 / el.r_ohm;
        break;
      case 'current_source':
        I = through = el.amps;
        break;
      case 'constant_power':
        I = through = constantPowerCurrent(el, v12);
        break;
      case 'voltage_source':
        if (isConstraintSource(modes, el)) continue;
        I = modes.get(el.id) === 'cc' ? el.i_max_A! : (el.volts - v12) / el.r_ohm!;
        through = -I;
        break;
    }
    currents[e] = I;
    out[n1] += through;
    out[n2] -= through;
  }
  for (const { node, el, parent } of red.tree) {
    // The source takes I from neg and delivers it at pos: outflow -I at pos, +I at neg.
    const posAtNode = ends[2 * el] === node;
    const I = posAtNode ? out[node] : -out[node];
    out[parent] += posAtNode ? I : -I;
    currents[el] = I;
  }
  if (modes.size) {
    const chargerIndex = new Map<string, number>();
    for (let e = 0; e < els.length; e++) if (modes.has(els[e].id)) chargerIndex.set(els[e].id, e);
    const next = nextModes(net, Vof, (id) => currents[chargerIndex.get(id)!], modes);
    if (next) return { nextModes: next };
  }
  return buildResultAt(net, topo, V, ends, currents, modes, iterations);
}

/** Analyses and factorizes a network (validating it first) and solves it once. */
export function prepareNetwork(net: Network): PreparedNetwork | SolveError {
  const checked = validateNetwork(net);
  if (!checked.ok) return checked;
  const topology = checked.topology;
  let modes = initialModes(net);
  const ends = checked.ends;
  let previous: Core | null = null;
  for (let pass = 0; pass < MAX_MODE_PASSES; pass++) {
    const core = buildCore(net, topology, modes, ends, previous);
    if ('ok' in core) return core;
    previous = core;
    const base = finish(net, topology, modes, core, core.y0, core.zLoads);
    if (!('nextModes' in base)) {
      return { network: net, topology, modes, base, core, stats: { unknowns: core.red.m, nnzL: core.factor?.nnzL ?? 0 } };
    }
    modes = base.nextModes;
  }
  return solveError('no_convergence', 'chargers kept switching between voltage and current limit', { elements: [...modes.keys()] });
}

/** Solves a network on the fast path. */
export function solveNetworkFast(net: Network): SolveOutcome {
  const prep = prepareNetwork(net);
  return 'ok' in prep ? prep : prep.base;
}

interface LowRankTerm {
  ra: number;
  rb: number;
  dg: number;
  /** Change of the effective Norton current (source current less g times the fixed offsets). */
  dJ: number;
}

/**
 * Solves the prepared network with changes applied, reusing its factorization: each change is a
 * rank-one update (Woodbury identity), costing one triangular solve pair. Falls back to a full solve
 * when a change moves a charger to another mode.
 */
export function solvePrepared(prep: PreparedNetwork, changes: NetworkChange[] = []): SolveOutcome {
  if (changes.length === 0) return prep.base;
  const changed = applyChanges(prep.network, changes);
  if ('ok' in changed) return changed;
  const { topology: topo, core, modes } = prep;
  const { red } = core;
  const terms: LowRankTerm[] = [];
  for (const ch of changes) {
    let a: string, b: string, dg: number, dJsrc: number;
    if (ch.kind === 'shunt') {
      for (const node of [ch.a, ch.b]) {
        if (!topo.index.has(node)) return solveError('unknown_node', `shunt '${ch.id}' refers to node '${node}', which is not in the network`, { nodes: [node] });
      }
      [a, b, dg, dJsrc] = [ch.a, ch.b, 1 / ch.r_ohm, 0];
    } else {
      const el = prep.network.elements.find((e) => e.id === ch.element)!;
      if (el.kind === 'battery') [a, b, dg, dJsrc] = [el.pos, el.neg, 1 / ch.r_ohm - 1 / el.r_ohm, -el.ocv_V / el.r_ohm];
      else if (el.kind === 'resistor' || el.kind === 'load_resistor') [a, b, dg, dJsrc] = [el.a, el.b, 1 / ch.r_ohm - 1 / el.r_ohm, 0];
      else return solveError('invalid_value', `element '${el.id}' cannot be shorted`, { elements: [el.id] });
    }
    const na = topo.index.get(a)!;
    const nb = topo.index.get(b)!;
    const ra = red.rep[na];
    const rb = red.rep[nb];
    if (ra === rb) continue; // inside one source tree: node voltages do not move
    terms.push({ ra, rb, dg, dJ: dJsrc - dg * (red.off[na] - red.off[nb]) });
  }
  let y0 = core.y0;
  let zLoads = core.zLoads;
  if (terms.length) {
    const factor = core.factor!;
    const m = red.m;
    const q = terms.length;
    const Z = terms.map((t) => factor.solve(unitColumn(m, t.ra, t.rb)));
    const M = new Float64Array(q * q);
    for (let s = 0; s < q; s++) for (let t = 0; t < q; t++) M[s * q + t] = (s === t ? 1 : 0) + terms[s].dg * across(Z[t], terms[s].ra, terms[s].rb);
    const correct = (x: Float64Array): Float64Array | null => {
      const h = new Float64Array(q);
      for (let s = 0; s < q; s++) h[s] = terms[s].dg * across(x, terms[s].ra, terms[s].rb);
      const z = denseSolve(M, h, q);
      if (!z) return null;
      const out = Float64Array.from(x);
      for (let t = 0; t < q; t++) {
        const zt = z[t];
        if (zt !== 0) {
          const col = Z[t];
          for (let j = 0; j < m; j++) out[j] -= col[j] * zt;
        }
      }
      return out;
    };
    const shifted = Float64Array.from(core.y0);
    terms.forEach((t, s) => {
      if (t.dJ !== 0) for (let j = 0; j < m; j++) shifted[j] += t.dJ * Z[s][j];
    });
    const yc = correct(shifted);
    if (!yc) return solveNetworkFast(changed);
    y0 = yc;
    const zc: (Float64Array | null)[] = [];
    for (const z of core.zLoads) {
      if (!z) zc.push(null);
      else {
        const c = correct(z);
        if (!c) return solveNetworkFast(changed);
        zc.push(c);
      }
    }
    zLoads = zc;
  }
  let ends = core.ends;
  if (changed.elements.length > prep.network.elements.length) {
    ends = new Int32Array(2 * changed.elements.length);
    ends.set(core.ends);
    for (let e = prep.network.elements.length; e < changed.elements.length; e++) {
      ends[2 * e] = topo.index.get(firstTerminal(changed.elements[e]))!;
      ends[2 * e + 1] = topo.index.get(secondTerminal(changed.elements[e]))!;
    }
  }
  const r = finish(changed, topo, modes, core, y0, zLoads, ends);
  return 'nextModes' in r ? solveNetworkFast(changed) : r;
}

/**
 * Solves the prepared network with new open-circuit voltages for some batteries (states of charge
 * stepped in a discharge run). The matrix does not change, so only the right-hand side is rebuilt and
 * solved (one triangular solve pair); the constant-power loads' Newton starts from the load voltages
 * of `previous` (an earlier step's result) when given. A charger that would change mode falls back to
 * a full solve of the changed network.
 */
export function solvePreparedEmf(prep: PreparedNetwork, ocv_V: ReadonlyMap<string, number>, previous?: SolveOutcome): SolveOutcome {
  const { network: net, topology: topo, core, modes } = prep;
  const elements = net.elements.slice();
  for (let e = 0; e < elements.length; e++) {
    const el = elements[e];
    const v = ocv_V.get(el.id);
    if (v === undefined) continue;
    if (el.kind !== 'battery') return solveError('invalid_value', `element '${el.id}' (${el.kind}) has no open-circuit voltage`, { elements: [el.id] });
    if (!Number.isFinite(v)) return solveError('invalid_value', `element '${el.id}': ocv_V must be a finite number (got ${v})`, { elements: [el.id] });
    elements[e] = { ...el, ocv_V: v };
  }
  const changed: Network = { ...net, elements };
  if (!core.factor) return solveNetworkFast(changed);
  const y0 = core.factor.solve(rightHandSide(changed, modes, core.ends, core.red));
  let warm: Float64Array | undefined;
  if (previous?.ok && core.loads.length) {
    warm = new Float64Array(core.loads.length);
    const V = previous.node_voltages_V;
    for (let j = 0; j < core.loads.length; j++) {
      const el = core.loads[j].el;
      warm[j] = (V[el.pos] ?? NaN) - (V[el.neg] ?? NaN);
    }
    if (!warm.every(Number.isFinite)) warm = undefined;
  }
  const r = finish(changed, topo, modes, core, y0, core.zLoads, core.ends, warm);
  return 'nextModes' in r ? solveNetworkFast(changed) : r;
}

/** Solves many variants of one prepared network (e.g. every battery shorted in turn). */
export function solveVariants(prep: PreparedNetwork, variants: NetworkChange[][]): SolveOutcome[] {
  return variants.map((changes) => solvePrepared(prep, changes));
}

/**
 * Lean linear re-solves on a prepared network's factorization, for sweeps over many one-change
 * variants (fault studies): only the currents of the watched elements, written into one reused buffer,
 * no result records, no Newton. The network is taken as linear: constant-power loads are left out,
 * chargers keep the modes of the prepared solution, and the elements picked by `omit` (current
 * sources only: they change the right-hand side, not the matrix) are left out as well.
 */
export interface LinearSweep {
  /** Node voltage of the unchanged linear network (0 for a node it does not have). */
  voltage(node: string): number;
  /**
   * Solves each variant (one change each) as a rank-one update and calls `visit` with the watched
   * elements' currents, in the order of `watch` (signs as in types.ts; a changed element reports its
   * current after the change). `changeCurrent` is the current through the change itself (a shunt's
   * current from a to b, or the shorted element's current). `currents` is reused between calls.
   */
  run(
    variants: readonly NetworkChange[],
    watch: readonly string[],
    visit: (variant: number, currents: Float64Array, changeCurrent: number) => void,
  ): SolveError | null;
}

const KIND_OPEN = 0; // no current (left out, or a load that is not linear)
const KIND_BATTERY = 1;
const KIND_RESISTOR = 2;
const KIND_FIXED = 3; // a fixed current: current source, charger in current limit

/** A lean linear sweep on a prepared network (see LinearSweep), or an error when the network has no
 * such linear form (an element picked by `omit` that is in the matrix). */
export function linearSweep(prep: PreparedNetwork, options: { omit?: (el: NetworkElement) => boolean } = {}): LinearSweep | SolveError {
  const { network: net, topology: topo, core, modes } = prep;
  const { red, ends } = core;
  const m = red.m;
  const els = net.elements;
  const factor = core.factor;
  const G = m; // ground slot: y[G] = 0
  const slot = (node: number) => (red.rep[node] >= 0 ? red.rep[node] : G);
  const y0 = new Float64Array(m + 1);
  y0.set(core.y0);
  // Left-out current sources: y0 -= K⁻¹ (their injection).
  if (options.omit) {
    let shift: Float64Array | null = null;
    for (let e = 0; e < els.length; e++) {
      const el = els[e];
      if (!options.omit(el)) continue;
      if (el.kind === 'constant_power') continue;
      if (el.kind !== 'current_source') return solveError('invalid_value', `element '${el.id}' (${el.kind}) is in the matrix and cannot be left out of a linear sweep`, { elements: [el.id] });
      shift ??= new Float64Array(m);
      const into = red.rep[ends[2 * e + 1]];
      const outOf = red.rep[ends[2 * e]];
      if (into >= 0) shift[into] += el.amps;
      if (outOf >= 0) shift[outOf] -= el.amps;
    }
    if (shift && factor) {
      const dy = factor.solve(shift);
      for (let j = 0; j < m; j++) y0[j] -= dy[j];
    }
  }
  // The sweep works in the factor's pivot order: slot k of a vector is unknown perm[k]; G stays last.
  const pinv = factor ? factor.pinv : new Int32Array(0);
  const pslot = (node: number) => (red.rep[node] >= 0 ? pinv[red.rep[node]] : G);
  const y0p = new Float64Array(m + 1);
  for (let j = 0; j < m; j++) y0p[pinv[j]] = y0[j];
  const omitted = (el: NetworkElement) => el.kind === 'constant_power' || (options.omit !== undefined && options.omit(el));
  const elementIndex = new Map<string, number>();
  for (let e = 0; e < els.length; e++) elementIndex.set(els[e].id, e);
  const volts = (node: number) => y0[slot(node)] + red.off[node];
  return {
    voltage(node) {
      const i = topo.index.get(node);
      return i === undefined ? 0 : volts(i);
    },
    run(variants, watch, visit) {
      const w = watch.length;
      const wa = new Int32Array(w);
      const wb = new Int32Array(w);
      const wc = new Float64Array(w); // fixed part of the voltage across: off[n1] - off[n2]
      const wg = new Float64Array(w);
      const wemf = new Float64Array(w); // battery EMF, or the fixed current
      const wkind = new Uint8Array(w);
      const wel = new Int32Array(w);
      for (let j = 0; j < w; j++) {
        const e = elementIndex.get(watch[j]);
        if (e === undefined) return solveError('unknown_element', `watched element '${watch[j]}' is not in the network`, { elements: [watch[j]] });
        const el = els[e];
        const n1 = ends[2 * e];
        const n2 = ends[2 * e + 1];
        wel[j] = e;
        wa[j] = pslot(n1);
        wb[j] = pslot(n2);
        wc[j] = red.off[n1] - red.off[n2];
        if (omitted(el)) wkind[j] = KIND_OPEN;
        else if (el.kind === 'battery') {
          wkind[j] = KIND_BATTERY;
          wg[j] = 1 / el.r_ohm;
          wemf[j] = el.ocv_V;
        } else if (el.kind === 'resistor' || el.kind === 'load_resistor') {
          wkind[j] = KIND_RESISTOR;
          wg[j] = 1 / el.r_ohm;
        } else if (el.kind === 'current_source') {
          wkind[j] = KIND_FIXED;
          wemf[j] = el.amps;
        } else if (el.kind === 'voltage_source' && modes.get(el.id) === 'cc') {
          wkind[j] = KIND_FIXED;
          wemf[j] = el.i_max_A!;
        } else if (el.kind === 'voltage_source' && el.r_ohm !== undefined) {
          wkind[j] = KIND_BATTERY;
          wg[j] = 1 / el.r_ohm;
          wemf[j] = el.volts;
        } else return solveError('invalid_value', `element '${el.id}' (an ideal source) cannot be watched in a linear sweep`, { elements: [el.id] });
      }
      const currents = new Float64Array(w);
      // Voltage across each watched element in the unchanged network; its current is linear in that
      // voltage: i = i0 + slope (v − v0).
      const v0 = new Float64Array(w);
      const i0 = new Float64Array(w);
      const slope = new Float64Array(w);
      const firstWatch = new Int32Array(els.length).fill(-1);
      const nextWatch = new Int32Array(w).fill(-1);
      for (let j = w - 1; j >= 0; j--) {
        v0[j] = y0p[wa[j]] - y0p[wb[j]] + wc[j];
        switch (wkind[j]) {
          case KIND_BATTERY:
            i0[j] = (wemf[j] - v0[j]) * wg[j];
            slope[j] = -wg[j];
            break;
          case KIND_RESISTOR:
            i0[j] = v0[j] * wg[j];
            slope[j] = wg[j];
            break;
          case KIND_FIXED:
            i0[j] = wemf[j];
            break;
        }
        nextWatch[j] = firstWatch[wel[j]];
        firstWatch[wel[j]] = j;
      }
      // Each variant as a rank-one change: its two nodes, its pivot slots, Δg, ΔJ and the new conductance.
      const nv = variants.length;
      const vna = new Int32Array(nv);
      const vnb = new Int32Array(nv);
      const vpa = new Int32Array(nv);
      const vpb = new Int32Array(nv);
      const vdg = new Float64Array(nv);
      const vdJ = new Float64Array(nv);
      const vg = new Float64Array(nv);
      const vchanged = new Int32Array(nv).fill(-1);
      for (let s = 0; s < nv; s++) {
        const ch = variants[s];
        if (!(Number.isFinite(ch.r_ohm) && ch.r_ohm > 0)) return solveError('invalid_value', `change ${ch.kind === 'shunt' ? `'${ch.id}'` : `to '${ch.element}'`}: r_ohm must be a finite number > 0`);
        const gNew = 1 / ch.r_ohm;
        let dg = gNew;
        let dJsrc = 0;
        if (ch.kind === 'shunt') {
          const ia = topo.index.get(ch.a);
          const ib = topo.index.get(ch.b);
          if (ia === undefined || ib === undefined) {
            const node = ia === undefined ? ch.a : ch.b;
            return solveError('unknown_node', `shunt '${ch.id}' refers to node '${node}', which is not in the network`, { nodes: [node] });
          }
          vna[s] = ia;
          vnb[s] = ib;
        } else {
          const e = elementIndex.get(ch.element);
          if (e === undefined) return solveError('unknown_element', `change refers to element '${ch.element}', which is not in the network`, { elements: [ch.element] });
          const el = els[e];
          if (omitted(el)) return solveError('invalid_value', `element '${el.id}' is left out of this sweep and cannot be shorted`, { elements: [el.id] });
          if (el.kind === 'battery') {
            dg = gNew - 1 / el.r_ohm;
            dJsrc = -el.ocv_V / el.r_ohm;
          } else if (el.kind === 'resistor' || el.kind === 'load_resistor') dg = gNew - 1 / el.r_ohm;
          else return solveError('invalid_value', `element '${el.id}' (${el.kind}) cannot be shorted: only batteries and resistors`, { elements: [el.id] });
          vna[s] = ends[2 * e];
          vnb[s] = ends[2 * e + 1];
          vchanged[s] = e;
        }
        vpa[s] = pslot(vna[s]);
        vpb[s] = pslot(vnb[s]);
        vdg[s] = dg;
        vdJ[s] = dJsrc - dg * (red.off[vna[s]] - red.off[vnb[s]]);
        vg[s] = gNew;
      }
      // Four variants per block solve (Sherman–Morrison each: y = y0 + α K⁻¹u, u = e_a − e_b).
      const Z = new Float64Array(4 * (m + 1));
      for (let s0 = 0; s0 < nv; s0 += 4) {
        Z.fill(0);
        let from = G;
        for (let r = 0; r < 4 && s0 + r < nv; r++) {
          const pa = vpa[s0 + r];
          const pb = vpb[s0 + r];
          if (pa === pb || !factor) continue;
          if (pa < G) Z[4 * pa + r] = 1;
          if (pb < G) Z[4 * pb + r] = -1;
          from = Math.min(from, pa, pb);
        }
        if (from < G) factor!.solvePermuted4(Z, from);
        for (let r = 0; r < 4 && s0 + r < nv; r++) {
          const s = s0 + r;
          const pa = vpa[s];
          const pb = vpb[s];
          const dg = vdg[s];
          const dJ = vdJ[s];
          const gNew = vg[s];
          const changed = vchanged[s];
          let alpha = 0;
          if (pa !== pb && factor) {
            const uz = Z[4 * pa + r] - Z[4 * pb + r];
            const den = 1 + dg * uz;
            if (!(Math.abs(den) > 1e-300) || !Number.isFinite(den)) return solveError('singular_network', `the network with change ${s + 1} is singular`);
            alpha = dJ - (dg * (y0p[pa] - y0p[pb] + dJ * uz)) / den;
          }
          for (let j = 0; j < w; j++) currents[j] = i0[j] + alpha * slope[j] * (Z[4 * wa[j] + r] - Z[4 * wb[j] + r]);
          // The changed element itself: its new conductance (a shorted battery has lost its EMF).
          for (let j = changed >= 0 ? firstWatch[changed] : -1; j >= 0; j = nextWatch[j]) {
            const v = v0[j] + alpha * (Z[4 * wa[j] + r] - Z[4 * wb[j] + r]);
            currents[j] = (els[changed].kind === 'battery' ? -v : v) * gNew;
          }
          const na = vna[s];
          const nb = vnb[s];
          const vChange = y0p[pa] - y0p[pb] + alpha * (Z[4 * pa + r] - Z[4 * pb + r]) + red.off[na] - red.off[nb];
          const changeCurrent = (changed >= 0 && els[changed].kind === 'battery' ? -vChange : vChange) * gNew;
          visit(s, currents, changeCurrent);
        }
      }
      return null;
    },
  };
}
