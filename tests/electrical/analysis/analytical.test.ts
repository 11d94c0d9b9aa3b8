import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import { inverterDcCurrent_A, type AnalysisOk } from '../../../shared/electrical/analysis';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { battery, currentLoad, diagram, end, ladder, run, runOhm } from './helpers';

const ok = (r: ReturnType<typeof analyzeDiagram>): AnalysisOk => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
};

describe('current sharing (first principles)', () => {
  it('two equal batteries with a diagonal take-off share equally', () => {
    const r = ok(analyzeDiagram(ladder(2, { posTap: 1, negTap: 2 })));
    const s = r.operating!.sources;
    expect(s.b1.share_pct).toBeCloseTo(50, 9);
    expect(s.b2.share_pct).toBeCloseTo(50, 9);
    expect(r.operating!.imbalance_pct).toBeCloseTo(0, 7);
  });

  it('with both leads on battery 1, battery 1 carries more', () => {
    const r = ok(analyzeDiagram(ladder(2)));
    expect(r.operating!.sources.b1.current_A).toBeGreaterThan(r.operating!.sources.b2.current_A);
  });

  it('N identical batteries post to post, both leads on battery 1: the ladder closed form', () => {
    // Derivation (first principles). Battery k (1 = take-off end) carries i_k; u_k its terminal voltage;
    // links of resistance R on each pole, internal resistance r, equal EMF E. With S_k = i_k + … + i_N
    // (the current in the links between k−1 and k), E − u_k = r i_k and u_k − u_{k−1} = 2R S_k, so
    // i_{k−1} = i_k + (2R/r) S_k. Differencing two neighbouring equations gives
    // i_{k−1} − (2 + 2R/r) i_k + i_{k+1} = 0, and the far end gives i_{N−1} = (1 + 2R/r) i_N.
    // With cosh θ = 1 + R/r both hold for i_k ∝ cosh((N − k + ½) θ) (since cosh(3θ/2)/cosh(θ/2) =
    // 2 cosh θ − 1 = 1 + 2R/r), scaled so the currents add up to the load current I.
    for (const N of [3, 5, 8]) {
      const r = 0.004;
      const R = runOhm(50, 0.3); // each jumper, 50 mm² solid, 0.3 m at 30 °C
      const I = 100;
      const theta = Math.acosh(1 + R / r);
      const weights = Array.from({ length: N }, (_, j) => Math.cosh((N - (j + 1) + 0.5) * theta));
      const total = weights.reduce((a, b) => a + b, 0);
      const res = ok(analyzeDiagram(ladder(N, { r_ohm: r, load_A: I })));
      for (let k = 1; k <= N; k++) {
        expect(res.operating!.sources[`b${k}`].current_A).toBeCloseTo((I * weights[k - 1]) / total, 6);
      }
    }
  });

  it('100 Ah and 200 Ah LFP with internal resistance inversely proportional to capacity split 1:2', () => {
    // Bolted together (zero-length links), r = 5 mΩ and 2.5 mΩ: currents in inverse ratio of r (first principles).
    const d = diagram(
      [battery('small', 0, { capacity_Ah: 100, r_internal_ohm: 0.005 }), battery('big', 200, { capacity_Ah: 200, r_internal_ohm: 0.0025 }), currentLoad('load', 90)],
      [
        { id: 'lp', from: end('small', 'pos'), to: end('big', 'pos'), props: run(50, 0) },
        { id: 'ln', from: end('small', 'neg'), to: end('big', 'neg'), props: run(50, 0) },
        { id: 'cp', from: end('big', 'pos'), to: end('load', 'pos'), props: run(50, 1) },
        { id: 'cn', from: end('big', 'neg'), to: end('load', 'neg'), props: run(50, 1) },
      ],
    );
    const s = ok(analyzeDiagram(d)).operating!.sources;
    expect(s.small.current_A).toBeCloseTo(30, 9);
    expect(s.big.current_A).toBeCloseTo(60, 9);
    expect(s.small.share_pct).toBeCloseTo(100 / 3, 9);
    expect(s.small.idealShare_pct).toBeCloseTo(100 / 3, 9);
    expect(s.big.deviation_pp).toBeCloseTo(0, 9);
  });
});

describe('bank figures', () => {
  it('inverter DC current: 2000 W / (12 V × 1.0) = 166.7 A; about 85 A per kW at 12 V', () => {
    // First principles P / (V × η); rule of thumb (common practice): ~85 A per kW on a 12 V bank.
    expect(inverterDcCurrent_A(2000, 12, 1.0)).toBeCloseTo(166.67, 2);
    const perKw = inverterDcCurrent_A(1000, 12, 0.98);
    expect(perKw).toBeGreaterThan(80);
    expect(perKw).toBeLessThan(90);
    expect(inverterDcCurrent_A(1000, 0, 0.9)).toBe(0);
  });

  it('parallel adds amp-hours, series adds volts', () => {
    const par = ok(analyzeDiagram(busbarBankTemplate({ count: 3 })));
    expect(par.bank.nominal_V).toBeCloseTo(12.8, 9); // 4 × 3.2 V LFP cells (common practice)
    expect(par.bank.capacity_Ah).toBeCloseTo(300, 9);
    const d = diagram(
      [battery('lo', 0), battery('hi', 200), currentLoad('load', 50)],
      [
        { id: 'mid', from: end('lo', 'pos'), to: end('hi', 'neg'), props: run(50, 0.3) },
        { id: 'cp', from: end('hi', 'pos'), to: end('load', 'pos'), props: run(50, 1) },
        { id: 'cn', from: end('lo', 'neg'), to: end('load', 'neg'), props: run(50, 1) },
      ],
      { systemVoltage_V: 24 },
    );
    const ser = ok(analyzeDiagram(d));
    expect(ser.bank.nominal_V).toBeCloseTo(25.6, 9);
    expect(ser.bank.capacity_Ah).toBeCloseTo(100, 9);
    // C-rate: 50 A out of a 100 Ah bank.
    expect(ser.bank.cRate).toBeCloseTo(0.5, 9);
  });
});

describe('faults', () => {
  it('short at the load end: I = V_oc / (R_int + R_path) (first principles)', () => {
    const d = diagram(
      [battery('b1', 0, { r_internal_ohm: 0.004, restingVoltage_V: 13.2 }), currentLoad('load', 20)],
      [
        { id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 2) },
        { id: 'cn', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 2) },
      ],
    );
    const r = ok(analyzeDiagram(d, { mode: 'fault' }));
    const expected = 13.2 / (0.004 + 2 * runOhm(35, 2) + 0.001); // 1 mΩ bolted fault
    const c = r.faults!.cases.find((x) => x.kind === 'cable' && x.id === 'cp')!;
    expect(c.faultCurrent_A).toBeCloseTo(expected, 6);
    expect(r.faults!.maxByCable.cn.current_A).toBeCloseTo(expected, 6);
    // A lone battery shorted internally has nothing else to feed it.
    expect(r.faults!.cases.find((x) => x.kind === 'battery')!.faultCurrent_A).toBeCloseTo(0, 9);
  });

  it('the sweep matches the solver run case by case (two independent code paths)', () => {
    const doc = busbarBankTemplate({ count: 6 });
    const sweep = ok(analyzeDiagram(doc, { mode: 'fault' }));
    for (const sel of [{ kind: 'battery' as const, id: 'bat3' }, { kind: 'cable' as const, id: 'c-pos2' }, { kind: 'cable' as const, id: 'c-main-neg' }]) {
      const one = ok(analyzeDiagram(doc, { mode: 'fault', fault: sel }));
      const fromSweep = sweep.faults!.cases.find((c) => c.kind === sel.kind && (c.id === sel.id || c.part === sel.id))!;
      expect(one.faultCase!.faultCurrent_A / fromSweep.faultCurrent_A).toBeCloseTo(1, 9);
    }
    // Each battery fuse's worst case: fuse current in that case equals the sweep maximum.
    const m = sweep.faults!.maxByFuse.fuse4;
    const c = sweep.faults!.cases[m.case];
    const one = ok(analyzeDiagram(doc, { mode: 'fault', fault: { kind: c.kind, id: c.id } }));
    expect(Math.abs(one.operating!.parts.fuse4.current_A!) / m.current_A).toBeCloseTo(1, 9);
  });

  it('batteries in parallel add their fault currents at a shorted battery', () => {
    // Battery 1 shorted (1 mΩ) in a bolted bank of 3 equal batteries: the other two feed it, each
    // E / (r + 2 × 1 mΩ) by symmetry (first principles: two sources in parallel into r_f).
    const E = 13.2;
    const r = 0.004;
    const d = diagram(
      [battery('a', 0, { restingVoltage_V: E, r_internal_ohm: r }), battery('b', 200, { restingVoltage_V: E, r_internal_ohm: r }), battery('c', 400, { restingVoltage_V: E, r_internal_ohm: r }), currentLoad('load', 10)],
      [
        { id: 'ab-pos', from: end('a', 'pos'), to: end('b', 'pos'), props: run(50, 0) },
        { id: 'ab-neg', from: end('a', 'neg'), to: end('b', 'neg'), props: run(50, 0) },
        { id: 'bc-pos', from: end('b', 'pos'), to: end('c', 'pos'), props: run(50, 0) },
        { id: 'bc-neg', from: end('b', 'neg'), to: end('c', 'neg'), props: run(50, 0) },
        { id: 'cp', from: end('c', 'pos'), to: end('load', 'pos'), props: run(50, 1) },
        { id: 'cn', from: end('c', 'neg'), to: end('load', 'neg'), props: run(50, 1) },
      ],
    );
    const res = ok(analyzeDiagram(d, { mode: 'fault' }));
    const fault = res.faults!.cases.find((c) => c.kind === 'battery' && c.id === 'a')!;
    // Two sources E behind r in parallel (E, r/2) into 1 mΩ.
    expect(fault.faultCurrent_A).toBeCloseTo(E / (r / 2 + 0.001), 6);
  });
});

describe('equalization, charging and discharge', () => {
  it('batteries at different resting voltages joined: I = ΔV / (r1 + r2 + R_links)', () => {
    const d = diagram(
      [battery('full', 0, { restingVoltage_V: 13.4, r_internal_ohm: 0.005 }), battery('low', 200, { restingVoltage_V: 13.1, r_internal_ohm: 0.005 })],
      [
        { id: 'jp', from: end('full', 'pos'), to: end('low', 'pos'), props: run(25, 0.5) },
        { id: 'jn', from: end('full', 'neg'), to: end('low', 'neg'), props: run(25, 0.5) },
      ],
    );
    const r = ok(analyzeDiagram(d, { mode: 'equalize' }));
    const expected = 0.3 / (0.01 + 2 * runOhm(25, 0.5));
    expect(r.operating!.sources.full.current_A).toBeCloseTo(expected, 6);
    expect(r.operating!.sources.low.current_A).toBeCloseTo(-expected, 6);
    expect(r.equalize!.maxCurrent_A).toBeCloseTo(expected, 6);
    expect(r.equalize!.between.sort()).toEqual(['full', 'low']);
  });

  it('a charger in current limit: the batteries take exactly its limit between them', () => {
    const doc = busbarBankTemplate({ count: 3, battery: { ...postToPostTemplate({ count: 1, takeOff: 'same-end' }).parts[0].props, soc: 0.5 } as never });
    doc.parts.push({ id: 'chg', type: 'charger', label: '', position: { x: 0, y: 500 }, rotation: 0, props: { voltage_setpoint_V: 14.2, current_limit_A: 40, r_internal_ohm: 0.005, enabled: true } });
    doc.cables.push({ id: 'chg-pos', from: end('chg', 'pos'), to: end('bus-pos', 't1'), props: { ...doc.cables[0].props, length_m: 1 } });
    doc.cables.push({ id: 'chg-neg', from: end('chg', 'neg'), to: end('bus-neg', 't1'), props: { ...doc.cables[0].props, length_m: 1 } });
    const r = ok(analyzeDiagram(doc, { mode: 'charge' }));
    expect(r.charge!.chargers.chg.mode).toBe('cc');
    expect(r.charge!.totalCharge_A).toBeCloseTo(40, 9);
    const sum = Object.values(r.operating!.sources).reduce((s, x) => s + x.current_A, 0);
    expect(sum).toBeCloseTo(-40, 9); // charging currents are negative
  });

  it('discharge at constant current: 100 Ah from full to the 5 % floor at 10 A lasts 9.5 h (Coulomb counting)', () => {
    const d = diagram(
      [battery('b1', 0, { capacity_Ah: 100, soc: 1 }), currentLoad('load', 10)],
      [
        { id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 1) },
        { id: 'cn', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
      ],
    );
    const r = ok(analyzeDiagram(d, { mode: 'discharge' })).discharge!;
    expect(r.stoppedBy).toBe('soc_floor');
    expect(r.firstEmpty).toBe('b1');
    expect(r.duration_h).toBeCloseTo(9.5, 9);
    expect(r.usable_Ah).toBeCloseTo(95, 9);
    expect(r.usable_pct).toBeCloseTo(95, 9);
    expect(r.steps).toBeLessThanOrEqual(200);
    // Samples are monotonic in time and in state of charge.
    for (let i = 1; i < r.samples.length; i++) {
      expect(r.samples[i].t_h).toBeGreaterThan(r.samples[i - 1].t_h);
      expect(r.samples[i].soc.b1).toBeLessThan(r.samples[i - 1].soc.b1);
    }
  });

  it('discharge of a lopsided bank: the battery with the larger share empties first', () => {
    const r = ok(analyzeDiagram(ladder(3, { load_A: 60 }), { mode: 'discharge' })).discharge!;
    expect(r.firstEmpty).toBe('b1');
    expect(r.usable_pct).toBeLessThan(95);
    expect(r.usable_pct).toBeGreaterThan(50);
  });
});

describe('errors are data', () => {
  it('structural errors come back as errors and findings, never a throw', () => {
    const d = diagram([battery('b1', 0), currentLoad('load', 10)], [{ id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 1) }]);
    const r = analyzeDiagram(d);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.stage).toBe('compile');
    expect(r.errors.map((e) => e.code)).toContain('unconnected_terminal');
    expect(r.findings.some((f) => f.id === 'structure-unconnected-terminal' && f.severity === 'error')).toBe(true);
  });

  it('a voltage collapse is a solve error naming the load, and the result has no NaN', () => {
    const d = diagram(
      [battery('b1', 0), { id: 'inv', type: 'inverter', position: { x: 500, y: 0 }, props: { power_W: 500_000, efficiency: 0.9 } }],
      [
        { id: 'cp', from: end('b1', 'pos'), to: end('inv', 'pos'), props: run(10, 10) },
        { id: 'cn', from: end('b1', 'neg'), to: end('inv', 'neg'), props: run(10, 10) },
      ],
    );
    const r = analyzeDiagram(d);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0].parts).toContain('inv');
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity|null,"mode"/);
  });
});
