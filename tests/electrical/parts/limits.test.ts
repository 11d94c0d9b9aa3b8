/** Battery current limits (continuous and pulse) and inverter surge: defaults, own figures, old documents. */
import { describe, expect, it } from 'vitest';
import { diagramSchema } from '../../../shared/diagram';
import {
  BATTERY_PRESETS, batteryDefaults, batteryMaxContinuous_A, batteryMaxPulse_A, batteryPropsSchema, batteryPulse_s,
  inverterDefaults, inverterPropsSchema, inverterSurge_s, inverterSurge_W, seriesStringPropsSchema, stringLimits, unitLimits,
} from '../../../shared/electrical/parts';
import { libraryItemSchema } from '../../../shared/library';

describe('battery pulse limits: defaults per chemistry', () => {
  it('a new 100 Ah LFP battery allows 100 A continuous and 200 A for 5 s', () => {
    // LFP: about 1C continuous and about 2C for about 5 s, set by the BMS (common practice, from memory).
    expect(batteryDefaults('lfp', 100)).toMatchObject({ max_continuous_A: 100, max_pulse_A: 200, pulse_s: 5 });
  });

  it('lead-acid and NMC batteries get their own chemistry figures', () => {
    // From memory (common practice): AGM about 0.5C continuous and about 5C for about 5 s; gel 0.2C and
    // about 3C for 5 s; flooded 0.25C and about 5C for 5 s; NMC 1C and about 2C for about 10 s.
    expect(batteryDefaults('agm', 200)).toMatchObject({ max_continuous_A: 100, max_pulse_A: 1000, pulse_s: 5 });
    expect(batteryDefaults('gel', 100)).toMatchObject({ max_continuous_A: 20, max_pulse_A: 300, pulse_s: 5 });
    expect(batteryDefaults('flooded', 200)).toMatchObject({ max_continuous_A: 50, max_pulse_A: 1000, pulse_s: 5 });
    expect(batteryDefaults('nmc', 50)).toMatchObject({ max_continuous_A: 50, max_pulse_A: 100, pulse_s: 10 });
  });

  it('the battery\u2019s own figures win; without them the chemistry\u2019s typical figures apply', () => {
    const own = { ...batteryDefaults('lfp', 280), max_pulse_A: 350, pulse_s: 3 };
    expect(batteryMaxPulse_A(own)).toBe(350);
    expect(batteryPulse_s(own)).toBe(3);
    // A battery saved before these fields existed: 2C × 280 Ah = 560 A for 5 s (LFP, from memory).
    const { max_pulse_A: _p, pulse_s: _s, ...old } = batteryDefaults('lfp', 280);
    expect(batteryMaxPulse_A(old)).toBe(560);
    expect(batteryPulse_s(old)).toBe(5);
  });

  it('battery presets carry the pulse figures', () => {
    // LFP 2C for 5 s, AGM 5C for 5 s (common practice, from memory).
    const preset = (chem: string, ah: number) => BATTERY_PRESETS.find((p) => p.props.chemistry === chem && p.props.capacity_Ah === ah)!.props;
    expect(preset('lfp', 200)).toMatchObject({ max_pulse_A: 400, pulse_s: 5 });
    expect(preset('agm', 100)).toMatchObject({ max_pulse_A: 500, pulse_s: 5 });
    for (const p of BATTERY_PRESETS) expect(p.props.max_pulse_A! > 0 && p.props.pulse_s! > 0).toBe(true);
  });

  it('rejects a non-positive pulse current or duration', () => {
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), max_pulse_A: 0 }).success).toBe(false);
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), pulse_s: -1 }).success).toBe(false);
  });
});

describe('series strings: each limit is the smallest member\u2019s', () => {
  it('takes the smallest continuous, pulse and duration over the members', () => {
    // In series one current flows through every member (first principles), so the weakest member sets each limit.
    const a = { ...batteryDefaults('lfp', 100), max_continuous_A: 120, max_pulse_A: 250, pulse_s: 10 };
    const b = { ...batteryDefaults('lfp', 100), max_continuous_A: 100, max_pulse_A: 300, pulse_s: 3 };
    expect(unitLimits([a, b])).toEqual({ maxContinuous_A: 100, maxPulse_A: 250, pulse_s: 3 });
    const s = seriesStringPropsSchema.parse({ count: 2, member: a, members: [a, b] });
    expect(stringLimits(s)).toEqual({ maxContinuous_A: 100, maxPulse_A: 250, pulse_s: 3 });
    expect(batteryMaxContinuous_A(b)).toBe(100);
  });
});

describe('inverter surge', () => {
  it('without its own figures: 2 × the continuous rating for 5 s', () => {
    // Common practice, from memory: inverters commonly state a surge of about twice their rating for seconds.
    expect(inverterSurge_W({ power_W: 1500, rated_W: 3000, efficiency: 0.9 })).toBe(6000);
    expect(inverterSurge_W({ power_W: 1500, efficiency: 0.9 })).toBe(3000); // no rating: the power in the case
    expect(inverterSurge_s({ power_W: 1500, efficiency: 0.9 })).toBe(5);
  });

  it('its own figures win', () => {
    const p = { ...inverterDefaults(), surge_W: 7000, surge_s: 0.5 };
    expect(inverterPropsSchema.parse(p)).toEqual(p);
    expect(inverterSurge_W(p)).toBe(7000);
    expect(inverterSurge_s(p)).toBe(0.5);
  });

  it('rejects a zero surge', () => {
    expect(inverterPropsSchema.safeParse({ ...inverterDefaults(), surge_W: 0 }).success).toBe(false);
    expect(inverterPropsSchema.safeParse({ ...inverterDefaults(), surge_s: 0 }).success).toBe(false);
  });
});

describe('documents saved before the pulse and surge fields', () => {
  // A document as an earlier version wrote it: no max_pulse_A, pulse_s, surge_W or surge_s.
  const oldBattery = { chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 100, r_internal_ohm: 0.00125, max_continuous_A: 100, soc: 0.9 };
  const oldInverter = { power_W: 2000, rated_W: 2000, efficiency: 0.9, cutoff_V: 10.5 };
  const oldDoc = {
    formatVersion: 1,
    settings: { systemVoltage_V: 12 },
    parts: [
      { id: 'bat1', type: 'battery', position: { x: 0, y: 0 }, props: oldBattery },
      { id: 'inv', type: 'inverter', position: { x: 400, y: 0 }, props: oldInverter },
    ],
    cables: [],
  };

  it('parse unchanged: no new fields are filled in', () => {
    const doc = diagramSchema.parse(structuredClone(oldDoc));
    expect(doc.parts[0].props).toEqual(oldBattery);
    expect(doc.parts[1].props).toEqual(oldInverter);
  });

  it('a library battery without the new fields still parses unchanged', () => {
    const item = { kind: 'battery', name: 'Old LFP 100', props: { ...oldBattery, soc: 1 } };
    const r = libraryItemSchema.safeParse(item);
    expect(r.success).toBe(true);
    expect(r.data?.props).toEqual({ ...oldBattery, soc: 1 });
  });
});
