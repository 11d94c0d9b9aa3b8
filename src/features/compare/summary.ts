/**
 * Results summaries for the compare table. A saved revision carries the summary the server computed when
 * it was saved; a version that is not a revision (the working copy, or a save refused with 409) is
 * summarised here with the same shared definition (shared/diagram/summary.ts).
 *
 * Design-check figures, not an approval to install.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { ResultsSummary } from '@shared/diagram/diff';
import { summarizeResults } from '@shared/diagram/summary';
import type { StoredResultsSummary } from '@/features/revisions/api';

export function summarizeDocument(doc: DiagramDocument): StoredResultsSummary {
  return summarizeResults(doc);
}

/** The stored shape as the shared diff expects it (older rows may lack some figures). */
export function asResultsSummary(s: StoredResultsSummary): ResultsSummary {
  return {
    batteries: s.batteries ?? [],
    imbalance_pct: s.imbalance_pct ?? 0,
    ...(s.loadVoltage_V !== undefined ? { loadVoltage_V: s.loadVoltage_V } : {}),
    ...(s.drop_pct !== undefined ? { drop_pct: s.drop_pct } : {}),
    losses_W: s.losses_W ?? 0,
    findings: s.findings ?? [],
  };
}
