// Fault variants solved on a prepared factorization (low-rank updates) against full solves of the
// changed network by the mathjs reference path.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { busbarBank, postToPostBank, randomMesh } from '../../../shared/electrical/network/builders';
import {
  applyChanges,
  batteryShortVariants,
  cableLoadEndShortVariants,
  internalShort,
  prepareNetwork,
  solvePrepared,
  solveVariants,
  solveNetworkReference,
  withShunt,
  type NetworkChange,
  type PreparedNetwork,
} from '../../../shared/electrical/network/solve';
import type { Network, SolveOutcome, SolveResult } from '../../../shared/electrical/network/types';
import { arbitraryNetwork, expectOperatingPoint, resultDifference } from './arbitrary';

const solved = (r: SolveOutcome): SolveResult => {
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r;
};
function prepared(net: Network): PreparedNetwork {
  const p = prepareNetwork(net);
  if ('ok' in p) throw new Error(p.error.message);
  return p;
}
function reference(net: Network, changes: NetworkChange[]): SolveOutcome {
  const changed = applyChanges(net, changes);
  if ('ok' in changed) return changed;
  return solveNetworkReference(changed);
}
function expectVariantMatches(prep: PreparedNetwork, changes: NetworkChange[]) {
  const fast = solved(solvePrepared(prep, changes));
  const ref = solved(reference(prep.network, changes));
  const d = resultDifference(fast, ref);
  expect(d.volts).toBeLessThan(1e-9);
  expect(d.amps).toBeLessThan(1e-8);
  expect(fast.notes.map((n) => n.code)).toEqual(ref.notes.map((n) => n.code));
  return fast;
}

describe('fault variants on a prepared network', () => {
  it('each battery of a 12-battery post-to-post bank internally shorted in turn', () => {
    const net = postToPostBank({ count: 12, posTap: 1, negTap: 12, load: { kind: 'constant_power', watts: 2000 } });
    const prep = prepared(net);
    const variants = batteryShortVariants(net, 0.001);
    expect(variants).toHaveLength(12);
    for (const v of variants) {
      const r = expectVariantMatches(prep, v.changes);
      // The shorted battery is back-fed by the others: negative (charging) current.
      expect(r.element_currents_A[(v.changes[0] as { element: string }).element]).toBeLessThan(0);
    }
    const all = solveVariants(prep, variants.map((v) => v.changes));
    expect(all.map((r) => solved(r).element_currents_A.b3)).toEqual(variants.map((v) => solved(solvePrepared(prep, v.changes)).element_currents_A.b3));
  });

  it('each cable shorted at its load end (shunt to the other polarity)', () => {
    const net = busbarBank({ count: 8, cable_ohm: 0.0015, load: { kind: 'load_resistor', r_ohm: 0.2 } });
    const prep = prepared(net);
    const cables = Array.from({ length: 8 }, (_, k) => ({ cable: `cable+${k + 1}`, loadEnd: 'bus+', otherSide: `b${k + 1}-` }));
    for (const v of cableLoadEndShortVariants(cables, 0.0005)) expectVariantMatches(prep, v.changes);
  });

  it('two changes at once (rank-two update), and an unchanged variant returns the base solution', () => {
    const net = postToPostBank({ count: 6, posTap: 2, negTap: 5, load: { kind: 'load_resistor', r_ohm: 0.1 } });
    const prep = prepared(net);
    expectVariantMatches(prep, [internalShort('b1'), withShunt('load+', 'load-', 0.01)]);
    expectVariantMatches(prep, [internalShort('link+2', 0.5), internalShort('b4', 0.002)]);
    expect(solvePrepared(prep, [])).toBe(prep.base);
  });

  it('shunts on nodes held by an ideal source (including both ends inside one source tree)', () => {
    const net = randomMesh({ elements: 300, width: 4, seed: 5, sources: true, constantPower: 2 });
    const prep = prepared(net);
    // vref holds m1.0 at 12.6 V above ground m0.0: a shunt across it changes only vref's current.
    const inside = expectVariantMatches(prep, [withShunt('m1.0', 'm0.0', 0.01)]);
    expect(inside.element_currents_A['shunt:m1.0:m0.0']).toBeCloseTo(12.6 / 0.01, 9);
    expectVariantMatches(prep, [withShunt('m1.0', 'm7.2', 0.003)]);
    expectVariantMatches(prep, [withShunt('m5.1', 'm9.3', 0.003), internalShort('h0', 1)]);
  });

  it('a fault that drives a charger into current limit falls back to a full solve', () => {
    const net = busbarBank({ count: 3, load: { kind: 'load_resistor', r_ohm: 1 }, charger: { volts: 13.6, r_ohm: 0.01, i_max_A: 60 } });
    const prep = prepared(net);
    expect(solved(prep.base).notes).toEqual([]);
    const r = expectVariantMatches(prep, [withShunt('bus+', 'bus-', 0.002)]);
    expect(r.notes.map((n) => n.code)).toContain('current_limit');
  });

  it('rejects changes that name unknown elements or nodes, or a bad resistance', () => {
    const prep = prepared(postToPostBank({ count: 2, posTap: 1, negTap: 2, load: { kind: 'load_resistor', r_ohm: 1 } }));
    const code = (r: SolveOutcome) => (r.ok ? 'ok' : r.error.code);
    expect(code(solvePrepared(prep, [internalShort('b9')]))).toBe('unknown_element');
    expect(code(solvePrepared(prep, [withShunt('load+', 'nowhere')]))).toBe('unknown_node');
    expect(code(solvePrepared(prep, [withShunt('load+', 'load-', 0)]))).toBe('invalid_value');
    expect(code(solvePrepared(prep, [internalShort('load')]))).toBe('ok'); // a load resistor can be shorted
  });

  it('random networks with random shunts and shorts agree with full reference solves', () => {
    const withChanges = arbitraryNetwork({ sources: true, constantPower: true, maxNodes: 10, loadHeadroom: 0.6 }).chain((net) => {
      const nodes = [...new Set(net.elements.flatMap((el) => Object.entries(el).filter(([k]) => ['pos', 'neg', 'a', 'b', 'from', 'to'].includes(k)).map(([, v]) => v as string)))];
      const shortable = net.elements.filter((el) => el.kind === 'battery' || el.kind === 'resistor' || el.kind === 'load_resistor').map((el) => el.id);
      const change: fc.Arbitrary<NetworkChange> = fc.oneof(
        fc.record({ a: fc.constantFrom(...nodes), b: fc.constantFrom(...nodes), k: fc.integer({ min: 0, max: 400 }) }).map(({ a, b, k }) => withShunt(a, b, 1e-4 * Math.pow(10, k / 100), `s-${a}-${b}-${k}`)),
        fc.record({ id: fc.constantFrom(...shortable), k: fc.integer({ min: 0, max: 300 }) }).map(({ id, k }) => internalShort(id, 1e-4 * Math.pow(10, k / 100))),
      );
      return fc.tuple(fc.constant(net), fc.uniqueArray(change, { maxLength: 3, selector: (c) => (c.kind === 'shunt' ? c.id : c.element) }));
    });
    fc.assert(
      fc.property(withChanges, ([net, changes]) => {
        const prep = prepareNetwork(net);
        fc.pre(!('ok' in prep));
        const fast = solvePrepared(prep as PreparedNetwork, changes);
        const ref = reference(net, changes);
        if (!fast.ok || !ref.ok) {
          const codes = [fast.ok ? 'ok' : fast.error.code, ref.ok ? 'ok' : ref.error.code];
          // A shunt or short can pull a constant-power load to the fold of P = v i, where the prepared
          // path (warm-started from the unchanged network's operating point and charger modes) may
          // find an operating point that a cold full solve misses (docs/decisions/010). That answer
          // must then be a genuine operating point of the changed network.
          const solvedOne = fast.ok ? fast : ref.ok ? ref : null;
          if (solvedOne && codes.includes('no_convergence') && net.elements.some((el) => el.kind === 'constant_power')) {
            const changed = applyChanges(net, changes);
            if ('ok' in changed) throw new Error(changed.error.message);
            expectOperatingPoint(changed, solvedOne);
            return;
          }
          expect(codes[0]).toBe(codes[1]);
          return;
        }
        const d = resultDifference(fast, ref);
        // The accuracy the core is held to against ngspice: 1 µV, currents within 1e-6 of the largest.
        // Random shorts of 0.1 mΩ across 10 Ω branches make some of these systems ill-conditioned
        // (about 1e-7 relative seen), so the tighter 1e-8 once used here failed on rare seeds.
        expect(d.volts).toBeLessThan(1e-6);
        const scale = Math.max(1, ...Object.values(ref.element_currents_A).map(Math.abs));
        expect(d.amps).toBeLessThan(1e-6 * scale);
      }),
      { numRuns: 300 },
    );
  });
});
