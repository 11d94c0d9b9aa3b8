/** The editor's analysis side: the findings list and the analysis panel (modes, results, take-off, sizing). */
export { FindingsPanel } from './FindingsPanel';
export { AnalysisPanel } from './AnalysisPanel';
