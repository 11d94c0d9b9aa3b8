/**
 * Battery chemistries: nominal and limit voltages per cell, resting (open-circuit) voltage against state
 * of charge, typical internal resistance and Peukert exponent. Per-cell values; a battery multiplies by
 * its cells in series.
 */

export const CHEMISTRY_IDS = ['lfp', 'nmc', 'agm', 'gel', 'flooded'] as const;
export type ChemistryId = (typeof CHEMISTRY_IDS)[number];

export interface Chemistry {
  id: ChemistryId;
  name: string;
  family: 'lithium' | 'lead_acid';
  cellNominal_V: number;
  /** Cells in series in a "12 V" block of this chemistry. */
  cellsPer12VBlock: number;
  cellFull_V: number;
  cellCutoff_V: number;
  /** Resting voltage per cell against state of charge (0..1), piecewise linear, strictly increasing. */
  ocvCurve: readonly (readonly [soc: number, cell_V: number])[];
  /**
   * Typical internal resistance × capacity for one cell, Ω·Ah (from memory): a battery's resistance is
   * about this × cells / Ah. A starting value only — the battery's own data or a measurement wins.
   */
  rCellTimesAh_ohmAh: number;
  /** Peukert exponent (from memory; ranges as quoted: AGM 1.05–1.15, gel 1.10–1.25, flooded 1.2–1.6, LFP about 1.05). */
  peukert: number;
  /** Typical continuous discharge limit as a C-rate (from memory). */
  typicalMaxContinuousC: number;
  /**
   * Typical pulse (short-time) discharge limit as a C-rate, and how long it may last, s (common
   * practice, from memory: a 12 V LFP battery's BMS commonly allows about 2C for a few seconds; lead-acid
   * blocks deliver several C for seconds). A starting value only — the battery's own data wins.
   */
  typicalMaxPulseC: number;
  typicalPulse_s: number;
  /**
   * Whether the lead-acid rule applies: do not mix batteries of different age, capacity or make in one
   * bank (common practice). Lithium batteries have their own pairing rules from their makers.
   */
  mixingAgeRuleApplies: boolean;
}

const LEAD_ACID_12V_CURVE: readonly (readonly [number, number])[] = [
  // Lead-acid 12 V resting voltage vs state of charge at about 27 °C (common practice):
  // 11.89 V 0 %, 12.06 V 25 %, 12.24 V 50 %, 12.45 V 75 %, 12.65 V 100 %. Stored per cell (÷ 6).
  [0, 11.89 / 6], [0.25, 12.06 / 6], [0.5, 12.24 / 6], [0.75, 12.45 / 6], [1, 12.65 / 6],
];

export const CHEMISTRIES: Record<ChemistryId, Chemistry> = {
  lfp: {
    id: 'lfp', name: 'Lithium iron phosphate (LiFePO₄)', family: 'lithium',
    // 3.2 V nominal, about 3.65 V full charge, about 2.5 V cut-off; 4 cells make 12.8 V (common practice).
    cellNominal_V: 3.2, cellsPer12VBlock: 4, cellFull_V: 3.65, cellCutoff_V: 2.5,
    // Resting curve — from memory; flat between about 20 % and 90 % (common practice).
    ocvCurve: [
      [0, 2.9], [0.05, 3.1], [0.1, 3.2], [0.2, 3.25], [0.3, 3.27], [0.4, 3.285], [0.5, 3.295], [0.6, 3.305],
      [0.7, 3.315], [0.8, 3.325], [0.9, 3.335], [0.95, 3.35], [0.99, 3.38], [1, 3.4],
    ],
    rCellTimesAh_ohmAh: 0.125, peukert: 1.05, typicalMaxContinuousC: 1, mixingAgeRuleApplies: false,
    // Pulse: about 2C for about 5 s, set by the BMS (common practice, from memory).
    typicalMaxPulseC: 2, typicalPulse_s: 5,
  },
  nmc: {
    id: 'nmc', name: 'Lithium NMC', family: 'lithium',
    // From memory: 3.6–3.7 V nominal, 4.2 V full, 3.0 V cut-off; 3 cells (11.1 V) per "12 V" block.
    cellNominal_V: 3.7, cellsPer12VBlock: 3, cellFull_V: 4.2, cellCutoff_V: 3.0,
    ocvCurve: [
      [0, 3.0], [0.1, 3.45], [0.2, 3.55], [0.3, 3.62], [0.4, 3.67], [0.5, 3.72], [0.6, 3.79], [0.7, 3.87],
      [0.8, 3.95], [0.9, 4.06], [1, 4.18],
    ],
    rCellTimesAh_ohmAh: 0.13, peukert: 1.05, typicalMaxContinuousC: 1, mixingAgeRuleApplies: false,
    // Pulse: about 2C for about 10 s (common practice, from memory).
    typicalMaxPulseC: 2, typicalPulse_s: 10,
  },
  agm: {
    id: 'agm', name: 'AGM lead-acid', family: 'lead_acid',
    // 2 V per cell nominal, 6 cells per 12 V; 1.75 V per cell cut-off (10.5 V), 2.4 V absorption (common practice).
    cellNominal_V: 2.0, cellsPer12VBlock: 6, cellFull_V: 2.4, cellCutoff_V: 1.75,
    // Common practice uses the one lead-acid resting table for AGM and gel too; they read slightly
    // higher when full (from memory).
    ocvCurve: LEAD_ACID_12V_CURVE,
    rCellTimesAh_ohmAh: 0.085, peukert: 1.1, typicalMaxContinuousC: 0.5, mixingAgeRuleApplies: true,
    // Pulse: about 5C for about 5 s (common practice, from memory; block data sheets often allow more).
    typicalMaxPulseC: 5, typicalPulse_s: 5,
  },
  gel: {
    id: 'gel', name: 'Gel lead-acid', family: 'lead_acid',
    cellNominal_V: 2.0, cellsPer12VBlock: 6, cellFull_V: 2.35, cellCutoff_V: 1.75,
    ocvCurve: LEAD_ACID_12V_CURVE,
    rCellTimesAh_ohmAh: 0.13, peukert: 1.15, typicalMaxContinuousC: 0.2, mixingAgeRuleApplies: true,
    // Pulse: about 3C for about 5 s (common practice, from memory; gel takes high rates less well).
    typicalMaxPulseC: 3, typicalPulse_s: 5,
  },
  flooded: {
    id: 'flooded', name: 'Flooded lead-acid', family: 'lead_acid',
    cellNominal_V: 2.0, cellsPer12VBlock: 6, cellFull_V: 2.45, cellCutoff_V: 1.75,
    ocvCurve: LEAD_ACID_12V_CURVE,
    rCellTimesAh_ohmAh: 0.12, peukert: 1.25, typicalMaxContinuousC: 0.25, mixingAgeRuleApplies: true,
    // Pulse: about 5C for about 5 s (common practice, from memory).
    typicalMaxPulseC: 5, typicalPulse_s: 5,
  },
};

/** Resting voltage of one cell at state of charge `soc` (clamped to 0..1), V. */
export function cellOcv_V(chemistry: ChemistryId, soc: number): number {
  const curve = CHEMISTRIES[chemistry].ocvCurve;
  const s = Math.min(1, Math.max(0, soc));
  for (let i = 1; i < curve.length; i++) {
    const [s0, v0] = curve[i - 1];
    const [s1, v1] = curve[i];
    if (s <= s1) return v0 + ((v1 - v0) * (s - s0)) / (s1 - s0);
  }
  return curve[curve.length - 1][1];
}

/** State of charge (0..1) from a resting cell voltage, by inverting the curve (clamped). */
export function socFromCellOcv(chemistry: ChemistryId, cell_V: number): number {
  const curve = CHEMISTRIES[chemistry].ocvCurve;
  if (cell_V <= curve[0][1]) return 0;
  for (let i = 1; i < curve.length; i++) {
    const [s0, v0] = curve[i - 1];
    const [s1, v1] = curve[i];
    if (cell_V <= v1) return s0 + ((s1 - s0) * (cell_V - v0)) / (v1 - v0);
  }
  return 1;
}

/** Cells in series for a battery of `nominal_V` of this chemistry (rounded). */
export function cellsForNominal(chemistry: ChemistryId, nominal_V: number): number {
  return Math.max(1, Math.round(nominal_V / CHEMISTRIES[chemistry].cellNominal_V));
}

/** Typical internal resistance of a battery, Ω (from memory; see `rCellTimesAh_ohmAh`). */
export function typicalInternalResistance_ohm(chemistry: ChemistryId, cells: number, capacity_Ah: number): number {
  return (CHEMISTRIES[chemistry].rCellTimesAh_ohmAh * cells) / capacity_Ah;
}
