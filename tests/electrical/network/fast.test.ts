// The sparse fast path against the mathjs reference path on generated bank layouts and meshes, and
// the LDLᵀ kernel on its own.
import { describe, expect, it } from 'vitest';
import { busbarBank, postToPostBank, randomMesh, seriesParallelBank } from '../../../shared/electrical/network/builders';
import { LdlFactor, minimumDegreeOrder } from '../../../shared/electrical/network/ldl';
import { prepareNetwork, solveNetwork, solveNetworkReference } from '../../../shared/electrical/network/solve';
import type { Network, SolveOutcome, SolveResult } from '../../../shared/electrical/network/types';
import { resultDifference } from './arbitrary';

const solved = (r: SolveOutcome): SolveResult => {
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r;
};

function expectSame(net: Network) {
  const fast = solved(solveNetwork(net));
  const ref = solved(solveNetworkReference(net));
  const d = resultDifference(fast, ref);
  expect(d.volts).toBeLessThan(1e-9);
  expect(d.amps).toBeLessThan(1e-8);
  expect(fast.notes.map((n) => n.code)).toEqual(ref.notes.map((n) => n.code));
}

describe('LDLᵀ kernel', () => {
  it('orders a star leaves first, so eliminating it makes no fill', () => {
    // Hub 0 joined to leaves 1..9: eliminating the hub first would fill a 9-clique (36 entries);
    // leaves first leaves exactly one entry of L per leaf.
    const n = 10;
    const cols: number[][] = Array.from({ length: n }, (_, j) => (j === 0 ? [0, 1, 2, 3, 4, 5, 6, 7, 8, 9] : [0, j]));
    const colPtr = Int32Array.from([0, ...cols.map((c) => c.length)].map((_, i, a) => a.slice(0, i + 1).reduce((x, y) => x + y, 0)));
    const rowIdx = Int32Array.from(cols.flat());
    const order = minimumDegreeOrder({ n, colPtr, rowIdx });
    // Once eight leaves are gone the hub and the last leaf both have degree 1: either may go last.
    expect(Array.from(order).indexOf(0)).toBeGreaterThanOrEqual(n - 2);
    const f = new LdlFactor({ n, colPtr, rowIdx }, order);
    expect(f.nnzL).toBe(9);
  });

  it('solves a tridiagonal system with a known solution', () => {
    // A = tridiag(-1, 2, -1) (n = 5), x = (1, 2, 3, 4, 5): b = A x = (0, 0, 0, 0, 6).
    const n = 5;
    const cols = Array.from({ length: n }, (_, j) => [j - 1, j, j + 1].filter((i) => i >= 0 && i < n));
    const colPtr = new Int32Array(n + 1);
    cols.forEach((c, j) => (colPtr[j + 1] = colPtr[j] + c.length));
    const rowIdx = Int32Array.from(cols.flat());
    const ax = Float64Array.from(cols.flatMap((c, j) => c.map((i) => (i === j ? 2 : -1))));
    const f = new LdlFactor({ n, colPtr, rowIdx });
    expect(f.factor(ax)).toBe(-1);
    const x = f.solve([0, 0, 0, 0, 6]);
    [1, 2, 3, 4, 5].forEach((v, i) => expect(x[i]).toBeCloseTo(v, 12));
  });

  it('reports a singular matrix instead of dividing by zero', () => {
    // [[1, -1], [-1, 1]] is singular (a floating pair).
    const f = new LdlFactor({ n: 2, colPtr: Int32Array.from([0, 2, 4]), rowIdx: Int32Array.from([0, 1, 0, 1]) });
    expect(f.factor(Float64Array.from([1, -1, -1, 1]))).toBeGreaterThanOrEqual(0);
  });
});

describe('fast path == mathjs path', () => {
  it('post-to-post banks of 2..16 batteries, several take-offs, resistive and constant-power loads', () => {
    for (let count = 2; count <= 16; count++) {
      for (const [posTap, negTap] of [[1, count], [1, 1], [Math.ceil(count / 2), count]]) {
        expectSame(postToPostBank({ count, posTap, negTap, load: { kind: 'load_resistor', r_ohm: 0.08 } }));
        expectSame(postToPostBank({ count, posTap, negTap, load: { kind: 'constant_power', watts: 250 * count } }));
      }
    }
  });

  it('busbar banks with chargers in both modes and series-parallel strings', () => {
    for (const i_max_A of [undefined, 20, 500]) {
      expectSame(busbarBank({ count: 6, ocv_V: [12.4, 12.6, 12.5, 12.9, 13.0, 12.2], load: { kind: 'constant_power', watts: 900 }, charger: { volts: 14.2, r_ohm: 0.01, i_max_A } }));
    }
    expectSame(seriesParallelBank({ series: 4, parallel: 2, load: { kind: 'load_resistor', r_ohm: 1 } }));
    expectSame(seriesParallelBank({ series: 2, parallel: 6, load: { kind: 'constant_power', watts: 3000 } }));
  });

  it.each([
    [300, 4, 11],
    [1000, 6, 12],
    [1500, 10, 13],
  ])('random mesh of %i elements (width %i, seed %i) with ideal sources, a charger and constant-power loads', (elements, width, seed) => {
    const net = randomMesh({ elements, width, seed, sources: true, constantPower: 4 });
    expectSame(net);
  });

  it('eliminates ideal sources instead of adding rows: unknowns = nodes - 1 - sources held', () => {
    const net = randomMesh({ elements: 400, width: 5, seed: 3, sources: true });
    const prep = prepareNetwork(net);
    if ('ok' in prep) throw new Error(prep.error.message);
    const nodes = Object.keys(solved(prep.base).node_voltages_V).length;
    // One ideal source (vref) holds one node to ground; the charger has series resistance.
    expect(prep.stats.unknowns).toBe(nodes - 2);
  });
});
