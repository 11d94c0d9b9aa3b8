/**
 * Conductor resistance: computed from resistivity, area and temperature, and the published tables
 * (NEC Chapter 9 Table 8, IEC 60228 class 5) for users who select the "table value".
 * SI-ish units: Ω·mm²/m for resistivity, Ω/m for resistance per length.
 */
import { type AwgSize, type ConductorSize, conductorArea_mm2 } from '../../units/conductor';

export type ConductorMaterial = 'copper' | 'aluminium';

export interface MaterialData {
  /** Resistivity at 20 °C, Ω·mm²/m. */
  rho20_ohm_mm2_per_m: number;
  /** Temperature coefficient of resistance at 20 °C, 1/K. */
  alpha20_per_K: number;
  source: string;
}

export const MATERIALS: Record<ConductorMaterial, MaterialData> = {
  // IEC 60028 annealed copper standard (100 % IACS): 58 MS/m → 0.017241 Ω·mm²/m at 20 °C, α = 0.00393/K.
  copper: { rho20_ohm_mm2_per_m: 0.017241, alpha20_per_K: 0.00393, source: 'IEC 60028' },
  // Aluminium for electrical purposes (61 % IACS): 0.028264 Ω·mm²/m at 20 °C, α = 0.00403/K — from memory.
  aluminium: { rho20_ohm_mm2_per_m: 0.028264, alpha20_per_K: 0.00403, source: 'from memory (61 % IACS)' },
};

/**
 * How the conductor is stranded, as a resistance allowance over a solid conductor of the same area.
 * - solid: 1.00.
 * - concentric (class B building wire): 1.02 — NEC Chapter 9 Table 8 stranded values are 1.8–2.5 % above
 *   solid (common practice to use ≈ 2 %).
 * - flexible (class 5 / fine-strand battery cable): 1.10 — chosen so the computed value of every IEC
 *   nominal size stays at or below the IEC 60228 class 5 maximum and within about 5 % of it.
 */
export type Stranding = 'solid' | 'concentric' | 'flexible';
export const STRANDING_FACTOR: Record<Stranding, number> = { solid: 1.0, concentric: 1.02, flexible: 1.1 };

/** Resistivity at temperature T (°C), Ω·mm²/m: ρ(T) = ρ20 (1 + α (T − 20)). */
export function resistivity_ohm_mm2_per_m(material: ConductorMaterial, temp_C: number): number {
  const m = MATERIALS[material];
  return m.rho20_ohm_mm2_per_m * (1 + m.alpha20_per_K * (temp_C - 20));
}

/** Resistance per metre of a conductor of `area_mm2` at `temp_C`, Ω/m. */
export function computedResistance_ohm_per_m(
  area_mm2: number,
  material: ConductorMaterial,
  temp_C: number,
  stranding: Stranding = 'solid',
): number {
  return (resistivity_ohm_mm2_per_m(material, temp_C) / area_mm2) * STRANDING_FACTOR[stranding];
}

// ---------------------------------------------------------------------------------------------------
// Published tables

/** NEC Chapter 9 Table 8: DC resistance at 75 °C, uncoated copper, Ω per 1000 ft, stranded conductors. */
export const NEC_CH9_T8_STRANDED_OHM_PER_KFT_75C: Partial<Record<AwgSize, number>> & Record<string, number> = {
  '14': 3.14, '12': 1.98, '10': 1.24, '8': 0.778, '6': 0.491, '4': 0.308, '2': 0.194, '1': 0.154,
  '1/0': 0.122, '2/0': 0.0967, '3/0': 0.0766, '4/0': 0.0608,
  // 3 AWG and kcmil rows — from memory (not in the reference copy).
  '3': 0.245,
  '250kcmil': 0.0515, '300kcmil': 0.0429, '350kcmil': 0.0367, '400kcmil': 0.0321, '500kcmil': 0.0258,
  '600kcmil': 0.0214, '750kcmil': 0.0171,
};

/** NEC Chapter 9 Table 8 solid conductors at 75 °C, Ω per 1000 ft. */
export const NEC_CH9_T8_SOLID_OHM_PER_KFT_75C: Partial<Record<AwgSize, number>> = {
  '14': 3.07, '12': 1.93, '10': 1.21, '8': 0.764,
};

/** Temperature correction used with NEC Chapter 9 Table 8: R2 = R1 (1 + 0.00323 (T2 − 75)) (recalled). */
export const NEC_T8_ALPHA_75C = 0.00323;

/** IEC 60228 class 5 (flexible) plain copper, maximum DC resistance at 20 °C, Ω/km. */
export const IEC_60228_CLASS5_OHM_PER_KM_20C: Record<number, number> = {
  1.5: 13.3, 2.5: 7.98, 4: 4.95, 6: 3.3, 10: 1.91, 16: 1.21, 25: 0.78, 35: 0.554, 50: 0.386, 70: 0.272,
  95: 0.206, 120: 0.161,
  // Larger sizes — from memory (not in the reference copy).
  150: 0.129, 185: 0.106, 240: 0.0801,
};

const FT_PER_KFT_IN_M = 304.8;

function necKey(size: ConductorSize): string | null {
  if (size.system === 'awg') return size.size;
  if (size.system === 'kcmil') return `${size.size}kcmil`;
  return null;
}

/**
 * The published "table value" resistance of a copper conductor at `temp_C`, Ω/m, or null when the
 * size is not in a table we ship. AWG/kcmil read NEC Chapter 9 Table 8 (stranded) corrected from 75 °C
 * with 0.00323/K; mm² read IEC 60228 class 5 maximum corrected from 20 °C with 0.00393/K.
 */
export function tableResistance_ohm_per_m(size: ConductorSize, temp_C: number): number | null {
  const key = necKey(size);
  if (key !== null) {
    const r = NEC_CH9_T8_STRANDED_OHM_PER_KFT_75C[key];
    if (r === undefined) return null;
    return (r / FT_PER_KFT_IN_M) * (1 + NEC_T8_ALPHA_75C * (temp_C - 75));
  }
  if (size.system !== 'mm2') return null;
  const r = IEC_60228_CLASS5_OHM_PER_KM_20C[size.size];
  if (r === undefined) return null;
  return (r / 1000) * (1 + MATERIALS.copper.alpha20_per_K * (temp_C - 20));
}

export type ResistanceBasis = 'computed' | 'table';

export interface ConductorResistanceInput {
  size: ConductorSize;
  material: ConductorMaterial;
  stranding: Stranding;
  basis: ResistanceBasis;
}

/**
 * Resistance per metre of a conductor, Ω/m. With basis 'table' and a copper size found in a table,
 * the table value; otherwise the computed value (and `fromTable` false).
 */
export function conductorResistance_ohm_per_m(
  c: ConductorResistanceInput,
  temp_C: number,
): { r_ohm_per_m: number; fromTable: boolean } {
  if (c.basis === 'table' && c.material === 'copper') {
    const t = tableResistance_ohm_per_m(c.size, temp_C);
    if (t !== null) return { r_ohm_per_m: t, fromTable: true };
  }
  return {
    r_ohm_per_m: computedResistance_ohm_per_m(conductorArea_mm2(c.size), c.material, temp_C, c.stranding),
    fromTable: false,
  };
}
