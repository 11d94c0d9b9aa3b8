import { describe, expect, it } from 'vitest';
import {
  FUSE_CLASSES, STANDARD_FUSE_RATINGS_A, nextStandardRating, previousStandardRating, typicalColdResistance_ohm,
} from '../../../shared/electrical/tables/fuses';

// NEC 240.6(A) standard ampere ratings, and the additional standard fuse ratings 1, 3, 6, 10, 601.
const NEC_240_6A = [
  15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500,
  600, 700, 800, 1000, 1200, 1600, 2000, 2500, 3000, 4000, 5000, 6000,
];
const ADDITIONAL = [1, 3, 6, 10, 601];

describe('standard ratings (NEC 240.6(A))', () => {
  it('lists exactly the standard and additional fuse ratings, ascending', () => {
    expect([...STANDARD_FUSE_RATINGS_A]).toEqual([...NEC_240_6A, ...ADDITIONAL].sort((a, b) => a - b));
  });

  it('nextStandardRating picks the smallest rating at or above', () => {
    expect(nextStandardRating(101)).toBe(110);
    expect(nextStandardRating(110)).toBe(110);
    expect(nextStandardRating(217)).toBe(225);
    expect(nextStandardRating(0.4)).toBe(1);
    expect(nextStandardRating(2)).toBe(3);
    expect(nextStandardRating(600.5)).toBe(601);
    expect(nextStandardRating(600.5, 'breaker')).toBe(700);
    expect(nextStandardRating(2, 'breaker')).toBe(15);
    expect(nextStandardRating(6001)).toBeNull();
    expect(nextStandardRating(Number.NaN)).toBeNull();
    expect(previousStandardRating(120)).toBe(110);
  });
});

describe('fuse classes (common practice, from memory)', () => {
  it('carries the typical DC interrupting ratings', () => {
    // Common practice, recalled: Class T about 20 kA DC; terminal fuses about 10 kA at 14 V; ANL a few kA; strip about 2 kA.
    expect(FUSE_CLASSES.class_t.interrupting_A).toBe(20_000);
    expect(FUSE_CLASSES.battery_terminal.interrupting_A).toBe(10_000);
    expect(FUSE_CLASSES.battery_terminal.interruptingAt_V).toBe(14);
    expect(FUSE_CLASSES.anl.interrupting_A).toBeGreaterThanOrEqual(1_000);
    expect(FUSE_CLASSES.anl.interrupting_A).toBeLessThan(10_000);
    expect(FUSE_CLASSES.strip.interrupting_A).toBe(2_000);
  });

  it('cold resistance falls with rating (drop at rating ÷ rating)', () => {
    expect(typicalColdResistance_ohm('anl', 100)).toBeCloseTo(0.05 / 100, 12);
    expect(typicalColdResistance_ohm('blade', 10)).toBeGreaterThan(typicalColdResistance_ohm('blade', 30));
  });
});
