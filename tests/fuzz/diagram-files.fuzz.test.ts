/**
 * Fuzzing the diagram file path: generated and mutated documents (as values and as JSON text) through
 * parseDiagram, then compileDiagram and the solver when the document is valid.
 * Property: nothing throws; a rejection lists errors with a JSON path and a message; a compile error
 * has a code, a message and the parts involved; a solved network has only finite numbers.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDiagram, MAX_REPORTED_ISSUES } from '../../shared/diagram/parse';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate } from '../../shared/diagram/templates';
import { compileDiagram } from '../../shared/electrical/compile';
import { solveNetwork } from '../../shared/electrical/network/solve';
import { mutatedText, mutatedValue, numbersIn, scaled } from './mutate';

/** Runs per property; the totals are recorded in docs/reliability.md. */
export const DIAGRAM_RUNS = scaled({ valueMutations: 2500, textMutations: 1000, arbitrary: 500 });

const validDiagram = fc.oneof(
  fc.record({ count: fc.integer({ min: 1, max: 6 }), takeOff: fc.constantFrom('same-end' as const, 'diagonal' as const) }).map((o) => postToPostTemplate(o)),
  fc.integer({ min: 1, max: 6 }).map((count) => busbarBankTemplate({ count })),
  fc.record({ seriesCount: fc.integer({ min: 1, max: 4 }), parallelCount: fc.integer({ min: 1, max: 3 }) }).map((o) => seriesParallelTemplate(o)),
);

const COMPILE_CODES = new Set([
  'empty_diagram', 'no_source', 'floating_part', 'unconnected_terminal', 'shorted_source', 'reversed_polarity',
  'unequal_parallel_voltage', 'zero_resistance_loop', 'disconnected_circuit', 'invalid_value',
]);

export interface Outcome {
  stage: 'rejected' | 'compile_error' | 'solve_error' | 'solved';
}


/** The whole file path on one input; throws (failing the property) on any broken promise. */
export function checkDiagramInput(input: unknown): Outcome {
  const parsed = parseDiagram(input);
  if (!parsed.ok) {
    expect(parsed.errors.length).toBeGreaterThan(0);
    expect(parsed.errors.length).toBeLessThanOrEqual(MAX_REPORTED_ISSUES);
    expect(parsed.totalErrors).toBeGreaterThanOrEqual(parsed.errors.length);
    for (const e of parsed.errors) {
      expect(e.path).toMatch(/^\$/);
      expect(typeof e.message).toBe('string');
      expect(e.message.trim().length).toBeGreaterThan(0);
    }
    return { stage: 'rejected' };
  }
  const compiled = compileDiagram(parsed.doc);
  if (!compiled.ok) {
    expect(compiled.errors.length).toBeGreaterThan(0);
    for (const e of compiled.errors) {
      expect(COMPILE_CODES.has(e.code), `unknown compile code ${e.code}`).toBe(true);
      expect(e.message.trim().length).toBeGreaterThan(0);
      expect(Array.isArray(e.parts)).toBe(true);
    }
    return { stage: 'compile_error' };
  }
  for (const n of numbersIn(compiled.network)) expect(Number.isFinite(n.value), `network ${n.path} = ${n.value}`).toBe(true);
  const solved = solveNetwork(compiled.network);
  if (!solved.ok) {
    expect(solved.error.code).toMatch(/^[a-z_]+$/);
    expect(solved.error.message.trim().length).toBeGreaterThan(0);
    return { stage: 'solve_error' };
  }
  for (const n of numbersIn(solved)) expect(Number.isFinite(n.value), `result ${n.path} = ${n.value}`).toBe(true);
  return { stage: 'solved' };
}

const tally = () => ({ rejected: 0, compile_error: 0, solve_error: 0, solved: 0 });

describe('fuzz: diagram files', () => {
  it('refuses a busbar with an absurd tapCount with an error at its path, instead of throwing', () => {
    const doc = busbarBankTemplate({ count: 1 });
    (doc.parts.find((p) => p.type === 'busbar')!.props as { tapCount: number }).tapCount = 2e300;
    const parsed = parseDiagram(doc);
    expect(parsed.ok).toBe(false);
  });

  it('valid templates compile and solve (the seeds the mutations start from)', () => {
    fc.assert(fc.property(validDiagram, (doc) => {
      expect(checkDiagramInput(doc).stage).toBe('solved');
    }), { numRuns: 60 });
  });

  it(`${DIAGRAM_RUNS.valueMutations} structurally mutated documents: no throw, clear errors, finite results`, () => {
    const seen = tally();
    fc.assert(
      fc.property(mutatedValue(validDiagram), (doc) => {
        seen[checkDiagramInput(doc).stage]++;
      }),
      { numRuns: DIAGRAM_RUNS.valueMutations },
    );
    // The mutations reach every stage: some documents are refused, some still solve.
    expect(seen.rejected).toBeGreaterThan(0);
    expect(seen.solved).toBeGreaterThan(0);
    expect(({} as { polluted?: unknown }).polluted).toBeUndefined();
  });

  it(`${DIAGRAM_RUNS.textMutations} damaged JSON texts: no throw, clear errors`, () => {
    const seen = tally();
    fc.assert(
      fc.property(mutatedText(validDiagram), (text) => {
        seen[checkDiagramInput(text).stage]++;
      }),
      { numRuns: DIAGRAM_RUNS.textMutations },
    );
    expect(seen.rejected).toBeGreaterThan(0);
  });

  it(`${DIAGRAM_RUNS.arbitrary} arbitrary values and strings: refused with a path and a message`, () => {
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue(), fc.string(), fc.anything()), (v) => {
        checkDiagramInput(v);
      }),
      { numRuns: DIAGRAM_RUNS.arbitrary },
    );
  });
});
