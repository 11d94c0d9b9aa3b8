/**
 * The analysis jobs the worker threads run (server/services/analysis-pool.ts), also runnable inline.
 * Both compile the diagram first and refuse a network above NETWORK_LIMITS.maxElements before solving:
 * the solve grows faster than linearly with the element count, so the count bounds a job's time.
 *
 * This module imports the whole electrical core; the request thread loads it only if the workers cannot
 * start (the pool imports it lazily), so the HTTP listener comes up without it.
 */
import { diagramSchema, type DiagramDocument } from '../../shared/electrical/document/schema';
import { compileDiagram } from '../../shared/electrical/compile';
import { type AnalysisMode, type FaultSelection } from '../../shared/electrical/analysis';
import { analyzeDiagram } from '../../shared/electrical/study';
import { summarizeResults, RESULTS_SUMMARY_VERSION, type RevisionResultsSummary } from './results-summary';
import { contentHash } from './content-hash';

/**
 * Largest compiled network (elements: batteries, internal resistances, cables, lugs, fuses, joints,
 * loads) the server analyses. A 40S×63P bank is about 5,400 elements and checks in under a second;
 * 60,000 keeps a check to tens of seconds on one core. Chosen here (a capacity limit, not an
 * electrical rule).
 */
export const NETWORK_LIMITS = { maxElements: 60_000 } as const;

export type AnalysisJob =
  | { kind: 'summary'; doc: DiagramDocument }
  /**
   * A revision about to be saved: `content` validated with the diagram schema (unless it comes from a
   * stored revision, `validate: false`), then its results summary, content hash and JSON text, all off
   * the request thread (a 2,000-part document costs tens of milliseconds for each). `validateOnly`: the
   * rest of the request was invalid, only the content's errors are wanted.
   */
  | { kind: 'revision'; content: unknown; validate: boolean; validateOnly?: boolean }
  /** `content` is untrusted: validated here with the diagram schema, off the request thread. */
  | { kind: 'check'; content: unknown; mode?: AnalysisMode; fault?: FaultSelection };

export type JobOutcome =
  | { kind: 'summary'; summary: RevisionResultsSummary }
  | { kind: 'revision'; summary: RevisionResultsSummary; contentHash: string; contentJson: string }
  /** A `validateOnly` revision job whose content is valid. */
  | { kind: 'valid' }
  /** The analysis result as JSON text (serialised in the worker, sent to the client as is). */
  | { kind: 'check'; json: string; elements: number }
  | { kind: 'too_large'; elements: number; limit: number }
  /** The content is not a valid diagram: zod issues as { "path.to.field": [messages] }. */
  | { kind: 'invalid'; fields: Record<string, string[]> };

function elementCount(doc: DiagramDocument): number | null {
  const compiled = compileDiagram(doc);
  return compiled.ok ? compiled.network.elements.length : null;
}

/** A summary saying the network was too large to analyse (the revision is still saved). */
function tooLargeSummary(elements: number): RevisionResultsSummary {
  return {
    summaryVersion: RESULTS_SUMMARY_VERSION,
    status: 'solve_failed',
    batteries: [],
    imbalance_pct: 0,
    losses_W: 0,
    findings: [],
    findingCounts: { error: 0, warning: 0, note: 0 },
    issues: [
      {
        code: 'network_too_large',
        message: `The compiled network has ${elements} elements, above the server's limit of ${NETWORK_LIMITS.maxElements}; it was not analysed.`,
        parts: [],
      },
    ],
  };
}

function summaryOf(doc: DiagramDocument): RevisionResultsSummary {
  const elements = elementCount(doc);
  return elements !== null && elements > NETWORK_LIMITS.maxElements ? tooLargeSummary(elements) : summarizeResults(doc);
}

/** The document validated with the diagram schema, or its first 50 issues as { "path.to.field": [messages] }. */
function validated(content: unknown): { doc: DiagramDocument } | { fields: Record<string, string[]> } {
  const parsed = diagramSchema.safeParse(content);
  if (parsed.success) return { doc: parsed.data };
  const fields: Record<string, string[]> = {};
  for (const issue of parsed.error.issues.slice(0, 50)) (fields[issue.path.map(String).join('.')] ??= []).push(issue.message);
  return { fields };
}

export function runAnalysisJob(job: AnalysisJob): JobOutcome {
  if (job.kind === 'summary') return { kind: 'summary', summary: summaryOf(job.doc) };
  if (job.kind === 'revision') {
    let doc = job.content as DiagramDocument;
    if (job.validate) {
      const v = validated(job.content);
      if ('fields' in v) return { kind: 'invalid', fields: v.fields };
      doc = v.doc;
    }
    if (job.validateOnly) return { kind: 'valid' };
    return { kind: 'revision', summary: summaryOf(doc), contentHash: contentHash(doc), contentJson: JSON.stringify(doc) };
  }
  const v = validated(job.content);
  if ('fields' in v) return { kind: 'invalid', fields: v.fields };
  const doc = v.doc;
  const elements = elementCount(doc);
  if (elements !== null && elements > NETWORK_LIMITS.maxElements) return { kind: 'too_large', elements, limit: NETWORK_LIMITS.maxElements };
  const result = analyzeDiagram(doc, { mode: job.mode ?? 'load', ...(job.fault ? { fault: job.fault } : {}) });
  return { kind: 'check', json: JSON.stringify(result), elements: elements ?? 0 };
}
