/** Overcurrent protective devices: standard ratings and fuse classes (editable presets). */

/** NEC 240.6(A) standard ampere ratings for fuses and inverse-time breakers. */
export const NEC_240_6A_STANDARD_RATINGS_A = [
  15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450,
  500, 600, 700, 800, 1000, 1200, 1600, 2000, 2500, 3000, 4000, 5000, 6000,
] as const;

/** NEC 240.6(A) additional standard ratings for fuses. */
export const NEC_240_6A_ADDITIONAL_FUSE_RATINGS_A = [1, 3, 6, 10, 601] as const;

/** All standard fuse ratings, ascending (NEC 240.6(A) including the additional fuse ratings). */
export const STANDARD_FUSE_RATINGS_A: readonly number[] = [
  ...NEC_240_6A_STANDARD_RATINGS_A,
  ...NEC_240_6A_ADDITIONAL_FUSE_RATINGS_A,
].sort((a, b) => a - b);

/**
 * The smallest standard rating at or above `amps` (NEC 240.6(A)), or null when `amps` exceeds the
 * largest standard rating. `device: 'breaker'` leaves out the additional fuse-only ratings.
 */
export function nextStandardRating(amps: number, device: 'fuse' | 'breaker' = 'fuse'): number | null {
  if (!Number.isFinite(amps)) return null;
  const list = device === 'fuse' ? STANDARD_FUSE_RATINGS_A : NEC_240_6A_STANDARD_RATINGS_A;
  for (const r of list) if (r >= amps - 1e-9) return r;
  return null;
}

/** The largest standard rating at or below `amps`, or null when below the smallest. */
export function previousStandardRating(amps: number, device: 'fuse' | 'breaker' = 'fuse'): number | null {
  const list = device === 'fuse' ? STANDARD_FUSE_RATINGS_A : NEC_240_6A_STANDARD_RATINGS_A;
  let best: number | null = null;
  for (const r of list) if (r <= amps + 1e-9) best = r;
  return best;
}

export const FUSE_CLASS_IDS = ['class_t', 'anl', 'battery_terminal', 'strip', 'blade', 'breaker_dc'] as const;
export type FuseClassId = (typeof FUSE_CLASS_IDS)[number];

export interface FuseClass {
  id: FuseClassId;
  name: string;
  /** Typical DC voltage rating, V. */
  voltage_V: number;
  /** Typical DC interrupting rating, A, at `interruptingAt_V`. */
  interrupting_A: number;
  interruptingAt_V: number;
  /**
   * Ratings made in this class, A, ascending (common practice, from memory; a maker's own range can be
   * narrower). Sizing offers a class only at a rating in this list.
   */
  ratings_A: readonly number[];
  /** Common ratings for the picker, A (each one in `ratings_A`). */
  commonRatings_A: number[];
  /** Typical voltage drop across the fuse at rated current when cold, mV (from memory) — gives cold resistance. */
  coldDropAtRating_mV: number;
}

/**
 * Fuse classes with typical ratings — common practice, from memory; confirm against the part's own
 * marked ratings. Interrupting ratings: Class T about 20 kA DC, battery-terminal fuses about 10 kA at
 * 14 V, ANL a few kA, strip (bolt-down) fuses about 2 kA (common practice, recalled).
 */
export const FUSE_CLASSES: Record<FuseClassId, FuseClass> = {
  class_t: {
    id: 'class_t', name: 'Class T', voltage_V: 160, interrupting_A: 20_000, interruptingAt_V: 160,
    ratings_A: [1, 3, 6, 10, 15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000, 1200], commonRatings_A: [30, 40, 50, 60, 80, 100, 125, 150, 175, 200, 225, 250, 300, 350, 400],
    coldDropAtRating_mV: 60,
  },
  anl: {
    id: 'anl', name: 'ANL', voltage_V: 32, interrupting_A: 3_000, interruptingAt_V: 32,
    ratings_A: [35, 40, 50, 60, 80, 100, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 750], commonRatings_A: [80, 100, 125, 150, 200, 250, 300, 400, 500],
    coldDropAtRating_mV: 50,
  },
  battery_terminal: {
    id: 'battery_terminal', name: 'Battery terminal fuse', voltage_V: 58, interrupting_A: 10_000, interruptingAt_V: 14,
    ratings_A: [30, 40, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300], commonRatings_A: [50, 80, 100, 125, 150, 200, 250, 300],
    coldDropAtRating_mV: 50,
  },
  strip: {
    id: 'strip', name: 'Strip fuse (bolt-down)', voltage_V: 32, interrupting_A: 2_000, interruptingAt_V: 32,
    ratings_A: [40, 50, 60, 70, 80, 100, 125, 150, 175, 200, 225, 250, 300, 350, 400, 500], commonRatings_A: [60, 80, 100, 125, 150, 200, 250, 300],
    coldDropAtRating_mV: 60,
  },
  blade: {
    id: 'blade', name: 'Blade fuse', voltage_V: 32, interrupting_A: 1_000, interruptingAt_V: 32,
    ratings_A: [1, 2, 3, 5, 10, 15, 20, 25, 30, 35, 40, 50, 60, 70, 80, 100, 120], commonRatings_A: [5, 10, 15, 20, 25, 30, 40, 60, 80, 100],
    coldDropAtRating_mV: 75,
  },
  breaker_dc: {
    id: 'breaker_dc', name: 'Circuit breaker (DC)', voltage_V: 48, interrupting_A: 5_000, interruptingAt_V: 48,
    ratings_A: [5, 10, 15, 20, 25, 30, 35, 40, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300], commonRatings_A: [20, 30, 50, 80, 100, 125, 150, 200, 250, 300],
    coldDropAtRating_mV: 100,
  },
};

/**
 * Typical cold resistance of a fuse or breaker of a class and rating, Ω — from memory: the voltage
 * drop at rated current divided by the rating (e.g. a 100 A ANL about 0.5 mΩ, a 10 A blade about 7.5 mΩ).
 */
export function typicalColdResistance_ohm(classId: FuseClassId, rating_A: number): number {
  return FUSE_CLASSES[classId].coldDropAtRating_mV / 1000 / rating_A;
}

/** Whether a class is made at a rating (the rating is in its list). */
export function classListsRating(classId: FuseClassId, rating_A: number): boolean {
  return FUSE_CLASSES[classId].ratings_A.some((r) => Math.abs(r - rating_A) < 1e-9);
}
