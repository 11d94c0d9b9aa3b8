/** Lug joints, busbars, fuses, switches and shunts: the pass-through parts. */
import { z } from 'zod';
import { FUSE_CLASSES, FUSE_CLASS_IDS, type FuseClassId, typicalColdResistance_ohm } from '../tables/fuses';
import { resistivity_ohm_mm2_per_m } from '../tables/conductors';
import type { NetworkElement } from '../network/types';
import { type ModelContext, type PartModel, TYPICAL_LUG_CONTACT_OHM, materialSchema, shortText } from './common';

// Lug / terminal joint -------------------------------------------------------------------------------

export const lugPropsSchema = z.object({
  contact_ohm: z.number().min(0).max(1),
  /** Stud size as marked, e.g. "M8" or "5/16 in". */
  stud: shortText(20).optional(),
});
export type LugProps = z.infer<typeof lugPropsSchema>;
export const LUG_TERMINALS = ['a', 'b'] as const;
export const lugModel = (p: LugProps): PartModel => ({
  elements: [{ id: 'contact', kind: 'resistor', a: 'a', b: 'b', r_ohm: p.contact_ohm, role: 'lug' }],
});
export const lugDefaults = (): LugProps => ({ contact_ohm: TYPICAL_LUG_CONTACT_OHM, stud: 'M8' });

// Busbar -----------------------------------------------------------------------------------------------

export const busbarPropsSchema = z
  .object({
    material: materialSchema,
    width_mm: z.number().positive().max(500),
    thickness_mm: z.number().positive().max(100),
    /** Cross-section override, mm² (otherwise width × thickness). */
    area_mm2: z.number().positive().max(50_000).optional(),
    /** Taps (studs) t1..tN along the bar. */
    tapCount: z.int().min(2).max(64),
    /** Centre-to-centre distance between neighbouring taps, m. */
    tapSpacing_m: z.number().positive().max(10),
    /** Per-segment lengths t1→t2, t2→t3 …, m (override the uniform spacing). */
    segmentLengths_m: z.array(z.number().positive().max(10)).max(63).optional(),
    rating_A: z.number().positive().max(100_000),
  })
  .refine((b) => b.segmentLengths_m === undefined || b.segmentLengths_m.length === b.tapCount - 1, {
    message: 'segmentLengths_m needs one length per gap between taps (tapCount − 1)',
    path: ['segmentLengths_m'],
  });
export type BusbarProps = z.infer<typeof busbarPropsSchema>;

export const busbarTerminals = (p: Pick<BusbarProps, 'tapCount'>) =>
  Array.from({ length: p.tapCount }, (_, i) => `t${i + 1}`);

export const busbarArea_mm2 = (p: BusbarProps) => p.area_mm2 ?? p.width_mm * p.thickness_mm;

/** Segment resistances between consecutive taps, Ω, at `temp_C` (solid bar: ρ(T) L / A). */
export function busbarSegmentResistances_ohm(p: BusbarProps, temp_C: number): number[] {
  const rho = resistivity_ohm_mm2_per_m(p.material, temp_C);
  const area = busbarArea_mm2(p);
  return Array.from({ length: p.tapCount - 1 }, (_, i) => (rho * (p.segmentLengths_m?.[i] ?? p.tapSpacing_m)) / area);
}

export function busbarModel(p: BusbarProps, ctx: ModelContext): PartModel {
  const elements: NetworkElement[] = busbarSegmentResistances_ohm(p, ctx.ambient_C).map((r, i) => ({
    id: `seg${i + 1}`, kind: 'resistor', a: `t${i + 1}`, b: `t${i + 2}`, r_ohm: r, role: 'busbar',
  }));
  return { elements };
}

/** 25 × 6 mm copper bar with 6 studs 40 mm apart, 300 A (common practice sizing, from memory). */
export const busbarDefaults = (): BusbarProps => ({
  material: 'copper', width_mm: 25, thickness_mm: 6, tapCount: 6, tapSpacing_m: 0.04, rating_A: 300,
});

// Fuse ---------------------------------------------------------------------------------------------------

export const fusePropsSchema = z.object({
  fuseClass: z.enum(FUSE_CLASS_IDS),
  rating_A: z.number().positive().max(10_000),
  voltage_rating_V: z.number().positive().max(2000),
  interrupting_A: z.number().positive().max(1_000_000),
  /** Cold resistance, Ω (otherwise the class's typical value at this rating, from memory). */
  cold_r_ohm: z.number().positive().max(10).optional(),
});
export type FuseProps = z.infer<typeof fusePropsSchema>;
export const FUSE_TERMINALS = ['a', 'b'] as const;
export const fuseResistance_ohm = (p: FuseProps) => p.cold_r_ohm ?? typicalColdResistance_ohm(p.fuseClass, p.rating_A);
export const fuseModel = (p: FuseProps): PartModel => ({
  elements: [{ id: 'element', kind: 'resistor', a: 'a', b: 'b', r_ohm: fuseResistance_ohm(p), role: 'fuse' }],
});
export function fuseDefaults(fuseClass: FuseClassId = 'class_t', rating_A = 200): FuseProps {
  const c = FUSE_CLASSES[fuseClass];
  return { fuseClass, rating_A, voltage_rating_V: c.voltage_V, interrupting_A: c.interrupting_A };
}

// Switch / disconnect ---------------------------------------------------------------------------------------

/** Resistance used for an open switch, Ω: a leakage path that keeps the network solvable. */
export const OPEN_SWITCH_OHM = 1e7;

export const switchPropsSchema = z.object({
  rating_A: z.number().positive().max(100_000),
  contact_ohm: z.number().min(0).max(1),
  closed: z.boolean(),
});
export type SwitchProps = z.infer<typeof switchPropsSchema>;
export const SWITCH_TERMINALS = ['a', 'b'] as const;
export const switchModel = (p: SwitchProps): PartModel => ({
  elements: [
    p.closed
      ? { id: 'contact', kind: 'resistor', a: 'a', b: 'b', r_ohm: p.contact_ohm, role: 'switch' }
      : { id: 'contact', kind: 'resistor', a: 'a', b: 'b', r_ohm: OPEN_SWITCH_OHM, role: 'switch_open' },
  ],
});
/** 300 A battery disconnect, 0.1 mΩ contact (from memory). */
export const switchDefaults = (): SwitchProps => ({ rating_A: 300, contact_ohm: 100e-6, closed: true });

// Shunt -------------------------------------------------------------------------------------------------------

export const shuntPropsSchema = z.object({
  rating_A: z.number().positive().max(100_000),
  /** Voltage drop at rated current, mV (50, 75 and 100 mV are usual). */
  drop_mV: z.number().positive().max(1000),
});
export type ShuntProps = z.infer<typeof shuntPropsSchema>;
export const SHUNT_TERMINALS = ['a', 'b'] as const;
export const shuntResistance_ohm = (p: ShuntProps) => p.drop_mV / 1000 / p.rating_A;
export const shuntModel = (p: ShuntProps): PartModel => ({
  elements: [{ id: 'shunt', kind: 'resistor', a: 'a', b: 'b', r_ohm: shuntResistance_ohm(p), role: 'shunt' }],
});
export const shuntDefaults = (): ShuntProps => ({ rating_A: 500, drop_mV: 50 });
