/**
 * Fuse and cable sizing for each battery or string branch (suggest.ts), applying it with the fuse at the
 * post (apply.ts), and the checked transaction that previews a change and refuses one that would make
 * the design worse (check.ts, plan.ts). Suggestions are a starting point, not an approval to install.
 */
export {
  type BranchSizing, type SizingOptions, type SizingResult, bankMaxVoltage_V, candidateConductors,
  sizingChanges, suggestSizing,
} from './suggest';
export { FUSE_BANK_SIDE, FUSE_BATTERY_SIDE, POST_LINK_LENGTH_M, applySizing } from './apply';
export { type DesignCheck, type LoadingChange, type ShareChange, checkChange } from './check';
export { type SizingPlan, type SizingWithPlan, applySafeSizing, planSizing, sizeDiagram } from './plan';
