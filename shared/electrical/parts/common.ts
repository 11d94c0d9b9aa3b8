/** Shared pieces of the part models: conductor-size schema, the model context and the local model shape. */
import { z } from 'zod';
import { AWG_SIZES } from '../../units/conductor';
import type { NetworkElement } from '../network/types';

/** A conductor size as the user wrote it: AWG, kcmil or mm². */
export const conductorSizeSchema = z.discriminatedUnion('system', [
  z.object({ system: z.literal('awg'), size: z.enum(AWG_SIZES) }),
  z.object({ system: z.literal('kcmil'), size: z.number().min(100).max(2000) }),
  z.object({ system: z.literal('mm2'), size: z.number().positive().max(1000) }),
]);

export const materialSchema = z.enum(['copper', 'aluminium']);

/** Conditions a part model is evaluated in (from the diagram's settings). */
export interface ModelContext {
  /** Ambient temperature around the bank, °C. */
  ambient_C: number;
  /** The bank's nominal voltage, V. */
  systemVoltage_V: number;
}

/**
 * A part's electrical model: network elements whose node names are the part's own terminal names, or
 * internal node names starting with "_" (the compiler makes them unique). Element ids are local too
 * (the compiler prefixes them with the part id). An empty list means the part is not electrical.
 */
export interface PartModel {
  elements: NetworkElement[];
}

/** Contact resistance of one bolted, clean crimped lug joint — from memory (tens of µΩ). */
export const TYPICAL_LUG_CONTACT_OHM = 20e-6;

export const shortText = (max: number) => z.string().max(max);
