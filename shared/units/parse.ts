/**
 * Parse what people type ("2/0 AWG", "35 mm²", "250 kcmil", "12 ft", "6'", "3.5 m") into SI values.
 * Every parser returns `{ ok: true, value }` or `{ ok: false, error: { code, message } }`; none throws.
 */
import { AWG_SIZES, type AwgSize, type ConductorSize, isAwgSize } from './conductor';
import { type LengthUnit, toMetres } from './length';
import { fToC } from './temperature';

export type ParseResult<T> = { ok: true; value: T } | { ok: false; error: { code: string; message: string } };

const fail = <T>(code: string, message: string): ParseResult<T> => ({ ok: false, error: { code, message } });

const NUM = String.raw`(\d+(?:[.,]\d+)?|\.\d+)`;
const num = (s: string) => Number(s.replace(',', '.'));

const LENGTH_UNITS: Record<string, LengthUnit> = {
  m: 'm', meter: 'm', meters: 'm', metre: 'm', metres: 'm',
  mm: 'mm', millimeter: 'mm', millimeters: 'mm', millimetre: 'mm', millimetres: 'mm',
  cm: 'm', // handled below
  ft: 'ft', foot: 'ft', feet: 'ft', "'": 'ft', '′': 'ft',
  in: 'in', inch: 'in', inches: 'in', '"': 'in', '″': 'in',
};

/**
 * Parse a length into metres. Accepts "3.5 m", "350 mm", "35 cm", "12 ft", "6'", "18 in", "18\"",
 * "6' 3\"" / "6 ft 3 in", and a bare number in `defaultUnit` when given.
 */
export function parseLength(input: string, defaultUnit?: LengthUnit): ParseResult<number> {
  const s = input.trim().toLowerCase();
  if (!s) return fail('empty', 'Enter a length, e.g. 1.5 m or 5 ft');
  const feetInches = new RegExp(String.raw`^${NUM}\s*(?:'|′|ft|feet|foot)\s*${NUM}\s*(?:"|″|in|inch|inches)?$`).exec(s);
  if (feetInches) {
    return checkLength(toMetres(num(feetInches[1]), 'ft') + toMetres(num(feetInches[2]), 'in'));
  }
  const m = new RegExp(String.raw`^${NUM}\s*([a-z'"′″]*)$`).exec(s);
  if (!m) return fail('unreadable_length', `Cannot read "${input}" as a length; write e.g. 1.5 m, 350 mm, 5 ft or 18 in`);
  const value = num(m[1]);
  const unitText = m[2];
  if (!unitText) {
    if (!defaultUnit) return fail('missing_unit', `Give a unit for "${input}" (m, mm, ft or in)`);
    return checkLength(toMetres(value, defaultUnit));
  }
  if (unitText === 'cm') return checkLength(value / 100);
  const unit = LENGTH_UNITS[unitText];
  if (!unit) return fail('unknown_unit', `Unknown length unit "${unitText}"; use m, mm, ft or in`);
  return checkLength(toMetres(value, unit));
}

function checkLength(m: number): ParseResult<number> {
  if (!Number.isFinite(m)) return fail('unreadable_length', 'Length is not a number');
  if (m <= 0) return fail('non_positive_length', 'Length must be greater than zero');
  return { ok: true, value: m };
}

/**
 * Parse a conductor size. Accepts "2/0 AWG", "2/0", "00", "#6", "6 AWG", "6 ga", "35 mm²", "35mm2",
 * "35 sq mm", "250 kcmil", "250 MCM". A bare number is AWG when `bareNumberSystem` is 'awg' (or when
 * written "n/0"), mm² when it is 'mm2'; otherwise it is an error since "35" could be either.
 */
export function parseConductorSize(input: string, bareNumberSystem?: 'awg' | 'mm2'): ParseResult<ConductorSize> {
  const s = input.trim().toLowerCase().replace(/\s+/g, ' ');
  if (!s) return fail('empty', 'Enter a conductor size, e.g. 2/0 AWG or 35 mm²');

  const mm2 = new RegExp(String.raw`^${NUM}\s*(?:mm²|mm2|mm\^2|sq\.? ?mm|sqmm|mm sq)$`).exec(s);
  if (mm2) {
    const size = num(mm2[1]);
    if (!(size > 0)) return fail('non_positive_size', 'Conductor area must be greater than zero');
    return { ok: true, value: { system: 'mm2', size } };
  }
  const kcmil = new RegExp(String.raw`^${NUM}\s*(?:kcmil|mcm)$`).exec(s);
  if (kcmil) {
    const size = num(kcmil[1]);
    if (!(size > 0)) return fail('non_positive_size', 'Conductor size must be greater than zero');
    return { ok: true, value: { system: 'kcmil', size } };
  }
  const awg = /^#?\s*(\d{1,2}(?:\/0)?|0{1,4})\s*(awg|ga|gauge)?$/.exec(s);
  if (awg) {
    const explicit = Boolean(awg[2]) || awg[1].includes('/') || /^0+$/.test(awg[1]) || s.startsWith('#');
    if (!explicit && bareNumberSystem === 'mm2') {
      return { ok: true, value: { system: 'mm2', size: Number(awg[1]) } };
    }
    if (!explicit && bareNumberSystem !== 'awg') {
      return fail('ambiguous_size', `"${input}" could be AWG or mm²; write e.g. "${awg[1]} AWG" or "${awg[1]} mm²"`);
    }
    let text = awg[1];
    if (/^0+$/.test(text)) text = `${text.length}/0`; // "00" → "2/0"
    if (!isAwgSize(text)) {
      return fail('unknown_awg', `${text} is not an AWG size we list (${AWG_SIZES[0]} … ${AWG_SIZES[AWG_SIZES.length - 1]})`);
    }
    return { ok: true, value: { system: 'awg', size: text as AwgSize } };
  }
  if (new RegExp(String.raw`^${NUM}$`).test(s) && bareNumberSystem === 'mm2') {
    return { ok: true, value: { system: 'mm2', size: num(s) } };
  }
  return fail('unreadable_size', `Cannot read "${input}" as a conductor size; write e.g. 2/0 AWG, 35 mm² or 250 kcmil`);
}

/** Parse a temperature into °C: "30 °C", "30C", "86 °F", "86F", or a bare number in °C. */
export function parseTemperature(input: string): ParseResult<number> {
  const s = input.trim().toLowerCase();
  const m = new RegExp(String.raw`^(-?)${NUM}\s*(°|º|deg)?\s*(c|f)?$`).exec(s);
  if (!m) return fail('unreadable_temperature', `Cannot read "${input}" as a temperature; write e.g. 30 °C or 86 °F`);
  const value = (m[1] ? -1 : 1) * num(m[2]);
  return { ok: true, value: m[4] === 'f' ? fToC(value) : value };
}

/** SI prefixes a quantity may be typed with ("2 kW", "120 mΩ", "50 µΩ"). Case matters: m is milli, M is mega. */
const SI_PREFIX: Record<string, number> = { G: 1e9, M: 1e6, k: 1e3, K: 1e3, c: 1e-2, m: 1e-3, µ: 1e-6, μ: 1e-6, u: 1e-6 };
/** Units that take an SI prefix, with the spellings people type for them. */
const BASE_UNITS: Record<string, string[]> = {
  Ω: ['Ω', 'Ω', 'ohm', 'ohms', 'Ohm', 'Ohms', 'R'],
  V: ['V'],
  A: ['A'],
  W: ['W'],
  s: ['s'],
  m: ['m'],
  Ah: ['Ah'],
};

function splitUnit(unit: string): { prefix: number; base: string } | null {
  for (const base of Object.keys(BASE_UNITS)) {
    if (unit === base) return { prefix: 1, base };
    if (unit.endsWith(base) && unit.length === base.length + 1 && unit[0] in SI_PREFIX) return { prefix: SI_PREFIX[unit[0]], base };
  }
  return null;
}

/**
 * Read a number typed for a field shown in `unit`: a bare number is in that unit; "120 mΩ", "0.12 Ω" and
 * "0.12 ohm" all read as 120 in a mΩ field; "2 kW" as 2000 in a W field; a mm field also takes any
 * length ("0.35 m", "1 in", "3 ft 6 in"). Answers the value in `unit`, or a message naming `label`.
 */
export function parseQuantity(input: string, unit: string | undefined, label: string): ParseResult<number> {
  const s = input.trim().replace(/(\d),(\d)/, '$1.$2');
  const numeric = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i;
  if (numeric.test(s)) return { ok: true, value: Number(s) };
  const bad = fail<number>('unreadable_number', `${label} must be a number${unit ? ` (${unit})` : ''}`);
  if (!unit) return bad;
  const m = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?)\s*(\S.*)$/i.exec(s);
  if (!m) return bad;
  const value = Number(m[1]);
  const typed = m[2].trim();
  if (typed === unit || typed.toLowerCase() === unit.toLowerCase()) return { ok: true, value };
  const field = splitUnit(unit);
  if (!field) return fail('wrong_unit', `${label} is in ${unit}; "${typed}" is not`);
  if (field.base === 'm') {
    const len = parseLength(s);
    if (len.ok) return { ok: true, value: Number((len.value / field.prefix).toPrecision(12)) };
  }
  for (const spelling of BASE_UNITS[field.base]) {
    if (!typed.endsWith(spelling)) continue;
    const p = typed.slice(0, -spelling.length).trim();
    if (p !== '' && !(p in SI_PREFIX)) continue;
    const factor = p === '' ? 1 : SI_PREFIX[p];
    // Rounded to 12 significant digits: "1.1 kW" is 1100 W, not 1100.0000000000002.
    return { ok: true, value: Number(((value * factor) / field.prefix).toPrecision(12)) };
  }
  return fail('wrong_unit', `${label} is in ${unit}; write e.g. "${value} ${unit}"`);
}
