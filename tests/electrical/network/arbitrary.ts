// fast-check generators of small random networks (every node reached from ground by construction).
import fc from 'fast-check';
import type { Network, NetworkElement } from '../../../shared/electrical/network/types';
import type { SolveResult } from '../../../shared/electrical/network/types';

// fast-check's doubles crowd at the bounds; integers mapped onto ranges spread the values evenly.
const linear = (min: number, max: number) => fc.integer({ min: 0, max: 10_000 }).map((k) => min + ((max - min) * k) / 10_000);
const logScale = (min: number, max: number) => fc.integer({ min: 0, max: 10_000 }).map((k) => min * Math.pow(max / min, k / 10_000));
const resistance = logScale(1e-4, 10);
const emf = linear(11, 14.6);

export interface ArbitraryOptions {
  maxNodes?: number;
  constantPower?: boolean;
  sources?: boolean;
  /**
   * Largest constant-power demand as a fraction of the power its own feed can deliver
   * (12.8² / 4 R_feed). Unset: 0 to 2,000 W whatever the feed, which reaches the fold of P = v i
   * (within 2.4 % of the 2,048 W a 20 mΩ feed gives) where operating points bunch up, cross or
   * vanish. Properties that compare two solves use a margin so they compare a well-posed problem.
   */
  loadHeadroom?: number;
}

export function arbitraryNetwork(o: ArbitraryOptions = {}): fc.Arbitrary<Network> {
  const maxNodes = o.maxNodes ?? 8;
  return fc.integer({ min: 2, max: maxNodes }).chain((nodes) => {
    const node = fc.integer({ min: 0, max: nodes - 1 }).map((i) => `n${i}`);
    // A spanning tree of batteries and resistors: node i hangs on an earlier node.
    const tree = fc.tuple(
      ...Array.from({ length: nodes - 1 }, (_, i) =>
        fc.record({
          parent: fc.integer({ min: 0, max: i }),
          battery: fc.boolean(),
          r: resistance,
          v: emf,
        }).map(({ parent, battery, r, v }): NetworkElement =>
          battery
            ? { id: `t${i + 1}`, kind: 'battery', pos: `n${i + 1}`, neg: `n${parent}`, ocv_V: v, r_ohm: Math.max(r, 0.002) }
            : { id: `t${i + 1}`, kind: 'resistor', a: `n${parent}`, b: `n${i + 1}`, r_ohm: r },
        ),
      ),
    );
    const extra = fc.array(
      fc.oneof(
        fc.record({ a: node, b: node, r: resistance }).map((x) => ({ kind: 'resistor' as const, a: x.a, b: x.b, r_ohm: x.r })),
        fc.record({ a: node, b: node, r: logScale(0.05, 50) }).map((x) => ({ kind: 'load_resistor' as const, a: x.a, b: x.b, r_ohm: x.r })),
        fc.record({ a: node, b: node, r: logScale(0.002, 0.05), v: emf }).map((x) => ({ kind: 'battery' as const, pos: x.a, neg: x.b, ocv_V: x.v, r_ohm: x.r })),
        fc.record({ a: node, b: node, i: linear(-20, 20) }).map((x) => ({ kind: 'current_source' as const, from: x.a, to: x.b, amps: x.i })),
        ...(o.sources
          ? [
              fc.record({ a: node, b: node, v: emf, r: logScale(0.005, 0.1), lim: fc.option(linear(1, 80), { nil: undefined }) }).map((x) => ({
                kind: 'voltage_source' as const, pos: x.a, neg: x.b, volts: x.v, r_ohm: x.r, ...(x.lim !== undefined ? { i_max_A: x.lim } : {}),
              })),
            ]
          : []),
      ),
      { maxLength: 2 * nodes },
    );
    // Ideal sources: at most one per node, to an earlier node, so they never form a loop.
    const ideal = o.sources
      ? fc.array(fc.record({ at: fc.integer({ min: 1, max: nodes - 1 }), to: fc.nat(), v: linear(-14, 14), lim: fc.option(linear(1, 60), { nil: undefined }) }), { maxLength: 2 })
      : fc.constant([]);
    const loads = o.constantPower
      ? fc.array(fc.record({ at: fc.integer({ min: 1, max: nodes - 1 }), w: linear(0, 2000), feed: logScale(0.002, 0.02), vmin: fc.option(fc.constant(4), { nil: undefined }) }), { maxLength: 2 })
      : fc.constant([]);
    return fc.tuple(tree, extra, ideal, loads).map(([t, x, id, ld]): Network => {
      const elements: NetworkElement[] = [...t];
      x.forEach((e, i) => elements.push({ ...e, id: `x${i}` } as NetworkElement));
      const used = new Set<number>();
      id.forEach((s, i) => {
        if (used.has(s.at)) return;
        used.add(s.at);
        elements.push({ id: `v${i}`, kind: 'voltage_source', pos: `n${s.at}`, neg: `n${s.to % s.at}`, volts: s.v, ...(s.lim !== undefined ? { i_max_A: s.lim } : {}) });
      });
      // Constant-power loads hang on their own 12.8 V feed (at most 20 mohm: 2,048 W available), so a
      // solution exists unless the tie into the rest of the network drains the feed near the fold.
      ld.forEach((l, i) => {
        const watts = o.loadHeadroom === undefined ? l.w : Math.round(((l.w / 2000) * o.loadHeadroom * 12.8 * 12.8) / (4 * l.feed) * 10) / 10;
        elements.push({ id: `feed${i}`, kind: 'battery', pos: `cp${i}`, neg: 'n0', ocv_V: 12.8, r_ohm: l.feed });
        elements.push({ id: `tie${i}`, kind: 'resistor', a: `cp${i}`, b: `n${l.at}`, r_ohm: 0.5 });
        elements.push({ id: `cp${i}`, kind: 'constant_power', pos: `cp${i}`, neg: 'n0', watts, ...(l.vmin !== undefined ? { v_min_V: l.vmin } : {}) });
      });
      return { ground: 'n0', elements };
    });
  });
}

/** Sum of element currents leaving each node (signs of types.ts). */
export function kclResiduals(net: Network, r: SolveResult): Map<string, number> {
  const out = new Map<string, number>();
  const add = (n: string, i: number) => out.set(n, (out.get(n) ?? 0) + i);
  for (const el of net.elements) {
    const i = r.element_currents_A[el.id];
    switch (el.kind) {
      case 'resistor':
      case 'load_resistor':
        add(el.a, i); add(el.b, -i); break;
      case 'current_source':
        add(el.from, i); add(el.to, -i); break;
      case 'constant_power':
        add(el.pos, i); add(el.neg, -i); break;
      case 'battery':
      case 'voltage_source':
        add(el.pos, -i); add(el.neg, i); break;
    }
  }
  return out;
}

/** Largest difference between two results, voltages and currents, relative to their scale. */
export function resultDifference(a: SolveResult, b: SolveResult): { volts: number; amps: number } {
  let volts = 0;
  let amps = 0;
  for (const [n, v] of Object.entries(a.node_voltages_V)) volts = Math.max(volts, Math.abs(v - b.node_voltages_V[n]) / (1 + Math.abs(v)));
  for (const [id, i] of Object.entries(a.element_currents_A)) amps = Math.max(amps, Math.abs(i - b.element_currents_A[id]) / (1 + Math.abs(i)));
  return { volts, amps };
}

/**
 * Throws unless r is a genuine operating point of net: Kirchhoff's current law at every node (within
 * 1e-7 of the largest current) and every constant-power load drawing what its law gives at its
 * voltage (P / v, or P v / v_min² below v_min_V).
 */
export function expectOperatingPoint(net: Network, r: SolveResult): void {
  const scale = Math.max(1, ...Object.values(r.element_currents_A).map(Math.abs));
  for (const [node, sum] of kclResiduals(net, r)) if (!(Math.abs(sum) <= 1e-7 * scale)) throw new Error(`KCL at ${node}: ${sum} A`);
  for (const el of net.elements) {
    if (el.kind !== 'constant_power') continue;
    const v = r.node_voltages_V[el.pos] - r.node_voltages_V[el.neg];
    const expected = el.v_min_V !== undefined && v < el.v_min_V ? (el.watts * v) / el.v_min_V ** 2 : el.watts / v;
    if (!(Math.abs(r.element_currents_A[el.id] - expected) <= 1e-9 * Math.max(1, Math.abs(expected)))) {
      throw new Error(`load law at ${el.id}: ${r.element_currents_A[el.id]} A at ${v} V, expected ${expected} A`);
    }
  }
}
