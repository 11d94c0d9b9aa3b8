/**
 * Conductor sizes: AWG (American Wire Gauge), kcmil and mm². Areas in mm² inside.
 *
 * AWG diameter from ASTM B258: d = 0.005 in × 92^((36 − n)/39), with 1/0 = 0, 2/0 = −1, 3/0 = −2,
 * 4/0 = −3. 1 kcmil = 1000 circular mils; 1 circular mil = π/4 × (0.001 in)², so 1 kcmil = 0.506707 mm².
 */
import { M_PER_IN } from './length';

/** AWG sizes we accept, smallest conductor first. "1/0".."4/0" are the aught sizes. */
export const AWG_SIZES = ['18', '16', '14', '12', '10', '8', '6', '4', '3', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const;
export type AwgSize = (typeof AWG_SIZES)[number];

/** Standard kcmil sizes (above 4/0), smallest first. */
export const KCMIL_SIZES = [250, 300, 350, 400, 500, 600, 700, 750, 800, 900, 1000] as const;

/** Standard metric conductor sizes (IEC 60228 nominal areas), mm². */
export const MM2_SIZES = [0.5, 0.75, 1, 1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240, 300, 400, 500] as const;

export const MM2_PER_KCMIL = (Math.PI / 4) * (0.001 * 25.4) ** 2 * 1000; // 0.506707 mm²

/** The gauge number n in the ASTM B258 formula: "1/0" → 0, "2/0" → −1, "3/0" → −2, "4/0" → −3. */
export function awgGaugeNumber(size: AwgSize): number {
  const aught = /^([1-4])\/0$/.exec(size);
  if (aught) return 1 - Number(aught[1]);
  return Number(size);
}

export function isAwgSize(s: string): s is AwgSize {
  return (AWG_SIZES as readonly string[]).includes(s);
}

/** Diameter of a solid round AWG conductor, metres (ASTM B258). */
export function awgDiameter_m(size: AwgSize): number {
  const n = awgGaugeNumber(size);
  return 0.005 * 92 ** ((36 - n) / 39) * M_PER_IN;
}

/** Cross-sectional area of an AWG conductor, mm² (area of the solid round conductor of that gauge). */
export function awgArea_mm2(size: AwgSize): number {
  const d_mm = awgDiameter_m(size) * 1000;
  return (Math.PI / 4) * d_mm * d_mm;
}

export const kcmilToMm2 = (kcmil: number) => kcmil * MM2_PER_KCMIL;
export const mm2ToKcmil = (mm2: number) => mm2 / MM2_PER_KCMIL;

/** How a conductor size is written by the user: AWG, kcmil or mm². */
export type ConductorSize =
  | { system: 'awg'; size: AwgSize }
  | { system: 'kcmil'; size: number }
  | { system: 'mm2'; size: number };

/** Cross-sectional area of a conductor size, mm². */
export function conductorArea_mm2(c: ConductorSize): number {
  switch (c.system) {
    case 'awg':
      return awgArea_mm2(c.size);
    case 'kcmil':
      return kcmilToMm2(c.size);
    case 'mm2':
      return c.size;
  }
}

/** The US standard sizes (AWG then kcmil) in order of increasing area. */
export function usStandardSizes(): ConductorSize[] {
  return [
    ...AWG_SIZES.map((size) => ({ system: 'awg', size }) as ConductorSize),
    ...KCMIL_SIZES.map((size) => ({ system: 'kcmil', size }) as ConductorSize),
  ];
}

/**
 * The largest AWG size whose area is at or below `area_mm2` — used to read a US ampacity table for a
 * metric conductor conservatively (never credits the metric conductor with more copper than it has).
 * Returns null when the area is below the smallest AWG size we list.
 */
export function awgAtOrBelow(area_mm2: number): AwgSize | null {
  let best: AwgSize | null = null;
  for (const s of AWG_SIZES) {
    if (awgArea_mm2(s) <= area_mm2 * (1 + 1e-9)) best = s;
  }
  return best;
}

/** The US standard size (AWG or kcmil) nearest in area to `area_mm2` (nearest on a log scale). */
export function nearestUsSize(area_mm2: number): ConductorSize {
  let best = usStandardSizes()[0];
  let bestErr = Infinity;
  for (const s of usStandardSizes()) {
    const err = Math.abs(Math.log(conductorArea_mm2(s) / area_mm2));
    if (err < bestErr) {
      bestErr = err;
      best = s;
    }
  }
  return best;
}

/** The standard metric size nearest in area to `area_mm2` (log scale). */
export function nearestMetricSize(area_mm2: number): number {
  let best: number = MM2_SIZES[0];
  for (const s of MM2_SIZES) {
    if (Math.abs(Math.log(s / area_mm2)) < Math.abs(Math.log(best / area_mm2))) best = s;
  }
  return best;
}
