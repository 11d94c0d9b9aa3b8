/**
 * The nodal solver of the electrical core. `solveNetwork` is the one to call; `solveNetworkReference`
 * is the plain mathjs implementation it is checked against.
 */
import type { Network, SolveOutcome } from './types';
import { solveNetworkReference } from './reference';

export { solveNetworkReference };
export { parseNetwork, parseNetworkJson, networkSchema } from './parse';
export { validateNetwork } from './validate';

/** Solves a network: node voltages, element currents, losses and source power, or a structured error. */
export function solveNetwork(net: Network): SolveOutcome {
  return solveNetworkReference(net);
}
