/** The mathjs reference path on the same generated meshes as solver.bench.ts (capped at 5,000 elements). */
import { solveNetworkReference } from '../shared/electrical/network/reference';
import type { BenchCase } from './registry';
import { mesh } from './solver.bench';

export const cases: BenchCase<any>[] = [
  { name: 'mathjs path: mesh 1,000 elements', setup: () => mesh(1000), run: solveNetworkReference, samples: 9 },
  {
    name: 'mathjs path: mesh 5,000 elements',
    setup: () => mesh(5000),
    run: solveNetworkReference,
    samples: 5,
    maxSeconds: 10,
    note: 'not run at 50,000 elements: it grows much faster than the fast path and would take most of the bench time budget',
  },
];
