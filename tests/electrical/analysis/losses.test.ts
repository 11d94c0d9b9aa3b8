/**
 * One definition of the wiring loss: conductors, joints, fuses, busbars, switches and shunts — the same
 * figure in the analysis, the revision summary and the editor. A resistive load's own power is not a loss.
 */
import { describe, expect, it } from 'vitest';
import { summarizeResults } from '../../../shared/diagram/summary';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { battery, diagram, end, run, runOhm } from './helpers';

describe('wiring loss', () => {
  it('one battery, 2 × 1 m of 50 mm² leads and a 1 Ω resistive load: the wiring loss is I² × 2 R_lead, the load is not a loss', () => {
    // First principles, by hand: I = V / (R_int + 2 R_lead + R_load); wiring loss I² · 2 R_lead; battery loss I² · R_int.
    // Lead resistance from IEC 60028 annealed copper at the 30 °C default ambient (helpers.runOhm).
    const rLead = runOhm(50, 1);
    const I = 12 / (0.01 + 2 * rLead + 1);
    const doc = diagram(
      [battery('b1', 0, { restingVoltage_V: 12, r_internal_ohm: 0.01 }), { id: 'load', type: 'dc_load', position: { x: 400, y: 0 }, props: { mode: 'resistance', r_ohm: 1 } }],
      [
        { id: 'lp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(50, 1) },
        { id: 'ln', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(50, 1) },
      ],
    );
    const r = analyzeDiagram(doc, { rules: false });
    if (!r.ok || !r.operating) throw new Error('no solution');
    expect(r.operating.losses.wiring_W).toBeCloseTo(I * I * 2 * rLead, 9);
    expect(r.operating.losses.total_W).toBeCloseTo(I * I * (2 * rLead + 0.01), 9);
    // The revision summary (History, Compare) reads the same figure — not the load's ~143 W.
    const s = summarizeResults(doc);
    expect(s.losses_W).toBeCloseTo(I * I * 2 * rLead, 5);
    expect(s.losses_W).toBeLessThan(1);
  });
});
