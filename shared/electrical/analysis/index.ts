export * from './types';
export { buildContext, cableAmpacity, cableAmpacity_A, modeNetwork, type AnalysisContext, type CableAmpacity, type SourceUnit } from './context';
export { bankFigures, inverterDcCurrent_A } from './bank';
export { DEFAULT_FAULT_OHM, faultCases, faultNetwork, faultSweep, prepareFaults } from './faults';
export { dischargeAnalysis } from './discharge';
export { operatingPoint } from './operating';
export { diagramTopology, ownFuses, postToPostChains, branchesToBusbar, type DiagramTopology, type Branch } from './topology';
