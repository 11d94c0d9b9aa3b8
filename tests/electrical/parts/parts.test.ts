import { describe, expect, it } from 'vitest';
import {
  BATTERY_PRESETS, CONDUCTOR_PRESETS, FUSE_PRESETS, PART_TYPES, PART_TYPE_IDS, batteryDefaults, batteryOcv_V,
  batteryPropsSchema, batteryShortCircuit_A, busbarSegmentResistances_ohm, busbarTerminals, cableRunPropsSchema,
  defaultPartProps, dcLoadModel, inverterDcPower_W, inverterModel, partModel, partTerminals, seriesStringModel,
  shuntResistance_ohm, stringNominal_V, cableRunDefaults, switchModel, fuseModel, chargerModel,
} from '../../../shared/electrical/parts';

const ctx = { ambient_C: 20, systemVoltage_V: 12 };

describe('part registry', () => {
  it.each(PART_TYPE_IDS)('%s: its defaults satisfy its own schema', (type) => {
    const def = PART_TYPES[type];
    expect(def.schema.safeParse(defaultPartProps(type)).success).toBe(true);
  });

  it('declares the terminals of each part', () => {
    expect(partTerminals('battery', defaultPartProps('battery'))).toEqual(['pos', 'neg']);
    expect(partTerminals('fuse', defaultPartProps('fuse'))).toEqual(['a', 'b']);
    expect(partTerminals('inverter', defaultPartProps('inverter'))).toEqual(['pos', 'neg']);
    expect(partTerminals('busbar', { ...defaultPartProps('busbar'), tapCount: 3 })).toEqual(['t1', 't2', 't3']);
    expect(partTerminals('note', defaultPartProps('note'))).toEqual([]);
    expect(partModel('note', { text: 'x' }, ctx).elements).toEqual([]);
  });

  it('new battery is 12.8 V 100 Ah lithium iron phosphate; new cable is 2/0 AWG copper', () => {
    expect(defaultPartProps('battery')).toMatchObject({ chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 100 });
    expect(cableRunDefaults()).toMatchObject({ conductor: { system: 'awg', size: '2/0' }, material: 'copper' });
  });

  it('offers presets of common sizes', () => {
    expect(BATTERY_PRESETS.some((p) => p.props.chemistry === 'lfp' && p.props.capacity_Ah === 200)).toBe(true);
    expect(CONDUCTOR_PRESETS.map((p) => p.label)).toEqual(expect.arrayContaining(['2/0 AWG', '4/0 AWG', '35 mm²', '250 kcmil']));
    expect(FUSE_PRESETS.some((p) => p.props.fuseClass === 'class_t' && p.props.rating_A === 200)).toBe(true);
    for (const p of BATTERY_PRESETS) expect(batteryPropsSchema.safeParse(p.props).success).toBe(true);
  });
});

describe('battery', () => {
  it('open-circuit voltage follows the chemistry curve: a 12 V AGM at 50 % rests at 12.24 V (common practice)', () => {
    const agm = { ...batteryDefaults('agm', 100), soc: 0.5 };
    expect(agm.nominal_V).toBe(12);
    expect(batteryOcv_V(agm)).toBeCloseTo(12.24, 9);
  });

  it('a measured resting voltage wins over the curve', () => {
    expect(batteryOcv_V({ ...batteryDefaults(), restingVoltage_V: 13.31 })).toBe(13.31);
  });

  it('short-circuit estimate is OCV / r unless the battery gives its own (first principles)', () => {
    const b = { ...batteryDefaults('agm', 100), soc: 1, r_internal_ohm: 0.005 };
    expect(batteryShortCircuit_A(b)).toBeCloseTo(12.65 / 0.005, 6);
    expect(batteryShortCircuit_A({ ...b, short_circuit_A: 3000 })).toBe(3000);
  });

  it('the model is one battery element pos/neg with the OCV and internal resistance', () => {
    const b = { ...batteryDefaults('agm', 100), soc: 1, r_internal_ohm: 0.004 };
    expect(partModel('battery', b, ctx).elements).toEqual([
      { id: 'cell', kind: 'battery', pos: 'pos', neg: 'neg', ocv_V: expect.closeTo(12.65, 9), r_ohm: 0.004, role: 'battery' },
    ]);
  });

  it('rejects a state of charge outside 0..1 and a non-positive capacity', () => {
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), soc: 1.2 }).success).toBe(false);
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), capacity_Ah: 0 }).success).toBe(false);
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), installDate: '2023-02-30x' }).success).toBe(false);
    expect(batteryPropsSchema.safeParse({ ...batteryDefaults(), installDate: '2023-02-14' }).success).toBe(true);
  });
});

describe('series string', () => {
  it('expands to members in series bottom to top, with jumpers when given', () => {
    const member = { ...batteryDefaults('agm', 100), soc: 1, r_internal_ohm: 0.005 };
    const s = { count: 4, member };
    expect(stringNominal_V(s)).toBe(48);
    const direct = seriesStringModel(s, ctx).elements;
    expect(direct.map((e) => e.id)).toEqual(['b1', 'b2', 'b3', 'b4']);
    expect(direct[0]).toMatchObject({ neg: 'neg', pos: '_p1' });
    expect(direct[1]).toMatchObject({ neg: '_p1', pos: '_p2' });
    expect(direct[3]).toMatchObject({ neg: '_p3', pos: 'pos' });
    const jumped = seriesStringModel({ ...s, interconnect: { conductor: { system: 'mm2', size: 35 }, length_m: 0.3, material: 'copper' } }, ctx).elements;
    expect(jumped.map((e) => e.id)).toEqual(['b1', 'j1', 'b2', 'j2', 'b3', 'j3', 'b4']);
    // 35 mm² flexible copper, 0.3 m at 20 °C: 0.017241 × 1.10 × 0.3 / 35 Ω (IEC 60028 resistivity, class 5 allowance)
    expect(jumped[1]).toMatchObject({ kind: 'resistor', a: '_p1', b: '_n2', r_ohm: expect.closeTo(0.017241 * 1.1 * 0.3 / 35, 12) });
  });
});

describe('pass-through parts', () => {
  it('busbar segments: ρ L / A, 25 × 6 mm copper, 40 mm between studs at 20 °C', () => {
    const bar = { ...defaultPartProps('busbar'), width_mm: 25, thickness_mm: 6, tapSpacing_m: 0.04, tapCount: 4 };
    const r = busbarSegmentResistances_ohm(bar, 20);
    expect(r).toHaveLength(3);
    for (const x of r) expect(x).toBeCloseTo((0.017241 * 0.04) / 150, 12); // IEC 60028 resistivity
    expect(busbarTerminals(bar)).toEqual(['t1', 't2', 't3', 't4']);
    const custom = busbarSegmentResistances_ohm({ ...bar, segmentLengths_m: [0.02, 0.04, 0.08] }, 20);
    expect(custom[2] / custom[0]).toBeCloseTo(4, 9);
  });

  it('shunt: 500 A / 50 mV is 0.1 mΩ (first principles)', () => {
    expect(shuntResistance_ohm({ rating_A: 500, drop_mV: 50 })).toBeCloseTo(1e-4, 12);
  });

  it('fuse uses its cold resistance when given', () => {
    const f = { ...defaultPartProps('fuse'), cold_r_ohm: 0.00042 };
    expect(fuseModel(f).elements[0]).toMatchObject({ kind: 'resistor', a: 'a', b: 'b', r_ohm: 0.00042 });
  });

  it('open switch is a very high resistance, closed is its contact resistance', () => {
    expect(switchModel({ rating_A: 300, contact_ohm: 1e-4, closed: true }).elements[0]).toMatchObject({ r_ohm: 1e-4, role: 'switch' });
    const open = switchModel({ rating_A: 300, contact_ohm: 1e-4, closed: false }).elements[0];
    expect(open.kind === 'resistor' && open.r_ohm).toBeGreaterThan(1e6);
  });
});

describe('loads and charger', () => {
  it('inverter is a constant-power load of P / efficiency', () => {
    const p = { power_W: 2000, efficiency: 0.9 };
    expect(inverterDcPower_W(p)).toBeCloseTo(2222.222, 3);
    expect(inverterModel(p).elements[0]).toMatchObject({ kind: 'constant_power', pos: 'pos', neg: 'neg', watts: expect.closeTo(2222.222, 3) });
    // Rule of thumb (common practice): 2 kW at 12 V with no losses is about 167 A.
    expect(inverterDcPower_W({ power_W: 2000, efficiency: 1 }) / 12).toBeCloseTo(166.7, 1);
  });

  it('DC load modes map to a current source, a resistor or constant power', () => {
    expect(dcLoadModel({ mode: 'current', current_A: 12 }).elements[0]).toMatchObject({ kind: 'current_source', from: 'pos', to: 'neg', amps: 12 });
    expect(dcLoadModel({ mode: 'resistance', r_ohm: 2 }).elements[0]).toMatchObject({ kind: 'load_resistor', a: 'pos', b: 'neg', r_ohm: 2 });
    expect(dcLoadModel({ mode: 'power', power_W: 300 }).elements[0]).toMatchObject({ kind: 'constant_power', watts: 300 });
  });

  it('charger is a current-limited voltage source; off means no element', () => {
    expect(chargerModel({ voltage_setpoint_V: 14.2, current_limit_A: 40, r_internal_ohm: 0.01, enabled: true }).elements[0]).toMatchObject({
      kind: 'voltage_source', pos: 'pos', neg: 'neg', volts: 14.2, i_max_A: 40, r_ohm: 0.01,
    });
    expect(chargerModel({ voltage_setpoint_V: 14.2, current_limit_A: 40, r_internal_ohm: 0, enabled: false }).elements).toEqual([]);
  });
});

describe('cable run props', () => {
  it('fills defaults and accepts each conductor system', () => {
    const r = cableRunPropsSchema.parse({ conductor: { system: 'kcmil', size: 250 }, length_m: 2 });
    expect(r).toMatchObject({ material: 'copper', stranding: 'flexible', role: 'cable', installation: 'free_air' });
    expect(cableRunPropsSchema.safeParse({ conductor: { system: 'mm2', size: 35 }, length_m: 1, insulation_C: 105 }).success).toBe(true);
    expect(cableRunPropsSchema.safeParse({ conductor: { system: 'mm2', size: 35 }, length_m: 1, insulation_C: 80 }).success).toBe(false);
    expect(cableRunPropsSchema.safeParse({ conductor: { system: 'awg', size: '5/0' }, length_m: 1 }).success).toBe(false);
  });
});
