/**
 * The analysis mode the canvas figures are in, and the mode's headline figures, for the editor's status
 * bar: "Load case", "Charging: 80 A into the bank", "Equalize: up to 42 A between Battery 1 and Battery 4",
 * "Fault: Battery 2 internally shorted, 9.1 kA", "Discharge: Battery 3 empties first after 4.2 h".
 */
import { useShallow } from 'zustand/react/shallow';
import { ErrorIcon, WarningIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { useLabels } from '../analysis/labels';
import { fmtAmps, fmtPct } from '../units';
import type { ModeSummary } from './types';

export const MODE_NAMES: Record<ModeSummary['mode'], string> = {
  load: 'Load case',
  charge: 'Charge',
  equalize: 'Equalize',
  fault: 'Fault',
  discharge: 'Discharge',
};

const fmtCurrent = (a: number) => (Math.abs(a) >= 1000 ? `${(a / 1000).toFixed(2)} kA` : fmtAmps(a));

function headline(s: ModeSummary, labelOf: (id: string) => string): string | null {
  switch (s.mode) {
    case 'load':
      return null;
    case 'charge':
      return `${fmtAmps(Math.abs(s.totalCharge_A))} into the bank from ${s.chargers} charger${s.chargers === 1 ? '' : 's'}`;
    case 'equalize':
      return s.between.length === 2 && s.maxCurrent_A >= 0.05
        ? `up to ${fmtAmps(s.maxCurrent_A)} between ${labelOf(s.between[0])} and ${labelOf(s.between[1])} when joined`
        : 'no current between the batteries when joined';
    case 'fault':
      if (s.selected) return `${labelOf(s.selected.part)} ${s.selected.kind === 'battery' ? 'internally shorted' : 'shorted at its load end'}: ${fmtCurrent(s.selected.faultCurrent_A)} in the fault`;
      return `largest prospective current over ${s.cases} case${s.cases === 1 ? '' : 's'}, worst ${fmtCurrent(s.worst_A)}${s.worstPart ? ` (${labelOf(s.worstPart)})` : ''}`;
    case 'discharge':
      if (s.duration_h === null) return 'load case at the start; simulating…';
      return `load case at the start; ${s.firstEmpty ? `${labelOf(s.firstEmpty)} empties first` : 'no battery reached its cut-off'} after ${s.duration_h.toFixed(1)} h${s.usable_pct !== null ? `, ${fmtPct(s.usable_pct)} of nameplate used` : ''}`;
  }
}

/** For the status bar: the mode of the canvas figures and their headline. */
export function ModeStatus() {
  const { summary, issue } = useEditorStore(useShallow((s) => ({ summary: s.results?.canvas.modeSummary ?? null, issue: s.results?.canvas.modeIssue ?? null })));
  const chosen = useEditorStore((s) => s.analysis.mode);
  const labelOf = useLabels();
  const mode = summary?.mode ?? chosen;
  const text = issue ?? (summary && summary.mode === chosen ? headline(summary, labelOf) : null);
  return (
    <span data-testid="canvas-mode" className="flex min-w-0 items-center gap-1.5">
      <span className="rounded border border-graphite-300 bg-white px-1.5 py-px text-[11px] font-semibold text-graphite-800">{MODE_NAMES[mode]}</span>
      {text ? <span className="truncate">{text}</span> : null}
    </span>
  );
}

/**
 * For the status bar: how many errors and warnings the editor's findings hold — the same list the
 * findings panel shows and the canvas badges count (results/findings.ts). Nothing when there are none.
 */
export function FindingCounts() {
  const { error, warning } = useEditorStore(
    useShallow((s) => {
      const findings = s.results?.canvas.findings ?? [];
      let error = 0;
      let warning = 0;
      for (const f of findings) {
        if (f.severity === 'error') error++;
        else if (f.severity === 'warning') warning++;
      }
      return { error, warning };
    }),
  );
  if (!error && !warning) return null;
  return (
    <span className="ml-auto flex items-center gap-2" data-testid="status-counts">
      {error ? (
        <span className="flex items-center gap-1 text-fault-700">
          <ErrorIcon size={13} /> {error} error{error === 1 ? '' : 's'}
        </span>
      ) : null}
      {warning ? (
        <span className="flex items-center gap-1 text-caution-700">
          <WarningIcon size={13} /> {warning} warning{warning === 1 ? '' : 's'}
        </span>
      ) : null}
    </span>
  );
}
