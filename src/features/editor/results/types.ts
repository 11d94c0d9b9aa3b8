/** What the canvas shows from an analysis: per-part and per-cable figures keyed by id, plus bank totals. */
import type { AnalysisMode } from '@shared/electrical/analysis';

export type Severity = 'error' | 'warning' | 'note';

export interface CanvasFinding {
  code: string;
  severity: Severity;
  message: string;
  /** Ids of the parts and cables involved. */
  parts: string[];
  /** The standard's clause, "common practice", or "analysis" for the core's own errors and notes. */
  basis?: string;
  suggestion?: string;
}

export interface BatteryFigure {
  /**
   * Current out of the battery (or string), A; positive when discharging, negative when charging. In the
   * fault sweep: the current in the fault with this battery internally shorted.
   */
  current_A: number;
  /** This battery's part of the bank's total battery current, 0..1 (0 where a share means nothing: equalize, fault). */
  share: number;
}

export interface CableFigure {
  /** Signed: positive from the cable's `from` end to its `to` end, A. In the fault sweep: the largest over all cases (unsigned). */
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
  /** Fault mode: the current is a prospective fault current, set against the interrupting rating. */
  interrupting_A?: number;
  /** Fault mode: |current| / interrupting rating. */
  interruptingLoading?: number;
}

export interface LoadFigure {
  /** Voltage across the load's terminals, V. */
  voltage_V: number;
  /** Drop from the highest battery terminal voltage to the load, % of the system voltage. */
  drop_pct: number;
  current_A: number;
}

/**
 * What the canvas marks: in a mode, the faulted part or cable, the battery that empties first, the pair
 * exchanging most; in any mode, a part with an open terminal ('not-connected'), a part or cable left out
 * because it leads only to one ('open-circuit'), and the sources and conductors of a drawn short ('short').
 */
export type CanvasMark = 'faulted' | 'worst-fault' | 'first-empty' | 'largest-exchange' | 'not-connected' | 'open-circuit' | 'short';

/** The mode's headline figures, for the status bar. */
export type ModeSummary =
  | { mode: 'load' }
  | { mode: 'charge'; totalCharge_A: number; chargers: number }
  | { mode: 'equalize'; maxCurrent_A: number; between: string[] }
  | { mode: 'fault'; cases: number; worst_A: number; worstPart: string | null; selected: { kind: 'battery' | 'cable'; part: string; faultCurrent_A: number } | null }
  | { mode: 'discharge'; firstEmpty: string | null; duration_h: number | null; usable_pct: number | null; stoppedBy: string | null };

export interface CanvasSummary {
  /** The analysis mode the figures are for. */
  mode: AnalysisMode;
  /** False when the diagram could not be solved in this mode (see findings and `modeIssue`). */
  solved: boolean;
  /** Why this mode has no figures (e.g. charge mode without an enabled charger). */
  modeIssue: string | null;
  modeSummary: ModeSummary;
  /** Ids the mode marks on the canvas. */
  marks: Record<string, CanvasMark>;
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
  /**
   * Set when this change could not be solved and the figures are the last ones that were (results/stale.ts):
   * the canvas shows them greyed, the status bar says why.
   */
  stale?: { reason: string };
  /** A short drawn in the diagram: the prospective current through each of its conductors (cables and parts), A. */
  shorts?: Record<string, number>;
}

export interface EditorResults {
  /** Sequence number of the document revision these results are for. */
  seq: number;
  /**
   * 'figures': the canvas figures are for `seq`, the findings, badges and `raw` still for an earlier
   * revision (the full analysis with every rule check follows); 'full': everything is for `seq`.
   */
  stage: 'figures' | 'full';
  /** Analysis mode they were computed in. */
  mode: string;
  canvas: CanvasSummary;
  /** The core's own result object (analyzeDiagram's, when available), for the analysis panels. */
  raw: unknown;
  /** Time the worker spent, ms. */
  elapsed_ms: number;
}
