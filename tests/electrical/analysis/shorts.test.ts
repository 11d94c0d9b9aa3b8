/**
 * A short drawn in the diagram: the result names the shorting conductors and the prospective current
 * through them, solved with the conductors' real resistances.
 */
import { describe, expect, it } from 'vitest';
import { type AnalysisResult } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { busbarBankTemplate } from '../../../shared/diagram';
import { type CableRunProps, fuseDefaults } from '../../../shared/electrical/parts';
import { battery, currentLoad, diagram, end, ladder, run, runOhm } from './helpers';

const failed = (r: AnalysisResult) => {
  if (r.ok) throw new Error('expected the analysis to stop on the short');
  return r;
};

// NEC (NFPA 70) Chapter 9 Table 8: 2/0 AWG stranded uncoated copper, 0.0967 Ω per 1000 ft at 75 °C.
const NEC_2_0_OHM_PER_KFT_75C = 0.0967;
const FT_PER_M = 1 / 0.3048; // exact by definition of the foot
/** 2/0 AWG copper run on the table basis at `temp_C`. */
const awg20 = (length_m: number, temp_C: number): CableRunProps =>
  ({ conductor: { system: 'awg', size: '2/0' }, length_m, stranding: 'concentric', resistanceBasis: 'table', ambient_C: temp_C }) as CableRunProps;

/** One 12.8 V battery with 5 mΩ internal resistance, its posts joined by `short`. */
const shorted = (short: CableRunProps) =>
  diagram([{ ...battery('b1', 0, { restingVoltage_V: 12.8, r_internal_ohm: 0.005 }), label: 'House battery' }], [
    { id: 'x', label: 'Spanner', from: end('b1', 'pos'), to: end('b1', 'neg'), props: short },
  ]);

describe('a drawn short: conductors and prospective current', () => {
  it('one 12.8 V battery (5 mΩ) shorted by 1 m of 2/0 AWG copper at 75 °C: I = V / (R_internal + R_cable)', () => {
    const rCable = (NEC_2_0_OHM_PER_KFT_75C / 1000) * FT_PER_M; // 0.3173 mΩ
    const expected = 12.8 / (0.005 + rCable); // first principles: about 2,407 A
    const r = failed(analyzeDiagram(shorted(awg20(1, 75))));
    expect(r.stage).toBe('compile');
    expect(r.shorts).toHaveLength(1);
    const s = r.shorts![0];
    expect(s).toMatchObject({ code: 'shorted_source', sources: ['b1'], conductors: ['x'], through: 'x' });
    expect(s.current_A / expected).toBeCloseTo(1, 9);
    expect(r.shortCircuit!.sources.b1 / expected).toBeCloseTo(1, 9);
    // The finding carries the current, names the parts by label and points at the fault analysis.
    const f = r.findings.find((x) => x.id === 'structure-shorted-source')!;
    expect(f.severity).toBe('error');
    expect(f.parts).toEqual(['b1', 'x']);
    expect(f.message).toMatch(/Spanner joins the positive and negative of House battery/);
    expect(f.message).toContain('about 2,407 A');
    expect(f.message).toMatch(/fault analysis/);
  });

  it('the same run at 30 °C: the table value corrected by R2 = R1 (1 + 0.00323 (T2 − 75)) (from memory)', () => {
    const rCable = (NEC_2_0_OHM_PER_KFT_75C / 1000) * FT_PER_M * (1 + 0.00323 * (30 - 75));
    const r = failed(analyzeDiagram(shorted(awg20(1, 30))));
    expect(r.shorts![0].current_A / (12.8 / (0.005 + rCable))).toBeCloseTo(1, 9);
  });

  it('a 0 m jumper across the posts: the battery’s own short-circuit current, V / R_internal', () => {
    const r = failed(analyzeDiagram(shorted(awg20(0, 75))));
    // 12.8 / 0.005 = 2,560 A (first principles); the study's 1 µΩ floor for a 0 Ω run moves it by 0.02 %.
    expect(r.shorts![0].current_A / 2560).toBeCloseTo(1, 3);
  });

  it('batteries in parallel feed a short across one of them: one short, fed through the jumpers', () => {
    // b1 and b2 (12.8 V, 5 mΩ) joined by 35 mm² × 0.5 m jumpers; run x (25 mm² × 1 m) across b2; a load on b1.
    const bat = (id: string, k: number) => battery(id, k * 200, { restingVoltage_V: 12.8, r_internal_ohm: 0.005 });
    const d = diagram([bat('b1', 0), bat('b2', 1), currentLoad('load', 50)], [
      { id: 'jp', from: end('b1', 'pos'), to: end('b2', 'pos'), props: run(35, 0.5, { role: 'jumper' }) },
      { id: 'jn', from: end('b1', 'neg'), to: end('b2', 'neg'), props: run(35, 0.5, { role: 'jumper' }) },
      { id: 'lp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 2) },
      { id: 'ln', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 2) },
      { id: 'x', from: end('b2', 'pos'), to: end('b2', 'neg'), props: run(25, 1) },
    ]);
    const r = failed(analyzeDiagram(d));
    expect(r.shorts).toHaveLength(1);
    const s = r.shorts![0];
    expect([...s.sources].sort()).toEqual(['b1', 'b2']);
    expect([...s.conductors].sort()).toEqual(['jn', 'jp', 'x']);
    expect(s.through).toBe('x');
    // One finding: the run across battery 2 is the short, battery 1 feeds it through the jumpers.
    expect(r.findings.filter((f) => f.id === 'structure-shorted-source')).toHaveLength(1);
    expect(r.errors.find((e) => e.code === 'shorted_source')!.message).toMatch(/^Short circuit: the cable from Battery positive to Battery negative joins .* with no load between; Battery feeds it through the jumper/);
    // Thevenin at b2's posts (first principles, loads off): E = 12.8 V behind r2 ∥ (r1 + 2 R_jumper).
    const rj = runOhm(35, 0.5);
    const rx = runOhm(25, 1);
    const rth = 1 / (1 / 0.005 + 1 / (0.005 + 2 * rj));
    const i = 12.8 / (rth + rx);
    expect(s.current_A / i).toBeCloseTo(1, 9);
    // Battery 1's share comes through the jumpers: (E − I·R_x) / (r1 + 2 R_jumper).
    const i1 = (12.8 - i * rx) / (0.005 + 2 * rj);
    expect(s.currents_A.jp / i1).toBeCloseTo(1, 9);
    expect(r.shortCircuit!.sources.b1 + r.shortCircuit!.sources.b2).toBeCloseTo(i, 6); // Kirchhoff current law at the run
    // The load's leads carry none of it (the load is off in the study) and are not shorting conductors.
    expect(r.shortCircuit!.cables.lp).toBeCloseTo(0, 9);
  });

  it('reversed polarity: two batteries + to − in a ring drive (E1 + E2) / (r1 + r2 + R_j1 + R_j2)', () => {
    const bat = (id: string, k: number) => battery(id, k * 200, { restingVoltage_V: 12.8, r_internal_ohm: 0.005 });
    const d = diagram([bat('b1', 0), bat('b2', 1)], [
      { id: 'j1', from: end('b1', 'pos'), to: end('b2', 'neg'), props: run(35, 0.3, { role: 'jumper' }) },
      { id: 'j2', from: end('b1', 'neg'), to: end('b2', 'pos'), props: run(35, 0.3, { role: 'jumper' }) },
    ]);
    const r = failed(analyzeDiagram(d));
    expect(r.shorts).toEqual([expect.objectContaining({ code: 'reversed_polarity' })]);
    const expected = 25.6 / (0.01 + 2 * runOhm(35, 0.3));
    expect(r.shorts![0].currents_A.j1 / expected).toBeCloseTo(1, 9);
    expect(r.findings.find((f) => f.id === 'structure-reversed-polarity')!.message).toMatch(/Reversed polarity: .* about [\d,]+ A/);
  });

  it('a charger shorted by a run of no resistance adds its current limit to the batteries’', () => {
    const d = diagram(
      [battery('b1', 0, { restingVoltage_V: 12.8, r_internal_ohm: 0.005 }), { id: 'ch', type: 'charger', position: { x: 300, y: 0 }, props: { voltage_setpoint_V: 14.2, current_limit_A: 40, r_internal_ohm: 0, enabled: true } }],
      [
        { id: 'cp', from: end('b1', 'pos'), to: end('ch', 'pos'), props: run(35, 1) },
        { id: 'cn', from: end('b1', 'neg'), to: end('ch', 'neg'), props: run(35, 1) },
        { id: 'z', from: end('ch', 'pos'), to: end('ch', 'neg'), props: run(35, 0) },
      ],
    );
    const r = failed(analyzeDiagram(d));
    expect(r.shorts).toHaveLength(1);
    expect(r.shorts![0].through).toBe('z');
    // The charger at its 40 A limit and the battery through both runs share the 0 m run (at the study's
    // 1 µΩ, R_f): I_b (r + 2 R_c) + (I_b + 40) R_f = 12.8 V (Kirchhoff voltage law round the battery's loop).
    const rf = 1e-6;
    const ib = (12.8 - 40 * rf) / (0.005 + 2 * runOhm(35, 1) + rf);
    const expected = ib + 40;
    expect(r.shorts![0].current_A / expected).toBeCloseTo(1, 6);
  });

  it('the short’s currents come with every cable and fuse (what the fault view shows)', () => {
    // A busbar bank with a fuse per battery and a run drawn across battery 2's posts.
    const d = busbarBankTemplate({ count: 2, batteryFuse: fuseDefaults('class_t', 100) });
    d.cables.push({ id: 'x', from: end('bat2', 'pos'), to: end('bat2', 'neg'), props: { ...d.cables[0].props, length_m: 0.5 } });
    const r = failed(analyzeDiagram(d, { mode: 'fault' }));
    expect(Object.keys(r.shortCircuit!.cables).sort()).toEqual(d.cables.map((c) => c.id).sort());
    expect(Object.keys(r.shortCircuit!.parts)).toEqual(expect.arrayContaining(['fuse1', 'fuse2', 'main-fuse', 'bus-pos', 'bus-neg']));
    // Battery 1 feeds the short through its own fuse and the busbars; the main fuse (load off) carries none of it.
    expect(r.shortCircuit!.parts.fuse1).toBeCloseTo(r.shortCircuit!.sources.bat1, 6);
    expect(r.shortCircuit!.parts['main-fuse']).toBeCloseTo(0, 9);
    expect(r.shorts![0].conductors).toEqual(expect.arrayContaining(['x', 'fuse1', 'c-fuse1', 'c-pos1', 'c-neg1']));
  });

  it('a short and a loose part: the short is studied on the connected remainder', () => {
    const d = shorted(awg20(1, 75));
    d.parts.push({ ...battery('spare', 400), label: '', rotation: 0 });
    const r = failed(analyzeDiagram(d));
    expect(r.notConnected).toEqual(['spare']);
    expect(r.errors.map((e) => e.code)).toEqual(['floating_part', 'shorted_source']);
    expect(r.shorts![0].sources).toEqual(['b1']);
  });

  it('does not fire on a healthy bank, nor on a failure that is not a short', () => {
    const healthy = analyzeDiagram(ladder(2));
    expect(healthy.ok).toBe(true);
    expect('shorts' in healthy).toBe(false);
    const noSource = analyzeDiagram(diagram([currentLoad('load', 10)], []));
    expect(noSource.ok).toBe(false);
    if (!noSource.ok) expect(noSource.shorts).toBeUndefined();
  });
});
