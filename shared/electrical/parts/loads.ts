/** Inverter, DC load and charger part models. */
import { z } from 'zod';
import type { PartModel } from './common';

// Inverter ----------------------------------------------------------------------------------------------

export const inverterPropsSchema = z.object({
  /** AC output power in the case analysed, W. */
  power_W: z.number().min(0).max(1_000_000),
  /** Continuous rating, W (for reference and checks). */
  rated_W: z.number().positive().max(1_000_000).optional(),
  /** DC-to-AC efficiency at this load, 0..1 (85–95 % near rated load, recalled). */
  efficiency: z.number().gt(0).max(1),
  /** Low-voltage cut-off, V. */
  cutoff_V: z.number().positive().max(1500).optional(),
  /** Surge (peak) AC output power, W, for `surge_s` (otherwise 2 × the continuous rating). */
  surge_W: z.number().positive().max(10_000_000).optional(),
  /** How long the surge lasts, s (otherwise 5 s). */
  surge_s: z.number().positive().max(3600).optional(),
});
export type InverterProps = z.infer<typeof inverterPropsSchema>;
export const INVERTER_TERMINALS = ['pos', 'neg'] as const;

/** DC input power, W: P_ac / efficiency (first principles: I_dc = P_ac / (V_dc × efficiency)). */
export const inverterDcPower_W = (p: InverterProps) => p.power_W / p.efficiency;

/** Surge power as a multiple of the continuous rating when the inverter's own figure is not given (common practice, from memory). */
export const TYPICAL_SURGE_FACTOR = 2;
/** Surge duration when not given, s (common practice, from memory). */
export const TYPICAL_SURGE_S = 5;

/** Surge AC output power, W: surge_W, else 2 × the continuous rating (or the power in the case, without a rating). */
export const inverterSurge_W = (p: InverterProps) => p.surge_W ?? TYPICAL_SURGE_FACTOR * (p.rated_W ?? p.power_W);
/** Surge duration, s: surge_s, else 5 s. */
export const inverterSurge_s = (p: InverterProps) => p.surge_s ?? TYPICAL_SURGE_S;

export const inverterModel = (p: InverterProps): PartModel => ({
  elements: [
    {
      id: 'input', kind: 'constant_power', pos: 'pos', neg: 'neg', watts: inverterDcPower_W(p), role: 'inverter',
      ...(p.cutoff_V !== undefined ? { v_min_V: p.cutoff_V } : {}),
    },
  ],
});
export const inverterDefaults = (): InverterProps => ({ power_W: 2000, rated_W: 2000, efficiency: 0.9, cutoff_V: 10.5 });

// DC load -------------------------------------------------------------------------------------------------

export const dcLoadPropsSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('current'), current_A: z.number().min(0).max(100_000) }),
  z.object({ mode: z.literal('resistance'), r_ohm: z.number().positive().max(1e6) }),
  z.object({ mode: z.literal('power'), power_W: z.number().min(0).max(1_000_000), cutoff_V: z.number().positive().max(1500).optional() }),
]);
export type DcLoadProps = z.infer<typeof dcLoadPropsSchema>;
export const DC_LOAD_TERMINALS = ['pos', 'neg'] as const;

export function dcLoadModel(p: DcLoadProps): PartModel {
  switch (p.mode) {
    case 'current':
      // Draws current out of pos, through the load, into neg.
      return { elements: [{ id: 'load', kind: 'current_source', from: 'pos', to: 'neg', amps: p.current_A, role: 'load' }] };
    case 'resistance':
      return { elements: [{ id: 'load', kind: 'load_resistor', a: 'pos', b: 'neg', r_ohm: p.r_ohm, role: 'load' }] };
    case 'power':
      return {
        elements: [
          { id: 'load', kind: 'constant_power', pos: 'pos', neg: 'neg', watts: p.power_W, role: 'load', ...(p.cutoff_V !== undefined ? { v_min_V: p.cutoff_V } : {}) },
        ],
      };
  }
}
export const dcLoadDefaults = (): DcLoadProps => ({ mode: 'current', current_A: 20 });

// Charger --------------------------------------------------------------------------------------------------

export const chargerPropsSchema = z.object({
  voltage_setpoint_V: z.number().positive().max(1500),
  current_limit_A: z.number().positive().max(100_000),
  r_internal_ohm: z.number().min(0).max(10),
  /** A charger that is off contributes nothing. */
  enabled: z.boolean(),
});
export type ChargerProps = z.infer<typeof chargerPropsSchema>;
export const CHARGER_TERMINALS = ['pos', 'neg'] as const;
export const chargerModel = (p: ChargerProps): PartModel =>
  p.enabled
    ? {
        elements: [
          {
            id: 'output', kind: 'voltage_source', pos: 'pos', neg: 'neg', volts: p.voltage_setpoint_V, i_max_A: p.current_limit_A,
            ...(p.r_internal_ohm > 0 ? { r_ohm: p.r_internal_ohm } : {}), role: 'charger',
          },
        ],
      }
    : { elements: [] };
/** 14.2 V, 40 A charger for a 12.8 V LFP bank (common practice setpoint). */
export const chargerDefaults = (): ChargerProps => ({ voltage_setpoint_V: 14.2, current_limit_A: 40, r_internal_ohm: 0.005, enabled: true });

// Note --------------------------------------------------------------------------------------------------------

export const notePropsSchema = z.object({ text: z.string().max(4000) });
export type NoteProps = z.infer<typeof notePropsSchema>;
export const noteDefaults = (): NoteProps => ({ text: '' });
