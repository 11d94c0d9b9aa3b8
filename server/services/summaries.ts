/**
 * Results summaries for saved revisions, computed in the analysis worker pool (./analysis-pool.ts) so a
 * large diagram's analysis never blocks the server's request thread.
 */
import type { DiagramDocument } from '../../shared/diagram/schema';
import type { RevisionResultsSummary } from './results-summary';
import { analysisPool, type AnalysisPool } from './analysis-pool';

/** The results summary of a valid diagram document (503 busy / 504 analysis_timeout from the pool). */
export async function computeResultsSummary(doc: DiagramDocument, pool: AnalysisPool = analysisPool()): Promise<RevisionResultsSummary> {
  const outcome = await pool.run({ kind: 'summary', doc });
  if (outcome.kind !== 'summary') throw new Error(`unexpected analysis outcome ${outcome.kind}`);
  return outcome.summary;
}

/** Start the workers now (at server start), so the first save does not wait for the core to load. */
export function warmResultsSummaries(): void {
  analysisPool().warm();
}
