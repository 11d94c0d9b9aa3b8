// The solver's lean entry points against full solves of the changed network by the mathjs reference
// path: the linear sweep (fault studies) and re-solves with new open-circuit voltages (discharge steps).
import { describe, expect, it } from 'vitest';
import { busbarBank, postToPostBank, randomMesh } from '../../../shared/electrical/network/builders';
import {
  applyChanges,
  batteryShortVariants,
  internalShort,
  linearSweep,
  prepareNetwork,
  solvePreparedEmf,
  solveNetworkReference,
  withShunt,
  type NetworkChange,
  type PreparedNetwork,
} from '../../../shared/electrical/network/solve';
import type { Network, SolveOutcome, SolveResult } from '../../../shared/electrical/network/types';
import { resultDifference } from './arbitrary';

const solved = (r: SolveOutcome): SolveResult => {
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r;
};
function prepared(net: Network): PreparedNetwork {
  const p = prepareNetwork(net);
  if ('ok' in p) throw new Error(p.error.message);
  return p;
}
const changedId = (ch: NetworkChange) => (ch.kind === 'shunt' ? ch.id : ch.element);

/** Runs the sweep and checks every variant's watched currents against a reference solve of `linear` with the change. */
function expectSweepMatches(prep: PreparedNetwork, linear: Network, variants: NetworkChange[], watch: string[], omit?: (el: Network['elements'][number]) => boolean) {
  const sweep = linearSweep(prep, { omit });
  if ('ok' in sweep) throw new Error(sweep.error.message);
  let visited = 0;
  const err = sweep.run(variants, watch, (v, currents, changeCurrent) => {
    visited++;
    const changed = applyChanges(linear, [variants[v]]);
    if ('ok' in changed) throw new Error(changed.error.message);
    const ref = solved(solveNetworkReference(changed));
    const scale = Math.max(1, ...Object.values(ref.element_currents_A).map(Math.abs));
    watch.forEach((id, j) => expect(Math.abs(currents[j] - ref.element_currents_A[id])).toBeLessThan(1e-8 * scale));
    expect(Math.abs(changeCurrent - ref.element_currents_A[changedId(variants[v])])).toBeLessThan(1e-8 * scale);
  });
  expect(err).toBeNull();
  expect(visited).toBe(variants.length);
}

describe('linear sweep', () => {
  it('every battery shorted and a shunt at the load, on a resistive busbar bank', () => {
    const net = busbarBank({ count: 6, ocv_V: [12.4, 12.6, 12.5, 12.9, 13.0, 12.2], load: { kind: 'load_resistor', r_ohm: 0.3 } });
    const variants = [...batteryShortVariants(net, 0.001).map((v) => v.changes[0]), withShunt('bus+', 'bus-', 0.002, 'fault:bus')];
    const watch = net.elements.filter((e) => e.kind !== 'constant_power').map((e) => e.id);
    expectSweepMatches(prepared(net), net, variants, watch);
  });

  it('leaves out constant-power loads and current sinks: the sweep is the network without them', () => {
    const base = postToPostBank({ count: 8, posTap: 1, negTap: 8, load: { kind: 'current_source', amps: 120 } });
    const net: Network = { ...base, elements: [...base.elements, { id: 'inv', kind: 'constant_power', pos: 'load+', neg: 'load-', watts: 900 }] };
    const linear: Network = { ...base, elements: base.elements.filter((e) => e.id !== 'load') };
    const variants = [...batteryShortVariants(base, 0.001).map((v) => v.changes[0]), withShunt('load+', 'load-', 0.001, 'fault:lead'), internalShort('link+3', 0.0001)];
    const watch = linear.elements.map((e) => e.id);
    expectSweepMatches(prepared(net), linear, variants, watch, (el) => el.id === 'load' || el.id === 'inv');
    // Without leaving the current sink out, its current is part of the solution.
    const sweep = linearSweep(prepared(net));
    if ('ok' in sweep) throw new Error(sweep.error.message);
    const ref = solved(solveNetworkReference({ ...base }));
    expect(sweep.voltage('load+')).toBeCloseTo(ref.node_voltages_V['load+'], 9);
  });

  it('works across nodes held by an ideal source', () => {
    const mesh = randomMesh({ elements: 300, width: 4, seed: 5, sources: true });
    const variants = [withShunt('m1.0', 'm7.2', 0.003, 's1'), withShunt('m5.1', 'm9.3', 0.003, 's2'), internalShort('h0', 1)];
    const watch = mesh.elements.filter((e) => e.kind === 'resistor' || e.kind === 'battery').map((e) => e.id);
    expectSweepMatches(prepared(mesh), mesh, variants, watch);
  });

  it('refuses to leave out an element that is in the matrix, and names unknown elements', () => {
    const net = busbarBank({ count: 3, load: { kind: 'load_resistor', r_ohm: 1 } });
    const leftOut = linearSweep(prepared(net), { omit: (el) => el.id === 'load' });
    expect('ok' in leftOut && leftOut.error.code).toBe('invalid_value');
    const sweep = linearSweep(prepared(net));
    if ('ok' in sweep) throw new Error(sweep.error.message);
    expect(sweep.run([internalShort('b1')], ['nope'], () => {})?.error.code).toBe('unknown_element');
    expect(sweep.run([internalShort('b9')], ['b1'], () => {})?.error.code).toBe('unknown_element');
    expect(sweep.run([withShunt('bus+', 'nowhere')], ['b1'], () => {})?.error.code).toBe('unknown_node');
  });
});

describe('re-solve with new open-circuit voltages', () => {
  it('matches a full reference solve of the changed network, cold and warm-started', () => {
    const net = postToPostBank({ count: 10, posTap: 1, negTap: 10, load: { kind: 'constant_power', watts: 1500, v_min_V: 10 } });
    const prep = prepared(net);
    let previous: SolveOutcome | undefined;
    for (let step = 0; step < 5; step++) {
      const ocv = new Map<string, number>(Array.from({ length: 10 }, (_, k) => [`b${k + 1}`, 13.3 - 0.05 * step - 0.01 * k]));
      const fast = solved(solvePreparedEmf(prep, ocv, previous));
      const changed: Network = { ...net, elements: net.elements.map((e) => (e.kind === 'battery' ? { ...e, ocv_V: ocv.get(e.id)! } : e)) };
      const ref = solved(solveNetworkReference(changed));
      const d = resultDifference(fast, ref);
      expect(d.volts).toBeLessThan(1e-9);
      expect(d.amps).toBeLessThan(1e-8);
      previous = fast;
    }
  });

  it('a charger that changes mode falls back to a full solve; a bad voltage is an error', () => {
    const net = busbarBank({ count: 3, load: { kind: 'load_resistor', r_ohm: 1 }, charger: { volts: 13.6, r_ohm: 0.01, i_max_A: 60 } });
    const prep = prepared(net);
    const low = new Map([['b1', 11.5], ['b2', 11.6], ['b3', 11.4]]);
    const fast = solved(solvePreparedEmf(prep, low));
    const ref = solved(solveNetworkReference({ ...net, elements: net.elements.map((e) => (e.kind === 'battery' ? { ...e, ocv_V: low.get(e.id)! } : e)) }));
    expect(resultDifference(fast, ref).volts).toBeLessThan(1e-9);
    expect(fast.notes.map((n) => n.code)).toEqual(ref.notes.map((n) => n.code));
    expect(fast.notes.map((n) => n.code)).toContain('current_limit');
    const bad = solvePreparedEmf(prep, new Map([['b1', NaN]]));
    expect(bad.ok ? 'ok' : bad.error.code).toBe('invalid_value');
    const notBattery = solvePreparedEmf(prep, new Map([['load', 12]]));
    expect(notBattery.ok ? 'ok' : notBattery.error.code).toBe('invalid_value');
  });
});
