/** Battery and series-string part models. */
import { z } from 'zod';
import {
  CHEMISTRIES,
  CHEMISTRY_IDS,
  type ChemistryId,
  cellOcv_V,
  cellsForNominal,
  typicalInternalResistance_ohm,
} from '../tables/batteries';
import type { NetworkElement } from '../network/types';
import { type ModelContext, type PartModel, conductorSizeSchema, materialSchema, shortText } from './common';
import { cableRunConductorResistance_ohm } from './cable';

export const batteryPropsSchema = z
  .object({
    chemistry: z.enum(CHEMISTRY_IDS),
    /** Make and model as written on the case (free text). */
    model: shortText(120).optional(),
    nominal_V: z.number().positive().max(1500),
    capacity_Ah: z.number().positive().max(100_000),
    r_internal_ohm: z.number().positive().max(10),
    max_continuous_A: z.number().positive().max(100_000).optional(),
    max_c_rate: z.number().positive().max(100).optional(),
    /** Largest pulse (short-time) discharge current, A, allowed for `pulse_s` (otherwise the chemistry's typical pulse C-rate). */
    max_pulse_A: z.number().positive().max(1_000_000).optional(),
    /** How long the pulse current may last, s (otherwise the chemistry's typical duration). */
    pulse_s: z.number().positive().max(3600).optional(),
    /** Short-circuit current from the battery's own data, A (otherwise estimated as OCV / r). */
    short_circuit_A: z.number().positive().max(1_000_000).optional(),
    /** State of charge 0..1. */
    soc: z.number().min(0).max(1),
    /** Measured resting voltage, V; when given it is used instead of the state-of-charge curve. */
    restingVoltage_V: z.number().positive().max(1500).optional(),
    /** Install date, YYYY-MM-DD. */
    installDate: z.iso.date().optional(),
    age_years: z.number().min(0).max(100).optional(),
    /** Cells in series inside the battery (default: nominal_V / cell nominal voltage, rounded). */
    cells_in_series: z.int().min(1).max(1000).optional(),
  })
  .refine((b) => b.restingVoltage_V === undefined || b.restingVoltage_V <= b.nominal_V * 1.5, {
    message: 'Resting voltage is far above the nominal voltage',
    path: ['restingVoltage_V'],
  });
export type BatteryProps = z.infer<typeof batteryPropsSchema>;

export const BATTERY_TERMINALS = ['pos', 'neg'] as const;

export function batteryCells(b: BatteryProps): number {
  return b.cells_in_series ?? cellsForNominal(b.chemistry, b.nominal_V);
}

/** Open-circuit voltage of a battery: the measured resting voltage, else the chemistry's curve at its SoC. */
export function batteryOcv_V(b: BatteryProps): number {
  return b.restingVoltage_V ?? cellOcv_V(b.chemistry, b.soc) * batteryCells(b);
}

/** Continuous current limit, A: max_continuous_A, else max_c_rate × capacity, else the chemistry's typical C-rate. */
export function batteryMaxContinuous_A(b: BatteryProps): number {
  if (b.max_continuous_A !== undefined) return b.max_continuous_A;
  const c = b.max_c_rate ?? CHEMISTRIES[b.chemistry].typicalMaxContinuousC;
  return c * b.capacity_Ah;
}

/** Pulse discharge limit, A: max_pulse_A, else the chemistry's typical pulse C-rate × capacity (common practice, from memory). */
export function batteryMaxPulse_A(b: BatteryProps): number {
  return b.max_pulse_A ?? CHEMISTRIES[b.chemistry].typicalMaxPulseC * b.capacity_Ah;
}

/** How long the pulse limit may be drawn, s: pulse_s, else the chemistry's typical duration (common practice, from memory). */
export function batteryPulse_s(b: BatteryProps): number {
  return b.pulse_s ?? CHEMISTRIES[b.chemistry].typicalPulse_s;
}

/** Current limits of a bank unit (a battery, or batteries in series): in series each limit is the smallest member's. */
export interface UnitLimits {
  maxContinuous_A: number;
  maxPulse_A: number;
  /** The shortest member pulse duration, s. */
  pulse_s: number;
}

export function unitLimits(members: readonly BatteryProps[]): UnitLimits {
  return {
    maxContinuous_A: Math.min(...members.map(batteryMaxContinuous_A)),
    maxPulse_A: Math.min(...members.map(batteryMaxPulse_A)),
    pulse_s: Math.min(...members.map(batteryPulse_s)),
  };
}

/** Prospective short-circuit current at the terminals, A: the battery's own figure, else OCV / r (first principles). */
export function batteryShortCircuit_A(b: BatteryProps): number {
  return b.short_circuit_A ?? batteryOcv_V(b) / b.r_internal_ohm;
}

export function batteryModel(b: BatteryProps): PartModel {
  return {
    elements: [{ id: 'cell', kind: 'battery', pos: 'pos', neg: 'neg', ocv_V: batteryOcv_V(b), r_ohm: b.r_internal_ohm, role: 'battery' }],
  };
}

export function batteryDefaults(chemistry: ChemistryId = 'lfp', capacity_Ah = 100): BatteryProps {
  const ch = CHEMISTRIES[chemistry];
  const cells = ch.cellsPer12VBlock;
  return {
    chemistry,
    nominal_V: Math.round(ch.cellNominal_V * cells * 10) / 10,
    capacity_Ah,
    r_internal_ohm: typicalInternalResistance_ohm(chemistry, cells, capacity_Ah),
    max_continuous_A: ch.typicalMaxContinuousC * capacity_Ah,
    max_pulse_A: ch.typicalMaxPulseC * capacity_Ah,
    pulse_s: ch.typicalPulse_s,
    soc: 1,
  };
}

// ---------------------------------------------------------------------------------------------------

/** Jumper between consecutive members of a series string (optional; without it members join directly). */
export const stringInterconnectSchema = z.object({
  conductor: conductorSizeSchema,
  length_m: z.number().positive().max(100),
  material: materialSchema.default('copper'),
});

export const seriesStringPropsSchema = z
  .object({
    count: z.int().min(1).max(64),
    /** One battery spec repeated `count` times… */
    member: batteryPropsSchema,
    /** …or one spec per member (bottom, most negative, first). Overrides `member` when given. */
    members: z.array(batteryPropsSchema).max(64).optional(),
    interconnect: stringInterconnectSchema.optional(),
  })
  .refine((s) => s.members === undefined || s.members.length === s.count, {
    message: 'members must list one battery per member (count)',
    path: ['members'],
  });
export type SeriesStringProps = z.infer<typeof seriesStringPropsSchema>;

export const SERIES_STRING_TERMINALS = ['pos', 'neg'] as const;

export function stringMembers(s: SeriesStringProps): BatteryProps[] {
  return s.members ?? Array.from({ length: s.count }, () => s.member);
}

export function stringNominal_V(s: SeriesStringProps): number {
  return stringMembers(s).reduce((sum, b) => sum + b.nominal_V, 0);
}

/** A string's current limits: each the smallest member's (the same current flows through every member). */
export function stringLimits(s: SeriesStringProps): UnitLimits {
  return unitLimits(stringMembers(s));
}

export function stringOcv_V(s: SeriesStringProps): number {
  return stringMembers(s).reduce((sum, b) => sum + batteryOcv_V(b), 0);
}

/** Members b1..bN from neg (bottom) to pos (top), joined directly or by jumpers j1..j(N−1). */
export function seriesStringModel(s: SeriesStringProps, ctx: ModelContext): PartModel {
  const members = stringMembers(s);
  const n = members.length;
  const elements: NetworkElement[] = [];
  for (let i = 0; i < n; i++) {
    const negNode = i === 0 ? 'neg' : s.interconnect ? `_n${i + 1}` : `_p${i}`;
    const posNode = i === n - 1 ? 'pos' : `_p${i + 1}`;
    const b = members[i];
    elements.push({ id: `b${i + 1}`, kind: 'battery', pos: posNode, neg: negNode, ocv_V: batteryOcv_V(b), r_ohm: b.r_internal_ohm, role: 'battery' });
    if (s.interconnect && i < n - 1) {
      const r = cableRunConductorResistance_ohm(
        { conductor: s.interconnect.conductor, length_m: s.interconnect.length_m, material: s.interconnect.material, stranding: 'flexible', resistanceBasis: 'computed' },
        ctx.ambient_C,
      );
      elements.push({ id: `j${i + 1}`, kind: 'resistor', a: `_p${i + 1}`, b: `_n${i + 2}`, r_ohm: r, role: 'jumper' });
    }
  }
  return { elements };
}

export function seriesStringDefaults(count = 4): SeriesStringProps {
  return { count, member: batteryDefaults('lfp', 100) };
}
