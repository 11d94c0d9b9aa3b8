/**
 * The nodal solver of the electrical core. `solveNetwork` is the one to call (the sparse fast path,
 * fast.ts); `solveNetworkReference` is the plain mathjs implementation it is checked against.
 * `prepareNetwork` + `solvePrepared` / `solveVariants` re-solve a network with small changes (fault
 * studies) on the same factorization.
 */
import type { Network, SolveOutcome } from './types';
import { solveNetworkFast } from './fast';

export { solveNetworkReference } from './reference';
export { linearSweep, prepareNetwork, solvePrepared, solvePreparedEmf, solveVariants, solveNetworkFast, type LinearSweep, type PreparedNetwork } from './fast';
export {
  applyChanges,
  batteryShortVariants,
  cableLoadEndShortVariants,
  internalShort,
  withShunt,
  type NetworkChange,
} from './changes';
export { parseNetwork, parseNetworkJson, networkSchema } from './parse';
export { validateNetwork } from './validate';

/** Solves a network: node voltages, element currents, losses and source power, or a structured error. */
export function solveNetwork(net: Network): SolveOutcome {
  return solveNetworkFast(net);
}
