// The fault sweep's maxima against a brute-force sweep: every fault case solved in full on the fault
// network (loads and chargers disconnected) by the mathjs reference path.
import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import type { DiagramDocument } from '../../../shared/electrical/document/schema';
import { buildContext, faultSweep, prepareFaults } from '../../../shared/electrical/analysis';
import { solveLoadCase } from '../../../shared/electrical/study';
import { analyzeDiagram } from '../../../shared/electrical/study/analyze';
import { applyChanges, solveNetworkReference } from '../../../shared/electrical/network/solve';
import { battery, diagram, end, run } from './helpers';

function bruteForce(doc: DiagramDocument) {
  const built = buildContext(doc);
  if (!built.ok) throw new Error('does not compile');
  const ctx = built.ctx;
  const prepared = prepareFaults(ctx);
  const maxByCable: Record<string, number> = {};
  const maxByFuse: Record<string, number> = {};
  const faultCurrents: number[] = [];
  for (const spec of prepared.specs) {
    const changed = applyChanges(prepared.net, [spec.change]);
    if ('ok' in changed) throw new Error(changed.error.message);
    const sol = solveNetworkReference(changed);
    if (!sol.ok) throw new Error(sol.error.message);
    const I = sol.element_currents_A;
    faultCurrents.push(Math.abs(I[spec.change.kind === 'shunt' ? spec.change.id : spec.change.element]));
    for (const c of doc.cables) if (c.id in I) maxByCable[c.id] = Math.max(maxByCable[c.id] ?? 0, Math.abs(I[c.id]));
    for (const f of ctx.topo.fuses) {
      const el = ctx.map.parts[f.id].elements[0];
      if (el in I) maxByFuse[f.id] = Math.max(maxByFuse[f.id] ?? 0, Math.abs(I[el]));
    }
  }
  return { ctx, maxByCable, maxByFuse, faultCurrents };
}

function expectSweepMatches(doc: DiagramDocument) {
  const bf = bruteForce(doc);
  const r = analyzeDiagram(doc);
  if (!r.ok || !r.faults) throw new Error('no fault sweep');
  const sweep = r.faults;
  expect(sweep.cases.length).toBe(bf.faultCurrents.length);
  sweep.cases.forEach((c, i) => expect(c.faultCurrent_A / bf.faultCurrents[i]).toBeCloseTo(1, 9));
  expect(Object.keys(sweep.maxByCable).sort()).toEqual(Object.keys(bf.maxByCable).sort());
  for (const [id, m] of Object.entries(sweep.maxByCable)) expect(Math.abs(m.current_A - bf.maxByCable[id])).toBeLessThan(1e-7 * Math.max(1, bf.maxByCable[id]));
  expect(Object.keys(sweep.maxByFuse).sort()).toEqual(Object.keys(bf.maxByFuse).sort());
  for (const [id, m] of Object.entries(sweep.maxByFuse)) expect(Math.abs(m.current_A - bf.maxByFuse[id])).toBeLessThan(1e-7 * Math.max(1, bf.maxByFuse[id]));
  // The sweep prepared on its own (no load case to reuse) gives the same figures.
  const alone = faultSweep(bf.ctx, prepareFaults(bf.ctx));
  for (const [id, m] of Object.entries(alone.maxByCable)) expect(m.current_A / sweep.maxByCable[id].current_A).toBeCloseTo(1, 9);
  return sweep;
}

describe('fault sweep == every case solved in full', () => {
  it('busbar bank with an inverter (constant-power load: the load case factorization is reused)', () => {
    const doc = busbarBankTemplate({ count: 6 });
    const built = buildContext(doc);
    if (!built.ok) throw new Error('does not compile');
    expect('op' in solveLoadCase(built.ctx)).toBe(true);
    expectSweepMatches(doc);
  });

  it('post-to-post bank, diagonal take-off', () => {
    expectSweepMatches(postToPostTemplate({ count: 5, takeOff: 'diagonal' }));
  });

  it('a resistive load (in the matrix: the fault network is factorized on its own) and a current load', () => {
    for (const load of [{ mode: 'resistance' as const, r_ohm: 0.2 }, { mode: 'current' as const, current_A: 80 }]) {
      const doc = diagram(
        [battery('a', 0), battery('b', 200, { soc: 0.7 }), { id: 'L', type: 'dc_load', position: { x: 900, y: 0 }, props: load }],
        [
          { id: 'jp', from: end('a', 'pos'), to: end('b', 'pos'), props: run(35, 0.4) },
          { id: 'jn', from: end('a', 'neg'), to: end('b', 'neg'), props: run(35, 0.4) },
          { id: 'lp', from: end('a', 'pos'), to: end('L', 'pos'), props: run(25, 3) },
          { id: 'ln', from: end('b', 'neg'), to: end('L', 'neg'), props: run(25, 3) },
        ],
      );
      const sweep = expectSweepMatches(doc);
      expect(sweep.cases.filter((c) => c.kind === 'cable').length).toBeGreaterThan(0);
    }
  });
});
