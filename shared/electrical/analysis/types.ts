/**
 * Result types of the analyses. Everything is plain JSON (no Maps, no NaN, no Infinity): figures are
 * keyed by diagram ids so the editor can put them on the canvas. SI units; field names end in them.
 */
import type { PartType } from '../parts/registry';
import type { AmpacityDerating } from '../tables/ampacity';

export type Severity = 'error' | 'warning' | 'note';

/** One result of a rule check. */
export interface Finding {
  /** Stable rule id, e.g. "fuse-above-ampacity". */
  id: string;
  severity: Severity;
  /** Diagram part and cable ids involved. */
  parts: string[];
  /** Plain language, with the numbers and their units. */
  message: string;
  /** The standard's clause or "common practice" / "first principles". */
  basis: string;
  suggestion?: string;
}

export type AnalysisMode = 'load' | 'charge' | 'equalize' | 'fault' | 'discharge';

export interface FaultSelection {
  kind: 'battery' | 'cable';
  /** A battery or series-string part id (kind 'battery'; a string member as "<stringId>/b<k>"), or a cable id. */
  id: string;
}

export interface AnalyzeOptions {
  mode?: AnalysisMode;
  /** With mode 'fault': the one fault to show in full. Without it, the sweep over every fault case. */
  fault?: FaultSelection;
  /** Run the rule checks (default true). */
  rules?: boolean;
  /** Resistance of a bolted fault, Ω (default 1 mΩ). */
  faultResistance_ohm?: number;
  discharge?: DischargeOptions;
}

export interface DischargeOptions {
  /** Largest change of any battery's state of charge in one step, 0..1 (default 0.02). */
  maxSocStep?: number;
  /** Most steps (default 200). */
  maxSteps?: number;
  /** State-of-charge floor by chemistry family (default lithium 0.05, lead-acid 0.5 — common practice). */
  socFloor?: { lithium?: number; lead_acid?: number };
}

/** A bank unit: a battery, or a series string taken as one unit. */
export interface SourceFigures {
  type: 'battery' | 'series_string';
  /** Positive when discharging, A. */
  current_A: number;
  /** I·V_nom of this unit over the sum for all units, %: for batteries in parallel, its share of the total battery current. */
  share_pct: number;
  /** Capacity-weighted share it would carry in an ideal bank: C·V_nom over the sum, %. */
  idealShare_pct: number;
  /** share − ideal share, percentage points. */
  deviation_pp: number;
  /** (share − ideal) / ideal, %. */
  deviation_pct: number;
  terminal_V: number;
  ocv_V: number;
  /** Loss in the internal resistance, W. */
  loss_W: number;
  nominal_V: number;
  capacity_Ah: number;
  /** |current| / capacity, 1/h. */
  cRate: number;
  maxContinuous_A: number;
  /** Fuses in this unit's own branches. */
  fuses: string[];
}

export interface CableFigures {
  /** Signed, positive from the cable's `from` end to its `to` end, A. */
  current_A: number;
  /** Voltage across the run including its lugs, V. */
  drop_V: number;
  loss_W: number;
  r_ohm: number;
  /** Corrected ampacity, A (null for a zero-length bolted joint or a size not in the table). */
  ampacity_A: number | null;
  /** |current| / ampacity, %. */
  utilisation_pct: number | null;
  /** Set when the run's insulation is rated below the selected table: its own column was read. */
  ampacityLimitedBy?: 'insulation';
  /** Temperature column the ampacity was read from, °C (set with `ampacityLimitedBy` or `ampacityNote`). */
  ampacityColumn_C?: number;
  /** How the insulation rating affected the ampacity ("60 °C insulation: read from the 60 °C column"). */
  ampacityNote?: string;
  /** The ampacity's derating chain, factor by factor (table value, ambient, bundling, engine space, terminations). */
  ampacityDerating?: AmpacityDerating;
}

export interface PartFigures {
  type: PartType;
  /** Current through an in-line part (fuse, switch, shunt, lug) or drawn by a load / delivered by a charger, A. */
  current_A?: number;
  /** Voltage across a load's or charger's terminals, V. */
  voltage_V?: number;
  /** Power absorbed by a load or delivered by a charger, W. */
  power_W?: number;
  loss_W: number;
  /** Loads: wiring drop from the reference battery terminals to the load, V and % of the system voltage. */
  drop_V?: number;
  drop_pct?: number;
  /** Fuses, switches, shunts, busbars: rating and use of it. */
  rating_A?: number;
  utilisation_pct?: number;
  /** Busbars: largest segment current, A. */
  maxSegmentCurrent_A?: number;
  /** Chargers: 'cv' holding voltage, 'cc' in current limit. */
  chargerMode?: 'cv' | 'cc';
}

export type LossKind = 'battery' | 'cable' | 'lug' | 'fuse' | 'busbar' | 'switch' | 'shunt' | 'charger' | 'other';

export interface OperatingPoint {
  sources: Record<string, SourceFigures>;
  parts: Record<string, PartFigures>;
  cables: Record<string, CableFigures>;
  /** Every network element's current and loss (ids as compiled: part id, "<part>/seg1", "<cable>/lugFrom" …). */
  elements: Record<string, { current_A: number; loss_W: number }>;
  /**
   * Losses: `total_W` over every element (a resistive load's own power counts in 'other'), `byKind`, and
   * `wiring_W` — conductors, lugs, fuses, busbars, switches and shunts: the one figure every screen,
   * summary and export calls "wiring loss".
   */
  losses: { total_W: number; wiring_W: number; byKind: Record<LossKind, number> };
  /** Sum over units of I·V_nom / V_bank: the bank's current, A (positive discharging). */
  bankCurrent_A: number;
  /**
   * (max − min) / mean of each unit's share over its ideal share, %. For equal batteries this is the
   * spread of the battery currents over their mean. 0 with fewer than two units or no current.
   */
  imbalance_pct: number;
  /** Reference for load voltage drop: the highest terminal voltage of a unit at the bank's voltage, V. */
  referenceVoltage_V: number;
  solverNotes: { code: string; message: string; elements: string[] }[];
}

export interface InverterFigures {
  power_W: number;
  efficiency: number;
  /** P / (V_nom × efficiency), A (first principles). */
  dcCurrentAtNominal_A: number;
  /** P / (V_system × efficiency), A. */
  dcCurrentAtSystemVoltage_A: number;
}

export interface BankFigures {
  /** Nominal voltage across the load (series adds volts), V. */
  nominal_V: number;
  /** Energy-equivalent capacity at nominal_V (parallel adds Ah), Ah. */
  capacity_Ah: number;
  energy_Wh: number;
  units: number;
  systemVoltage_V: number;
  inverters: Record<string, InverterFigures>;
  /** Bank current / capacity in the load case, 1/h (null when the load case was not solved). */
  cRate: number | null;
}

export interface FaultCase {
  kind: 'battery' | 'cable';
  /** Battery element id (part id, or "<string>/b<k>") or cable id. */
  id: string;
  /** Diagram part or cable the fault is in. */
  part: string;
  label: string;
  /** Current in the fault itself, A. */
  faultCurrent_A: number;
}

export interface FaultSweep {
  fault_ohm: number;
  cases: FaultCase[];
  /** Largest prospective current through each fuse over all cases, and the case (index into `cases`). */
  maxByFuse: Record<string, { current_A: number; case: number }>;
  maxByCable: Record<string, { current_A: number; case: number }>;
  /** Largest current in any fault case, A. */
  worstFault_A: number;
}

export interface DischargeSample {
  t_h: number;
  currents_A: Record<string, number>;
  soc: Record<string, number>;
  loadVoltage_V: number;
}

export interface DischargeResult {
  samples: DischargeSample[];
  /** The unit that reached its cut-off first (null if the step limit came first). */
  firstEmpty: string | null;
  stoppedBy: 'soc_floor' | 'voltage_cutoff' | 'load_cutoff' | 'step_limit' | 'no_load' | 'solve_failed';
  duration_h: number;
  /** Ah delivered (energy-equivalent at the bank's nominal voltage) against the nameplate. */
  usable_Ah: number;
  nameplate_Ah: number;
  usable_pct: number;
  steps: number;
}

export interface AnalysisIssue {
  code: string;
  message: string;
  parts: string[];
}

export interface AnalysisOk {
  ok: true;
  mode: AnalysisMode;
  bank: BankFigures;
  /** The solved case of this mode (load, charge, equalize, or the selected fault). */
  operating: OperatingPoint | null;
  charge?: { chargers: Record<string, { current_A: number; voltage_V: number; mode: 'cv' | 'cc' }>; totalCharge_A: number };
  equalize?: { maxCurrent_A: number; between: string[] };
  faults?: FaultSweep;
  faultCase?: FaultCase;
  discharge?: DischargeResult;
  findings: Finding[];
  /** Compiler and analysis notes (not rule findings). */
  notes: AnalysisIssue[];
  /**
   * Parts and cables left out of the figures because they are not connected (a terminal open as drawn,
   * or a run that leads only to such a part); present only when something was left out. The figures are
   * those of the connected remainder; each loose part also has an error finding, so the checks still fail.
   */
  notConnected?: string[];
  /** The parts among them with a terminal open as drawn, and those terminals; the rest lead only to them. */
  openTerminals?: Record<string, string[]>;
}

/** A short drawn in the diagram: a source's terminals joined by conductors alone, and the current it would drive. */
export interface DrawnShort {
  code: 'shorted_source' | 'reversed_polarity' | 'zero_resistance_loop';
  /** The batteries, strings or chargers shorted. */
  sources: string[];
  /** The cables and in-line parts that close the short. */
  conductors: string[];
  /** Prospective current through each shorting conductor, A (magnitude). */
  currents_A: Record<string, number>;
  /** The largest of them, A, and the conductor that carries it. */
  current_A: number;
  through: string;
}

/** Every current with the drawn shorts in place (loads off, chargers at their limit), A. */
export interface ShortCircuitFigures {
  /** Out of each battery or string (positive discharging). */
  sources: Record<string, number>;
  /** Through each cable, signed from its `from` end to its `to` end. */
  cables: Record<string, number>;
  /** Through each in-line part (fuse, switch, shunt, lug; a busbar: its largest segment), magnitude. */
  parts: Record<string, number>;
}

export interface AnalysisFailed {
  ok: false;
  mode: AnalysisMode;
  stage: 'compile' | 'solve' | 'options';
  errors: AnalysisIssue[];
  /** The errors as findings, plus any checks that need no solution. */
  findings: Finding[];
  /** Shorts drawn in the diagram, with the prospective current through their conductors (compile stage). */
  shorts?: DrawnShort[];
  /** Every fuse's, cable's and battery's current with those shorts in place (for the fault view). */
  shortCircuit?: ShortCircuitFigures;
  /** Parts and cables left out of the short study because they are not connected. */
  notConnected?: string[];
}

export type AnalysisResult = AnalysisOk | AnalysisFailed;
