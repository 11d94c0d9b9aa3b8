/**
 * POST /api/diagrams/:id/check: the electrical analysis of a diagram (shared/electrical/analysis
 * `analyzeDiagram`), run in the analysis worker pool. The content (sent, or the stored working copy) is
 * validated with the diagram schema in the worker, and a compiled network above the element limit is
 * refused before it is solved. Nothing is stored.
 */
import type { CheckMode } from '../../shared/schemas/diagrams';
import type { FaultSelection } from '../../shared/electrical/analysis/types';
import { invalidFields, tooLarge, unprocessable } from './errors';
import type { AnalysisPool } from './analysis-pool';

export interface CheckOutcome {
  /** The analysis result as JSON text (serialised in the worker). */
  analysisJson: string;
  elements: number;
}

export async function checkDiagram(
  pool: AnalysisPool,
  input: { content: unknown; source: 'request' | 'working_copy'; mode: CheckMode; fault?: FaultSelection },
): Promise<CheckOutcome> {
  const outcome = await pool.run({ kind: 'check', content: input.content, mode: input.mode, ...(input.fault ? { fault: input.fault } : {}) });
  switch (outcome.kind) {
    case 'check':
      return { analysisJson: outcome.json, elements: outcome.elements };
    case 'too_large':
      throw tooLarge(
        'network_too_large',
        `This diagram compiles to ${outcome.elements.toLocaleString('en-US')} network elements; the server checks at most ${outcome.limit.toLocaleString('en-US')}. Split the bank into smaller diagrams.`,
        { elements: outcome.elements, limit: outcome.limit },
      );
    case 'invalid': {
      if (input.source === 'working_copy') {
        throw unprocessable('invalid_working_copy', 'The saved working copy is not a valid diagram; open it in the editor and save it again, or send content to check.', {
          fields: outcome.fields,
        });
      }
      const fields = Object.fromEntries(Object.entries(outcome.fields).map(([k, v]) => [k ? `content.${k}` : 'content', v]));
      throw invalidFields(fields);
    }
    default:
      throw new Error(`unexpected analysis outcome ${outcome.kind}`);
  }
}
