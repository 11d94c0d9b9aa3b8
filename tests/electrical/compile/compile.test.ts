import { describe, expect, it } from 'vitest';
import {
  type DiagramDocument, type DiagramDocumentInput, busbarBankTemplate, diagramSchema, postToPostTemplate,
  seriesParallelTemplate,
} from '../../../shared/diagram';
import { SHORT_STUDY_FLOOR_OHM, compileDiagram, compileWithShorts } from '../../../shared/electrical/compile';
import { batteryDefaults, busbarDefaults, chargerDefaults } from '../../../shared/electrical/parts';
import { solveNetwork } from '../../../shared/electrical/network/solve';
import type { CableRunProps } from '../../../shared/electrical/parts';

// Hand-computed: 2/0 AWG = 133.1 kcmil (from memory) × 0.506707 mm²/kcmil = 67.44 mm²;
// annealed copper 0.017241 Ω·mm²/m at 20 °C, α = 0.00393/K (IEC 60028).
const AREA_2_0 = 133.1 * 0.506707;
const RHO_30C = 0.017241 * (1 + 0.00393 * 10);

const cable = (props: Partial<CableRunProps> = {}) => ({ conductor: { system: 'awg', size: '2/0' }, length_m: 1, ...props }) as CableRunProps;
const end = (part: string, terminal: string) => ({ part, terminal });

function doc(parts: DiagramDocumentInput['parts'], cables: DiagramDocumentInput['cables'], settings = {}): DiagramDocument {
  return diagramSchema.parse({ formatVersion: 1, settings: { systemVoltage_V: 12, ...settings }, parts, cables });
}

const battery = (id: string, x = 0, props = {}) => ({ id, type: 'battery' as const, position: { x, y: 0 }, props: { ...batteryDefaults(), ...props } });
const load = (id = 'load', amps = 50) => ({ id, type: 'dc_load' as const, position: { x: 500, y: 0 }, props: { mode: 'current' as const, current_A: amps } });

function simple(c: Partial<CableRunProps> = {}, settings = {}) {
  return doc(
    [battery('b1'), load()],
    [
      { id: 'c1', from: end('b1', 'pos'), to: end('load', 'pos'), props: cable(c) },
      { id: 'c2', from: end('b1', 'neg'), to: end('load', 'neg'), props: cable(c) },
    ],
    settings,
  );
}

function codes(r: ReturnType<typeof compileDiagram>) {
  return r.ok ? [] : r.errors.map((e) => e.code);
}

describe('cable resistance in the network', () => {
  it('2/0 AWG solid copper, 1 m at the bank ambient of 30 °C', () => {
    const r = compileDiagram(simple({ stranding: 'solid' }));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const c1 = r.network.elements.find((e) => e.id === 'c1')!;
    expect(c1.kind).toBe('resistor');
    expect(c1.kind === 'resistor' && c1.r_ohm / (RHO_30C / AREA_2_0)).toBeCloseTo(1, 3);
    expect(r.map.cables.c1).toMatchObject({ temp_C: 30, from_node: 'b1.pos', to_node: 'load.pos' });
  });

  it('flexible stranding adds 10 %, a hotter bank raises resistance by α, a run ambient overrides the bank', () => {
    const flex = compileDiagram(simple({ stranding: 'flexible' }, { ambient_C: 50 }));
    if (!flex.ok) throw new Error('compile failed');
    const r = flex.network.elements.find((e) => e.id === 'c1');
    const expected = (0.017241 * (1 + 0.00393 * 30) * 1.1) / AREA_2_0;
    expect(r?.kind === 'resistor' && r.r_ohm / expected).toBeCloseTo(1, 3);
    const own = compileDiagram(simple({ stranding: 'solid', ambient_C: 20 }, { ambient_C: 50 }));
    const r20 = own.ok && own.network.elements.find((e) => e.id === 'c1');
    expect(r20 && r20.kind === 'resistor' && r20.r_ohm / (0.017241 / AREA_2_0)).toBeCloseTo(1, 3);
  });

  it('the table basis uses NEC Chapter 9 Table 8 (2/0 stranded 0.0967 Ω/kft at 75 °C, 0.00323/K recalled)', () => {
    const r = compileDiagram(simple({ resistanceBasis: 'table' }, { ambient_C: 75 }));
    const c1 = r.ok && r.network.elements.find((e) => e.id === 'c1');
    expect(c1 && c1.kind === 'resistor' && c1.r_ohm).toBeCloseTo(0.0967 / 304.8, 12);
  });

  it('lug contacts become their own elements in series with the conductor', () => {
    const r = compileDiagram(simple({ lugFrom_ohm: 2e-5, lugTo_ohm: 3e-5 }));
    if (!r.ok) throw new Error('compile failed');
    expect(r.map.cables.c1.elements.sort()).toEqual(['c1', 'c1/lugFrom', 'c1/lugTo']);
    const lug = r.network.elements.find((e) => e.id === 'c1/lugFrom');
    expect(lug).toMatchObject({ kind: 'resistor', a: 'b1.pos', r_ohm: 2e-5, role: 'lug' });
    expect(r.map.cables.c1.r_ohm - r.map.cables.c1.conductor_ohm).toBeCloseTo(5e-5, 12);
  });

  it('a zero-length connection joins terminals into one node', () => {
    const d = doc(
      [battery('b1'), { id: 'f1', type: 'fuse', position: { x: 0, y: -100 }, props: { fuseClass: 'battery_terminal', rating_A: 100, voltage_rating_V: 58, interrupting_A: 10000, cold_r_ohm: 4e-4 } }, load()],
      [
        { id: 'post', from: end('b1', 'pos'), to: end('f1', 'a'), props: cable({ length_m: 0 }) },
        { id: 'c1', from: end('f1', 'b'), to: end('load', 'pos'), props: cable() },
        { id: 'c2', from: end('b1', 'neg'), to: end('load', 'neg'), props: cable() },
      ],
    );
    const r = compileDiagram(d);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.network.elements.find((e) => e.id === 'post')).toBeUndefined();
    expect(r.map.parts.f1.nodes.a).toBe('b1.pos');
    expect(r.network.elements.find((e) => e.id === 'f1')).toMatchObject({ a: 'b1.pos', b: 'f1.b', r_ohm: 4e-4 });
  });
});

describe('templates compile', () => {
  it('post to post, N = 3: batteries, 2(N − 1) jumpers, main fuse, three main cables, inverter', () => {
    const r = compileDiagram(postToPostTemplate({ count: 3, takeOff: 'diagonal' }));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const byRole = (role: string) => r.network.elements.filter((e) => e.role === role).length;
    expect(r.network.elements).toHaveLength(3 + 4 + 1 + 3 + 1);
    expect(byRole('battery')).toBe(3);
    expect(byRole('jumper')).toBe(4);
    expect(byRole('cable')).toBe(3);
    expect(byRole('fuse')).toBe(1);
    expect(r.network.ground).toBe('bat1.neg');
    expect(r.systemVoltage).toBe(12);
    const inv = r.network.elements.find((e) => e.id === 'inverter');
    expect(inv).toMatchObject({ kind: 'constant_power', watts: expect.closeTo(2000 / 0.9, 6) });
    // Every element has an owner, and every owner lists it.
    for (const e of r.network.elements) expect(r.map.elementOwner[e.id]).toBeDefined();
  });

  it('busbar bank, N = 4: 7N + 5 elements; busbar segments 25 × 6 mm copper, 40 mm at 30 °C', () => {
    const r = compileDiagram(busbarBankTemplate({ count: 4 }));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.network.elements).toHaveLength(7 * 4 + 5);
    expect(r.map.parts['bus-pos'].elements).toEqual(['bus-pos/seg1', 'bus-pos/seg2', 'bus-pos/seg3', 'bus-pos/seg4']);
    const seg = r.network.elements.find((e) => e.id === 'bus-neg/seg2');
    expect(seg && seg.kind === 'resistor' && seg.r_ohm).toBeCloseTo((RHO_30C * 0.04) / 150, 12);
    expect(seg).toMatchObject({ a: 'bus-neg.t2', b: 'bus-neg.t3' });
  });

  it('4S2P strings: each string is four batteries and three jumpers in series', () => {
    const r = compileDiagram(seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 }));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.map.parts.string1.elements).toEqual(['string1/b1', 'string1/j1', 'string1/b2', 'string1/j2', 'string1/b3', 'string1/j3', 'string1/b4']);
    expect(r.network.elements).toHaveLength(31);
    expect(r.network.ground).toBe('string1.neg');
  });

  it('diagonal take-off shares equally between two identical batteries; same-end favours battery 1 (first principles)', () => {
    const opts = { count: 2, inverter: { power_W: 1000, efficiency: 1 } } as const;
    for (const [takeOff, equal] of [['diagonal', true], ['same-end', false]] as const) {
      const r = compileDiagram(postToPostTemplate({ ...opts, takeOff }));
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      const s = solveNetwork(r.network);
      if (!s.ok) throw new Error(JSON.stringify(s.error));
      const i1 = s.element_currents_A.bat1;
      const i2 = s.element_currents_A.bat2;
      if (equal) expect(i1 / i2).toBeCloseTo(1, 9);
      else expect(i1).toBeGreaterThan(i2 * 1.001);
    }
  });
});

describe('structural errors name the parts', () => {
  it('an unconnected terminal', () => {
    const d = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    d.cables = d.cables.filter((c) => c.id !== 'c-main-neg');
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'unconnected_terminal', parts: ['inverter'], message: 'Inverter is not connected: negative terminal' })]);
  });

  it('a floating part; a note is not electrical', () => {
    const d = simple();
    d.parts.push({ ...battery('spare', 900), label: 'Spare', rotation: 0 }, { id: 'memo', type: 'note', label: '', rotation: 0, position: { x: 0, y: 0 }, props: { text: 'Check torque' } });
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'floating_part', parts: ['spare'], message: 'Spare is not connected: no terminal is wired' })]);
  });

  it('reversed polarity: one battery’s + to the other’s − in a parallel pair', () => {
    const d = doc(
      [battery('b1'), battery('b2', 200), load()],
      [
        { id: 'j1', from: end('b1', 'pos'), to: end('b2', 'neg'), props: cable({ role: 'jumper', length_m: 0.3 }) },
        { id: 'j2', from: end('b1', 'neg'), to: end('b2', 'pos'), props: cable({ role: 'jumper', length_m: 0.3 }) },
        { id: 'c1', from: end('b1', 'pos'), to: end('load', 'pos'), props: cable() },
        { id: 'c2', from: end('b1', 'neg'), to: end('load', 'neg'), props: cable() },
      ],
    );
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'reversed_polarity', parts: expect.arrayContaining(['b1', 'b2']) })]);
    expect(!r.ok && [...r.errors[0].conductors!].sort()).toEqual(['j1', 'j2']);
  });

  it('two batteries correctly in series are not an error', () => {
    const d = doc(
      [battery('b1'), battery('b2', 200), load()],
      [
        { id: 'j1', from: end('b1', 'pos'), to: end('b2', 'neg'), props: cable({ role: 'jumper', length_m: 0.3 }) },
        { id: 'c1', from: end('b2', 'pos'), to: end('load', 'pos'), props: cable() },
        { id: 'c2', from: end('b1', 'neg'), to: end('load', 'neg'), props: cable() },
      ],
      { systemVoltage_V: 24 },
    );
    expect(compileDiagram(d).ok).toBe(true);
  });

  it('series strings of unequal voltage in parallel (4S beside 3S)', () => {
    const d = seriesParallelTemplate({ seriesCount: 4, parallelCount: 2 });
    const s2 = d.parts.find((p) => p.id === 'string2')!;
    if (s2.type === 'series_string') s2.props = { ...s2.props, count: 3 };
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([
      expect.objectContaining({ code: 'unequal_parallel_voltage', parts: expect.arrayContaining(['string1', 'string2']), message: expect.stringMatching(/12\.8 V apart/) }),
    ]);
  });

  it('unequal voltage also found across separate batteries: two in series beside one', () => {
    const d = doc(
      [battery('b1'), battery('b2', 200), battery('b3', 400), load()],
      [
        { id: 'j1', from: end('b1', 'pos'), to: end('b2', 'neg'), props: cable({ length_m: 0.3 }) },
        { id: 'j2', from: end('b2', 'pos'), to: end('b3', 'pos'), props: cable({ length_m: 0.3 }) },
        { id: 'j3', from: end('b1', 'neg'), to: end('b3', 'neg'), props: cable({ length_m: 0.3 }) },
        { id: 'c1', from: end('b3', 'pos'), to: end('load', 'pos'), props: cable() },
        { id: 'c2', from: end('b3', 'neg'), to: end('load', 'neg'), props: cable() },
      ],
    );
    const r = compileDiagram(d);
    expect(codes(r)).toEqual(['unequal_parallel_voltage']);
    expect(!r.ok && [...r.errors[0].parts].sort()).toEqual(['b1', 'b2', 'b3']);
  });

  it('a battery shorted by conductors', () => {
    const bus = { id: 'bus', type: 'busbar' as const, position: { x: 0, y: -200 }, props: { ...busbarDefaults(), tapCount: 3 } };
    const d = doc(
      [battery('b1'), bus, load()],
      [
        { id: 'c1', from: end('b1', 'pos'), to: end('bus', 't1'), props: cable() },
        { id: 'c2', from: end('b1', 'neg'), to: end('bus', 't2'), props: cable() },
        { id: 'c3', from: end('bus', 't3'), to: end('load', 'pos'), props: cable() },
        { id: 'c4', from: end('b1', 'neg'), to: end('load', 'neg'), props: cable() },
      ],
    );
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'shorted_source', parts: ['b1'] })]);
    // The short runs b1 + → c1 → busbar → c2 → b1 −; the load's leads end on the load, not in the loop.
    expect(!r.ok && [...r.errors[0].conductors!].sort()).toEqual(['bus', 'c1', 'c2']);
  });

  it('a zero-resistance loop between ideal sources', () => {
    const ideal = { ...chargerDefaults(), r_internal_ohm: 0 };
    const d = doc(
      [battery('b1'), { id: 'ch1', type: 'charger', position: { x: 200, y: 0 }, props: ideal }, { id: 'ch2', type: 'charger', position: { x: 400, y: 0 }, props: { ...ideal, voltage_setpoint_V: 14.4 } }],
      [
        { id: 'c1', from: end('b1', 'pos'), to: end('ch1', 'pos'), props: cable() },
        { id: 'c2', from: end('b1', 'neg'), to: end('ch1', 'neg'), props: cable() },
        { id: 'd1', from: end('ch1', 'pos'), to: end('ch2', 'pos'), props: cable({ length_m: 0 }) },
        { id: 'd2', from: end('ch1', 'neg'), to: end('ch2', 'neg'), props: cable({ length_m: 0 }) },
      ],
    );
    const r = compileDiagram(d);
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'zero_resistance_loop', parts: ['ch1', 'ch2'] })]);
    // Two chargers in parallel: a loop of sources, but neither's own terminals are joined — not a short.
    expect(!r.ok && r.errors[0].conductors).toBeUndefined();
    // With internal resistance the same wiring is fine.
    for (const p of d.parts) if (p.type === 'charger') p.props = { ...p.props, r_internal_ohm: 0.01 };
    expect(compileDiagram(d).ok).toBe(true);
  });

  it('a second circuit not joined to the bank, and a diagram with no source', () => {
    const d = simple();
    d.parts.push({ ...battery('b9', 900), label: '', rotation: 0 }, { ...load('load9'), label: '', rotation: 0 });
    d.cables.push(
      { id: 'c91', from: end('b9', 'pos'), to: end('load9', 'pos'), props: cable() as never },
      { id: 'c92', from: end('b9', 'neg'), to: end('load9', 'neg'), props: cable() as never },
    );
    const r = compileDiagram(diagramSchema.parse(d));
    expect(!r.ok && r.errors).toEqual([expect.objectContaining({ code: 'disconnected_circuit', parts: ['b9', 'load9'] })]);

    const bus = { id: 'bus', type: 'busbar' as const, position: { x: 0, y: 0 }, props: busbarDefaults() };
    const noSource = doc([bus, load()], [
      { id: 'c1', from: end('bus', 't1'), to: end('load', 'pos'), props: cable() },
      { id: 'c2', from: end('bus', 't2'), to: end('load', 'neg'), props: cable() },
    ]);
    expect(codes(compileDiagram(noSource))).toContain('no_source');
    expect(codes(compileDiagram(doc([], [])))).toEqual(['empty_diagram']);
  });
});

describe('shorts: the conductors that close them, and the network with the short in it', () => {
  const bank = (shortLength_m: number) =>
    doc(
      [battery('b1'), battery('b2', 200), load()],
      [
        { id: 'jp', from: end('b1', 'pos'), to: end('b2', 'pos'), props: cable({ role: 'jumper', length_m: 0.3 }) },
        { id: 'jn', from: end('b1', 'neg'), to: end('b2', 'neg'), props: cable({ role: 'jumper', length_m: 0.3 }) },
        { id: 'c1', from: end('b1', 'pos'), to: end('load', 'pos'), props: cable() },
        { id: 'c2', from: end('b2', 'neg'), to: end('load', 'neg'), props: cable() },
        { id: 'x', from: end('b2', 'pos'), to: end('b2', 'neg'), props: cable({ length_m: shortLength_m }) },
      ],
    );

  it('a run across battery 2 shorts it alone; battery 1 is shorted through the jumpers and that run', () => {
    const r = compileDiagram(bank(0.5));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const by = Object.fromEntries(r.errors.map((e) => [e.parts.join(','), [...(e.conductors ?? [])].sort()]));
    expect(by).toEqual({ b1: ['jn', 'jp', 'x'], b2: ['x'] });
  });

  it('compileWithShorts keeps the short: a 0 m run is a floor resistance, not a merged node', () => {
    const r = compileWithShorts(bank(0));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const x = r.network.elements.find((e) => e.id === 'x');
    expect(x?.kind === 'resistor' && x.r_ohm).toBe(SHORT_STUDY_FLOOR_OHM);
    expect(r.shorts.map((e) => e.code)).toEqual(['shorted_source', 'shorted_source']);
    // The network solves; the run carries current out of battery 2's positive (Kirchhoff current law at b2 +).
    const sol = solveNetwork(r.network);
    expect(sol.ok).toBe(true);
    if (sol.ok) expect(sol.element_currents_A.x).toBeGreaterThan(1000);
  });

  it('compileWithShorts refuses a diagram without a short, and one with any other structural error', () => {
    expect(compileWithShorts(simple()).ok).toBe(false);
    const open = bank(0.5);
    open.cables = open.cables.filter((c) => c.id !== 'c2');
    const r = compileWithShorts(open);
    expect(!r.ok && r.errors.map((e) => e.code)).toContain('unconnected_terminal');
  });
});
