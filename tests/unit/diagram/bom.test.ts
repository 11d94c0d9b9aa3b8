import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, parseDiagram, postToPostTemplate, seriesParallelTemplate } from '../../../shared/diagram';
import { billOfMaterials, type BomLine } from '../../../shared/diagram/bom';
import { batteryDefaults } from '../../../shared/electrical/parts';

const byCategory = (lines: BomLine[], c: BomLine['category']) => lines.filter((l) => l.category === c);

describe('billOfMaterials', () => {
  // 4 batteries post to post: 3 gaps × 2 jumpers of 0.3 m, battery → main fuse 0.15 m, main positive and
  // negative 2 m each (the template's documented defaults), all one conductor here.
  const doc = () => postToPostTemplate({ count: 4, takeOff: 'diagonal', conductor: { system: 'awg', size: '2/0' } });
  const CABLES = 3 * 2 + 3;
  const LENGTH_M = 3 * 2 * 0.3 + 0.15 + 2 + 2; // 5.95 m terminal to terminal

  it('totals the cables of a post-to-post bank with the cut allowance at each end', () => {
    const bom = billOfMaterials(doc(), { unitSystem: 'metric', cutAllowancePerEnd_m: 0.05 });
    const cables = byCategory(bom.lines, 'cables');
    expect(cables).toHaveLength(1);
    expect(cables[0].cuts).toHaveLength(CABLES);
    // 5.95 + 9 × 2 × 0.05 = 6.85 m, rounded up to 0.1 m.
    expect(cables[0].quantity).toBe(6.9);
    expect(cables[0].unit).toBe('m');
    expect(cables[0].description).toBe('67.4 mm² (2/0 AWG) copper cable, 90 °C insulation');
    const sumCuts = cables[0].cuts!.reduce((s, c) => s + c.cut_m, 0);
    expect(sumCuts).toBeCloseTo(LENGTH_M + CABLES * 2 * 0.05, 9);
    expect(bom.totals.find((t) => t.category === 'cables')).toEqual({ category: 'cables', lines: 1, quantity: 6.9, unit: 'm' });
  });

  it('lists cuts longest first with their labels', () => {
    const cuts = byCategory(billOfMaterials(doc(), { unitSystem: 'metric' }).lines, 'cables')[0].cuts!;
    expect(cuts.map((c) => c.id)).toEqual(['c-main-pos', 'c-main-neg', 'j-pos-1', 'j-neg-1', 'j-pos-2', 'j-neg-2', 'j-pos-3', 'j-neg-3', 'c-main-fuse']);
    expect(cuts[0]).toEqual({ id: 'c-main-pos', label: 'Main positive', length_m: 2, cut_m: 2.1, length: 2, cutLength: 2.1 });
  });

  it('uses the allowance given, and feet for a US team', () => {
    const none = billOfMaterials(doc(), { unitSystem: 'metric', cutAllowancePerEnd_m: 0 });
    expect(byCategory(none.lines, 'cables')[0].quantity).toBe(6); // 5.95 m rounded up to 0.1 m
    const us = billOfMaterials(doc(), { unitSystem: 'us' });
    const line = byCategory(us.lines, 'cables')[0];
    expect(line.unit).toBe('ft');
    expect(line.description).toBe('2/0 AWG copper cable, 90 °C insulation');
    // 6.85 m / 0.3048 m/ft = 22.47 ft, rounded up to whole feet.
    expect(line.quantity).toBe(23);
    // 2.1 m = 6.89 ft → 6.9 ft.
    expect(line.cuts![0].cutLength).toBe(6.9);
    expect(() => billOfMaterials(doc(), { unitSystem: 'metric', cutAllowancePerEnd_m: -1 })).toThrow(RangeError);
  });

  it('counts two lugs per cable, batteries, the main fuse with its holder and the inverter', () => {
    const bom = billOfMaterials(doc(), { unitSystem: 'metric' });
    const lugs = byCategory(bom.lines, 'lugs');
    expect(lugs).toEqual([
      expect.objectContaining({ description: 'Crimp lug for 67.4 mm² (2/0 AWG) copper, stud size not set', quantity: 2 * CABLES, unit: 'pcs' }),
    ]);
    expect(byCategory(bom.lines, 'batteries')).toEqual([
      {
        category: 'batteries', description: 'Lithium iron phosphate (LiFePO₄) battery, 12.8 V, 100 Ah', quantity: 4, unit: 'pcs', partIds: ['bat1', 'bat2', 'bat3', 'bat4'],
        parts: [1, 2, 3, 4].map((n) => ({ id: `bat${n}`, label: `Battery ${n}` })),
      },
    ]);
    // 2000 W / (12.8 V × 0.9) = 173.6 A; × 1.25 = 217 A → 225 A, the next NEC 240.6(A) standard rating.
    expect(byCategory(bom.lines, 'fuses').map((l) => [l.description, l.quantity])).toEqual([['Class T, 225 A, 160 V DC, interrupting rating 20 kA', 1]]);
    expect(byCategory(bom.lines, 'fuse_holders').map((l) => [l.description, l.quantity])).toEqual([['Class T fuse holder for a 225 A fuse', 1]]);
    expect(byCategory(bom.lines, 'inverters').map((l) => [l.description, l.quantity])).toEqual([['Inverter, 2000 W continuous', 1]]);
    expect(bom.lines.map((l) => l.category)).toEqual(['batteries', 'cables', 'lugs', 'fuses', 'fuse_holders', 'inverters']);
    expect(bom.caution).toMatch(/not an approval to install/);
  });

  it('names parts by label (the type when unlabelled) and unlabelled cables by where they run', () => {
    const d = doc();
    const fuse = d.parts.find((p) => p.id === 'main-fuse')!;
    fuse.label = '';
    const jumper = d.cables.find((c) => c.id === 'j-pos-1')!;
    delete jumper.label;
    const bom = billOfMaterials(d, { unitSystem: 'metric' });
    expect(byCategory(bom.lines, 'fuses')[0].parts).toEqual([{ id: 'main-fuse', label: 'Fuse' }]);
    const cables = byCategory(bom.lines, 'cables')[0];
    expect(cables.parts.find((p) => p.id === 'j-pos-1')?.label).toBe('Battery 1 (+) to Battery 2 (+)');
    expect(cables.cuts!.find((c) => c.id === 'j-pos-1')?.label).toBe('Battery 1 (+) to Battery 2 (+)');
    // Same order as the ids.
    expect(cables.parts.map((p) => p.id)).toEqual(cables.partIds);
  });

  it('counts no conductor and no lugs for a zero-length (bolted) connection', () => {
    const d = doc();
    d.cables.find((c) => c.id === 'c-main-fuse')!.props.length_m = 0;
    const bom = billOfMaterials(d, { unitSystem: 'metric', cutAllowancePerEnd_m: 0 });
    const cables = byCategory(bom.lines, 'cables')[0];
    expect(cables.cuts).toHaveLength(CABLES - 1);
    expect(cables.partIds).not.toContain('c-main-fuse');
    expect(cables.quantity).toBe(5.8); // 5.95 − 0.15
    expect(byCategory(bom.lines, 'lugs')[0].quantity).toBe(2 * (CABLES - 1));
  });

  it('expands series strings to their batteries and counts their interconnects as cables', () => {
    const d = seriesParallelTemplate({ seriesCount: 4, parallelCount: 2, conductor: { system: 'awg', size: '4' } });
    const bom = billOfMaterials(d, { unitSystem: 'metric', cutAllowancePerEnd_m: 0 });
    expect(byCategory(bom.lines, 'batteries')).toEqual([
      expect.objectContaining({ quantity: 8, partIds: ['string1', 'string2'] }),
    ]);
    const jumpers = byCategory(bom.lines, 'cables').find((l) => l.description.endsWith('insulation rating not set'))!;
    // 2 strings × (4 − 1) interconnects of 0.3 m.
    expect(jumpers.cuts!.map((c) => c.id)).toEqual(['string1/j1', 'string1/j2', 'string1/j3', 'string2/j1', 'string2/j2', 'string2/j3']);
    expect(jumpers.quantity).toBe(1.8);
    // Cables: per string fuse lead 0.15, positive 1, negative 1 (×2) and main 0.15 + 2 + 2; plus 6 interconnects.
    const lugs = byCategory(bom.lines, 'lugs').reduce((s, l) => s + l.quantity, 0);
    expect(lugs).toBe(2 * (2 * 3 + 3 + 6));
    expect(byCategory(bom.lines, 'busbars')).toEqual([
      expect.objectContaining({ description: 'Copper busbar 25 mm × 6 mm, 3 taps at 40 mm, 300 A', quantity: 2, partIds: ['bus-pos', 'bus-neg'] }),
    ]);
    expect(byCategory(bom.lines, 'fuses').reduce((s, l) => s + l.quantity, 0)).toBe(3);
  });

  it('takes the stud size from a lug part at a cable end and counts a lug part no cable reaches', () => {
    const r = parseDiagram({
      formatVersion: 1,
      settings: { systemVoltage_V: 12 },
      parts: [
        { id: 'b1', type: 'battery', position: { x: 0, y: 0 }, props: batteryDefaults('agm', 100) },
        { id: 'L1', type: 'lug', position: { x: 0, y: 0 }, props: { contact_ohm: 2e-5, stud: 'M10' } },
        { id: 'L2', type: 'lug', position: { x: 0, y: 0 }, props: { contact_ohm: 2e-5, stud: '3/8 in' } },
        { id: 'sh', type: 'shunt', position: { x: 0, y: 0 }, props: { rating_A: 500, drop_mV: 50 } },
        { id: 'sw', type: 'switch', position: { x: 0, y: 0 }, props: { rating_A: 300, contact_ohm: 1e-4, closed: true } },
        { id: 'ch', type: 'charger', position: { x: 0, y: 0 }, props: { voltage_setpoint_V: 14.4, current_limit_A: 30, r_internal_ohm: 0.01, enabled: true } },
        { id: 'load', type: 'dc_load', position: { x: 0, y: 0 }, props: { mode: 'current', current_A: 10 } },
      ],
      cables: [
        { id: 'c0', from: { part: 'b1', terminal: 'pos' }, to: { part: 'L1', terminal: 'a' }, props: { conductor: { system: 'mm2', size: 35 }, length_m: 0 } },
        { id: 'c1', from: { part: 'L1', terminal: 'b' }, to: { part: 'sw', terminal: 'a' }, props: { conductor: { system: 'mm2', size: 35 }, length_m: 0.5 } },
        { id: 'c2', from: { part: 'sw', terminal: 'b' }, to: { part: 'load', terminal: 'pos' }, props: { conductor: { system: 'mm2', size: 35 }, length_m: 1 } },
        { id: 'c3', from: { part: 'b1', terminal: 'neg' }, to: { part: 'sh', terminal: 'a' }, props: { conductor: { system: 'mm2', size: 35 }, length_m: 0.4 } },
        { id: 'c4', from: { part: 'sh', terminal: 'b' }, to: { part: 'load', terminal: 'neg' }, props: { conductor: { system: 'mm2', size: 35 }, length_m: 1 } },
      ],
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const bom = billOfMaterials(r.doc, { unitSystem: 'metric' });
    expect(byCategory(bom.lines, 'lugs').map((l) => [l.description, l.quantity])).toEqual([
      ['Crimp lug for 35 mm² copper, M10 stud', 1],
      ['Crimp lug for 35 mm² copper, stud size not set', 7],
      ['Crimp lug (conductor size not set), 3/8 in stud', 1],
    ]);
    expect(bom.lines.filter((l) => ['shunts', 'switches', 'chargers'].includes(l.category)).map((l) => l.description)).toEqual([
      'Battery disconnect switch, 300 A', 'Shunt 500 A / 50 mV', 'Charger, 14.4 V set point, 30 A',
    ]);
    // The DC load is the owner's equipment: not on the list.
    expect(bom.lines.some((l) => l.partIds.includes('load') && l.category !== 'lugs' && l.category !== 'cables')).toBe(false);
  });

  it('splits cables by conductor, material and insulation rating', () => {
    const d = busbarBankTemplate({ count: 2, conductor: { system: 'awg', size: '2' } });
    d.cables.find((c) => c.id === 'c-neg1')!.props.insulation_C = 105;
    d.cables.find((c) => c.id === 'c-neg2')!.props.material = 'aluminium';
    const lines = byCategory(billOfMaterials(d, { unitSystem: 'us' }).lines, 'cables');
    expect(lines.map((l) => [l.description, l.cuts!.length])).toEqual([
      ['2 AWG copper cable, 90 °C insulation', 7],
      ['2 AWG copper cable, 105 °C insulation', 1],
      ['2 AWG aluminium cable, 90 °C insulation', 1],
    ]);
  });
});
