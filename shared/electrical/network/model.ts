/**
 * Element models shared by both solver paths: constant-power load law, charger modes, element currents
 * from node voltages, and the result (currents, losses, source and load power, notes).
 */
import type { Network, NetworkElement, SolveError, SolveResult } from './types';
import { conducts, findFloatingNodes, firstTerminal, floatingError, secondTerminal, solveError, type NetworkTopology } from './validate';

/** A current-limited voltage source (charger) is either holding its voltage or its current limit. */
export type ChargerMode = 'cv' | 'cc';
export type ChargerModes = Map<string, ChargerMode>;

type ConstantPower = Extract<NetworkElement, { kind: 'constant_power' }>;
type VoltageSource = Extract<NetworkElement, { kind: 'voltage_source' }>;

export const MAX_NEWTON_ITERATIONS = 100;
export const MAX_MODE_PASSES = 20;

/** Current drawn by a constant-power load at terminal voltage v: P / v, or the resistance it has at
 * v_min_V when v is below v_min_V (so the load law stays defined through collapse). */
export function constantPowerCurrent(el: ConstantPower, v: number): number {
  if (el.v_min_V !== undefined && v < el.v_min_V) return (el.watts * v) / (el.v_min_V * el.v_min_V);
  return el.watts / v;
}

/** dI/dV of the constant-power load law. */
export function constantPowerSlope(el: ConstantPower, v: number): number {
  if (el.v_min_V !== undefined && v < el.v_min_V) return el.watts / (el.v_min_V * el.v_min_V);
  return -el.watts / (v * v);
}

/** True when the load law is undefined at v (no v_min_V guard and a non-positive voltage). */
export function constantPowerCollapsed(el: ConstantPower, v: number): boolean {
  return el.v_min_V === undefined && el.watts !== 0 && !(v > 0);
}

export function collapseError(ids: string[]): SolveError {
  return solveError(
    'no_convergence',
    `constant-power ${ids.length === 1 ? 'load' : 'loads'} ${ids.map((i) => `'${i}'`).join(', ')}: the network cannot deliver the demanded power (voltage collapse); reduce the load, lower the path resistance or give v_min_V`,
    { elements: ids },
  );
}

export function initialModes(net: Network): ChargerModes {
  const modes: ChargerModes = new Map();
  for (const el of net.elements) if (el.kind === 'voltage_source' && el.i_max_A !== undefined) modes.set(el.id, 'cv');
  return modes;
}

export function modeOf(modes: ChargerModes, el: VoltageSource): ChargerMode {
  return modes.get(el.id) ?? 'cv';
}

/** Voltage sources solved as constraints: ideal (no r_ohm) and holding their voltage. */
export function isConstraintSource(modes: ChargerModes, el: NetworkElement): boolean {
  return el.kind === 'voltage_source' && el.r_ohm === undefined && modeOf(modes, el) === 'cv';
}

/** Node voltage lookup by name. */
export type VoltageOf = (node: string) => number;

/**
 * Current of an element from the node voltages (signs as in types.ts). Constraint sources are not
 * covered: their current comes from the solver.
 */
export function elementCurrent(el: NetworkElement, V: VoltageOf, modes: ChargerModes): number {
  switch (el.kind) {
    case 'battery':
      return (el.ocv_V - (V(el.pos) - V(el.neg))) / el.r_ohm;
    case 'resistor':
    case 'load_resistor':
      return (V(el.a) - V(el.b)) / el.r_ohm;
    case 'current_source':
      return el.amps;
    case 'constant_power':
      return constantPowerCurrent(el, V(el.pos) - V(el.neg));
    case 'voltage_source':
      if (modeOf(modes, el) === 'cc') return el.i_max_A!;
      if (el.r_ohm !== undefined) return (el.volts - (V(el.pos) - V(el.neg))) / el.r_ohm;
      throw new Error(`current of ideal source ${el.id} comes from the solver`);
  }
}

/**
 * The charger modes consistent with a solution, or null when the current modes already are.
 * CV holds while the delivered current is within i_max_A; CC holds while the terminal voltage stays at
 * or below the setpoint less the drop in the source's own resistance.
 */
export function nextModes(net: Network, V: VoltageOf, current: (id: string) => number, modes: ChargerModes): ChargerModes | null {
  let next: ChargerModes | null = null;
  for (const el of net.elements) {
    if (el.kind !== 'voltage_source' || el.i_max_A === undefined) continue;
    const mode = modeOf(modes, el);
    let want: ChargerMode = mode;
    if (mode === 'cv') {
      if (current(el.id) > el.i_max_A * (1 + 1e-12) + 1e-12) want = 'cc';
    } else {
      const vt = V(el.pos) - V(el.neg);
      const vLimit = el.volts - el.i_max_A * (el.r_ohm ?? 0);
      if (vt > vLimit + 1e-12 * (1 + Math.abs(el.volts))) want = 'cv';
    }
    if (want !== mode) {
      next ??= new Map(modes);
      next.set(el.id, want);
    }
  }
  return next;
}

/** Error for a singular system: the floating nodes with the present charger modes, when there are any. */
export function singularError(net: Network, topo: NetworkTopology, modes: ChargerModes, detail: string): SolveError {
  const floating = findFloatingNodes(net, topo, (el) => conducts(el) && !(el.kind === 'voltage_source' && modeOf(modes, el) === 'cc'));
  if (floating.length) {
    const err = floatingError(floating);
    err.error.message += ' (chargers in current limit carry no voltage)';
    return err;
  }
  return solveError('singular_network', `the network equations are singular: ${detail}`);
}

/**
 * Builds the result from node voltages (by topology index) and the constraint sources' currents.
 * Returns an error instead of any non-finite number.
 */
export function buildResult(
  net: Network,
  topo: NetworkTopology,
  voltages: ArrayLike<number>,
  constraintCurrents: Map<string, number>,
  modes: ChargerModes,
  iterations: number,
): SolveResult | SolveError {
  const index = topo.index;
  const V: VoltageOf = (n) => voltages[index.get(n)!];
  const els = net.elements;
  const ends = new Int32Array(2 * els.length);
  const currents = new Float64Array(els.length);
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    ends[2 * e] = index.get(firstTerminal(el))!;
    ends[2 * e + 1] = index.get(secondTerminal(el))!;
    currents[e] = isConstraintSource(modes, el) ? constraintCurrents.get(el.id)! : elementCurrent(el, V, modes);
  }
  return buildResultAt(net, topo, voltages, ends, currents, modes, iterations);
}

/**
 * The result records from node voltages (by topology index), each element's terminal indices
 * (ends[2e], ends[2e + 1]) and each element's current (signs as in types.ts). Returns an error instead
 * of any non-finite number.
 */
export function buildResultAt(
  net: Network,
  topo: NetworkTopology,
  voltages: ArrayLike<number>,
  ends: Int32Array,
  currents: ArrayLike<number>,
  modes: ChargerModes,
  iterations: number,
): SolveResult | SolveError {
  const nodes = topo.nodes;
  const node_voltages_V: Record<string, number> = {};
  for (let i = 0; i < nodes.length; i++) {
    const v = voltages[i];
    if (!Number.isFinite(v)) return singularError(net, topo, modes, `node '${nodes[i]}' has no finite voltage`);
    node_voltages_V[nodes[i]] = v;
  }
  const element_currents_A: Record<string, number> = {};
  const element_losses_W: Record<string, number> = {};
  const source_power_W: Record<string, number> = {};
  const load_power_W: Record<string, number> = {};
  const notes: SolveResult['notes'] = [];
  const els = net.elements;
  for (let e = 0; e < els.length; e++) {
    const el = els[e];
    const i = currents[e];
    if (!Number.isFinite(i)) return singularError(net, topo, modes, `element '${el.id}' has no finite current`);
    const id = el.id;
    element_currents_A[id] = i;
    switch (el.kind) {
      case 'battery':
        element_losses_W[id] = i * i * el.r_ohm;
        source_power_W[id] = el.ocv_V * i;
        break;
      case 'resistor':
      case 'load_resistor':
        element_losses_W[id] = i * i * el.r_ohm;
        break;
      case 'current_source':
        element_losses_W[id] = 0;
        source_power_W[id] = el.amps * (voltages[ends[2 * e + 1]] - voltages[ends[2 * e]]);
        break;
      case 'constant_power': {
        const v = voltages[ends[2 * e]] - voltages[ends[2 * e + 1]];
        element_losses_W[id] = 0;
        load_power_W[id] = v * i;
        if (el.v_min_V !== undefined && v < el.v_min_V) {
          notes.push({
            code: 'below_v_min',
            message: `constant-power load '${id}' is below v_min_V (${el.v_min_V} V): solved as the resistance it has at v_min_V, drawing ${(v * i).toPrecision(4)} W of ${el.watts} W`,
            elements: [id],
          });
        }
        break;
      }
      case 'voltage_source': {
        const r = el.r_ohm ?? 0;
        element_losses_W[id] = i * i * r;
        const cc = modeOf(modes, el) === 'cc';
        // Power of the ideal part: its setpoint in CV; in CC the voltage it actually holds.
        source_power_W[id] = (cc ? voltages[ends[2 * e]] - voltages[ends[2 * e + 1]] + i * r : el.volts) * i;
        if (cc) {
          notes.push({
            code: 'current_limit',
            message: `voltage source '${id}' is in current limit at ${el.i_max_A} A (below its ${el.volts} V setpoint)`,
            elements: [id],
          });
        }
        break;
      }
    }
  }
  return { ok: true, node_voltages_V, element_currents_A, element_losses_W, source_power_W, load_power_W, iterations, notes };
}
