/** Length conversions. SI (metres) inside; feet, inches and millimetres at the edges. */

export const M_PER_FT = 0.3048; // exact, international foot
export const M_PER_IN = 0.0254; // exact
export const M_PER_MM = 0.001;

export type LengthUnit = 'm' | 'mm' | 'ft' | 'in';

const TO_M: Record<LengthUnit, number> = { m: 1, mm: M_PER_MM, ft: M_PER_FT, in: M_PER_IN };

export function toMetres(value: number, unit: LengthUnit): number {
  return value * TO_M[unit];
}

export function fromMetres(value_m: number, unit: LengthUnit): number {
  return value_m / TO_M[unit];
}

export const ftToM = (ft: number) => ft * M_PER_FT;
export const mToFt = (m: number) => m / M_PER_FT;
export const inToM = (inch: number) => inch * M_PER_IN;
export const mToIn = (m: number) => m / M_PER_IN;
