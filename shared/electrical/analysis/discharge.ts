/**
 * Discharge over time: the loads as drawn (a constant-power inverter solved by the solver's Newton at
 * each step), chargers off. Each step integrates every battery's state of charge with its present
 * current (Coulomb counting; no Peukert correction), then moves its open-circuit voltage along its
 * chemistry's resting-voltage curve.
 *
 * Steps are adaptive and bounded: each step is as long as it takes the fastest-changing battery to move
 * `maxSocStep` (default 2 %), shortened so no battery passes its floor; at most `maxSteps` (default 200).
 * It stops when the first battery reaches its state-of-charge floor (default lithium 5 %, lead-acid 50 %
 * — common practice) or its cut-off voltage under load (the chemistry's cell cut-off × cells), or a
 * load's voltage falls below its own low-voltage cut-off.
 *
 * The network is prepared (ordered and factorized) once: a step changes only the batteries'
 * open-circuit voltages, i.e. the right-hand side, so each step is one triangular solve pair and a
 * Newton on the loads warm-started from the previous step (`solvePreparedEmf`).
 */
import { prepareNetwork, solvePreparedEmf } from '../network/fast';
import type { NetworkElement, SolveOutcome } from '../network/types';
import { batteryCells, type BatteryProps } from '../parts/battery';
import { CHEMISTRIES, cellOcv_V, socFromCellOcv } from '../tables/batteries';
import { type AnalysisContext, modeNetwork } from './context';
import type { DischargeOptions, DischargeResult, DischargeSample } from './types';

interface Cell {
  element: string;
  unit: string;
  props: BatteryProps;
  cells: number;
  soc: number;
  floor: number;
  cutoff_V: number;
  index: number;
}

export function dischargeAnalysis(ctx: AnalysisContext, opts: DischargeOptions = {}): DischargeResult {
  const maxSocStep = Math.min(0.5, Math.max(1e-4, opts.maxSocStep ?? 0.02));
  const maxSteps = Math.min(5000, Math.max(1, Math.floor(opts.maxSteps ?? 200)));
  const base = modeNetwork(ctx, 'load');
  const elements: NetworkElement[] = base.elements;
  const position = new Map(elements.map((e, i) => [e.id, i]));
  const prep = prepareNetwork(base);
  const cells: Cell[] = [];
  for (const u of ctx.units) {
    u.elements.forEach((id, i) => {
      const props = u.members[i];
      const n = batteryCells(props);
      const family = CHEMISTRIES[props.chemistry].family;
      const floor = family === 'lithium' ? opts.socFloor?.lithium ?? 0.05 : opts.socFloor?.lead_acid ?? 0.5;
      // A measured resting voltage wins over the stated SoC (as in the battery model).
      const soc = props.restingVoltage_V !== undefined ? socFromCellOcv(props.chemistry, props.restingVoltage_V / n) : props.soc;
      cells.push({ element: id, unit: u.id, props, cells: n, soc, floor, cutoff_V: CHEMISTRIES[props.chemistry].cellCutoff_V * n, index: position.get(id)! });
    });
  }
  const cellsOf = new Map<string, Cell[]>();
  for (const c of cells) {
    const list = cellsOf.get(c.unit);
    if (list) list.push(c);
    else cellsOf.set(c.unit, [c]);
  }
  const lowestSoc = (unit: string) => {
    let lo = Infinity;
    for (const c of cellsOf.get(unit) ?? []) lo = Math.min(lo, c.soc);
    return lo;
  };
  const nameplate_Ah = ctx.bankNominal_V > 0 ? ctx.units.reduce((s, u) => s + u.capacity_Ah * u.nominal_V, 0) / ctx.bankNominal_V : 0;
  const result = (samples: DischargeSample[], stoppedBy: DischargeResult['stoppedBy'], firstEmpty: string | null, steps: number): DischargeResult => {
    const delivered = ctx.units.reduce((s, u) => {
      const cs = cellsOf.get(u.id) ?? [];
      const drawn = Math.min(...cs.map((c) => (initialSoc.get(c.element)! - c.soc) * c.props.capacity_Ah));
      return s + drawn * u.nominal_V;
    }, 0);
    const usable_Ah = ctx.bankNominal_V > 0 ? delivered / ctx.bankNominal_V : 0;
    const last = samples[samples.length - 1];
    return {
      samples,
      firstEmpty,
      stoppedBy,
      duration_h: last ? last.t_h : 0,
      usable_Ah,
      nameplate_Ah,
      usable_pct: nameplate_Ah > 0 ? (usable_Ah / nameplate_Ah) * 100 : 0,
      steps,
    };
  };
  const initialSoc = new Map(cells.map((c) => [c.element, c.soc]));
  const sample = (t_h: number, I: Record<string, number>, V: Record<string, number>): DischargeSample => {
    const currents_A: Record<string, number> = {};
    const soc: Record<string, number> = {};
    for (const u of ctx.units) {
      currents_A[u.id] = I[u.elements[0]] ?? 0;
      soc[u.id] = lowestSoc(u.id);
    }
    const first = ctx.topo.loads[0];
    const n = first ? ctx.map.parts[first.id].nodes : null;
    return { t_h, currents_A, soc, loadVoltage_V: n ? (V[n.pos] ?? 0) - (V[n.neg] ?? 0) : 0 };
  };
  const samples: DischargeSample[] = [];
  let t = 0;
  if ('ok' in prep) return result(samples, 'solve_failed', null, 0);
  const ocv = new Map<string, number>();
  let previous: SolveOutcome | undefined;
  for (let step = 0; step <= maxSteps; step++) {
    for (const c of cells) ocv.set(c.element, cellOcv_V(c.props.chemistry, c.soc) * c.cells);
    const sol = solvePreparedEmf(prep, ocv, previous);
    previous = sol;
    if (!sol.ok) return result(samples, 'solve_failed', null, step);
    const I = sol.element_currents_A;
    const V = sol.node_voltages_V;
    samples.push(sample(t, I, V));
    // Cut-offs at this state.
    for (const c of cells) {
      const el = elements[c.index] as Extract<NetworkElement, { kind: 'battery' }>;
      const terminal = (V[el.pos] ?? 0) - (V[el.neg] ?? 0);
      if (c.soc <= c.floor + 1e-9) return result(samples, 'soc_floor', c.unit, step);
      if (terminal <= c.cutoff_V && (I[c.element] ?? 0) > 0) return result(samples, 'voltage_cutoff', c.unit, step);
    }
    for (const p of ctx.topo.loads) {
      const cutoff = p.type === 'inverter' ? p.props.cutoff_V : p.props.mode === 'power' ? p.props.cutoff_V : undefined;
      const n = ctx.map.parts[p.id].nodes;
      if (cutoff !== undefined && (V[n.pos] ?? 0) - (V[n.neg] ?? 0) <= cutoff) return result(samples, 'load_cutoff', null, step);
    }
    if (step === maxSteps) break;
    // Step length: the fastest battery moves maxSocStep, none passes its floor.
    let dt_h = Infinity;
    for (const c of cells) {
      const i = I[c.element] ?? 0;
      if (i <= 0) continue;
      const rate = i / c.props.capacity_Ah; // SoC per hour
      dt_h = Math.min(dt_h, maxSocStep / rate, Math.max(0, c.soc - c.floor) / rate);
    }
    if (!Number.isFinite(dt_h) || dt_h <= 0) return result(samples, 'no_load', null, step);
    for (const c of cells) {
      const i = I[c.element] ?? 0;
      c.soc = Math.min(1, Math.max(0, c.soc - (i * dt_h) / c.props.capacity_Ah));
      if (Math.abs(c.soc - c.floor) < 1e-9) c.soc = c.floor;
    }
    t += dt_h;
  }
  return result(samples, 'step_limit', null, maxSteps);
}
