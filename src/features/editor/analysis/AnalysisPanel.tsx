/**
 * The analysis side panel: the mode switch (load, charge, equalize, fault, discharge) with its own
 * controls, the results of that mode, the take-off explorer and the sizing assistant.
 */
import { useId } from 'react';
import type { AnalysisMode, AnalysisOk, FaultSelection } from '@shared/electrical';
import type { DiagramDocument } from '@shared/diagram';
import { SafetyCaution } from '@/components/SafetyCaution';
import { Notice } from '@/components/Notice';
import { useEditorStore } from '../store';
import { DischargeChart } from './DischargeChart';
import { FaultResults, faultCaseLabel } from './FaultResults';
import { useLabels, type LabelOf } from './labels';
import { BankTable, BatteriesTable, CablesTable, FusesTable, LoadsAndLosses } from './ResultsTables';
import { SizingAssistant } from './SizingAssistant';
import { TakeoffExplorer } from './TakeoffExplorer';
import { useAnalysisResult } from './useCore';
import { Figures, Section, fmtA } from './ui';

export const MODES: { id: AnalysisMode; label: string; what: string }[] = [
  { id: 'load', label: 'Load', what: 'Loads as drawn, chargers off: how the load current shares between the batteries.' },
  { id: 'charge', label: 'Charge', what: 'Chargers on, loads off: how the charge current splits between the batteries.' },
  { id: 'equalize', label: 'Equalize', what: 'Loads and chargers off: the current that flows between batteries at different states of charge when joined.' },
  { id: 'fault', label: 'Fault', what: 'A bolted short: prospective current at each fuse and cable, against interrupting ratings.' },
  { id: 'discharge', label: 'Discharge', what: 'The load held until the first battery reaches its cut-off: currents and states of charge over time.' },
];

function ModeSwitch() {
  const mode = useEditorStore((s) => s.analysis.mode);
  const setAnalysis = useEditorStore((s) => s.setAnalysis);
  const fault = useEditorStore((s) => s.analysis.fault);
  const name = useId();
  return (
    <fieldset>
      <legend className="mb-1 text-[12px] font-medium text-graphite-700">Analysis</legend>
      <div className="grid grid-cols-5 overflow-hidden rounded-md border border-graphite-300 text-[11px]">
        {MODES.map((m, i) => (
          <label
            key={m.id}
            className={`relative cursor-pointer px-0.5 py-1 text-center font-medium has-[:checked]:bg-graphite-800 has-[:checked]:text-white has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-copper-500 ${i ? 'border-l border-graphite-300' : ''}`}
          >
            <input
              type="radio"
              name={name}
              value={m.id}
              checked={mode === m.id}
              onChange={() => setAnalysis(m.id === 'fault' ? { mode: m.id, ...(fault ? { fault } : {}) } : { mode: m.id })}
              className="sr-only"
            />
            {m.label}
          </label>
        ))}
      </div>
      <p className="mt-1 text-[11px] leading-[1.4] text-graphite-600">{MODES.find((m) => m.id === mode)?.what}</p>
    </fieldset>
  );
}

/** Fault target: the sweep over every case, or one battery or cable shorted. */
function FaultPicker({ doc, labelOf, cases }: { doc: DiagramDocument; labelOf: LabelOf; cases: AnalysisOk['faults'] }) {
  const fault = useEditorStore((s) => s.analysis.fault);
  const setAnalysis = useEditorStore((s) => s.setAnalysis);
  const id = useId();
  const batteries = cases
    ? cases.cases.filter((c) => c.kind === 'battery').map((c) => ({ id: c.id, text: faultCaseLabel(c, labelOf) }))
    : doc.parts.filter((p) => p.type === 'battery' || p.type === 'series_string').map((p) => ({ id: p.id, text: `${labelOf(p.id)} internally shorted` }));
  const cables = doc.cables.filter((c) => c.props.length_m > 0).map((c) => ({ id: c.id, text: `${labelOf(c.id)} shorted at its load end` }));
  const value = fault ? `${fault.kind}:${fault.id}` : '';
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-[12px] font-medium text-graphite-700">
        Faulted part
      </label>
      <select
        id={id}
        className="bw-input"
        value={value}
        onChange={(e) => {
          const v = e.target.value;
          if (!v) return setAnalysis({ mode: 'fault' });
          const i = v.indexOf(':');
          setAnalysis({ mode: 'fault', fault: { kind: v.slice(0, i) as FaultSelection['kind'], id: v.slice(i + 1) } });
        }}
      >
        <option value="">Every fault case (sweep)</option>
        <optgroup label="Batteries">
          {batteries.map((b) => (
            <option key={b.id} value={`battery:${b.id}`}>
              {b.text}
            </option>
          ))}
        </optgroup>
        <optgroup label="Cables">
          {cables.map((c) => (
            <option key={c.id} value={`cable:${c.id}`}>
              {c.text}
            </option>
          ))}
        </optgroup>
      </select>
    </div>
  );
}

function ModeResults({ result, doc, labelOf }: { result: AnalysisOk; doc: DiagramDocument; labelOf: LabelOf }) {
  const op = result.operating;
  const dropLimit = doc.settings.voltageDropLimit_pct;
  switch (result.mode) {
    case 'fault':
      return <FaultResults result={result} doc={doc} labelOf={labelOf} />;
    case 'discharge':
      return result.discharge ? <DischargeChart discharge={result.discharge} labelOf={labelOf} /> : null;
    default:
      if (!op) return <p className="text-[12px] text-graphite-600">This case did not solve; see Findings.</p>;
      return (
        <div className="space-y-3">
          {result.mode === 'charge' && result.charge ? (
            <Figures
              rows={[
                ['Charge current', fmtA(result.charge.totalCharge_A)],
                ...Object.entries(result.charge.chargers).map(([id, c]): [string, string] => [labelOf(id), `${fmtA(c.current_A)} at ${c.voltage_V.toFixed(2)} V (${c.mode === 'cc' ? 'current limit' : 'holding voltage'})`]),
              ]}
            />
          ) : null}
          {result.mode === 'equalize' && result.equalize ? (
            <p className="text-[12px]">
              Largest current when joined: <strong className="tabular-nums">{fmtA(result.equalize.maxCurrent_A)}</strong>
              {result.equalize.between.length === 2 ? ` between ${labelOf(result.equalize.between[0])} and ${labelOf(result.equalize.between[1])}` : ''}.
            </p>
          ) : null}
          <BatteriesTable op={op} labelOf={labelOf} />
          <CablesTable op={op} labelOf={labelOf} />
          <FusesTable op={op} doc={doc} labelOf={labelOf} />
          {result.mode === 'load' ? <LoadsAndLosses op={op} doc={doc} labelOf={labelOf} dropLimit_pct={dropLimit} /> : <LoadsAndLosses op={op} doc={{ ...doc, parts: [] }} labelOf={labelOf} dropLimit_pct={dropLimit} />}
        </div>
      );
  }
}

export function AnalysisPanel() {
  const { result, updating, error } = useAnalysisResult();
  const doc = useEditorStore((s) => s.doc);
  const mode = useEditorStore((s) => s.analysis.mode);
  const labelOf = useLabels();
  const stale = result !== null && result.mode !== mode;
  return (
    <div className="space-y-3">
      <ModeSwitch />
      {mode === 'fault' ? <FaultPicker doc={doc} labelOf={labelOf} cases={result?.ok ? result.faults : undefined} /> : null}
      <div aria-live="polite" className="min-h-4 text-[11px] text-graphite-500">
        {updating || stale ? 'Updating…' : ''}
      </div>
      {error ? <Notice signal="error">The analysis could not run: {error}</Notice> : null}
      {!result ? (
        <p className="text-[12px] text-graphite-600">{doc.parts.length ? 'Analysing…' : 'Draw a bank to analyse it.'}</p>
      ) : !result.ok ? (
        <Notice signal="warning" title="Not solved:">
          {result.errors.map((e) => e.message.replace(/\.$/, '')).join('; ')}. See Findings for the parts involved.
        </Notice>
      ) : (
        <>
          <Section title={`Results: ${MODES.find((m) => m.id === result.mode)?.label.toLowerCase()}`}>
            <ModeResults result={result} doc={doc} labelOf={labelOf} />
          </Section>
          <Section title="Bank" defaultOpen={false}>
            <BankTable bank={result.bank} labelOf={labelOf} />
          </Section>
        </>
      )}
      <Section title="Take-off explorer" defaultOpen={false}>
        <TakeoffExplorer />
      </Section>
      <Section title="Sizing assistant" defaultOpen={false}>
        <SizingAssistant />
      </Section>
      <SafetyCaution className="border-t border-graphite-200 pt-2" />
    </div>
  );
}
