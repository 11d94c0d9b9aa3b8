import { describe, expect, it } from 'vitest';
import { type DiagramDocument, busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { batteryDefaults, fuseDefaults, switchDefaults } from '../../../shared/electrical/parts';
import { RULES } from '../../../shared/electrical/rules';
import { battery, currentLoad, diagram, end, ladder, run } from '../analysis/helpers';

const ids = (doc: DiagramDocument) => analyzeDiagram(doc).findings.map((f) => f.id);
const findings = (doc: DiagramDocument, id: string) => analyzeDiagram(doc).findings.filter((f) => f.id === id);
const clone = (d: DiagramDocument) => structuredClone(d);
function part<T = Record<string, unknown>>(d: DiagramDocument, id: string): T {
  return d.parts.find((p) => p.id === id)!.props as T;
}

/** The 4-battery busbar template (1.5 m main runs) with a battery switch between its main fuse and the inverter. */
function bankWithDisconnect(): DiagramDocument {
  // 1.5 m main runs: the switch's contact adds a little drop, and the bank stays within 3 %.
  const d = busbarBankTemplate({ count: 4, mainCable_m: 1.5 });
  const main = d.cables.find((c) => c.id === 'c-main-pos')!;
  const load = main.to;
  main.to = { part: 'disconnect', terminal: 'a' };
  d.parts.push({ id: 'disconnect', type: 'switch', label: 'Battery switch', position: { x: 0, y: -200 }, rotation: 0, props: switchDefaults() });
  // The switch sits 0.3 m from the inverter: the run keeps its length (and its voltage drop).
  d.cables.push({ id: 'c-switch', from: { part: 'disconnect', terminal: 'b' }, to: load, props: { ...main.props, length_m: 0.3 } });
  main.props = { ...main.props, length_m: main.props.length_m - 0.3 };
  return d;
}

/** A clean 4-battery busbar bank (main fuse, battery switch, a fuse per battery): no findings expected. */
const clean = bankWithDisconnect;

describe('rule registry', () => {
  it('every rule has a stable id, a basis and a title', () => {
    const seen = new Set<string>();
    for (const r of RULES) {
      expect(r.id).toMatch(/^[a-z]+(-[a-z]+)*$/);
      expect(r.basis.length).toBeGreaterThan(5);
      expect(seen.has(r.id)).toBe(false);
      seen.add(r.id);
    }
  });
  it('the clean busbar bank has no findings', () => {
    // The surge and N-1 checks have their own tests (tests/electrical/analysis/contingency.test.ts).
    const others = new Set(['inverter-surge', 'n-minus-one']);
    expect(ids(clean()).filter((id) => !others.has(id))).toEqual([]);
  });
  it('the template as built (main fuse, no battery switch) has one warning, for the switch, at 12.8 V', () => {
    const f = analyzeDiagram(busbarBankTemplate({ count: 4 })).findings.filter((x) => x.severity !== 'note');
    expect(f.filter((x) => x.severity === 'error')).toEqual([]);
    expect(f.filter((x) => x.id === 'battery-disconnect-missing').map((x) => x.severity)).toEqual(['warning']);
  });
});

describe('each rule fires where it should and not elsewhere', () => {
  it('mixed-chemistry', () => {
    const d = clean();
    d.parts.find((p) => p.id === 'bat2')!.props = { ...batteryDefaults('agm', 100) } as never;
    expect(ids(d)).toContain('mixed-chemistry');
    expect(ids(clean())).not.toContain('mixed-chemistry');
  });

  it('mixed-nominal-voltage', () => {
    // 12.8 V LFP next to a 12.0 V LFP-labelled battery (within the compiler's parallel tolerance).
    const d = clean();
    part<{ nominal_V: number }>(d, 'bat2').nominal_V = 12.75;
    const f = findings(d, 'mixed-nominal-voltage');
    expect(f).toHaveLength(1);
    expect(f[0].message).toContain('12.75 V');
    expect(ids(clean())).not.toContain('mixed-nominal-voltage');
  });

  it('mixed-capacity-or-age: capacity, and lead-acid more than 6 months apart (common practice)', () => {
    const d = clean();
    part<{ capacity_Ah: number }>(d, 'bat3').capacity_Ah = 200;
    expect(findings(d, 'mixed-capacity-or-age')[0].message).toMatch(/100 Ah, 200 Ah/);
    const agm = (date: string) => ({ ...batteryDefaults('agm', 100), installDate: date });
    const old = busbarBankTemplate({ count: 2, battery: agm('2023-01-10') });
    old.parts.find((p) => p.id === 'bat2')!.props = agm('2023-09-01') as never; // ~7.7 months
    expect(findings(old, 'mixed-capacity-or-age').some((f) => /months apart/.test(f.message))).toBe(true);
    const close = busbarBankTemplate({ count: 2, battery: agm('2023-01-10') });
    close.parts.find((p) => p.id === 'bat2')!.props = agm('2023-05-01') as never; // under 4 months
    expect(findings(close, 'mixed-capacity-or-age')).toEqual([]);
  });

  it('parallel-battery-without-fuse', () => {
    const d = busbarBankTemplate({ count: 3, batteryFuse: null });
    expect(findings(d, 'parallel-battery-without-fuse').map((f) => f.parts[0]).sort()).toEqual(['bat1', 'bat2', 'bat3']);
    expect(ids(busbarBankTemplate({ count: 1, batteryFuse: null }))).not.toContain('parallel-battery-without-fuse');
    expect(ids(clean())).not.toContain('parallel-battery-without-fuse');
  });

  it('fuse-above-ampacity (NEC 240.4): 60 A fuse on 8 AWG (50 A at 75 °C, NEC 310.16)', () => {
    const d = clean();
    for (const c of d.cables) if (['c-fuse1', 'c-pos1'].includes(c.id)) c.props.conductor = { system: 'awg', size: '8' };
    const f = findings(d, 'fuse-above-ampacity');
    expect(f.map((x) => x.parts[1]).sort()).toEqual(['c-fuse1', 'c-pos1']);
    expect(f[0].message).toContain('50.0 A');
    expect(ids(clean())).not.toContain('fuse-above-ampacity');
  });

  it('fuse-above-ampacity names the insulation limit: 60 A fuse on 6 AWG with 60 °C insulation (55 A, NEC 310.16 60 °C column, from memory)', () => {
    // 6 AWG: 65 A at 75 °C (NEC Table 310.16) carries the clean bank's 60 A fuse; 60 °C insulation reads
    // the 60 °C column, 55 A, below it (NEC 240.4).
    const d = clean();
    for (const c of d.cables) if (['c-fuse1', 'c-pos1'].includes(c.id)) c.props.insulation_C = 60;
    const f = findings(d, 'fuse-above-ampacity');
    expect(f.map((x) => x.parts[1]).sort()).toEqual(['c-fuse1', 'c-pos1']);
    expect(f[0].message).toContain('55.0 A');
    expect(f[0].message).toContain('60 °C insulation: read from the 60 °C column');
    expect(f[0].suggestion).toMatch(/higher-rated insulation/);
    // 75 °C insulation on the 75 °C table: 65 A, no finding.
    const d75 = clean();
    for (const c of d75.cables) if (['c-fuse1', 'c-pos1'].includes(c.id)) c.props.insulation_C = 75;
    expect(ids(d75)).not.toContain('fuse-above-ampacity');
  });

  it('fuse-above-ampacity names the termination limit: 60 A fuse on 6 AWG with 60 °C terminations (55 A, NEC 110.14(C) and the NEC 310.16 60 °C column, from memory)', () => {
    // 6 AWG: 65 A at 75 °C (NEC Table 310.16); terminations rated 60 °C cap it at the 60 °C column, 55 A.
    const d = clean();
    for (const c of d.cables) if (c.id === 'c-pos1') c.props.terminal_C = 60;
    const f = findings(d, 'fuse-above-ampacity');
    expect(f.map((x) => x.parts[1])).toEqual(['c-pos1']);
    expect(f[0].message).toContain('55.0 A');
    expect(f[0].message).toContain('terminations rated 60 °C');
    expect(f[0].suggestion).toMatch(/terminations rated for a higher temperature/);
    const d75 = clean();
    for (const c of d75.cables) if (c.id === 'c-pos1') c.props.terminal_C = 75;
    expect(ids(d75)).not.toContain('fuse-above-ampacity');
  });

  it('each cable figure carries its derating chain: 6 AWG, 75 °C table, 40 °C ambient, bundled with 6 (NEC Table 310.16; 310.15(B), from memory; 310.15(C)(1))', () => {
    const d = clean();
    d.settings.ambient_C = 40;
    const c = d.cables.find((x) => x.id === 'c-neg3')!;
    c.props.installation = 'bundled';
    c.props.bundledConductors = 6;
    const r = analyzeDiagram(d);
    if (!r.ok) throw new Error('analysis failed');
    const fig = r.operating!.cables['c-neg3'];
    const chain = fig.ampacityDerating!;
    expect(chain.base_A).toBe(65); // NEC Table 310.16, 75 °C, 6 AWG
    expect(chain.factors.map((x) => [x.kind, x.factor])).toEqual([
      ['ambient', Math.sqrt((75 - 40) / (75 - 30))],
      ['bundling', 0.8],
    ]);
    expect(chain.final_A).toBeCloseTo(65 * Math.sqrt(35 / 45) * 0.8, 9);
    expect(fig.ampacity_A).toBe(chain.final_A);
  });

  it('fuse-voltage-rating: a 32 V fuse on a 48 V system', () => {
    const d = clean();
    d.settings.systemVoltage_V = 48;
    part<{ voltage_rating_V: number }>(d, 'fuse2').voltage_rating_V = 32;
    const f = findings(d, 'fuse-voltage-rating');
    expect(f.some((x) => x.parts[0] === 'fuse2' && x.severity === 'error')).toBe(true);
    expect(ids(clean())).not.toContain('fuse-voltage-rating');
  });

  it('interrupting-rating: a 1 kA fuse where the bank can deliver more', () => {
    const d = clean();
    part<{ interrupting_A: number }>(d, 'fuse1').interrupting_A = 1000;
    expect(findings(d, 'interrupting-rating').map((f) => f.parts[0])).toEqual(['fuse1']);
    expect(ids(clean())).not.toContain('interrupting-rating');
  });

  it('fuse-below-design-current: 42.5 A × 1.25 needs 53 A, a 50 A fuse is short', () => {
    const d = clean();
    part<{ rating_A: number }>(d, 'fuse1').rating_A = 50;
    expect(findings(d, 'fuse-below-design-current').map((f) => f.parts[0])).toEqual(['fuse1']);
    expect(ids(clean())).not.toContain('fuse-below-design-current');
  });

  it('cable-over-ampacity', () => {
    const d = clean();
    const c = d.cables.find((x) => x.id === 'c-neg2')!;
    c.props.conductor = { system: 'awg', size: '12' }; // 25 A at 75 °C (NEC 310.16)
    expect(findings(d, 'cable-over-ampacity').map((f) => f.parts[0])).toContain('c-neg2');
    expect(ids(clean())).not.toContain('cable-over-ampacity');
  });

  it('cable-over-ampacity names the insulation limit: 8 AWG carries a battery share of 40–50 A at 75 °C but not at 60 °C', () => {
    // 8 AWG copper: 50 A at 75 °C (NEC Table 310.16), 40 A at 60 °C (NEC Table 310.16, from memory).
    // The inverter is raised to 2.2 kW so that battery 2's share through its 8 AWG lead lies between the two.
    const with8 = (insulation_C: 60 | 75) => {
      const d = clean();
      Object.assign(part(d, 'inverter'), { power_W: 2200, rated_W: 2200 });
      const c = d.cables.find((x) => x.id === 'c-neg2')!;
      c.props.conductor = { system: 'awg', size: '8' };
      c.props.insulation_C = insulation_C;
      return d;
    };
    const r60 = analyzeDiagram(with8(60));
    if (!r60.ok) throw new Error('analysis failed');
    const fig = r60.operating!.cables['c-neg2'];
    const i = Math.abs(fig.current_A);
    expect(i).toBeGreaterThan(40);
    expect(i).toBeLessThan(50);
    expect(fig.ampacity_A).toBe(40);
    expect(fig.ampacityLimitedBy).toBe('insulation');
    expect(fig.ampacityColumn_C).toBe(60);
    expect(fig.utilisation_pct).toBeCloseTo((i / 40) * 100, 9);
    const f = r60.findings.filter((x) => x.id === 'cable-over-ampacity');
    expect(f.map((x) => x.parts[0])).toEqual(['c-neg2']);
    expect(f[0].message).toContain('ampacity of 40.0 A');
    expect(f[0].message).toContain('60 °C insulation: read from the 60 °C column');
    expect(f[0].basis).toContain('60 °C insulation');
    const r75 = analyzeDiagram(with8(75));
    if (!r75.ok) throw new Error('analysis failed');
    expect(r75.operating!.cables['c-neg2'].ampacity_A).toBe(50);
    expect(r75.operating!.cables['c-neg2'].ampacityLimitedBy).toBeUndefined();
    expect(r75.findings.map((x) => x.id)).not.toContain('cable-over-ampacity');
  });

  it('voltage-drop above 3 % (NEC 210.19(A) note / ABYC E-11)', () => {
    const d = clean();
    d.cables.find((x) => x.id === 'c-main-neg')!.props.length_m = 6;
    expect(findings(d, 'voltage-drop')[0].parts).toEqual(['inverter']);
    const relaxed = clone(d);
    relaxed.settings.voltageDropLimit_pct = 10;
    expect(ids(relaxed)).not.toContain('voltage-drop');
  });

  it('battery-over-continuous', () => {
    const d = clean();
    part<{ max_continuous_A: number }>(d, 'bat4').max_continuous_A = 30;
    expect(findings(d, 'battery-over-continuous').map((f) => f.parts[0])).toEqual(['bat4']);
    expect(ids(clean())).not.toContain('battery-over-continuous');
  });

  it('post-to-post-count: 5 batteries chained with the default limit of 4', () => {
    expect(ids(postToPostTemplate({ count: 5, takeOff: 'diagonal' }))).toContain('post-to-post-count');
    expect(ids(postToPostTemplate({ count: 4, takeOff: 'diagonal' }))).not.toContain('post-to-post-count');
  });

  it('busbar-cable-length-spread', () => {
    const d = clean();
    d.cables.find((x) => x.id === 'c-neg3')!.props.length_m = 1.5;
    expect(findings(d, 'busbar-cable-length-spread')[0].parts).toContain('bus-neg');
    const within = clean();
    within.cables.find((x) => x.id === 'c-neg3')!.props.length_m = 1.05;
    expect(ids(within)).not.toContain('busbar-cable-length-spread');
  });

  it('current-imbalance', () => {
    const d = ladder(4); // both leads on b1
    const f = findings(d, 'current-imbalance');
    expect(f).toHaveLength(1);
    expect(f[0].parts[0]).toBe('b1');
    expect(ids(ladder(2, { posTap: 1, negTap: 2 }))).not.toContain('current-imbalance');
  });

  it('both-leads-one-battery', () => {
    expect(ids(ladder(2))).toContain('both-leads-one-battery');
    expect(ids(ladder(2, { posTap: 1, negTap: 2 }))).not.toContain('both-leads-one-battery');
    // A single battery has nothing to share with.
    const single = diagram([battery('b1', 0), currentLoad('load', 10)], [
      { id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 1) },
      { id: 'cn', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
    ]);
    expect(ids(single)).not.toContain('both-leads-one-battery');
  });

  it('structural errors become findings', () => {
    const d = clean();
    d.cables = d.cables.filter((c) => c.id !== 'c-neg1');
    const f = analyzeDiagram(d).findings;
    expect(f.some((x) => x.id === 'structure-unconnected-terminal' && x.parts.includes('bat1'))).toBe(true);
    expect(ids(clean()).some((x) => x.startsWith('structure-'))).toBe(false);
  });

  it('equalization findings: a battery far below the others pushes its fuse', () => {
    const d = busbarBankTemplate({ count: 2, batteryFuse: fuseDefaults('class_t', 60) });
    part<{ restingVoltage_V: number }>(d, 'bat1').restingVoltage_V = 13.4;
    part<{ restingVoltage_V: number }>(d, 'bat2').restingVoltage_V = 12.6;
    // 0.8 V across about 20 mΩ of loop (two internal resistances, four 6 AWG runs, two fuses): ~40 A.
    part<{ rating_A: number }>(d, 'fuse1').rating_A = 25;
    part<{ rating_A: number }>(d, 'fuse2').rating_A = 25;
    const r = analyzeDiagram(d, { mode: 'equalize' });
    expect(r.findings.some((f) => f.id === 'equalization-current-over-fuse')).toBe(true);
    const same = busbarBankTemplate({ count: 2, batteryFuse: fuseDefaults('class_t', 25) });
    expect(analyzeDiagram(same, { mode: 'equalize' }).findings.some((f) => f.id.startsWith('equalization'))).toBe(false);
  });
});
