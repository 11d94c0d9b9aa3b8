/** What the canvas shows from an analysis: per-part and per-cable figures keyed by id, plus bank totals. */

export type Severity = 'error' | 'warning' | 'note';

export interface CanvasFinding {
  code: string;
  severity: Severity;
  message: string;
  /** Ids of the parts and cables involved. */
  parts: string[];
}

export interface BatteryFigure {
  /** Current out of the battery (or string), A; positive when discharging. */
  current_A: number;
  /** This battery's part of the bank's total battery current, 0..1. */
  share: number;
}

export interface CableFigure {
  current_A: number;
  /** Corrected ampacity from the bank's ampacity table, A (null when the size is not in the table). */
  ampacity_A: number | null;
  /** |current| / ampacity (null without an ampacity). */
  loading: number | null;
}

export interface FuseFigure {
  current_A: number;
  /** |current| / rating. */
  loading: number;
}

export interface LoadFigure {
  /** Voltage across the load's terminals, V. */
  voltage_V: number;
  /** Drop from the highest battery terminal voltage to the load, % of the system voltage. */
  drop_pct: number;
  current_A: number;
}

export interface CanvasSummary {
  /** False when the diagram could not be solved (see findings). */
  solved: boolean;
  batteries: Record<string, BatteryFigure>;
  cables: Record<string, CableFigure>;
  fuses: Record<string, FuseFigure>;
  loads: Record<string, LoadFigure>;
  /** Spread of battery currents, (max − min) / mean, % (null with fewer than two batteries). */
  imbalance_pct: number | null;
  /** Power lost in cables, busbars, fuses, switches, shunts and lugs, W. */
  wiringLoss_W: number;
  /** Power lost inside the batteries, W. */
  internalLoss_W: number;
  findings: CanvasFinding[];
  /** Findings per part or cable id: how many and the worst severity. */
  badges: Record<string, { count: number; severity: Severity }>;
}

export interface EditorResults {
  /** Sequence number of the document revision these results are for. */
  seq: number;
  /** Analysis mode they were computed in. */
  mode: string;
  canvas: CanvasSummary;
  /** The core's own result object (analyzeDiagram's, when available), for the analysis panels. */
  raw: unknown;
  /** Time the worker spent, ms. */
  elapsed_ms: number;
}
