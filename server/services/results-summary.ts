/** The revision results summary is defined once, in shared/diagram/summary.ts (server and client use it). */
export { RESULTS_SUMMARY_VERSION, summarizeResults, type RevisionResultsSummary } from '../../shared/diagram/summary';
