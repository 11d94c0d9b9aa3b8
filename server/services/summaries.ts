/**
 * Work on a revision's content done in the analysis worker pool (./analysis-pool.ts), so a large diagram
 * never blocks the server's request thread: its results summary, and for a save the whole preparation
 * (schema validation, summary, content hash, JSON text).
 */
import type { DiagramDocument } from '../../shared/electrical/document/schema';
import type { FieldErrors } from '../../shared/schemas/errors';
import type { RevisionResultsSummary } from './results-summary';
import { analysisPool, type AnalysisPool } from './analysis-pool';

/** The results summary of a valid diagram document (503 busy / 504 analysis_timeout from the pool). */
export async function computeResultsSummary(doc: DiagramDocument, pool: AnalysisPool = analysisPool()): Promise<RevisionResultsSummary> {
  const outcome = await pool.run({ kind: 'summary', doc });
  if (outcome.kind !== 'summary') throw new Error(`unexpected analysis outcome ${outcome.kind}`);
  return outcome.summary;
}

/** A revision's content ready to store: what the request thread needs, with no document work left on it. */
export interface PreparedRevision {
  /** The validated document (defaults filled in) as JSON text: stored as is and sent back as is. */
  contentJson: string;
  /** SHA-256 of its canonical JSON (./content-hash.ts). */
  contentHash: string;
  resultsSummary: RevisionResultsSummary;
}

/** Field errors of an invalid document, keyed as the API names them: under `content`. */
function underContent(fields: Record<string, string[]>): FieldErrors {
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [k ? `content.${k}` : 'content', v]));
}

/**
 * Validate (unless the content comes from a stored revision: `validate: false`), analyse, hash and
 * serialise a revision's content in a worker. An invalid document gives its field errors instead.
 */
export async function prepareRevision(
  content: unknown,
  opts: { validate: boolean },
  pool: AnalysisPool = analysisPool(),
): Promise<{ ok: true; revision: PreparedRevision } | { ok: false; fields: FieldErrors }> {
  const outcome = await pool.run({ kind: 'revision', content, validate: opts.validate });
  if (outcome.kind === 'invalid') return { ok: false, fields: underContent(outcome.fields) };
  if (outcome.kind !== 'revision') throw new Error(`unexpected analysis outcome ${outcome.kind}`);
  return { ok: true, revision: { contentJson: outcome.contentJson, contentHash: outcome.contentHash, resultsSummary: outcome.summary } };
}

/** Only the field errors of a revision's content (none: valid), for a request whose other fields are invalid. */
export async function revisionContentErrors(content: unknown, pool: AnalysisPool = analysisPool()): Promise<FieldErrors> {
  const outcome = await pool.run({ kind: 'revision', content, validate: true, validateOnly: true });
  if (outcome.kind === 'invalid') return underContent(outcome.fields);
  if (outcome.kind !== 'valid') throw new Error(`unexpected analysis outcome ${outcome.kind}`);
  return {};
}

/** Start the workers now (at server start), so the first save does not wait for the core to load. */
export function warmResultsSummaries(): void {
  analysisPool().warm();
}
