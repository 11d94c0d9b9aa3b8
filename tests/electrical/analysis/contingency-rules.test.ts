/** The rules on the N-1 study ('n-minus-one') and on an inverter's surge ('inverter-surge'). */
import { describe, expect, it } from 'vitest';
import type { DiagramDocumentInput } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/study';
import type { FuseProps, InverterProps } from '../../../shared/electrical/parts';
import { battery, currentLoad, diagram, end, run } from './helpers';

const fuse = (id: string, label: string, rating_A: number, extra: Partial<FuseProps> = {}) => ({
  id, label, type: 'fuse' as const, position: { x: 0, y: -100 },
  props: { fuseClass: 'class_t' as const, rating_A, voltage_rating_V: 160, interrupting_A: 20_000, ...extra },
});

interface BankOptions {
  count: number;
  fuse_A: number;
  /** The load: a constant current, A, or an inverter. */
  load: { current_A: number } | { inverter: InverterProps; mainFuse_A?: number };
  battery?: Record<string, unknown>;
  /** Leads: 70 mm² labelled "Lead k+" / "Lead k−" (default), or unlabelled 4 AWG. */
  leads?: 'labelled' | 'awg4';
}

/**
 * `count` LFP 100 Ah batteries (4 mΩ), each with its own fuse bolted to its positive post (battery side
 * 'a'), 1 m leads of 70 mm² from each fuse's bank side and each negative to the load, or to a main fuse
 * in front of an inverter.
 */
function bank(o: BankOptions) {
  const parts: DiagramDocumentInput['parts'] = [];
  const cables: DiagramDocumentInput['cables'] = [];
  const inverter = 'inverter' in o.load ? o.load : null;
  const posTarget = inverter?.mainFuse_A ? end('fm', 'a') : end('load', 'pos');
  for (let k = 1; k <= o.count; k++) {
    parts.push({ ...battery(`b${k}`, k * 200, { r_internal_ohm: 0.004, ...o.battery }), label: `House ${k}` });
    parts.push(fuse(`f${k}`, `Fuse ${k}`, o.fuse_A));
    cables.push({ id: `post${k}`, from: end(`b${k}`, 'pos'), to: end(`f${k}`, 'a'), props: run(70, 0) });
    if (o.leads === 'awg4') {
      const awg4 = { ...run(70, 1), conductor: { system: 'awg' as const, size: '4' as const } };
      cables.push({ id: `cp${k}`, from: end(`f${k}`, 'b'), to: posTarget, props: awg4 });
      cables.push({ id: `cn${k}`, from: end(`b${k}`, 'neg'), to: end('load', 'neg'), props: awg4 });
    } else {
      cables.push({ id: `cp${k}`, label: `Lead ${k}+`, from: end(`f${k}`, 'b'), to: posTarget, props: run(70, 1) });
      cables.push({ id: `cn${k}`, label: `Lead ${k}−`, from: end(`b${k}`, 'neg'), to: end('load', 'neg'), props: run(70, 1) });
    }
  }
  if (inverter) {
    parts.push({ id: 'load', label: 'Inverter', type: 'inverter', position: { x: 900, y: 0 }, props: inverter.inverter });
    if (inverter.mainFuse_A) {
      parts.push(fuse('fm', 'Main fuse', inverter.mainFuse_A));
      cables.push({ id: 'feed', from: end('fm', 'b'), to: end('load', 'pos'), props: run(95, 0.5) });
    }
  } else if ('current_A' in o.load) parts.push({ ...currentLoad('load', o.load.current_A), label: 'DC panel' });
  return diagram(parts, cables);
}

const found = (doc: ReturnType<typeof diagram>, id: string) => analyzeDiagram(doc).findings.filter((f) => f.id === id);

describe('n-minus-one', () => {
  it('fires as an error when the battery left would exceed its maximum continuous current', () => {
    // Two equal batteries share 150 A (75 A each, by symmetry). With one disconnected the other carries
    // all 150 A (Kirchhoff's current law): 150 % of the 100 A continuous limit of a 100 Ah LFP battery
    // (1C, common practice from memory) and 120 % of its 125 A fuse.
    const f = found(bank({ count: 2, fuse_A: 125, load: { current_A: 150 } }), 'n-minus-one');
    expect(f).toHaveLength(2);
    const one = f.find((x) => x.parts[0] === 'b2')!;
    expect(one.severity).toBe('error');
    expect(one.message).toContain('With House 2 disconnected (its BMS or fuse open), House 1 carries 150 A, 150 % of its maximum continuous current of 100 A.');
    expect(one.message).toContain('Fuse 1 150 A (125 A rating)');
    expect(one.parts).toEqual(expect.arrayContaining(['b2', 'b1', 'f1']));
    expect(one.basis).toMatch(/common practice/);
  });

  it('is a warning when only a fuse is over, naming the fuse and its numbers', () => {
    // Batteries rated 200 A continuous: only the 125 A fuse is exceeded (150 A, 120 %).
    const f = found(bank({ count: 2, fuse_A: 125, load: { current_A: 150 }, battery: { max_continuous_A: 200 } }), 'n-minus-one');
    expect(f).toHaveLength(2);
    expect(f.every((x) => x.severity === 'warning')).toBe(true);
    expect(f.find((x) => x.parts[0] === 'b1')!.message).toBe(
      'With House 1 disconnected (its BMS or fuse open), Fuse 2 carries 150 A, 120 % of its 125 A rating.',
    );
  });

  it('names an unlabelled cable by its two ends, with its ampacity', () => {
    // 4 AWG copper: 85 A at 30 °C (NEC Table 310.16, 75 °C column). 100 A on two batteries is 50 A per
    // lead; with one battery out the other's leads carry all 100 A (KCL). Batteries rated 200 A, fuses 125 A.
    const doc = bank({ count: 2, fuse_A: 125, load: { current_A: 100 }, battery: { max_continuous_A: 200 }, leads: 'awg4' });
    const f = found(doc, 'n-minus-one').find((x) => x.parts[0] === 'b2')!;
    expect(f.severity).toBe('warning');
    expect(f.message).toMatch(/^With House 2 disconnected \(its BMS or fuse open\), the cable (Fuse 1 \(bank side\) to DC panel \(\+\)|House 1 \(−\) to DC panel \(−\)) carries 100 A, 118 % of its ampacity of 85\.0 A\./);
    expect(f.parts.sort()).toEqual(['b2', 'cn1', 'cp1']);
  });

  it('does not fire when every other battery, fuse and cable stays within its limit', () => {
    // Three batteries, 150 A: with one out the other two carry 75 A each (symmetry and KCL), under the
    // 100 A continuous limit and the 125 A fuses.
    expect(found(bank({ count: 3, fuse_A: 125, load: { current_A: 150 } }), 'n-minus-one')).toEqual([]);
  });

  it('leaves a part that is already over in the load case to the load-case rules', () => {
    // 130 A on two batteries: 65 A each through 60 A fuses already; with one out, 130 A. The fuses are
    // reported by fuse-below-design-current; the batteries (rated 200 A) stay within their limit.
    const doc = bank({ count: 2, fuse_A: 60, load: { current_A: 130 }, battery: { max_continuous_A: 200 } });
    expect(found(doc, 'n-minus-one')).toEqual([]);
    expect(found(doc, 'fuse-below-design-current').length).toBeGreaterThan(0);
  });

  it('is not run for a single battery', () => {
    expect(found(bank({ count: 1, fuse_A: 125, load: { current_A: 90 } }), 'n-minus-one')).toEqual([]);
  });
});

describe('inverter-surge', () => {
  const inv = (p: Partial<InverterProps>): InverterProps => ({ power_W: 1000, rated_W: 1000, efficiency: 0.9, ...p });
  // Surge DC current: I = P_surge / (V_nominal × efficiency) (first principles), V_nominal = 4 × 3.2 V
  // = 12.8 V for LFP (common practice). Two equal batteries on equal leads split it in half (symmetry).
  const surgeA = (w: number) => w / (12.8 * 0.9);

  it('does not fire for the default surge (2 × 1000 W for 5 s) on two 100 Ah LFP batteries', () => {
    // 2000 W → 173.6 A, 86.8 A per battery: under the 200 A pulse limit (2C for 5 s, common practice
    // from memory) and the 150 A fuses; the main fuse (300 A) carries 173.6 A.
    expect(surgeA(2000) / 2).toBeLessThan(150);
    expect(found(bank({ count: 2, fuse_A: 150, load: { inverter: inv({}), mainFuse_A: 300 } }), 'inverter-surge')).toEqual([]);
  });

  it('fires for each battery over its pulse limit and each fuse over its rating during the surge', () => {
    // 6000 W for 5 s → 520.8 A; 260.4 A per battery, above the 200 A pulse limit (2C × 100 Ah for
    // 5 s, common practice from memory) and the 150 A battery fuses; the main fuse in the inverter's
    // feed carries all 520.8 A, 174 % of its 300 A rating.
    const f = found(bank({ count: 2, fuse_A: 150, load: { inverter: inv({ surge_W: 6000, surge_s: 5 }), mainFuse_A: 300 } }), 'inverter-surge');
    // Batteries over their pulse limit are warnings; fuses at 174 % of rating (up to 2 ×, from memory a fuse
    // usually holds for longer than the surge) are notes to check the curve.
    expect(f.filter((x) => x.parts[1] === 'b1' || x.parts[1] === 'b2').every((x) => x.severity === 'warning')).toBe(true);
    expect(f.filter((x) => ['f1', 'f2', 'fm'].includes(x.parts[1])).every((x) => x.severity === 'note')).toBe(true);
    const head = `During Inverter’s surge (6 kW for 5 s, about ${surgeA(6000).toFixed(0)} A from the bank at 12.8 V and 90 % efficiency)`;
    const each = (surgeA(6000) / 2).toFixed(0);
    expect(f.find((x) => x.parts[1] === 'b1')!.message).toBe(`${head}, House 1 would deliver about ${each} A, above its pulse limit of 200 A (for 5 s).`);
    expect(f.find((x) => x.parts[1] === 'f2')!.message).toBe(
      `${head}, Fuse 2 would carry about ${each} A, ${((surgeA(6000) / 2 / 150) * 100).toFixed(0)} % of its 150 A rating: its time–current curve must allow 5 s at that current.`,
    );
    expect(f.find((x) => x.parts[1] === 'fm')!.message).toContain(`Main fuse would carry about ${surgeA(6000).toFixed(0)} A, ${((surgeA(6000) / 300) * 100).toFixed(0)} % of its 300 A rating`);
    expect(f.map((x) => x.parts[1]).sort()).toEqual(['b1', 'b2', 'f1', 'f2', 'fm']);
  });

  it('a fuse at more than twice its rating during the surge is a warning', () => {
    // 6000 W → 520.8 A in the inverter's feed: 347 % of a 150 A main fuse (first principles: I = P / (V × efficiency)).
    const f = found(bank({ count: 2, fuse_A: 300, load: { inverter: inv({ surge_W: 6000, surge_s: 5 }), mainFuse_A: 150 } }), 'inverter-surge');
    expect(f.find((x) => x.parts[1] === 'fm')?.severity).toBe('warning');
  });

  it('a surge longer than the battery\u2019s pulse rating is held against its continuous limit', () => {
    // 3000 W → 260.4 A, 130.2 A per battery: within the 200 A pulse limit for 5 s, but a 10 s surge
    // outlasts the 5 s pulse rating, and 130.2 A is above the 100 A continuous limit (1C, from memory).
    const long = found(bank({ count: 2, fuse_A: 150, load: { inverter: inv({ surge_W: 3000, surge_s: 10 }) } }), 'inverter-surge');
    expect(long.map((x) => x.parts[1]).sort()).toEqual(['b1', 'b2']);
    expect(long[0].message).toContain(`would deliver about ${(surgeA(3000) / 2).toFixed(0)} A for longer than its 5 s pulse rating, above its maximum continuous current of 100 A.`);
    const short = found(bank({ count: 2, fuse_A: 150, load: { inverter: inv({ surge_W: 3000, surge_s: 5 }) } }), 'inverter-surge');
    expect(short).toEqual([]);
  });

  it('uses the battery\u2019s own pulse figure when given', () => {
    // 6000 W → 260.4 A per battery, under a stated 300 A pulse limit for 10 s; the fuses are 300 A.
    const doc = bank({ count: 2, fuse_A: 300, load: { inverter: inv({ surge_W: 6000, surge_s: 5 }) }, battery: { max_pulse_A: 300, pulse_s: 10 } });
    expect(found(doc, 'inverter-surge')).toEqual([]);
  });
});
