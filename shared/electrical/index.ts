/**
 * The electrical core's public entry: the network solver, part models, tables, the diagram compiler,
 * the analyses (`analyzeDiagram`), rule checks, sizing and the take-off optimizer. Pure functions on
 * plain data; safe in a web worker.
 */
export * from './network/types';
export {
  solveNetwork, solveNetworkReference, prepareNetwork, solvePrepared, solvePreparedEmf, solveVariants, linearSweep, applyChanges,
  batteryShortVariants, cableLoadEndShortVariants, internalShort, withShunt, parseNetwork, parseNetworkJson,
  validateNetwork, type PreparedNetwork, type NetworkChange, type LinearSweep,
} from './network/solve';
export * from './parts';
export * from './tables';
export * from './compile';
export * from './analysis';
export * from './rules';
export * from './study';
export * from './sizing';
export * from './optimizer';
