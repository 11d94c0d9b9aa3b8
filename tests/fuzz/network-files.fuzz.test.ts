/**
 * Fuzzing the network file path (`npm run solve`): generated and mutated networks, as values and as JSON
 * text, through parseNetwork / parseNetworkJson and then the solver.
 * Property: nothing throws; a refusal is a structured error (known code, message, element and node lists
 * when given); a solution holds only finite numbers (no NaN, no Infinity).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseNetwork, parseNetworkJson } from '../../shared/electrical/network/parse';
import { solveNetwork } from '../../shared/electrical/network/solve';
import type { SolveError } from '../../shared/electrical/network/types';
import { arbitraryNetwork } from '../electrical/network/arbitrary';
import { mutatedText, mutatedValue, numbersIn, scaled } from './mutate';

export const NETWORK_RUNS = scaled({ valueMutations: 5000, textMutations: 2000, arbitrary: 500 });

// The codes of SolveErrorCode (shared/electrical/network/types.ts), written out.
const CODES = new Set([
  'malformed_network', 'unknown_node', 'unknown_element', 'duplicate_id', 'invalid_value', 'floating_node',
  'singular_network', 'zero_resistance_loop', 'no_convergence',
]);

const seeds = fc.oneof(arbitraryNetwork({ sources: true, constantPower: true }), arbitraryNetwork({ maxNodes: 4 }));

function expectStructured(e: SolveError) {
  expect(e.ok).toBe(false);
  expect(CODES.has(e.error.code), `unknown code ${e.error.code}`).toBe(true);
  expect(typeof e.error.message).toBe('string');
  expect(e.error.message.trim().length).toBeGreaterThan(0);
  for (const list of [e.error.elements, e.error.nodes]) {
    if (list !== undefined) {
      expect(Array.isArray(list)).toBe(true);
      for (const x of list) expect(typeof x).toBe('string');
    }
  }
}

type Stage = 'refused' | 'solve_error' | 'solved';

function checkParsed(parsed: ReturnType<typeof parseNetwork>): Stage {
  if (!parsed.ok) {
    expectStructured(parsed);
    return 'refused';
  }
  const r = solveNetwork(parsed.network);
  if (!r.ok) {
    expectStructured(r);
    return 'solve_error';
  }
  const bad = numbersIn(r).filter((n) => !Number.isFinite(n.value));
  expect(bad.map((n) => `${n.path} = ${n.value}`)).toEqual([]);
  return 'solved';
}

const tally = (): Record<Stage, number> => ({ refused: 0, solve_error: 0, solved: 0 });

describe('fuzz: network files', () => {
  // Found by this fuzzing: a 1e301 V battery used to solve into Infinity W. validateNetwork now bounds values.
  it('refuses absurd finite values (a 1e301 V battery) instead of answering Infinity', () => {
    const net = {
      ground: 'n0',
      elements: [
        { id: 'b1', kind: 'battery', pos: 'n1', neg: 'n0', ocv_V: 1.1e301, r_ohm: 0.002 },
        { id: 'r1', kind: 'resistor', a: 'n1', b: 'n0', r_ohm: 0.05 },
      ],
    };
    const parsed = parseNetwork(net);
    const r = parsed.ok ? solveNetwork(parsed.network) : parsed;
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.code).toBe('invalid_value');
      expect(r.error.elements).toEqual(['b1']);
      expect(r.error.message).toContain('ocv_V');
    }
  });

  it(`${NETWORK_RUNS.valueMutations} structurally mutated networks: structured errors or finite results`, () => {
    const seen = tally();
    fc.assert(
      fc.property(mutatedValue(seeds), (net) => {
        seen[checkParsed(parseNetwork(net))]++;
      }),
      { numRuns: NETWORK_RUNS.valueMutations },
    );
    expect(seen.refused).toBeGreaterThan(0);
    expect(seen.solved).toBeGreaterThan(0);
    expect(({} as { polluted?: unknown }).polluted).toBeUndefined();
  });

  it(`${NETWORK_RUNS.textMutations} damaged network files: structured errors or finite results`, () => {
    const seen = tally();
    fc.assert(
      fc.property(mutatedText(seeds), (text) => {
        seen[checkParsed(parseNetworkJson(text))]++;
      }),
      { numRuns: NETWORK_RUNS.textMutations },
    );
    expect(seen.refused).toBeGreaterThan(0);
  });

  it(`${NETWORK_RUNS.arbitrary} arbitrary values: refused as malformed_network`, () => {
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue(), fc.anything()), (v) => {
        const parsed = parseNetwork(v);
        checkParsed(parsed);
      }),
      { numRuns: NETWORK_RUNS.arbitrary },
    );
  });
});
