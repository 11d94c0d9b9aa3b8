/**
 * Results summaries for the compare table. A saved revision carries the summary the server computed when
 * it was saved; a version that is not a revision (the working copy, or a save refused with 409) is
 * summarised here with the same core (`analyzeDiagram`, load case) and the same definitions as the
 * server's stored summary: battery current and share of the bank current, imbalance, the worst load's
 * voltage and drop, wiring losses (cables, busbars, fuses, joints; not inside batteries or chargers).
 *
 * Design-check figures, not an approval to install.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { ResultsSummary } from '@shared/diagram/diff';
import { analyzeDiagram } from '@shared/electrical/analysis';
import type { StoredResultsSummary } from '@/features/revisions/api';

/** Rounded to 6 significant digits, as stored with revisions. */
const r6 = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(6)) : 0);

export function summarizeDocument(doc: DiagramDocument): StoredResultsSummary {
  const result = analyzeDiagram(doc, { mode: 'load' });
  const findings = result.findings.map((f, i) => ({ id: `${f.id}-${i + 1}`, rule: f.id, severity: f.severity, parts: f.parts, message: f.message }));
  if (!result.ok || !result.operating) {
    return {
      status: !result.ok && result.stage === 'compile' ? 'compile_failed' : 'solve_failed',
      batteries: [], imbalance_pct: 0, losses_W: 0, findings,
      issues: result.ok ? result.notes : result.errors,
    };
  }
  const op = result.operating;
  const labels = new Map(doc.parts.map((p) => [p.id, p.label || p.id]));
  const batteries = Object.entries(op.sources).map(([id, s]) => ({ id, label: labels.get(id) ?? id, current_A: r6(s.current_A), share: r6(s.share_pct / 100) }));
  let worst: { voltage_V: number; drop_pct?: number } | null = null;
  for (const f of Object.values(op.parts)) {
    if ((f.type === 'dc_load' || f.type === 'inverter') && f.voltage_V !== undefined && (!worst || f.voltage_V < worst.voltage_V)) worst = { voltage_V: f.voltage_V, drop_pct: f.drop_pct };
  }
  const { battery: _battery, charger: _charger, ...wiring } = op.losses.byKind;
  return {
    status: 'solved',
    batteries,
    imbalance_pct: r6(op.imbalance_pct),
    ...(worst ? { loadVoltage_V: r6(worst.voltage_V), ...(worst.drop_pct !== undefined ? { drop_pct: r6(worst.drop_pct) } : {}) } : {}),
    losses_W: r6(Object.values(wiring).reduce((x, y) => x + (y ?? 0), 0)),
    findings,
    issues: result.notes,
  };
}

/** The stored shape as the shared diff expects it (severity "info" is the rules' "note"). */
export function asResultsSummary(s: StoredResultsSummary): ResultsSummary {
  return {
    batteries: s.batteries ?? [],
    imbalance_pct: s.imbalance_pct ?? 0,
    ...(s.loadVoltage_V !== undefined ? { loadVoltage_V: s.loadVoltage_V } : {}),
    ...(s.drop_pct !== undefined ? { drop_pct: s.drop_pct } : {}),
    losses_W: s.losses_W ?? 0,
    findings: (s.findings ?? []).map((f) => ({ ...f, severity: f.severity === 'info' ? 'note' : f.severity })),
  };
}
