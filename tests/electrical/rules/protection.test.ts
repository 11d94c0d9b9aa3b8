/**
 * The protection checks installers make first: main overcurrent device, battery disconnect, battery fuse
 * distance (marine), fuse voltage rating against the charging voltage, the bank's C-rate, short cables.
 * Each rule is shown firing, and not firing on the same bank put right.
 */
import { describe, expect, it } from 'vitest';
import { type DiagramDocument, busbarBankTemplate, diagramSchema, seriesParallelTemplate } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { batteryDefaults, chargerDefaults, fuseDefaults, switchDefaults } from '../../../shared/electrical/parts';
import { battery, currentLoad, diagram, end, run } from '../analysis/helpers';

const findings = (doc: DiagramDocument, id: string) => analyzeDiagram(doc).findings.filter((f) => f.id === id);
const ids = (doc: DiagramDocument) => analyzeDiagram(doc).findings.map((f) => f.id);
function part<T = Record<string, unknown>>(d: DiagramDocument, id: string): T {
  return d.parts.find((p) => p.id === id)!.props as T;
}
const cable = (d: DiagramDocument, id: string) => d.cables.find((c) => c.id === id)!;

/** A battery switch between the main fuse (or the bank) and the inverter. */
function withDisconnect(d: DiagramDocument, closed = true): DiagramDocument {
  const main = cable(d, 'c-main-pos');
  const load = main.to;
  main.to = { part: 'disconnect', terminal: 'a' };
  d.parts.push({ id: 'disconnect', type: 'switch', label: 'Battery switch', position: { x: 0, y: -200 }, rotation: 0, props: { ...switchDefaults(), closed } });
  // The switch sits 0.3 m from the inverter: the run keeps its length (and its voltage drop).
  d.cables.push({ id: 'c-switch', from: { part: 'disconnect', terminal: 'b' }, to: load, props: { ...main.props, length_m: 0.3 } });
  main.props = { ...main.props, length_m: main.props.length_m - 0.3 };
  return d;
}

/** A charger on the positive busbar's spare tap and the negative busbar's, with no fuse of its own. */
function withCharger(d: DiagramDocument, props: Partial<ReturnType<typeof chargerDefaults>> = {}): DiagramDocument {
  const bus = part<{ tapCount: number }>(d, 'bus-pos');
  bus.tapCount += 1;
  part<{ tapCount: number }>(d, 'bus-neg').tapCount += 1;
  const tap = `t${bus.tapCount}`;
  d.parts.push({ id: 'charger', type: 'charger', label: 'Shore charger', position: { x: 900, y: 300 }, rotation: 0, props: { ...chargerDefaults(), ...props } });
  d.cables.push({ id: 'c-chg-pos', from: { part: 'bus-pos', terminal: tap }, to: { part: 'charger', terminal: 'pos' }, props: { ...cable(d, 'c-main-neg').props, length_m: 1 } });
  d.cables.push({ id: 'c-chg-neg', from: { part: 'bus-neg', terminal: tap }, to: { part: 'charger', terminal: 'neg' }, props: { ...cable(d, 'c-main-neg').props, length_m: 1 } });
  return d;
}

const marine = (d: DiagramDocument) => ({ ...d, settings: { ...d.settings, ruleSet: 'marine' as const } });

describe('main-overcurrent-missing', () => {
  it('a 4-battery busbar bank feeding a 2000 W inverter with no main fuse and no disconnect: an error naming the missing device', () => {
    const d = busbarBankTemplate({ count: 4, mainFuse: null });
    const f = findings(d, 'main-overcurrent-missing');
    expect(f).toHaveLength(1);
    expect(f[0].severity).toBe('error');
    expect(f[0].parts[0]).toBe('inverter');
    expect(f[0].message).toContain('No main fuse or DC circuit breaker');
    expect(f[0].message).toContain('positive feed of Inverter');
    expect(f[0].message).not.toMatch(/\(inverter\)|\bbat\d/); // named by label, never by id
    // The batteries' own fuses carry one share each, not the feed.
    expect(f[0].message).toContain("past the batteries' own fuses");
    // I_dc = P / (V × efficiency) (first principles): 2000 W at 90 % between 12.8 V nominal and 13.6 V
    // (LFP full, 3.4 V resting per cell × 4, recalled): 163–174 A.
    const drawn = Number(/draws about (\d+) A/.exec(f[0].message)?.[1]);
    expect(drawn).toBeGreaterThanOrEqual(Math.floor(2000 / (13.6 * 0.9)));
    expect(drawn).toBeLessThanOrEqual(Math.ceil(2000 / (12.8 * 0.9)));
    expect(f[0].message).toMatch(/would draw about [\d,]+ A/);
    // The other check of this bank: no disconnect either.
    expect(ids(d)).toContain('battery-disconnect-missing');
  });

  it('does not fire where the feed has a main fuse (the template as built)', () => {
    expect(ids(busbarBankTemplate({ count: 4 }))).not.toContain('main-overcurrent-missing');
    expect(ids(withDisconnect(busbarBankTemplate({ count: 4 })))).not.toContain('main-overcurrent-missing');
  });

  it('a disconnect is not an overcurrent device: a switch alone in the feed still fires', () => {
    const d = withDisconnect(busbarBankTemplate({ count: 2, mainFuse: null }));
    expect(findings(d, 'main-overcurrent-missing').map((f) => f.parts[0])).toEqual(['inverter']);
  });

  it('suggests a rating: 100 A continuous needs at least 125 A (NEC 210.20(A)), 125 A is a standard rating (NEC 240.6(A))', () => {
    const d = diagram([battery('b1', 0), currentLoad('load', 100)], [
      { id: 'cp', from: end('b1', 'pos'), to: end('load', 'pos'), props: run(35, 1) },
      { id: 'cn', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
    ]);
    const f = findings(d, 'main-overcurrent-missing');
    expect(f).toHaveLength(1);
    expect(f[0].message).toContain('draws about 100 A');
    expect(f[0].suggestion).toContain('at least 125 A (125 % of 100 A): 125 A is the next standard rating');
  });

  it("one battery: its own fuse in the run to the load is the feed's main device", () => {
    const d = diagram(
      [battery('b1', 0), { id: 'f1', type: 'fuse', position: { x: 0, y: -100 }, props: fuseDefaults('class_t', 150) }, currentLoad('load', 100)],
      [
        { id: 'post', from: end('b1', 'pos'), to: end('f1', 'a'), props: run(35, 0.1) },
        { id: 'cp', from: end('f1', 'b'), to: end('load', 'pos'), props: run(35, 1) },
        { id: 'cn', from: end('b1', 'neg'), to: end('load', 'neg'), props: run(35, 1) },
      ],
    );
    expect(ids(d)).not.toContain('main-overcurrent-missing');
  });

  it('a charger wired to the bank needs its own overcurrent device too', () => {
    const d = withCharger(withDisconnect(busbarBankTemplate({ count: 2 })));
    const f = findings(d, 'main-overcurrent-missing');
    expect(f.map((x) => x.parts[0])).toEqual(['charger']);
    expect(f[0].message).toContain('positive charger output of Shore charger');
    expect(f[0].message).toContain('charger limit 40.0 A');
  });
});

describe('battery-disconnect-missing', () => {
  it('12.8 V bank, general rule set: a warning (below the 60 V of NEC 480.7, from memory)', () => {
    const f = findings(busbarBankTemplate({ count: 4 }), 'battery-disconnect-missing');
    expect(f).toHaveLength(1);
    expect(f[0].severity).toBe('warning');
    expect(f[0].parts).toEqual(['inverter', 'bat1', 'bat2', 'bat3', 'bat4']);
    expect(f[0].message).toContain('between the bank and Inverter');
    expect(f[0].message).toContain('Battery 1, Battery 2, Battery 3 and Battery 4');
    expect(f[0].message).toContain('12.8 V bank');
    expect(f[0].message).toContain('60 V');
  });

  it('marine rule set: an error (ABYC E-11 battery switch, from memory)', () => {
    const f = findings(marine(busbarBankTemplate({ count: 4 })), 'battery-disconnect-missing');
    expect(f.map((x) => x.severity)).toEqual(['error']);
    expect(f[0].message).toContain('ABYC E-11');
  });

  it('above 60 V DC: an error (NEC 480.7, from memory) — 8 × 12.8 V LFP in series, 102.4 V', () => {
    const d = seriesParallelTemplate({ seriesCount: 8, parallelCount: 2 });
    const f = findings(d, 'battery-disconnect-missing');
    expect(f.map((x) => x.severity)).toEqual(['error']);
    expect(f[0].message).toContain('102.4 V');
    expect(f[0].message).toContain('NEC 480.7');
  });

  it('does not fire with a battery switch in the feed, closed or open', () => {
    expect(ids(withDisconnect(busbarBankTemplate({ count: 4 })))).not.toContain('battery-disconnect-missing');
    expect(ids(marine(withDisconnect(busbarBankTemplate({ count: 4 }))))).not.toContain('battery-disconnect-missing');
    expect(ids(withDisconnect(busbarBankTemplate({ count: 4 }), false))).not.toContain('battery-disconnect-missing');
  });
});

describe('battery-fuse-distance (marine rule set; ABYC E-11: within 7 in / 175 mm along the conductor)', () => {
  it('fires for a fuse 300 mm from the post, under the marine rule set only', () => {
    const d = withDisconnect(busbarBankTemplate({ count: 4 }));
    cable(d, 'c-fuse2').props.length_m = 0.3;
    const f = findings(marine(d), 'battery-fuse-distance');
    expect(f).toHaveLength(1);
    expect(f[0].parts).toEqual(['bat2', 'fuse2']);
    expect(f[0].message).toContain('positive conductor of Battery 2, Fuse 2, is');
    expect(f[0].message).toContain('300 mm (11.8 in)'); // 300 / 25.4 = 11.81 in
    expect(f[0].message).toContain('175 mm (7 in)');
    expect(ids(d)).not.toContain('battery-fuse-distance');
  });

  it('175 mm is within the limit, 180 mm is not', () => {
    const at = (m: number) => {
      const d = busbarBankTemplate({ count: 2 });
      cable(d, 'c-fuse1').props.length_m = m;
      return findings(marine(d), 'battery-fuse-distance').map((f) => f.parts[0]);
    };
    expect(at(0.175)).toEqual([]);
    expect(at(0.18)).toEqual(['bat1']);
  });

  it('counts every run between the post and the fuse: 100 mm + 100 mm through a shunt is 200 mm', () => {
    const d = busbarBankTemplate({ count: 1 });
    const c = cable(d, 'c-fuse1');
    c.props.length_m = 0.1;
    c.to = { part: 'shunt', terminal: 'a' };
    d.parts.push({ id: 'shunt', type: 'shunt', label: 'Shunt', position: { x: 0, y: -80 }, rotation: 0, props: { rating_A: 500, drop_mV: 50 } });
    d.cables.push({ id: 'c-shunt', from: { part: 'shunt', terminal: 'b' }, to: { part: 'fuse1', terminal: 'a' }, props: { ...c.props, length_m: 0.1 } });
    const f = findings(marine(d), 'battery-fuse-distance');
    expect(f.map((x) => x.parts)).toEqual([['bat1', 'fuse1']]);
    expect(f[0].message).toContain('200 mm');
  });

  it('a battery whose conductor reaches no fuse at all', () => {
    const d = busbarBankTemplate({ count: 1, batteryFuse: null, mainFuse: null });
    const f = findings(marine(d), 'battery-fuse-distance');
    expect(f.map((x) => x.parts)).toEqual([['bat1']]);
    expect(f[0].message).toContain('reaches no fuse');
  });
});

describe('fuse-voltage-rating: against the charging voltage, not the nominal', () => {
  it('a 14 V fuse on a 12.8 V LFP bank is below its 14.6 V full charge (3.65 V per cell × 4, common practice)', () => {
    const d = busbarBankTemplate({ count: 2 });
    part<{ voltage_rating_V: number }>(d, 'fuse1').voltage_rating_V = 14;
    const f = findings(d, 'fuse-voltage-rating');
    expect(f.map((x) => [x.parts[0], x.severity])).toEqual([['fuse1', 'error']]);
    expect(f[0].message).toContain('14.6 V');
    expect(f[0].message).toContain('3.65 V per cell × 4 cells');
    part<{ voltage_rating_V: number }>(d, 'fuse1').voltage_rating_V = 32;
    expect(ids(d)).not.toContain('fuse-voltage-rating');
  });

  it("a 58 V fuse on a 48 V system of 16 LFP cells: above the 51.2 V nominal, below the 58.4 V charge (3.65 V × 16)", () => {
    const d = seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 });
    part<{ voltage_rating_V: number }>(d, 'fuse1').voltage_rating_V = 58;
    const f = findings(d, 'fuse-voltage-rating');
    expect(f.map((x) => x.parts[0])).toEqual(['fuse1']);
    expect(f[0].message).toContain('58.4 V');
    part<{ voltage_rating_V: number }>(d, 'fuse1').voltage_rating_V = 60;
    expect(ids(d)).not.toContain('fuse-voltage-rating');
  });

  it("an enabled charger's setpoint is the bank's highest voltage; a disabled one is not", () => {
    const on = withCharger(busbarBankTemplate({ count: 2 }), { voltage_setpoint_V: 14.2, enabled: true });
    part<{ voltage_rating_V: number }>(on, 'fuse1').voltage_rating_V = 14.4;
    expect(ids(on)).not.toContain('fuse-voltage-rating');
    part<{ voltage_rating_V: number }>(on, 'fuse1').voltage_rating_V = 14;
    expect(findings(on, 'fuse-voltage-rating')[0].message).toContain('the setpoint of Shore charger');
    const off = withCharger(busbarBankTemplate({ count: 2 }), { voltage_setpoint_V: 14.2, enabled: false });
    part<{ voltage_rating_V: number }>(off, 'fuse1').voltage_rating_V = 14.4;
    expect(findings(off, 'fuse-voltage-rating')[0].message).toContain('14.6 V'); // LFP 3.65 V × 4
  });
});

describe('bank C-rate against the batteries\u2019 continuous limits', () => {
  it('bank-over-continuous: four 100 Ah batteries limited to 40 A each (160 A, 0.40 C) under a 2000 W inverter', () => {
    const d = withDisconnect(busbarBankTemplate({ count: 4, battery: { ...batteryDefaults('lfp', 100), max_continuous_A: 40 } }));
    const f = findings(d, 'bank-over-continuous');
    expect(f).toHaveLength(1);
    expect(f[0].parts).toEqual(['bat1', 'bat2', 'bat3', 'bat4']);
    expect(f[0].message).toContain('combined continuous limit of 160 A (0.40 C)'); // 4 × 40 A; 160 A / 400 Ah
    expect(f[0].message).toContain('400 Ah');
    // 2000 W at 90 % between 12.8 V and 13.6 V (first principles): 163–174 A, 0.41–0.43 C of 400 Ah.
    const c = Number(/, (\d\.\d\d) C of its/.exec(f[0].message)?.[1]);
    expect(c).toBeGreaterThanOrEqual(0.4);
    expect(c).toBeLessThanOrEqual(0.44);
    expect(ids(withDisconnect(busbarBankTemplate({ count: 4 })))).not.toContain('bank-over-continuous');
  });

  it('battery-over-continuous reports the bank C-rate, and says when balance (not size) is the fix', () => {
    const d = busbarBankTemplate({ count: 4 });
    part<{ max_continuous_A: number }>(d, 'bat4').max_continuous_A = 30;
    const f = findings(d, 'battery-over-continuous');
    expect(f.map((x) => x.parts[0])).toEqual(['bat4']);
    // Combined limit: 3 × 100 A + 30 A = 330 A over 400 Ah = 0.83 (0.825) C.
    expect(f[0].message).toMatch(/combined limit of 0\.8[23] C/);
    expect(f[0].message).toContain('(0.30 C)'); // 30 A / 100 Ah
    expect(f[0].suggestion).toMatch(/balance/);
    expect(ids(d)).not.toContain('bank-over-continuous');
  });
});

describe('short-cable (note)', () => {
  it('a 0 mm and a 5 mm run with a conductor ask to be confirmed; 10 mm does not', () => {
    const d = withDisconnect(busbarBankTemplate({ count: 2 }));
    cable(d, 'c-fuse1').props.length_m = 0;
    cable(d, 'c-fuse2').props.length_m = 0.005;
    const f = findings(d, 'short-cable');
    expect(f.map((x) => [x.parts[0], x.severity])).toEqual([['c-fuse1', 'note'], ['c-fuse2', 'note']]);
    expect(f[0].message).toContain('0 mm');
    // An unlabelled cable is named by its ends.
    expect(f[0].message).toContain('The cable from Battery 1 + to Fuse 1 is 0 mm long');
    expect(f[1].message).toContain('5 mm');
    cable(d, 'c-fuse2').props.length_m = 0.01;
    expect(findings(d, 'short-cable').map((x) => x.parts[0])).toEqual(['c-fuse1']);
  });
});

describe('settings.ruleSet', () => {
  it("a document written before the setting reads as the 'general' rule set", () => {
    const input = JSON.parse(JSON.stringify(busbarBankTemplate({ count: 2 })));
    delete input.settings.ruleSet;
    expect(diagramSchema.parse(input).settings.ruleSet).toBe('general');
    expect(diagramSchema.safeParse({ ...input, settings: { ...input.settings, ruleSet: 'offshore' } }).success).toBe(false);
  });
});
