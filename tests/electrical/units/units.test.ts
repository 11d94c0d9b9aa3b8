import { describe, expect, it } from 'vitest';
import {
  awgArea_mm2, awgAtOrBelow, awgDiameter_m, awgGaugeNumber, cToF, conductorArea_mm2, fToC, formatConductor,
  formatLength, formatLengthForDrawing, ftToM, kcmilToMm2, mToFt, mm2ToKcmil, nearestUsSize, parseConductorSize, parseLength,
  parseTemperature,
} from '../../../shared/units';

describe('AWG sizes (ASTM B258)', () => {
  it('numbers the aught sizes 1/0 = 0 … 4/0 = −3', () => {
    expect(awgGaugeNumber('1/0')).toBe(0);
    expect(awgGaugeNumber('2/0')).toBe(-1);
    expect(awgGaugeNumber('3/0')).toBe(-2);
    expect(awgGaugeNumber('4/0')).toBe(-3);
    expect(awgGaugeNumber('14')).toBe(14);
  });

  it('gives 4/0 a diameter of 0.4600 in (ASTM B258: d = 0.005 in × 92^((36 − n)/39))', () => {
    expect(awgDiameter_m('4/0') / 0.0254).toBeCloseTo(0.46, 6);
  });

  it('gives 14 AWG 0.0641 in and 10 AWG 0.1019 in (ASTM B258 formula, evaluated by hand)', () => {
    expect(awgDiameter_m('14') / 0.0254).toBeCloseTo(0.06408, 4);
    expect(awgDiameter_m('10') / 0.0254).toBeCloseTo(0.10190, 4);
  });

  it('gives areas matching the circular-mil sizes: 2/0 = 133.1 kcmil, 4/0 = 211.6 kcmil, 1/0 = 105.6 kcmil (from memory)', () => {
    expect(mm2ToKcmil(awgArea_mm2('2/0'))).toBeCloseTo(133.1, 0);
    expect(mm2ToKcmil(awgArea_mm2('4/0'))).toBeCloseTo(211.6, 0);
    expect(mm2ToKcmil(awgArea_mm2('1/0'))).toBeCloseTo(105.6, 0);
  });

  it('converts kcmil at 1 kcmil = 0.506707 mm²', () => {
    expect(kcmilToMm2(1)).toBeCloseTo(0.506707, 6);
    expect(conductorArea_mm2({ system: 'kcmil', size: 250 })).toBeCloseTo(126.677, 2);
    expect(conductorArea_mm2({ system: 'mm2', size: 35 })).toBe(35);
  });

  it('reads a metric size at the AWG size at or below its area', () => {
    expect(awgAtOrBelow(35)).toBe('2'); // 2 AWG 33.6 mm², 1 AWG 42.4 mm²
    expect(awgAtOrBelow(70)).toBe('2/0'); // 2/0 67.4 mm², 3/0 85.0 mm²
    expect(awgAtOrBelow(0.5)).toBeNull();
  });

  it('finds the nearest US size for a metric conductor', () => {
    expect(nearestUsSize(35)).toEqual({ system: 'awg', size: '2' });
    expect(nearestUsSize(95)).toEqual({ system: 'awg', size: '3/0' });
    expect(nearestUsSize(120)).toEqual({ system: 'kcmil', size: 250 }); // 250 kcmil 126.7 mm² is nearer than 4/0 107.2 mm²
    expect(nearestUsSize(150)).toEqual({ system: 'kcmil', size: 300 });
  });
});

describe('length and temperature', () => {
  it('converts feet exactly (1 ft = 0.3048 m)', () => {
    expect(ftToM(12)).toBeCloseTo(3.6576, 10);
    expect(mToFt(0.3048)).toBeCloseTo(1, 12);
  });
  it('converts °F and °C', () => {
    expect(fToC(86)).toBeCloseTo(30, 10);
    expect(cToF(-40)).toBeCloseTo(-40, 10);
    expect(cToF(100)).toBeCloseTo(212, 10);
  });
});

describe('parsing user input', () => {
  it.each([
    ['2/0 AWG', { system: 'awg', size: '2/0' }],
    ['4/0', { system: 'awg', size: '4/0' }],
    ['00', { system: 'awg', size: '2/0' }],
    ['#6', { system: 'awg', size: '6' }],
    ['6 awg', { system: 'awg', size: '6' }],
    ['35 mm²', { system: 'mm2', size: 35 }],
    ['35mm2', { system: 'mm2', size: 35 }],
    ['2,5 mm2', { system: 'mm2', size: 2.5 }],
    ['250 kcmil', { system: 'kcmil', size: 250 }],
    ['350 MCM', { system: 'kcmil', size: 350 }],
  ])('reads %s', (text, expected) => {
    expect(parseConductorSize(text)).toEqual({ ok: true, value: expected });
  });

  it('refuses a bare number as ambiguous unless told the system', () => {
    const r = parseConductorSize('35');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.code).toBe('ambiguous_size');
    expect(parseConductorSize('35', 'mm2')).toEqual({ ok: true, value: { system: 'mm2', size: 35 } });
    expect(parseConductorSize('6', 'awg')).toEqual({ ok: true, value: { system: 'awg', size: '6' } });
  });

  it('explains sizes it cannot read', () => {
    const r = parseConductorSize('5/0 AWG');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.code).toBe('unknown_awg');
    const q = parseConductorSize('fat cable');
    expect(q.ok).toBe(false);
  });

  it.each([
    ['12 ft', 3.6576],
    ['3.5 m', 3.5],
    ["6'", 1.8288],
    ['18 in', 0.4572],
    ['18"', 0.4572],
    ['350 mm', 0.35],
    ['35 cm', 0.35],
    ["6' 3\"", 1.905],
    ['6 ft 3 in', 1.905],
  ])('reads the length %s', (text, metres) => {
    const r = parseLength(text);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(metres, 9);
  });

  it('asks for a unit, rejects unknown units and non-positive lengths', () => {
    expect(parseLength('12').ok).toBe(false);
    expect(parseLength('12', 'ft')).toEqual({ ok: true, value: expect.closeTo(3.6576, 9) });
    const u = parseLength('12 yd');
    expect(!u.ok && u.error.code).toBe('unknown_unit');
    const z = parseLength('0 m');
    expect(!z.ok && z.error.code).toBe('non_positive_length');
  });

  it('reads temperatures in °C and °F', () => {
    expect(parseTemperature('30 °C')).toEqual({ ok: true, value: 30 });
    const f = parseTemperature('86F');
    expect(f.ok && f.value).toBeCloseTo(30, 9);
    expect(parseTemperature('-10')).toEqual({ ok: true, value: -10 });
    expect(parseTemperature('warm').ok).toBe(false);
  });
});

describe('formatting for a unit system', () => {
  it('shows metres or feet', () => {
    expect(formatLength(3.5, 'metric')).toBe('3.50 m');
    expect(formatLength(3.6576, 'us')).toBe('12.0 ft');
    expect(formatLength(0.1778, 'us')).toBe('7.0 in');
    expect(formatLength(0.05, 'metric')).toBe('50 mm');
  });

  it('shows a metric conductor in US units as the nearest size, marked approximate', () => {
    expect(formatConductor({ system: 'mm2', size: 35 }, 'us')).toEqual({ text: '≈ 2 AWG (35 mm²)', approximate: true });
    expect(formatConductor({ system: 'awg', size: '2/0' }, 'us')).toEqual({ text: '2/0 AWG', approximate: false });
    expect(formatConductor({ system: 'awg', size: '2/0' }, 'metric')).toEqual({ text: '67.4 mm² (2/0 AWG)', approximate: false });
    expect(formatConductor({ system: 'mm2', size: 35 }, 'metric').text).toBe('35 mm²');
  });
});

describe('lengths on a drawing', () => {
  it('US lengths in feet and whole inches, inches alone below 2 ft; metric as usual', () => {
    // 1 in = 25.4 mm exactly (international yard and pound, 1959): 2 m = 78.74 in = 6 ft 6.74 in.
    expect(formatLengthForDrawing(2, 'us')).toBe('6 ft 7 in');
    expect(formatLengthForDrawing(3.6576, 'us')).toBe('12 ft'); // 144 in
    expect(formatLengthForDrawing(0.3, 'us')).toBe('11.8 in');
    expect(formatLengthForDrawing(0.6096, 'us')).toBe('2 ft'); // 24 in
    expect(formatLengthForDrawing(0.3048 * 3 - 0.001, 'us')).toBe('3 ft'); // 35.96 in rounds up to 3 ft 0 in
    expect(formatLengthForDrawing(2, 'metric')).toBe('2.00 m');
  });
});
