/**
 * Format SI values for the team's unit system. Metric shows m and mm²; US customary shows ft and
 * AWG/kcmil. A metric conductor shown in US units is given as the nearest standard size and marked
 * approximate ("≈ 2 AWG").
 */
import { type ConductorSize, conductorArea_mm2, nearestMetricSize, nearestUsSize } from './conductor';
import { mToFt, mToIn } from './length';
import { cToF } from './temperature';

export type UnitSystem = 'metric' | 'us';

export interface Formatted {
  text: string;
  /** True when the shown value is the nearest standard size, not the conductor itself. */
  approximate: boolean;
}

function fixed(x: number, digits: number): string {
  return x.toFixed(digits);
}

/** Format a length. Metric: "2.50 m" (mm below 0.1 m); US: "8.2 ft" (inches below 2 ft). */
export function formatLength(length_m: number, system: UnitSystem, digits?: number): string {
  if (system === 'metric') {
    if (Math.abs(length_m) < 0.1) return `${fixed(length_m * 1000, digits ?? 0)} mm`;
    return `${fixed(length_m, digits ?? 2)} m`;
  }
  const ft = mToFt(length_m);
  if (Math.abs(ft) < 2) return `${fixed(mToIn(length_m), digits ?? 1)} in`;
  return `${fixed(ft, digits ?? 1)} ft`;
}

/**
 * A length as the trade writes it on a drawing: metric as `formatLength`; US in feet and whole inches
 * ("6 ft 7 in", "12 ft"), inches alone below 2 ft ("11.8 in"). For display; input fields keep decimals.
 */
export function formatLengthForDrawing(length_m: number, system: UnitSystem): string {
  if (system === 'metric') return formatLength(length_m, system);
  const inches = mToIn(length_m);
  if (Math.abs(inches) < 24) return `${fixed(inches, 1)} in`;
  let ft = Math.floor(inches / 12);
  let rest = Math.round(inches - ft * 12);
  if (rest === 12) {
    ft += 1;
    rest = 0;
  }
  return rest ? `${ft} ft ${rest} in` : `${ft} ft`;
}

/** Format a conductor size area as text. */
export function sizeLabel(c: ConductorSize): string {
  switch (c.system) {
    case 'awg':
      return `${c.size} AWG`;
    case 'kcmil':
      return `${c.size} kcmil`;
    case 'mm2':
      return `${c.size} mm²`;
  }
}

function areaText(area_mm2: number): string {
  return area_mm2 >= 10 ? area_mm2.toFixed(1) : area_mm2.toFixed(2);
}

/**
 * Format a conductor size for a unit system.
 * - metric: mm² sizes as written ("35 mm²"); AWG/kcmil sizes as their exact area plus the size ("67.4 mm² (2/0 AWG)").
 * - us: AWG/kcmil as written; mm² as the nearest US standard size, approximate ("≈ 2 AWG (35 mm²)").
 */
export function formatConductor(c: ConductorSize, system: UnitSystem): Formatted {
  if (system === 'metric') {
    if (c.system === 'mm2') return { text: sizeLabel(c), approximate: false };
    return { text: `${areaText(conductorArea_mm2(c))} mm² (${sizeLabel(c)})`, approximate: false };
  }
  if (c.system !== 'mm2') return { text: sizeLabel(c), approximate: false };
  const near = nearestUsSize(c.size);
  return { text: `≈ ${sizeLabel(near)} (${sizeLabel(c)})`, approximate: true };
}

/** Format a bare area (mm²) for a unit system; US shows the nearest AWG/kcmil, marked approximate. */
export function formatArea(area_mm2: number, system: UnitSystem): Formatted {
  if (system === 'metric') return { text: `${areaText(area_mm2)} mm²`, approximate: false };
  return { text: `≈ ${sizeLabel(nearestUsSize(area_mm2))}`, approximate: true };
}

/** Nearest standard metric size label for an area, e.g. for suggesting a metric equivalent. */
export function nearestMetricLabel(area_mm2: number): string {
  return `${nearestMetricSize(area_mm2)} mm²`;
}

export function formatTemperature(c: number, system: UnitSystem, digits = 0): string {
  return system === 'metric' ? `${c.toFixed(digits)} °C` : `${cToF(c).toFixed(digits)} °F`;
}

const NUM_RE = String.raw`(-?\d+(?:\.\d+)?)`;
/** A unit ends at a space, punctuation or the end (so "mΩ", "min" or "m/s" are never read as metres). */
const UNIT_END = String.raw`(?=$|[\s,.;:)\]])`;

/**
 * A plain-language message written in metric (the core's findings and checks) shown in `system`: for US,
 * lengths in m or mm become ft or in, areas in mm² the nearest AWG/kcmil (marked ≈, the metric size kept),
 * °C becomes °F. Metric text is returned unchanged.
 */
export function localizeUnitsInText(text: string, system: UnitSystem): string {
  if (system === 'metric') return text;
  return text
    .replace(new RegExp(String.raw`${NUM_RE}\s?mm²`, 'g'), (_, n: string) => formatConductor({ system: 'mm2', size: Number(n) }, 'us').text)
    .replace(new RegExp(String.raw`${NUM_RE}\s?mm${UNIT_END}`, 'g'), (_, n: string) => formatLength(Number(n) / 1000, 'us'))
    .replace(new RegExp(String.raw`${NUM_RE}\s?m${UNIT_END}`, 'g'), (_, n: string) => formatLength(Number(n), 'us'))
    .replace(new RegExp(String.raw`${NUM_RE}\s?°C`, 'g'), (_, n: string) => formatTemperature(Number(n), 'us'));
}
