// TEMPORARY placeholders: the analysis-panel engineer replaces this file with the real panels.
import { createElement } from 'react';

export function FindingsPanel() {
  return createElement('p', { className: 'text-[13px] text-graphite-600' }, 'Findings list (temporary placeholder: the findings panel is being built).');
}

export function AnalysisPanel() {
  return createElement('p', { className: 'text-[13px] text-graphite-600' }, 'Analysis options and results (temporary placeholder: the analysis panel is being built).');
}
