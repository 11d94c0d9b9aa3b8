/**
 * The findings, grouped by severity (errors, warnings, notes). Each finding is a button: activating
 * it (click, Enter or Space) selects its parts on the canvas and frames them.
 *
 * The list is the editor's one list of findings (results/findings.ts), the same the status bar counts
 * and the canvas badges count per part. Each shows a plain-language title and names parts by label.
 */
import { useMemo, useState } from 'react';
import { localizeUnitsInText } from '@shared/units';
import type { Severity } from '@shared/electrical';
import { SafetyCaution } from '@/components/SafetyCaution';
import { useEditorStore } from '../store';
import { findingsOf } from '../results/findings';
import type { CanvasFinding } from '../results/types';
import { findingTitle, useLabels, usePlainText, useRuleTitles } from './labels';
import { SEVERITIES, SEVERITY } from './severity';

/** Findings about fault currents: each offers the fault analysis, where the canvas shows every current with the fault in place. */
const FAULT_FINDINGS = new Set(['structure-shorted-source', 'structure-reversed-polarity', 'structure-zero-resistance-loop', 'interrupting-rating']);
import { useAnalysisResult } from './useCore';

interface Shown extends CanvasFinding {
  key: string;
}

/** The editor's findings: those of the live results, or (when the editor has none) of the panels' own analysis. */
function useFindings(): { findings: CanvasFinding[] | null; updating: boolean; error?: string } {
  const live = useEditorStore((s) => s.results?.canvas.findings ?? null);
  const { result, updating, error } = useAnalysisResult();
  const own = useMemo(() => (result ? findingsOf(result) : null), [result]);
  return { findings: live ?? own, updating, error: live ? undefined : error };
}

export function FindingsPanel() {
  const { findings, updating, error } = useFindings();
  const labelOf = useLabels();
  const plain = usePlainText();
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const titles = useRuleTitles();
  const focusParts = useEditorStore((s) => s.focusParts);
  const mode = useEditorStore((s) => s.analysis.mode);
  const setAnalysis = useEditorStore((s) => s.setAnalysis);
  const nParts = useEditorStore((s) => s.doc.parts.length);
  const [active, setActive] = useState<string | null>(null);

  const groups = useMemo(() => {
    const by: Record<Severity, Shown[]> = { error: [], warning: [], note: [] };
    findings?.forEach((f, i) => by[f.severity].push({ ...f, key: `f${i}:${f.code}` }));
    return by;
  }, [findings]);

  if (!findings) {
    return (
      <div className="space-y-2 text-[13px] text-graphite-600" aria-busy={updating}>
        {error ? <p>The checks could not run: {error}</p> : <p>{nParts ? 'Checking the diagram…' : 'Draw a bank to check it.'}</p>}
      </div>
    );
  }

  const total = SEVERITIES.reduce((n, s) => n + groups[s].length, 0);

  return (
    <div className="space-y-3" aria-busy={updating}>
      <div className="flex items-center gap-2 text-[12px] text-graphite-700">
        <h2 className="text-[13px] font-semibold text-graphite-900">Findings</h2>
        <span data-testid="findings-counts">
          {SEVERITIES.map((s) => `${groups[s].length} ${groups[s].length === 1 ? SEVERITY[s].word.toLowerCase() : SEVERITY[s].plural.toLowerCase()}`).join(' · ')}
        </span>
        {updating ? <span className="ml-auto text-graphite-500" role="status">Updating…</span> : null}
      </div>
      {total === 0 ? (
        <p className="rounded-md border border-graphite-200 bg-graphite-50 px-3 py-2 text-[13px] text-graphite-700">
          No findings from the rule checks in this diagram.
        </p>
      ) : null}
      {SEVERITIES.filter((s) => groups[s].length).map((sev) => {
        const S = SEVERITY[sev];
        return (
          <section key={sev} aria-labelledby={`findings-${sev}`}>
            <h3 id={`findings-${sev}`} className={`mb-1 flex items-center gap-1.5 text-[12px] font-semibold ${S.text}`}>
              <S.Icon size={15} />
              {S.plural} ({groups[sev].length})
            </h3>
            <ul className="space-y-1.5">
              {groups[sev].map((f) => (
                <li key={f.key}>
                  <button
                    type="button"
                    className={`w-full rounded-md border px-2.5 py-2 text-left text-[12px] leading-[1.35] ${S.box} hover:brightness-[0.98] ${active === f.key ? 'ring-2 ring-copper-500' : ''}`}
                    aria-pressed={active === f.key}
                    aria-describedby={`findings-${sev}`}
                    data-finding={f.code}
                    onClick={() => {
                      setActive(f.key);
                      if (f.parts.length) focusParts(f.parts);
                    }}
                  >
                    <span className={`flex items-center gap-1 font-semibold ${S.text}`}>
                      <S.Icon size={13} className="shrink-0" />
                      <span className="sr-only">{S.word}: </span>
                      <span className="min-w-0">{findingTitle(f.code, titles)}</span>
                    </span>
                    <span className="mt-0.5 block text-graphite-900">{localizeUnitsInText(plain(f.message), unitSystem)}</span>
                    {f.suggestion ? <span className="mt-1 block text-graphite-700">→ {plain(f.suggestion)}</span> : null}
                    {f.basis ? <span className="mt-1 block text-[11px] text-graphite-500">Basis: {plain(f.basis)}</span> : null}
                    {f.parts.length ? (
                      <span className="mt-1 flex flex-wrap gap-1">
                        {f.parts.map((id) => (
                          <span key={id} className="rounded border border-graphite-200 bg-white px-1 text-[11px] text-graphite-700">
                            {labelOf(id)}
                          </span>
                        ))}
                      </span>
                    ) : null}
                  </button>
                  {FAULT_FINDINGS.has(f.code) && mode !== 'fault' ? (
                    <a
                      href="#fault-analysis"
                      className="mt-0.5 inline-block text-[11px] text-copper-700 underline underline-offset-2 hover:text-copper-800"
                      onClick={(e) => {
                        e.preventDefault();
                        setAnalysis({ mode: 'fault' });
                      }}
                    >
                      Show the fault currents (fault analysis)
                    </a>
                  ) : null}
                </li>
              ))}
            </ul>
          </section>
        );
      })}
      <p className="text-[11px] text-graphite-500">Choose a finding to select its parts on the canvas. The checks are a design aid: passing them is not approval to install.</p>
      <SafetyCaution />
    </div>
  );
}
