/**
 * Nodal solver benchmarks: the 40-battery bank with every battery shorted in turn, generated meshes of
 * 1,000 / 5,000 / 50,000 elements on the fast path, and ngspice's own analysis time for the same
 * circuits when ngspice is installed. The mathjs reference path: solver.reference.bench.ts.
 */
import { existsSync } from 'node:fs';
import { postToPostBank, randomMesh } from '../shared/electrical/network/builders';
// The fast path and the change helpers only (not solve.ts, which also loads mathjs for the reference
// path): the memory case then measures what the fast path costs. The mathjs cases are in
// solver.reference.bench.ts.
import { batteryShortVariants, withShunt } from '../shared/electrical/network/changes';
import { prepareNetwork, solveNetworkFast as solveNetwork, solvePrepared, solveVariants, type PreparedNetwork } from '../shared/electrical/network/fast';
import type { Network } from '../shared/electrical/network/types';
import { NGSPICE, parsePrintAll, runNgspiceRaw, toSpice } from '../tests/helpers/ngspice';
import type { BenchCase } from './registry';

/** The generated network used by every size-based case (same seed for all three solvers). */
export const mesh = (elements: number): Network => randomMesh({ elements, width: 12, seed: 1, sources: true, constantPower: 3 });

function mustSolve(net: Network) {
  const r = solveNetwork(net);
  if (!r.ok) throw new Error(`bench network does not solve: ${r.error.message}`);
  return net;
}

const bank40 = () => postToPostBank({ count: 40, posTap: 1, negTap: 40, link_ohm: 0.0004, load: { kind: 'constant_power', watts: 2000, v_min_V: 10 } });

/** Netlist for timing ngspice: loads' nodes seeded from its own unloaded solution, op, rusage. */
async function ngspiceCase(net: Network): Promise<string | null> {
  if (!existsSync(NGSPICE)) return null;
  const unloaded = toSpice(net, { omitConstantPower: true });
  const v = unloaded.read(parsePrintAll((await runNgspiceRaw(unloaded.netlist)).stdout)).node_voltages_V;
  // Seed only the constant-power loads' nodes: ngspice's .nodeset handling grows with the square of the
  // number of seeded nodes (a full seed of 20k nodes takes 18 s).
  const seeded = net.elements.flatMap((el) => (el.kind === 'constant_power' ? [el.pos, el.neg] : []));
  const nodeset = Object.fromEntries(seeded.map((n) => [n, v[n]]));
  return toSpice(net, { nodeset }).netlist.replace('print all', 'rusage everything');
}

async function ngspiceAnalysisMs(netlist: string | null): Promise<number | null> {
  if (netlist === null) return null;
  const { stdout } = await runNgspiceRaw(netlist);
  const m = /Total analysis time \(seconds\) = ([0-9.eE+-]+)/.exec(stdout);
  if (!m) throw new Error('ngspice printed no analysis time');
  return Number(m[1]) * 1000;
}

const NGSPICE_NOTE = "ngspice's own 'Total analysis time' of the op analysis (rusage everything; 1 ms resolution), without process start or netlist parsing";

export const cases: BenchCase<any>[] = [
  {
    name: 'solver: 40-battery bank, solve + each battery shorted (41 solves)',
    setup: bank40,
    run: (net: Network) => {
      const prep = prepareNetwork(net) as PreparedNetwork;
      const out = solveVariants(prep, batteryShortVariants(net, 0.001).map((v) => v.changes));
      if (out.length !== 40 || !out.every((r) => r.ok)) throw new Error('fault variants failed');
    },
    samples: 101,
    targetMs: 5,
  },
  { name: 'solver: mesh 1,000 elements', setup: () => mustSolve(mesh(1000)), run: solveNetwork, samples: 101, targetMs: 2 },
  { name: 'solver: mesh 5,000 elements', setup: () => mustSolve(mesh(5000)), run: solveNetwork, samples: 51, targetMs: 15 },
  {
    name: 'solver: mesh 50,000 elements',
    setup: () => mustSolve(mesh(50_000)),
    run: solveNetwork,
    samples: 9,
    targetMs: 300,
    targetMb: 300,
    memory: true,
    note: 'peak RSS of a child process that loads only this file (Node + tsx + network objects + fast path), process.resourceUsage().maxRSS; RSS before = before the network is built',
  },
  {
    name: 'solver: mesh 50,000 elements, one fault on the prepared factorization',
    setup: () => {
      const net = mesh(50_000);
      return prepareNetwork(net) as PreparedNetwork;
    },
    run: (prep: PreparedNetwork) => solvePrepared(prep, [withShunt('m1000.5', 'm0.0', 0.001)]),
    samples: 11,
  },
  { name: 'ngspice op: mesh 1,000 elements', setup: () => ngspiceCase(mesh(1000)), measure: ngspiceAnalysisMs, samples: 5, note: NGSPICE_NOTE },
  { name: 'ngspice op: mesh 5,000 elements', setup: () => ngspiceCase(mesh(5000)), measure: ngspiceAnalysisMs, samples: 5 },
  { name: 'ngspice op: mesh 50,000 elements', setup: () => ngspiceCase(mesh(50_000)), measure: ngspiceAnalysisMs, samples: 3, maxSeconds: 30 },
];
