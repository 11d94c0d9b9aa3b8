/**
 * Ampacity (allowable current) tables and their correction factors. Tables are indexed by AWG/kcmil;
 * a metric (mm²) conductor is read at the largest AWG size whose area is at or below its own
 * (conservative: it is never credited with more copper than it has).
 */
import { type AwgSize, type ConductorSize, awgAtOrBelow, conductorArea_mm2 } from '../../units/conductor';

export const AMPACITY_TABLE_IDS = [
  'nec-310.16-75C',
  'nec-310.16-90C',
  'cfr-183.425-105C-outside',
  'cfr-183.425-105C-engine',
] as const;
export type AmpacityTableId = (typeof AMPACITY_TABLE_IDS)[number];

export interface AmpacityTable {
  id: AmpacityTableId;
  name: string;
  /** Conductor temperature rating the table is for, °C. */
  conductor_C: number;
  /** Ambient the table is written for, °C (null when the table already covers its space, e.g. engine rooms). */
  baseAmbient_C: number | null;
  /** Whether the table already includes an engine-space (hot space) allowance. */
  engineSpace: boolean;
  /** Amperes by size key ("14" … "4/0", "250kcmil" …). */
  amps: Record<string, number>;
}

const AWG_KEYS = ['14', '12', '10', '8', '6', '4', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const;
const zip = (values: number[]) => Object.fromEntries(AWG_KEYS.map((k, i) => [k, values[i]]));

export const AMPACITY_TABLES: Record<AmpacityTableId, AmpacityTable> = {
  'nec-310.16-75C': {
    // NEC Table 310.16, copper, 75 °C column, 30 °C ambient, not more than three current-carrying
    // conductors (2014 and later editions).
    id: 'nec-310.16-75C', name: 'NEC 310.16, 75 °C copper', conductor_C: 75, baseAmbient_C: 30, engineSpace: false,
    amps: {
      ...zip([20, 25, 35, 50, 65, 85, 115, 130, 150, 175, 200, 230]),
      // 3 AWG and kcmil rows — from memory.
      '3': 100, '250kcmil': 255, '300kcmil': 285, '350kcmil': 310, '400kcmil': 335, '500kcmil': 380,
      '600kcmil': 420, '750kcmil': 475,
    },
  },
  'nec-310.16-90C': {
    // NEC Table 310.16, copper, 90 °C column, 30 °C ambient, not more than three current-carrying conductors.
    id: 'nec-310.16-90C', name: 'NEC 310.16, 90 °C copper', conductor_C: 90, baseAmbient_C: 30, engineSpace: false,
    amps: {
      ...zip([25, 30, 40, 55, 75, 95, 130, 145, 170, 195, 225, 260]),
      // 3 AWG and kcmil rows — from memory.
      '3': 115, '250kcmil': 290, '300kcmil': 320, '350kcmil': 350, '400kcmil': 380, '500kcmil': 430,
      '600kcmil': 475, '750kcmil': 535,
    },
  },
  'cfr-183.425-105C-outside': {
    // 33 CFR 183.425 Table 5, 105 °C insulation, outside engine spaces.
    id: 'cfr-183.425-105C-outside', name: '33 CFR 183.425, 105 °C, outside engine spaces', conductor_C: 105,
    baseAmbient_C: 30, engineSpace: false,
    amps: zip([35, 45, 60, 80, 120, 160, 210, 245, 285, 330, 385, 445]),
  },
  'cfr-183.425-105C-engine': {
    // 33 CFR 183.425 Table 5, 105 °C insulation, inside engine spaces (outside value × 0.85).
    id: 'cfr-183.425-105C-engine', name: '33 CFR 183.425, 105 °C, inside engine spaces', conductor_C: 105,
    baseAmbient_C: null, engineSpace: true,
    amps: zip([30, 38, 51, 68, 102, 136, 178, 208, 242, 280, 327, 378]),
  },
};

/** The engine-space table that goes with a table, for cables installed in an engine or other hot space. */
export function engineSpaceTable(id: AmpacityTableId): AmpacityTableId {
  return id === 'cfr-183.425-105C-outside' ? 'cfr-183.425-105C-engine' : id;
}

/**
 * Ambient temperature correction: sqrt((Tc − Ta)/(Tc − Tbase)), the equation NEC 310.15(B) gives for
 * ambients other than the table's (from memory). Returns 0 when the ambient reaches the conductor rating.
 */
export function ambientCorrectionFactor(conductor_C: number, ambient_C: number, baseAmbient_C = 30): number {
  if (ambient_C >= conductor_C) return 0;
  return Math.sqrt((conductor_C - ambient_C) / (conductor_C - baseAmbient_C));
}

/**
 * Adjustment for more than three current-carrying conductors in a raceway or bundle,
 * NEC 310.15(C)(1) (from memory): 4–6: 80 %, 7–9: 70 %, 10–20: 50 %, 21–30: 45 %, 31–40: 40 %, 41+: 35 %.
 */
export function bundlingFactor(conductors: number): number {
  if (conductors <= 3) return 1;
  if (conductors <= 6) return 0.8;
  if (conductors <= 9) return 0.7;
  if (conductors <= 20) return 0.5;
  if (conductors <= 30) return 0.45;
  if (conductors <= 40) return 0.4;
  return 0.35;
}

function tableKey(size: ConductorSize): { key: string; readAs?: AwgSize } | null {
  if (size.system === 'awg') return { key: size.size };
  if (size.system === 'kcmil') return { key: `${size.size}kcmil` };
  const awg = awgAtOrBelow(conductorArea_mm2(size));
  return awg ? { key: awg, readAs: awg } : null;
}

export interface AmpacityInput {
  size: ConductorSize;
  table: AmpacityTableId;
  /** Ambient around the conductor, °C (default: the table's base ambient). */
  ambient_C?: number;
  /** Current-carrying conductors bundled together (default 1). */
  bundledConductors?: number;
  /** Installed in an engine room or other hot space (switches a marine table to its engine-space column). */
  engineSpace?: boolean;
}

export type AmpacityResult =
  | {
      ok: true;
      amps: number;
      baseAmps: number;
      table: AmpacityTableId;
      ambientFactor: number;
      bundlingFactor: number;
      /** Set when a mm² conductor was read at this AWG size. */
      readAsAwg?: AwgSize;
    }
  | { ok: false; error: { code: 'size_not_in_table'; message: string } };

/** Allowable current of a copper conductor from a table, with ambient and bundling corrections. */
export function ampacity(input: AmpacityInput): AmpacityResult {
  const tableId = input.engineSpace ? engineSpaceTable(input.table) : input.table;
  const table = AMPACITY_TABLES[tableId];
  const key = tableKey(input.size);
  const base = key ? table.amps[key.key] : undefined;
  if (!key || base === undefined) {
    return {
      ok: false,
      error: { code: 'size_not_in_table', message: `${table.name} has no row for this conductor size` },
    };
  }
  const ambientFactor =
    table.baseAmbient_C === null || input.ambient_C === undefined
      ? 1
      : ambientCorrectionFactor(table.conductor_C, input.ambient_C, table.baseAmbient_C);
  const bf = bundlingFactor(input.bundledConductors ?? 1);
  return {
    ok: true,
    amps: base * ambientFactor * bf,
    baseAmps: base,
    table: tableId,
    ambientFactor,
    bundlingFactor: bf,
    ...(key.readAs ? { readAsAwg: key.readAs } : {}),
  };
}
