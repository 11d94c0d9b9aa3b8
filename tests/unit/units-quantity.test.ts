/**
 * Typed quantities: a field shown in one unit reads its unit, the same unit with an SI prefix, and for
 * lengths any length unit. Expected values are worked by hand from the SI prefix definitions
 * (k = 10³, m = 10⁻³, µ = 10⁻⁶) and the exact inch (25.4 mm) and foot (12 in).
 */
import { describe, expect, it } from 'vitest';
import { localizeUnitsInText, parseLength, parseQuantity } from '../../shared/units';

const value = (text: string, unit: string | undefined) => {
  const r = parseQuantity(text, unit, 'Field');
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
};

describe('parseQuantity', () => {
  it('reads a bare number, a decimal comma and the field’s own unit', () => {
    expect(value('3,5', 'V')).toBe(3.5);
    expect(value('100 Ah', 'Ah')).toBe(100);
    expect(value('120 mΩ', 'mΩ')).toBe(120);
    expect(value('12.8V', 'V')).toBe(12.8);
  });

  it('reads power, current and time with prefixes', () => {
    expect(value('2 kW', 'W')).toBe(2000);
    expect(value('1.1 kW', 'W')).toBe(1100);
    expect(value('1.2 kA', 'A')).toBe(1200);
    expect(value('500 ms', 's')).toBe(0.5);
    expect(value('350 mA', 'A')).toBe(0.35);
  });

  it('reads resistance in any prefix and spelling into the field’s prefix', () => {
    expect(value('0.12 Ω', 'mΩ')).toBe(120);
    expect(value('0.12 ohm', 'mΩ')).toBe(120);
    expect(value('120 mΩ', 'µΩ')).toBe(120000);
    expect(value('50 uΩ', 'µΩ')).toBe(50);
    expect(value('0.05 mΩ', 'µΩ')).toBe(50);
    expect(value('2 Ω', 'mΩ')).toBe(2000);
  });

  it('reads any length into a mm field, feet and inches included', () => {
    expect(value('350 mm', 'mm')).toBe(350);
    expect(value('0.35 m', 'mm')).toBe(350);
    expect(value('35 cm', 'mm')).toBe(350);
    expect(value('1 in', 'mm')).toBe(25.4);
    // 3 ft 6 in = 42 in = 1066.8 mm
    expect(value('3 ft 6 in', 'mm')).toBe(1066.8);
  });

  it('refuses a wrong or unreadable unit with a message naming the field', () => {
    const w = parseQuantity('2 kV', 'W', 'Power');
    expect(w).toEqual({ ok: false, error: { code: 'wrong_unit', message: 'Power is in W; write e.g. "2 W"' } });
    const x = parseQuantity('two', 'W', 'Power');
    expect(x).toEqual({ ok: false, error: { code: 'unreadable_number', message: 'Power must be a number (W)' } });
    expect(parseQuantity('5 %', undefined, 'Margin').ok).toBe(false);
    expect(parseQuantity('5 x', '%', 'Margin')).toEqual({ ok: false, error: { code: 'wrong_unit', message: 'Margin is in %; "x" is not' } });
  });
});

describe('parseLength with feet and inches', () => {
  it('reads "3 ft 6 in", "3\' 6\\"" and "3ft6in" as 42 inches', () => {
    // 42 in × 0.0254 m/in = 1.0668 m
    for (const t of ['3 ft 6 in', '3\' 6"', '3ft6in', '3 feet 6 inches']) {
      const r = parseLength(t);
      expect(r.ok && Math.abs(r.value - 1.0668) < 1e-12, t).toBe(true);
    }
  });
});

describe('localizeUnitsInText', () => {
  it('leaves metric text as written', () => {
    const t = 'Cable runs range from 1.20 m to 2.40 m; 35 mm² at 30 °C.';
    expect(localizeUnitsInText(t, 'metric')).toBe(t);
  });

  it('shows lengths, areas and temperatures of a metric message in US units', () => {
    // 1.20 m / 0.3048 = 3.94 ft; 2.40 m = 7.87 ft; 150 mm = 5.91 in; 30 °C = 86 °F.
    expect(localizeUnitsInText('Cable runs range from 1.20 m (Battery 1) to 2.40 m, 40 % apart.', 'us')).toBe(
      'Cable runs range from 3.9 ft (Battery 1) to 7.9 ft, 40 % apart.',
    );
    expect(localizeUnitsInText('It is 150 mm long with a 35 mm² conductor at 30 °C.', 'us')).toBe('It is 5.9 in long with a ≈ 2 AWG (35 mm²) conductor at 86 °F.');
  });

  it('never reads milliohms, minutes or a ratio as a length', () => {
    const t = 'Internal resistance 12 mΩ, 5 min at 2 m/s.';
    expect(localizeUnitsInText(t, 'us')).toBe(t);
  });
});
