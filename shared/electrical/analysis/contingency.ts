/**
 * N-1 study: the load case with one bank unit (a battery, or a series string) disconnected at a time —
 * its BMS or its fuse open — and the rest of the bank carrying the load. A bank in parallel is expected
 * to keep working with any one battery's BMS open (common practice); the currents of the others then
 * rise, and their fuses, cables and continuous limits must still hold.
 *
 * Each case re-uses the load case's prepared network: the disconnected unit's battery element loses its
 * EMF and its internal resistance becomes the open-switch leakage (10 MΩ, as an open switch is modelled),
 * a rank-one change solved on the same factorization (`solvePrepared`); the constant-power loads are
 * solved again by Newton on top of it, so the remaining units carry the full load. Opening one member of
 * a series string opens the whole string (one current flows through every member).
 *
 * Only units that span the bank's voltage are studied (nominal at least 75 % of the bank's, as the
 * reference voltage is chosen in operating.ts): batteries wired in series as separate parts are not
 * alternatives to each other, and with one of them open the bank carries nothing.
 */
import { internalShort } from '../network/changes';
import { solvePrepared, type PreparedNetwork } from '../network/fast';
import { OPEN_SWITCH_OHM } from '../parts/passive';
import type { AnalysisContext, SourceUnit } from './context';
import type { AnalysisIssue } from './types';

/** One case: `unit` disconnected. */
export type ContingencyCase =
  | {
      ok: true;
      /** The disconnected unit (battery or series-string part id). */
      unit: string;
      /** Every other unit's current, A (positive discharging). */
      sources: Record<string, number>;
      /** Every fuse's current, A (signed, positive from terminal a to b). */
      fuses: Record<string, number>;
      /** Every cable's current, A (signed, positive from its `from` end to its `to` end; 0 for a merged zero-length joint). */
      cables: Record<string, number>;
      /** Loads that fell below their low-voltage cut-off in this case (part ids). */
      loadsBelowCutoff: string[];
    }
  | { ok: false; unit: string; error: AnalysisIssue };

export interface ContingencyStudy {
  /** One case per unit that spans the bank voltage, in document order. */
  cases: ContingencyCase[];
}

/** Units that can stand in for each other: those spanning at least 75 % of the bank's nominal voltage. */
export function parallelUnits(ctx: AnalysisContext): SourceUnit[] {
  const vBank = ctx.bankNominal_V > 0 ? ctx.bankNominal_V : ctx.settings.systemVoltage_V;
  return ctx.units.filter((u) => u.nominal_V >= 0.75 * vBank);
}

/** Finite or zero: results never carry NaN. */
const fin = (x: number) => (Number.isFinite(x) ? x : 0);

function issueOf(ctx: AnalysisContext, unit: string, error: { code: string; message: string; elements?: string[] }): AnalysisIssue {
  const parts = new Set<string>([unit]);
  for (const e of error.elements ?? []) {
    const owner = ctx.map.elementOwner[e];
    if (owner) parts.add(owner.id);
  }
  return { code: error.code, message: error.message, parts: [...parts] };
}

/**
 * The N-1 cases of the load case. `loadCase` is the load case's prepared network (loads as drawn,
 * chargers off) and must have solved. Null with fewer than two units that span the bank voltage.
 */
export function contingencyStudy(ctx: AnalysisContext, loadCase: PreparedNetwork): ContingencyStudy | null {
  if (!loadCase.base.ok) return null;
  const units = parallelUnits(ctx);
  if (units.length < 2) return null;
  const inNetwork = new Set(loadCase.network.elements.map((e) => e.id));
  const fuseElements = ctx.topo.fuses.map((f) => ({ id: f.id, el: ctx.map.parts[f.id]?.elements[0] })).filter((f) => f.el !== undefined && inNetwork.has(f.el));
  const loadOf = new Map<string, string>();
  for (const p of ctx.topo.loads) for (const e of ctx.map.parts[p.id]?.elements ?? []) loadOf.set(e, p.id);

  const cases: ContingencyCase[] = [];
  for (const u of units) {
    const el = u.elements[0];
    if (el === undefined || !inNetwork.has(el)) continue;
    const sol = solvePrepared(loadCase, [internalShort(el, OPEN_SWITCH_OHM)]);
    if (!sol.ok) {
      cases.push({ ok: false, unit: u.id, error: issueOf(ctx, u.id, sol.error) });
      continue;
    }
    const I = sol.element_currents_A;
    const sources: Record<string, number> = {};
    for (const other of ctx.units) if (other.id !== u.id) sources[other.id] = fin(I[other.elements[0]] ?? 0);
    const fuses: Record<string, number> = {};
    for (const f of fuseElements) fuses[f.id] = fin(I[f.el!] ?? 0);
    const cables: Record<string, number> = {};
    for (const c of ctx.doc.cables) if (ctx.map.cables[c.id]) cables[c.id] = fin(I[c.id] ?? 0);
    const below = new Set<string>();
    for (const n of sol.notes) if (n.code === 'below_v_min') for (const e of n.elements) if (loadOf.has(e)) below.add(loadOf.get(e)!);
    cases.push({ ok: true, unit: u.id, sources, fuses, cables, loadsBelowCutoff: [...below] });
  }
  return { cases };
}
