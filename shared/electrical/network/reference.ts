/**
 * Reference solver: plain modified nodal analysis on mathjs sparse matrices (LU with partial pivoting).
 * Unknowns are the voltages of every node but ground plus the current of every ideal voltage source
 * holding its voltage. Constant-power loads are linearised (Newton companion model: a conductance dI/dV
 * in parallel with a current source) and the system is re-solved until the voltages settle. Chargers
 * start in CV and switch modes until the solution is consistent.
 *
 * It is written for clarity, not speed; the fast path (fast.ts) is checked against it.
 */
import { create, lusolveDependencies, sluDependencies, SparseMatrixDependencies, type Matrix } from 'mathjs';
import type { Network, NetworkElement, SolveOutcome } from './types';
import {
  MAX_MODE_PASSES,
  MAX_NEWTON_ITERATIONS,
  buildResult,
  collapseError,
  constantPowerCollapsed,
  constantPowerCurrent,
  constantPowerSlope,
  initialModes,
  isConstraintSource,
  modeOf,
  nextModes,
  singularError,
  type ChargerModes,
} from './model';
import { solveError, validateNetwork, type NetworkTopology } from './validate';

// Created on first use, so a bundle that never calls the reference path can drop mathjs.
let mathInstance: ReturnType<typeof createMath> | null = null;
const createMath = () => create({ lusolveDependencies, sluDependencies, SparseMatrixDependencies });
const mathjs = () => (mathInstance ??= createMath());

type Triplets = Map<number, Map<number, number>>; // column -> row -> value

function add(t: Triplets, row: number, col: number, v: number) {
  if (row < 0 || col < 0) return; // ground row/column
  let c = t.get(col);
  if (!c) t.set(col, (c = new Map()));
  c.set(row, (c.get(row) ?? 0) + v);
}

function toSparse(t: Triplets, size: number) {
  const values: number[] = [];
  const index: number[] = [];
  const ptr: number[] = [0];
  for (let c = 0; c < size; c++) {
    const col = t.get(c);
    if (col) {
      for (const r of [...col.keys()].sort((x, y) => x - y)) {
        index.push(r);
        values.push(col.get(r)!);
      }
    }
    ptr.push(index.length);
  }
  // The SparseMatrix constructor accepts CSC data ({ values, index, ptr, size }); its typings do not say so.
  const Sparse = (mathjs() as unknown as { SparseMatrix: new (data: object) => Matrix }).SparseMatrix;
  return new Sparse({ values, index, ptr, size: [size, size] });
}

interface LinearSolution {
  V: Float64Array;
  constraintCurrents: Map<string, number>;
}

/** One linear MNA solve with every constant-power load replaced by its companion model at `vCp`. */
function solveLinear(
  net: Network,
  topo: NetworkTopology,
  modes: ChargerModes,
  vCp: Map<string, number> | null,
): LinearSolution | 'singular' {
  const n = topo.nodes.length;
  const row = (node: string) => topo.index.get(node)! - 1; // ground is -1
  const constraints = net.elements.filter((el) => isConstraintSource(modes, el)) as Extract<NetworkElement, { kind: 'voltage_source' }>[];
  const size = n - 1 + constraints.length;
  const A: Triplets = new Map();
  const b = new Array<number>(size).fill(0);
  const conductance = (x: string, y: string, g: number) => {
    const i = row(x);
    const j = row(y);
    add(A, i, i, g);
    add(A, j, j, g);
    add(A, i, j, -g);
    add(A, j, i, -g);
  };
  // Current `amps` driven into node `into` and out of node `outOf`.
  const inject = (into: string, outOf: string, amps: number) => {
    if (row(into) >= 0) b[row(into)] += amps;
    if (row(outOf) >= 0) b[row(outOf)] -= amps;
  };
  const stamp = (el: NetworkElement) => {
    switch (el.kind) {
      case 'battery':
        conductance(el.pos, el.neg, 1 / el.r_ohm);
        inject(el.pos, el.neg, el.ocv_V / el.r_ohm);
        return;
      case 'resistor':
      case 'load_resistor':
        conductance(el.a, el.b, 1 / el.r_ohm);
        return;
      case 'current_source':
        inject(el.to, el.from, el.amps);
        return;
      case 'constant_power': {
        if (!vCp) return; // open while the first estimate is found
        const v0 = vCp.get(el.id)!;
        const i0 = constantPowerCurrent(el, v0);
        const g = constantPowerSlope(el, v0);
        conductance(el.pos, el.neg, g);
        inject(el.neg, el.pos, i0 - g * v0); // draws i0 + g (v - v0) from pos to neg
        return;
      }
      case 'voltage_source':
        if (modeOf(modes, el) === 'cc') inject(el.pos, el.neg, el.i_max_A!);
        else if (el.r_ohm !== undefined) {
          conductance(el.pos, el.neg, 1 / el.r_ohm);
          inject(el.pos, el.neg, el.volts / el.r_ohm);
        }
        return;
    }
  };
  for (const el of net.elements) stamp(el);
  constraints.forEach((el, k) => {
    const col = n - 1 + k;
    add(A, row(el.pos), col, -1); // the source's current enters the network at pos
    add(A, row(el.neg), col, 1);
    add(A, col, row(el.pos), 1);
    add(A, col, row(el.neg), -1);
    b[col] = el.volts;
  });

  const V = new Float64Array(n);
  const constraintCurrents = new Map<string, number>();
  if (size > 0) {
    let x: number[];
    try {
      const math = mathjs();
      const lu = math.slu(toSparse(A, size), 1, 1);
      x = (math.lusolve(lu, b).valueOf() as number[][]).map((r) => r[0]);
    } catch {
      return 'singular';
    }
    for (let i = 1; i < n; i++) V[i] = x[i - 1];
    constraints.forEach((el, k) => constraintCurrents.set(el.id, x[n - 1 + k]));
  }
  for (const v of V) if (!Number.isFinite(v)) return 'singular';
  return { V, constraintCurrents };
}

/** Reference solve of a network (mathjs). Same result shape and errors as solveNetwork. */
export function solveNetworkReference(net: Network): SolveOutcome {
  const checked = validateNetwork(net);
  if (!checked.ok) return checked;
  const topo = checked.topology;
  const cpLoads = net.elements.filter((el) => el.kind === 'constant_power');
  let modes = initialModes(net);
  for (let pass = 0; pass < MAX_MODE_PASSES; pass++) {
    let sol = solveLinear(net, topo, modes, null);
    if (sol === 'singular') return singularError(net, topo, modes, 'LU factorization failed');
    let iterations = 1;
    const vAcross = (s: LinearSolution, el: NetworkElement & { pos: string; neg: string }) =>
      s.V[topo.index.get(el.pos)!] - s.V[topo.index.get(el.neg)!];
    if (cpLoads.length) {
      // First from the voltages the network gives with the loads open (the upper operating point).
      // Past the fold of P = v i there is none; a load with v_min_V then settles on its resistive
      // branch, which Newton reaches from below v_min_V, so a second start is taken from there.
      const open = sol;
      const starts = [new Map(cpLoads.map((el) => [el.id, vAcross(open, el as never)]))];
      if (cpLoads.some((el) => (el as { v_min_V?: number }).v_min_V !== undefined)) {
        starts.push(
          new Map(cpLoads.map((el) => {
            const vMin = (el as { v_min_V?: number }).v_min_V;
            return [el.id, vMin !== undefined ? vMin / 2 : vAcross(open, el as never)];
          })),
        );
      }
      let found: { sol: LinearSolution; iterations: number } | null = null;
      for (const start of starts) {
        const attempt = newtonFrom(net, topo, modes, cpLoads, open, start, vAcross);
        if (Array.isArray(attempt)) {
          if (start === starts[0]) return collapseError(attempt);
          continue;
        }
        if (attempt) {
          found = attempt;
          break;
        }
      }
      if (!found) return collapseError(cpLoads.map((el) => el.id));
      sol = found.sol;
      iterations = found.iterations;
    }
    const s = sol;
    const V = (node: string) => s.V[topo.index.get(node)!];
    const changed = nextModes(net, V, (id) => s.constraintCurrents.get(id) ?? currentOfNonConstraint(net, id, V, modes), modes);
    if (!changed) return buildResult(net, topo, s.V, s.constraintCurrents, modes, iterations);
    modes = changed;
  }
  return solveError('no_convergence', 'chargers kept switching between voltage and current limit', {
    elements: [...modes.keys()],
  });
}

/**
 * Newton on the full MNA system from a starting guess of the loads' voltages: each pass re-stamps the
 * loads' companion models and re-solves until the node voltages and the loads' currents settle. Returns the solution, the ids
 * of loads whose law is undefined at a first guess (collapse), or null when it does not settle.
 */
function newtonFrom(
  net: Network,
  topo: NetworkTopology,
  modes: ChargerModes,
  cpLoads: NetworkElement[],
  open: LinearSolution,
  start: Map<string, number>,
  vAcross: (s: LinearSolution, el: never) => number,
): { sol: LinearSolution; iterations: number } | string[] | null {
  let sol = open;
  let vCp = start;
  for (let iterations = 1; iterations <= MAX_NEWTON_ITERATIONS; iterations++) {
    const collapsed = cpLoads.filter((el) => constantPowerCollapsed(el as never, vCp.get(el.id)!));
    if (collapsed.length) return collapsed.map((el) => el.id);
    const next = solveLinear(net, topo, modes, vCp);
    if (next === 'singular') return null;
    let step = 0;
    let scale = 1;
    for (let i = 0; i < next.V.length; i++) {
      step = Math.max(step, Math.abs(next.V[i] - sol.V[i]));
      scale = Math.max(scale, Math.abs(next.V[i]));
    }
    sol = next;
    const vNext = new Map(cpLoads.map((el) => [el.id, vAcross(next, el as never)]));
    // Settled when the voltages stop moving and so do the loads' currents: near zero volts the
    // companion conductance (-P / v²) is so large that v barely moves while P / v is still far off.
    let currentsSettled = true;
    for (const el of cpLoads) {
      const before = constantPowerCurrent(el as never, vCp.get(el.id)!);
      const after = constantPowerCurrent(el as never, vNext.get(el.id)!);
      if (!(Math.abs(after - before) <= 1e-9 * Math.max(1, Math.abs(after)))) currentsSettled = false;
    }
    vCp = vNext;
    if (step <= 1e-10 * scale && currentsSettled) return { sol, iterations };
  }
  return null;
}

function currentOfNonConstraint(net: Network, id: string, V: (n: string) => number, modes: ChargerModes): number {
  const el = net.elements.find((e) => e.id === id)!;
  if (el.kind !== 'voltage_source') return NaN;
  if (modeOf(modes, el) === 'cc') return el.i_max_A!;
  return (el.volts - (V(el.pos) - V(el.neg))) / el.r_ohm!;
}
