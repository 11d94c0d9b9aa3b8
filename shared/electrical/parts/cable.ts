/** Cable run: one conductor between two terminals (the `props` of a diagram cable). */
import { z } from 'zod';
import type { ConductorSize } from '../../units/conductor';
import {
  type ConductorMaterial,
  type ResistanceBasis,
  type Stranding,
  conductorResistance_ohm_per_m,
} from '../tables/conductors';
import { conductorSizeSchema, materialSchema } from './common';

export const INSULATION_RATINGS_C = [60, 75, 90, 105] as const;
/** Termination temperature ratings a run can name (NEC 110.14(C) columns). */
export const TERMINAL_RATINGS_C = [60, 75, 90] as const;

export const cableRunPropsSchema = z.object({
  conductor: conductorSizeSchema,
  /**
   * Length of this one conductor, terminal to terminal, m. 0 means the two terminals are bolted
   * directly together (e.g. a terminal fuse on a battery post): no conductor resistance.
   */
  length_m: z.number().min(0).max(1000),
  material: materialSchema.default('copper'),
  /** Stranding allowance; battery cable is usually fine-strand flexible. */
  stranding: z.enum(['solid', 'concentric', 'flexible']).default('flexible'),
  /** 'computed' from resistivity and area, or the published 'table' value where one exists. */
  resistanceBasis: z.enum(['computed', 'table']).default('computed'),
  /** Insulation temperature rating, °C. */
  insulation_C: z.union([z.literal(60), z.literal(75), z.literal(90), z.literal(105)]).default(90),
  /**
   * Temperature rating of the lowest-rated termination on this run (lug, stud, fuse holder, breaker or
   * busbar terminal), °C, when known. The run's ampacity never exceeds the table's column at this
   * temperature (NEC 110.14(C), from memory). Omitted: the terminations are not taken into account.
   */
  terminal_C: z.union([z.literal(60), z.literal(75), z.literal(90)]).optional(),
  installation: z.enum(['free_air', 'bundled', 'engine_space']).default('free_air'),
  /** Current-carrying conductors in the bundle when installation is 'bundled'. */
  bundledConductors: z.int().min(2).max(100).optional(),
  /** Ambient around this run, °C; defaults to the bank's ambient. */
  ambient_C: z.number().min(-60).max(150).optional(),
  role: z.enum(['cable', 'jumper']).default('cable'),
  /** Contact resistance of the lug joint at each end, Ω (omit for none modelled). */
  lugFrom_ohm: z.number().min(0).max(1).optional(),
  lugTo_ohm: z.number().min(0).max(1).optional(),
});
export type CableRunProps = z.infer<typeof cableRunPropsSchema>;

export interface ConductorRunSpec {
  conductor: ConductorSize;
  length_m: number;
  material: ConductorMaterial;
  stranding: Stranding;
  resistanceBasis: ResistanceBasis;
}

/** Conductor resistance of a run at `temp_C`, Ω (no lugs). */
export function cableRunConductorResistance_ohm(c: ConductorRunSpec, temp_C: number): number {
  const { r_ohm_per_m } = conductorResistance_ohm_per_m(
    { size: c.conductor, material: c.material, stranding: c.stranding, basis: c.resistanceBasis },
    temp_C,
  );
  return r_ohm_per_m * c.length_m;
}

/** The conductor temperature used for resistance: the run's ambient, else the bank's. */
export function cableTemperature_C(c: CableRunProps, bankAmbient_C: number): number {
  return c.ambient_C ?? bankAmbient_C;
}

export function cableRunDefaults(): CableRunProps {
  return {
    conductor: { system: 'awg', size: '2/0' },
    length_m: 1,
    material: 'copper',
    stranding: 'flexible',
    resistanceBasis: 'computed',
    insulation_C: 90,
    installation: 'free_air',
    role: 'cable',
  };
}
