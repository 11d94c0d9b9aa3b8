// Hand-computed cases (first principles: Ohm's and Kirchhoff's laws, Thevenin equivalents). Every
// expected value is worked out in the comment beside it, never taken from the solver.
import { describe, expect, it } from 'vitest';
import { solveNetwork, solveNetworkReference } from '../../../shared/electrical/network/solve';
import type { Network, SolveOutcome, SolveResult } from '../../../shared/electrical/network/types';

const solvers = [
  ['solveNetwork', solveNetwork],
  ['solveNetworkReference', solveNetworkReference],
] as const;

function solved(r: SolveOutcome): SolveResult {
  if (!r.ok) throw new Error(`${r.error.code}: ${r.error.message}`);
  return r;
}

describe.each(solvers)('%s: analytical cases', (_name, solve) => {
  it('two-resistor divider on an ideal source', () => {
    // 12 V across 1 ohm + 2 ohm: I = 12 / 3 = 4 A, mid = 12 - 4 * 1 = 8 V.
    const r = solved(
      solve({
        ground: 'n',
        elements: [
          { id: 'v', kind: 'voltage_source', pos: 'p', neg: 'n', volts: 12 },
          { id: 'r1', kind: 'resistor', a: 'p', b: 'm', r_ohm: 1 },
          { id: 'r2', kind: 'resistor', a: 'm', b: 'n', r_ohm: 2 },
        ],
      }),
    );
    expect(r.node_voltages_V.m).toBeCloseTo(8, 12);
    expect(r.element_currents_A.r1).toBeCloseTo(4, 12);
    expect(r.element_currents_A.v).toBeCloseTo(4, 12);
    expect(r.source_power_W.v).toBeCloseTo(48, 10);
    expect(r.element_losses_W.r2).toBeCloseTo(32, 10); // 4^2 * 2
  });

  // Two identical batteries (12.8 V, 10 mohm), interconnects 2 mohm on each side, 1 ohm load.
  const pair = (loadNeg: 'n1' | 'n2'): Network => ({
    ground: 'n2',
    elements: [
      { id: 'b1', kind: 'battery', pos: 'p1', neg: 'n1', ocv_V: 12.8, r_ohm: 0.01 },
      { id: 'b2', kind: 'battery', pos: 'p2', neg: 'n2', ocv_V: 12.8, r_ohm: 0.01 },
      { id: 'jp', kind: 'resistor', a: 'p1', b: 'p2', r_ohm: 0.002 },
      { id: 'jn', kind: 'resistor', a: 'n1', b: 'n2', r_ohm: 0.002 },
      { id: 'load', kind: 'load_resistor', a: 'p1', b: loadNeg, r_ohm: 1 },
    ],
  });

  it('two equal batteries with a diagonal take-off share the load equally', () => {
    // Each battery sees one interconnect in its path: two 12.8 V / 12 mohm Thevenin branches in parallel,
    // 6 mohm together. I = 12.8 / 1.006; each battery carries half.
    const r = solved(solve(pair('n2')));
    const I = 12.8 / 1.006;
    expect(r.element_currents_A.load).toBeCloseTo(I, 10);
    expect(r.element_currents_A.b1).toBeCloseTo(I / 2, 10);
    expect(r.element_currents_A.b2).toBeCloseTo(I / 2, 10);
  });

  it('both leads on one battery: that battery carries more, in the ratio of the path resistances', () => {
    // b1 path 10 mohm, b2 path 10 + 2 + 2 = 14 mohm; parallel 5.8333 mohm. Shares inverse to resistance.
    const r = solved(solve(pair('n1')));
    const rth = (0.01 * 0.014) / 0.024;
    const I = 12.8 / (1 + rth);
    expect(r.element_currents_A.b1).toBeCloseTo((I * 0.014) / 0.024, 10);
    expect(r.element_currents_A.b2).toBeCloseTo((I * 0.01) / 0.024, 10);
    expect(r.element_currents_A.b1 / r.element_currents_A.b2).toBeCloseTo(1.4, 10);
  });

  it('a current source into a resistor', () => {
    // 3 A into 4 ohm: V = 12 V; the source delivers 3 * 12 = 36 W.
    const r = solved(
      solve({ ground: 'g', elements: [
        { id: 'i', kind: 'current_source', from: 'g', to: 'x', amps: 3 },
        { id: 'r', kind: 'resistor', a: 'x', b: 'g', r_ohm: 4 },
      ] }),
    );
    expect(r.node_voltages_V.x).toBeCloseTo(12, 12);
    expect(r.source_power_W.i).toBeCloseTo(36, 10);
  });

  it('an ideal source between two non-ground nodes', () => {
    // Va - Vb = 10, KCL: Va / 1 + Vb / 1 = 0 -> Va = 5, Vb = -5, source current 5 A.
    const r = solved(
      solve({ ground: 'g', elements: [
        { id: 'v', kind: 'voltage_source', pos: 'a', neg: 'b', volts: 10 },
        { id: 'ra', kind: 'resistor', a: 'a', b: 'g', r_ohm: 1 },
        { id: 'rb', kind: 'resistor', a: 'b', b: 'g', r_ohm: 1 },
      ] }),
    );
    expect(r.node_voltages_V.a).toBeCloseTo(5, 12);
    expect(r.node_voltages_V.b).toBeCloseTo(-5, 12);
    expect(r.element_currents_A.v).toBeCloseTo(5, 12);
  });

  const charger = (i_max_A: number): Network => ({
    ground: 'n',
    elements: [
      { id: 'chg', kind: 'voltage_source', pos: 'p', neg: 'n', volts: 14.4, i_max_A },
      { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12, r_ohm: 0.05 },
    ],
  });

  it('a charger below its current limit holds its voltage', () => {
    // CV: I = (14.4 - 12) / 0.05 = 48 A < 100 A.
    const r = solved(solve(charger(100)));
    expect(r.node_voltages_V.p).toBeCloseTo(14.4, 12);
    expect(r.element_currents_A.chg).toBeCloseTo(48, 9);
    expect(r.element_currents_A.bat).toBeCloseTo(-48, 9);
    expect(r.notes).toEqual([]);
  });

  it('a charger above its current limit delivers the limit', () => {
    // CV would need 48 A > 10 A: CC at 10 A, V = 12 + 10 * 0.05 = 12.5 V.
    const r = solved(solve(charger(10)));
    expect(r.element_currents_A.chg).toBeCloseTo(10, 12);
    expect(r.node_voltages_V.p).toBeCloseTo(12.5, 12);
    expect(r.notes.map((n) => n.code)).toEqual(['current_limit']);
  });

  it('a constant-power load on a battery settles on the upper root', () => {
    // v = ocv - r P / v -> v^2 - 12 v + 0.05 * 500 = 0 -> v = (12 + sqrt(144 - 100)) / 2.
    const r = solved(
      solve({ ground: 'n', elements: [
        { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12, r_ohm: 0.05 },
        { id: 'inv', kind: 'constant_power', pos: 'p', neg: 'n', watts: 500 },
      ] }),
    );
    const v = (12 + Math.sqrt(44)) / 2;
    expect(r.node_voltages_V.p).toBeCloseTo(v, 9);
    expect(r.element_currents_A.inv).toBeCloseTo(500 / v, 8);
    expect(r.load_power_W!.inv).toBeCloseTo(500, 8);
    expect(r.iterations).toBeGreaterThan(1);
  });

  it('a constant-power load beyond what the battery can deliver is an error, not NaN', () => {
    // Maximum power into a load from 12 V / 50 mohm is 12^2 / (4 * 0.05) = 720 W.
    const r = solve({ ground: 'n', elements: [
      { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12, r_ohm: 0.05 },
      { id: 'inv', kind: 'constant_power', pos: 'p', neg: 'n', watts: 1000 },
    ] });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.code).toBe('no_convergence');
      expect(r.error.elements).toEqual(['inv']);
    }
  });

  it('a constant-power load that no source can drive is a collapse, not a huge current near 0 V', () => {
    // The two batteries and the ideal source close a loop among n1, n2 and n3 that reaches ground only
    // through the load's own terminals, so no current can return: the load sees 0 V open circuit and
    // cannot draw 2,545.8 W. (Found by the changes property on a shorted feed: the plain iteration
    // once stopped at 1e-16 V with 2.7e19 A in the load, because its voltages had stopped moving.)
    const r = solve({ ground: 'n0', elements: [
      { id: 't2', kind: 'battery', pos: 'n2', neg: 'n1', ocv_V: 12.65924, r_ohm: 0.06846994830911338 },
      { id: 't3', kind: 'battery', pos: 'n3', neg: 'n2', ocv_V: 11.25092, r_ohm: 0.002 },
      { id: 'v0', kind: 'voltage_source', pos: 'n2', neg: 'n1', volts: -9.6544, i_max_A: 30.382 },
      { id: 'short', kind: 'resistor', a: 'cp0', b: 'n0', r_ohm: 1e-4 },
      { id: 'tie0', kind: 'resistor', a: 'cp0', b: 'n1', r_ohm: 0.5 },
      { id: 'cp0', kind: 'constant_power', pos: 'cp0', neg: 'n0', watts: 2545.8 },
    ] });
    expect(r.ok ? 'ok' : r.error.code).toBe('no_convergence');
  });

  it('with v_min_V the collapsed load becomes its resistance at v_min_V and is flagged', () => {
    // R = 10^2 / 1000 = 0.1 ohm; v = 12 * 0.1 / 0.15 = 8 V (< 10 V, so on the resistive branch).
    const r = solved(
      solve({ ground: 'n', elements: [
        { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12, r_ohm: 0.05 },
        { id: 'inv', kind: 'constant_power', pos: 'p', neg: 'n', watts: 1000, v_min_V: 10 },
      ] }),
    );
    expect(r.node_voltages_V.p).toBeCloseTo(8, 9);
    expect(r.element_currents_A.inv).toBeCloseTo(80, 8);
    expect(r.notes.map((n) => n.code)).toEqual(['below_v_min']);
  });

  it('a node fed only by a current source is floating, named in the error', () => {
    const r = solve({ ground: 'n', elements: [
      { id: 'bat', kind: 'battery', pos: 'p', neg: 'n', ocv_V: 12, r_ohm: 0.05 },
      { id: 'i', kind: 'current_source', from: 'p', to: 'x', amps: 1 },
    ] });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.code).toBe('floating_node');
      expect(r.error.nodes).toEqual(['x']);
    }
  });
});
