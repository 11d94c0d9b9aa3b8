/**
 * Loose parts do not stop the analysis: the connected remainder is solved, the loose parts are named
 * (error findings, so the checks still fail) and left out of the figures.
 */
import { describe, expect, it } from 'vitest';
import { type AnalysisOk } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { battery, currentLoad, diagram, end, ladder, run, runOhm } from './helpers';

const ok = (r: ReturnType<typeof analyzeDiagram>): AnalysisOk => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
};
const cut = (d: ReturnType<typeof ladder>, ...ids: string[]) => ({ ...d, cables: d.cables.filter((c) => !ids.includes(c.id)) });

describe('an open terminal: the connected remainder is solved', () => {
  it('battery 3 with an open negative is not part of the bank: batteries 1 and 2 share the load as a pair', () => {
    // ladder(3): both leads on battery 1, 100 A constant-current load, r = 4 mΩ, jumpers 50 mm² × 0.3 m.
    const r = ok(analyzeDiagram(cut(ladder(3), 'jn2')));
    expect(r.notConnected).toEqual(['b3', 'jp2']);
    expect(r.openTerminals).toEqual({ b3: ['neg'] });
    const s = r.operating!.sources;
    expect(Object.keys(s).sort()).toEqual(['b1', 'b2']);
    // Current divider (first principles): battery 2's path is r + 2 R_jumper, battery 1's is r.
    const rInt = 0.004;
    const rj = runOhm(50, 0.3);
    const i2 = (100 * rInt) / (rInt + rInt + 2 * rj);
    expect(s.b2.current_A).toBeCloseTo(i2, 6);
    expect(s.b1.current_A).toBeCloseTo(100 - i2, 6);
    // The cable that led only to battery 3 has no figure.
    expect(r.operating!.cables.jp2).toBeUndefined();
  });

  it('the loose battery stays an error finding, named by its label and terminal', () => {
    const d = cut(ladder(3), 'jn2');
    d.parts.find((p) => p.id === 'b3')!.label = 'Battery 3';
    const r = ok(analyzeDiagram(d));
    const f = r.findings.filter((x) => x.id === 'structure-unconnected-terminal');
    expect(f).toEqual([expect.objectContaining({ severity: 'error', parts: ['b3'], message: 'Battery 3 is not connected: negative terminal' })]);
    // What was left out only because it led to battery 3 is said too.
    expect(r.notes).toEqual(expect.arrayContaining([expect.objectContaining({ code: 'left_out', parts: ['jp2'] })]));
  });

  it('a load with an open negative draws nothing', () => {
    const r = ok(analyzeDiagram(cut(ladder(2), 'lead-neg')));
    expect(r.notConnected).toEqual(['load', 'lead-pos']);
    expect(r.operating!.parts.load).toBeUndefined();
    for (const s of Object.values(r.operating!.sources)) expect(Math.abs(s.current_A)).toBeLessThan(1e-9);
  });

  it('the rules read the remainder: a parallel battery without a fuse is found for the connected ones only, without a throw', () => {
    const r = ok(analyzeDiagram(cut(ladder(3), 'jn2')));
    const unfused = r.findings.filter((f) => f.id === 'parallel-battery-without-fuse').flatMap((f) => f.parts);
    expect(unfused.sort()).toEqual(['b1', 'b2']);
  });

  it('the fault sweep runs on the remainder', () => {
    const r = ok(analyzeDiagram(cut(ladder(3), 'jn2'), { mode: 'fault' }));
    const batteries = r.faults!.cases.filter((c) => c.kind === 'battery').map((c) => c.part);
    expect(batteries.sort()).toEqual(['b1', 'b2']);
  });

  it('does not fire on a wired diagram', () => {
    const r = ok(analyzeDiagram(ladder(3)));
    expect(r.notConnected).toBeUndefined();
    expect(r.findings.some((f) => f.id.startsWith('structure-'))).toBe(false);
  });

  it('nothing to solve: a battery and a load both with open negatives still fail, with the errors', () => {
    const d = diagram([battery('b1', 0), currentLoad('load', 10)], [{ id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 1) }]);
    const r = analyzeDiagram(d);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.code)).toEqual(['unconnected_terminal', 'unconnected_terminal']);
  });

  it('another structural error still stops the analysis (a 24 V battery beside 12 V ones, and a loose one)', () => {
    const d = cut(ladder(3), 'jn2');
    const b2 = d.parts.find((p) => p.id === 'b2')!;
    if (b2.type === 'battery') b2.props = { ...b2.props, nominal_V: 25.6 };
    const r = analyzeDiagram(d);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.code)).toEqual(expect.arrayContaining(['unconnected_terminal', 'unequal_parallel_voltage']));
  });
});
