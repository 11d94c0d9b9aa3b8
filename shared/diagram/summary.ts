/**
 * The results summary a revision stores beside its content, and the compare view computes for a version
 * that is not a revision (the working copy, or a save refused with 409): each battery's share of the bank
 * current, the imbalance, the wiring losses, the worst load's voltage and drop, and the rule findings
 * with counts by severity. One definition for server and client, computed with the shared core
 * (`analyzeDiagram`, load case). The shape is `ResultsSummary` (./diff.ts) plus `status`,
 * `findingCounts` and `issues`.
 *
 * These are design-check figures, not an approval to install.
 */
import type { ResultsSummary } from './diff';
import type { DiagramDocument } from '../electrical/document/schema';
import { analyzeDiagram } from '../electrical/study';
import type { Severity } from '../electrical/analysis';

/**
 * 2: `losses_W` is the core's wiring loss (`losses.wiring_W`); version 1 also counted a resistive load's
 * own power and anything else outside batteries and chargers. Summaries stored at version 1 keep their figure.
 */
export const RESULTS_SUMMARY_VERSION = 2;

export interface RevisionResultsSummary extends ResultsSummary {
  summaryVersion: number;
  /** 'solved': the load case was solved; otherwise the stage that failed (figures are then empty / 0). */
  status: 'solved' | 'compile_failed' | 'solve_failed';
  findingCounts: Record<Severity, number>;
  /** Compiler or solver errors when not solved, and analysis notes. */
  issues: { code: string; message: string; parts: string[] }[];
}

/** Rounded to 6 significant digits: the summary is for display and comparison, not further solving. */
const r6 = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(6)) : 0);

export function summarizeResults(doc: DiagramDocument): RevisionResultsSummary {
  const result = analyzeDiagram(doc, { mode: 'load' });
  const findings = result.findings.map((f, i) => ({ id: `${f.id}-${i + 1}`, rule: f.id, severity: f.severity, parts: f.parts, message: f.message }));
  const findingCounts: Record<Severity, number> = { error: 0, warning: 0, note: 0 };
  for (const f of findings) findingCounts[f.severity] += 1;
  const base = { summaryVersion: RESULTS_SUMMARY_VERSION, findings, findingCounts };

  if (!result.ok || !result.operating) {
    return {
      ...base,
      status: !result.ok && result.stage === 'compile' ? 'compile_failed' : 'solve_failed',
      batteries: [],
      imbalance_pct: 0,
      losses_W: 0,
      issues: result.ok ? result.notes : result.errors,
    };
  }
  const op = result.operating;
  const labels = new Map(doc.parts.map((p) => [p.id, p.label || p.id]));
  const batteries = Object.entries(op.sources).map(([id, s]) => ({ id, label: labels.get(id) ?? id, current_A: r6(s.current_A), share: r6(s.share_pct / 100) }));
  // The worst-placed load: lowest voltage at its terminals.
  let worst: { voltage_V: number; drop_pct?: number } | null = null;
  for (const f of Object.values(op.parts)) {
    if ((f.type === 'dc_load' || f.type === 'inverter') && f.voltage_V !== undefined && (!worst || f.voltage_V < worst.voltage_V)) worst = { voltage_V: f.voltage_V, drop_pct: f.drop_pct };
  }
  return {
    ...base,
    status: 'solved',
    batteries,
    imbalance_pct: r6(op.imbalance_pct),
    ...(worst ? { loadVoltage_V: r6(worst.voltage_V), ...(worst.drop_pct !== undefined ? { drop_pct: r6(worst.drop_pct) } : {}) } : {}),
    // The wiring loss as the core defines it (conductors, joints, fuses, busbars, switches, shunts).
    losses_W: r6(op.losses.wiring_W),
    issues: result.notes,
  };
}
