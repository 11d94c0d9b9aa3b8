/**
 * The resistive network the solver works on. This is also the JSON network file format read by
 * `npm run solve` (docs/cli.md). SI units throughout. Voltages are relative to `ground`.
 *
 * Sign conventions:
 * - battery: an ideal source `ocv_V` in series with `r_ohm`, from `neg` to `pos`. Its current is positive
 *   when discharging: I = (ocv_V - (V[pos] - V[neg])) / r_ohm.
 * - resistor / load_resistor: current positive from `a` to `b`.
 * - current_source: current positive from `from` to `to` through the external circuit, i.e. it takes
 *   `amps` out of node `from` and delivers it into node `to`.
 * - constant_power: a load drawing `watts` from `pos` to `neg` (current positive from pos through the
 *   load to neg), solved by Newton iteration; `v_min_V` guards against collapse (below it the load is
 *   treated as the resistance it would have at v_min_V, and the result is flagged).
 * - voltage_source: an ideal source holding V[pos] - V[neg] = volts; current positive when it delivers
 *   current out of `pos` (i.e. charging whatever is connected). Optional `i_max_A` turns it into a
 *   current-limited source (constant voltage until the limit, then constant current) — a charger.
 */
export type NetworkElement =
  | { id: string; kind: 'battery'; pos: string; neg: string; ocv_V: number; r_ohm: number; role?: string }
  | { id: string; kind: 'resistor'; a: string; b: string; r_ohm: number; role?: string }
  | { id: string; kind: 'load_resistor'; a: string; b: string; r_ohm: number; role?: string }
  | { id: string; kind: 'current_source'; from: string; to: string; amps: number; role?: string }
  | { id: string; kind: 'constant_power'; pos: string; neg: string; watts: number; v_min_V?: number; role?: string }
  | { id: string; kind: 'voltage_source'; pos: string; neg: string; volts: number; i_max_A?: number; r_ohm?: number; role?: string };

export type ElementKind = NetworkElement['kind'];

export interface Network {
  ground: string;
  /** Optional list of node names; nodes are also taken from the elements. */
  nodes?: string[];
  elements: NetworkElement[];
}

export interface SolveResult {
  ok: true;
  node_voltages_V: Record<string, number>;
  /** Current of every element by id, signs as above. */
  element_currents_A: Record<string, number>;
  /** Power dissipated in each element's resistance (W, >= 0). Sources' delivered power is separate. */
  element_losses_W: Record<string, number>;
  /** Power delivered by each source (battery: ocv_V * I; voltage source: volts * I) in W. */
  source_power_W: Record<string, number>;
  /**
   * Power absorbed by each constant-power load (V * I) in W. Together with the other two maps:
   * sum(source_power_W) = sum(element_losses_W) + sum(load_power_W).
   */
  load_power_W?: Record<string, number>;
  /** Newton iterations used (1 for a linear network). */
  iterations: number;
  /** Notes such as a constant-power load that hit v_min_V or a charger in current limit. */
  notes: { code: string; message: string; elements: string[] }[];
}

export type SolveErrorCode =
  | 'malformed_network'
  | 'unknown_node'
  | 'unknown_element'
  | 'duplicate_id'
  | 'invalid_value'
  | 'floating_node'
  | 'singular_network'
  | 'zero_resistance_loop'
  | 'no_convergence';

export interface SolveError {
  ok: false;
  error: {
    code: SolveErrorCode;
    message: string;
    /** Nodes and elements involved, when known. */
    nodes?: string[];
    elements?: string[];
  };
}

export type SolveOutcome = SolveResult | SolveError;
