/**
 * Ampacity (allowable current) tables and their correction factors. Tables are indexed by AWG/kcmil;
 * a metric (mm²) conductor is read at the largest AWG size whose area is at or below its own
 * (conservative: it is never credited with more copper than it has). Each table carries its columns for
 * lower insulation ratings: a conductor is read at the column of its insulation when that is rated
 * below the table's temperature, and never credited above the table's own column.
 */
import { type AwgSize, type ConductorSize, KCMIL_SIZES, awgAtOrBelow, conductorArea_mm2, kcmilToMm2 } from '../../units/conductor';

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
  /** For an engine-space table: the outside table its columns are derived from. */
  outside?: AmpacityTableId;
  /** Amperes by size key ("14" … "4/0", "250kcmil" …), the table's own column. */
  amps: Record<string, number>;
  /**
   * The columns of the same table for conductors whose insulation is rated at or below `conductor_C`,
   * by insulation temperature, °C (the table's own column included). A conductor with lower-rated
   * insulation is read from the column of its rating.
   */
  columns: Record<number, Record<string, number>>;
}

const AWG_KEYS = ['14', '12', '10', '8', '6', '4', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const;
const zip = (values: number[]) => Object.fromEntries(AWG_KEYS.map((k, i) => [k, values[i]]));
const scaled = (amps: Record<string, number>, factor: number) =>
  Object.fromEntries(Object.entries(amps).map(([k, a]) => [k, a * factor]));

// NEC Table 310.16, copper, 30 °C ambient, not more than three current-carrying conductors
// (2014 and later editions), by conductor (insulation) temperature rating.
const NEC_310_16_COPPER = {
  // 60 °C column — from memory, every row (2014+ editions; earlier editions printed 20 A and 25 A for
  // 14 and 12 AWG with a footnote limiting their protection).
  60: {
    ...zip([15, 20, 30, 40, 55, 70, 95, 110, 125, 145, 165, 195]),
    '3': 85, '250kcmil': 215, '300kcmil': 240, '350kcmil': 260, '400kcmil': 280, '500kcmil': 320,
    '600kcmil': 350, '750kcmil': 400,
  },
  // 75 °C column.
  75: {
    ...zip([20, 25, 35, 50, 65, 85, 115, 130, 150, 175, 200, 230]),
    // 3 AWG and kcmil rows — from memory.
    '3': 100, '250kcmil': 255, '300kcmil': 285, '350kcmil': 310, '400kcmil': 335, '500kcmil': 380,
    '600kcmil': 420, '750kcmil': 475,
  },
  // 90 °C column.
  90: {
    ...zip([25, 30, 40, 55, 75, 95, 130, 145, 170, 195, 225, 260]),
    // 3 AWG and kcmil rows — from memory.
    '3': 115, '250kcmil': 290, '300kcmil': 320, '350kcmil': 350, '400kcmil': 380, '500kcmil': 430,
    '600kcmil': 475, '750kcmil': 535,
  },
} satisfies Record<number, Record<string, number>>;

// 33 CFR 183.425 Table 5, allowable amperage of conductors, outside engine spaces, by temperature rating
// of the conductor insulation. The 105 °C column is the project's checked reference; the 3 AWG row and the
// 60/75/90 °C columns were read from the regulation's table as well and are checked in the tests.
const CFR_183_425_OUTSIDE = {
  60: { ...zip([20, 25, 40, 55, 80, 105, 140, 165, 195, 225, 260, 300]), '3': 120 },
  75: { ...zip([20, 25, 40, 65, 95, 125, 170, 195, 230, 265, 310, 360]), '3': 145 },
  90: { ...zip([30, 40, 55, 70, 100, 135, 180, 210, 245, 285, 330, 385]), '3': 155 },
  105: { ...zip([35, 45, 60, 80, 120, 160, 210, 245, 285, 330, 385, 445]), '3': 180 },
} satisfies Record<number, Record<string, number>>;

/**
 * Inside engine spaces the outside amperage is multiplied by a factor for the insulation rating
 * (33 CFR 183.425(c) and note 1 to Table 5): 60 °C 0.58, 75 °C 0.75, 90 °C 0.82 — from memory (they equal
 * the NEC 310.15(B) correction for a 46–50 °C ambient); 105 °C 0.85 (the printed engine-space column).
 */
export const CFR_ENGINE_SPACE_FACTOR: Record<60 | 75 | 90 | 105, number> = { 60: 0.58, 75: 0.75, 90: 0.82, 105: 0.85 };

const CFR_183_425_ENGINE = {
  60: scaled(CFR_183_425_OUTSIDE[60], CFR_ENGINE_SPACE_FACTOR[60]),
  75: scaled(CFR_183_425_OUTSIDE[75], CFR_ENGINE_SPACE_FACTOR[75]),
  90: scaled(CFR_183_425_OUTSIDE[90], CFR_ENGINE_SPACE_FACTOR[90]),
  // 33 CFR 183.425 Table 5, 105 °C, inside engine spaces, as printed (outside value × 0.85, rounded).
  105: { ...zip([30, 38, 51, 68, 102, 136, 178, 208, 242, 280, 327, 378]), '3': 153 },
} satisfies Record<number, Record<string, number>>;

export const AMPACITY_TABLES: Record<AmpacityTableId, AmpacityTable> = {
  'nec-310.16-75C': {
    id: 'nec-310.16-75C', name: 'NEC 310.16, 75 °C copper', conductor_C: 75, baseAmbient_C: 30, engineSpace: false,
    amps: NEC_310_16_COPPER[75],
    columns: { 60: NEC_310_16_COPPER[60], 75: NEC_310_16_COPPER[75] },
  },
  'nec-310.16-90C': {
    id: 'nec-310.16-90C', name: 'NEC 310.16, 90 °C copper', conductor_C: 90, baseAmbient_C: 30, engineSpace: false,
    amps: NEC_310_16_COPPER[90],
    columns: NEC_310_16_COPPER,
  },
  'cfr-183.425-105C-outside': {
    id: 'cfr-183.425-105C-outside', name: '33 CFR 183.425, 105 °C, outside engine spaces', conductor_C: 105,
    baseAmbient_C: 30, engineSpace: false,
    amps: CFR_183_425_OUTSIDE[105],
    columns: CFR_183_425_OUTSIDE,
  },
  'cfr-183.425-105C-engine': {
    id: 'cfr-183.425-105C-engine', name: '33 CFR 183.425, 105 °C, inside engine spaces', conductor_C: 105,
    baseAmbient_C: null, engineSpace: true, outside: 'cfr-183.425-105C-outside',
    amps: CFR_183_425_ENGINE[105],
    columns: CFR_183_425_ENGINE,
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

/**
 * The table row of a conductor. A mm² conductor is read at the largest row (AWG or kcmil) whose area is at
 * or below its own, so it is never credited with more copper than it has (a 150 mm² cable at 250 kcmil,
 * 126.7 mm²; 35 mm² at 2 AWG, 33.6 mm²).
 */
function tableKey(size: ConductorSize, rows: Record<string, number>): { key: string; readAs?: AwgSize; readAsKcmil?: number } | null {
  if (size.system === 'awg') return { key: size.size };
  if (size.system === 'kcmil') return { key: `${size.size}kcmil` };
  const area = conductorArea_mm2(size) * (1 + 1e-9);
  const kcmil = KCMIL_SIZES.filter((k) => kcmilToMm2(k) <= area && `${k}kcmil` in rows).at(-1);
  if (kcmil !== undefined) return { key: `${kcmil}kcmil`, readAsKcmil: kcmil };
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
  /** Temperature rating of the conductor's insulation, °C (default: the table's own rating). */
  insulation_C?: number;
  /**
   * Temperature rating of the lowest-rated termination, °C (NEC 110.14(C)): the result never exceeds the
   * table's column at this temperature. Omitted: no termination limit.
   */
  terminal_C?: number;
}

/** One step of the derating chain: the final ampacity is the base × every factor. */
export interface AmpacityFactor {
  kind: 'ambient' | 'bundling' | 'engine_space' | 'terminal';
  /** Plain language, with the figures ("Ambient 40 °C, 75 °C conductor"). */
  name: string;
  /** The clause the factor comes from. */
  basis: string;
  /** Multiplier, 0..1 (1 when the step takes nothing off). */
  factor: number;
}

/**
 * The derating chain of one reading, factor by factor, for display: `base_A` from `table` at
 * `column_C` (for an engine-space reading the outside column, so the engine-space allowance shows as
 * its own step), then each factor in order; `final_A` is the ampacity (the product, up to rounding).
 */
export interface AmpacityDerating {
  table: AmpacityTableId;
  column_C: number;
  base_A: number;
  factors: AmpacityFactor[];
  final_A: number;
}

export type AmpacityResult =
  | {
      ok: true;
      amps: number;
      baseAmps: number;
      table: AmpacityTableId;
      /** Temperature column read, °C: the table's own, or the insulation's when that is rated lower. */
      column_C: number;
      /**
       * What set the column: 'table' (the selected table's own temperature), or 'insulation' (the
       * conductor's insulation is rated below it, so its own column was read).
       */
      limitedBy: 'table' | 'insulation';
      /** Plain-language note when the insulation rating changed or was not credited. */
      note?: string;
      ambientFactor: number;
      bundlingFactor: number;
      /** The chain from the table value to `amps`, factor by factor. */
      derating: AmpacityDerating;
      /** Set when a mm² conductor was read at this AWG size… */
      readAsAwg?: AwgSize;
      /** …or at this kcmil size. */
      readAsKcmil?: number;
    }
  | { ok: false; error: { code: 'size_not_in_table' | 'insulation_below_table'; message: string } };

/**
 * The column of a table for a conductor's insulation rating, °C. The insulation limits the conductor
 * temperature, so a table whose temperature is above the insulation rating is read at the insulation's
 * own column (NEC 310.16 columns by conductor temperature rating; 33 CFR 183.425 Table 5 columns by
 * insulation rating). Insulation rated above the table is not credited: the table's own column stands,
 * since the table is the designer's choice (e.g. to respect 75 °C terminations, NEC 110.14(C) — from
 * memory). A rating between columns is read at the next column below it. Null when the insulation is
 * rated below every column of the table.
 */
export function insulationColumn_C(table: AmpacityTable, insulation_C?: number): number | null {
  const limit = insulation_C === undefined ? table.conductor_C : Math.min(insulation_C, table.conductor_C);
  const below = Object.keys(table.columns).map(Number).filter((t) => t <= limit);
  return below.length ? Math.max(...below) : null;
}

/**
 * Allowable current of a copper conductor from a table, read at the column of its insulation rating,
 * with ambient and bundling corrections.
 */
export function ampacity(input: AmpacityInput): AmpacityResult {
  const tableId = input.engineSpace ? engineSpaceTable(input.table) : input.table;
  const table = AMPACITY_TABLES[tableId];
  const column_C = insulationColumn_C(table, input.insulation_C);
  if (column_C === null) {
    return {
      ok: false,
      error: {
        code: 'insulation_below_table',
        message: `${table.name} has no column for ${input.insulation_C} °C insulation`,
      },
    };
  }
  const key = tableKey(input.size, table.columns[column_C]);
  const base = key ? table.columns[column_C][key.key] : undefined;
  if (!key || base === undefined) {
    return {
      ok: false,
      error: { code: 'size_not_in_table', message: `${table.name} has no row for this conductor size` },
    };
  }
  const limitedBy = column_C < table.conductor_C ? 'insulation' : 'table';
  const ins = input.insulation_C;
  const note =
    limitedBy === 'insulation'
      ? `${ins} °C insulation: read from the ${column_C} °C column`
      : ins !== undefined && ins > table.conductor_C
        ? `${ins} °C insulation not credited above the table's ${table.conductor_C} °C column`
        : undefined;
  // The ambient correction goes with the conductor temperature of the column read (NEC 310.15(B), from memory).
  const ambientFactor =
    table.baseAmbient_C === null || input.ambient_C === undefined
      ? 1
      : ambientCorrectionFactor(column_C, input.ambient_C, table.baseAmbient_C);
  const conductors = input.bundledConductors ?? 1;
  const bf = bundlingFactor(conductors);
  const corrected = base * ambientFactor * bf;
  // NEC 110.14(C) (from memory): the corrected ampacity may start from the conductor's own column, but
  // it may not exceed the column of the lowest-rated termination.
  const terminalColumn = input.terminal_C === undefined ? null : insulationColumn_C(table, input.terminal_C);
  const terminalCap = terminalColumn === null ? null : table.columns[terminalColumn][key.key];
  const amps = terminalCap !== undefined && terminalCap !== null ? Math.min(corrected, terminalCap) : corrected;

  const factors: AmpacityFactor[] = [];
  if (table.baseAmbient_C !== null) {
    const amb = input.ambient_C ?? table.baseAmbient_C;
    factors.push({
      kind: 'ambient',
      name: `Ambient ${amb} °C, ${column_C} °C conductor (table at ${table.baseAmbient_C} °C)`,
      basis: 'NEC 310.15(B) temperature correction, √((Tc − Ta)/(Tc − 30)) (from memory)',
      factor: ambientFactor,
    });
  }
  factors.push({
    kind: 'bundling',
    name: conductors > 3 ? `Bundled with ${conductors} current-carrying conductors` : 'Not bundled (3 or fewer current-carrying conductors)',
    basis: 'NEC 310.15(C)(1) adjustment for more than three current-carrying conductors',
    factor: bf,
  });
  // A marine engine-space reading shows the outside column as its base and the allowance as a step.
  const outside = table.outside ? AMPACITY_TABLES[table.outside].columns[column_C]?.[key.key] : undefined;
  if (outside !== undefined) {
    factors.push({
      kind: 'engine_space',
      name: `Inside an engine space (${column_C} °C insulation)`,
      basis: '33 CFR 183.425 Table 5, inside engine spaces',
      factor: outside > 0 ? base / outside : 1,
    });
  }
  if (terminalCap !== undefined && terminalCap !== null) {
    factors.push({
      kind: 'terminal',
      name: `Terminations rated ${input.terminal_C} °C: at most ${terminalCap} A (${terminalColumn} °C column)`,
      basis: 'NEC 110.14(C) termination temperature limit (from memory)',
      factor: corrected > 0 ? Math.min(1, terminalCap / corrected) : 1,
    });
  }
  const derating: AmpacityDerating = {
    table: outside !== undefined ? table.outside! : tableId,
    column_C,
    base_A: outside ?? base,
    factors,
    final_A: amps,
  };
  return {
    ok: true,
    amps,
    baseAmps: base,
    table: tableId,
    column_C,
    limitedBy,
    ...(note ? { note } : {}),
    ambientFactor,
    bundlingFactor: bf,
    derating,
    ...(key.readAs ? { readAsAwg: key.readAs } : {}),
    ...(key.readAsKcmil ? { readAsKcmil: key.readAsKcmil } : {}),
  };
}
