/**
 * The editor's one list of findings for an analysis result. The status bar counts it, the findings
 * panel lists it, the canvas badges count it per part and the print view prints it: one list, so the
 * counts agree everywhere.
 *
 * What goes in, once each:
 * - the rule findings (the structural rule already reports each compiler error, as "structure-<code>");
 * - the compiler and solver errors no rule finding reports (a solve that fails, say);
 * - the analysis notes (an open switch, a conductor without a table value, no fault study …).
 * Pure: runs in the compute worker and in tests.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisResult, OperatingPoint } from '@shared/electrical/analysis';
import type { CanvasFinding } from './types';

/** The rule finding id the structural rule gives a compiler error of this code. */
export const structuralFindingId = (code: string) => `structure-${code.replace(/_/g, '-')}`;

const sameParts = (a: readonly string[], b: readonly string[]) => {
  if (a.length !== b.length) return false;
  const set = new Set(a);
  return b.every((x) => set.has(x));
};

export function findingsOf(res: AnalysisResult): CanvasFinding[] {
  const out: CanvasFinding[] = res.findings.map((f) => ({
    code: f.id, severity: f.severity, message: f.message, parts: f.parts, basis: f.basis, ...(f.suggestion ? { suggestion: f.suggestion } : {}),
  }));
  if (!res.ok) {
    if (res.stage !== 'options') {
      // Errors the rules did not already report stay visible; one the structural rule reported is not added twice.
      for (const e of res.errors) {
        const reported = out.some((f) => (f.code === e.code || f.code === structuralFindingId(e.code)) && sameParts(f.parts, e.parts));
        if (!reported) out.push({ code: e.code, severity: 'error', message: e.message, parts: e.parts, basis: 'analysis' });
      }
    }
  } else {
    for (const n of res.notes) out.push({ code: n.code, severity: 'note', message: n.message, parts: n.parts, basis: 'analysis note' });
  }
  return out;
}

const owner = (element: string) => element.split('/')[0];
const watts = (w: number) => `${Math.round(w).toLocaleString('en-US')} W`;

/**
 * A solver note (a load held at its minimum voltage, a charger at its current limit) as a warning in
 * plain words, the part named by its label. The numbers are read from the solver's own note.
 */
export function solverNoteFinding(note: OperatingPoint['solverNotes'][number], doc: DiagramDocument): CanvasFinding {
  const parts = [...new Set(note.elements.map(owner))];
  const part = doc.parts.find((p) => p.id === parts[0]);
  const name = part?.label || 'A part';
  const num = (re: RegExp) => {
    const m = re.exec(note.message);
    const x = m ? Number(m[1]) : NaN;
    return Number.isFinite(x) ? x : null;
  };
  let message = note.message;
  if (note.code === 'below_v_min') {
    const vMin = num(/v_min_V \(([-\d.e+]+) V\)/);
    const drawn = num(/drawing ([-\d.e+]+) W/);
    const needed = num(/of ([-\d.e+]+) W$/);
    if (vMin !== null && drawn !== null && needed !== null) {
      message = `${name} is below its minimum input voltage of ${vMin} V: it is modelled as drawing ${watts(drawn)} of the ${watts(needed)} it needs; in practice it would shut down or draw more current. Reduce the wiring drop (shorter or larger cables).`;
    }
  } else if (note.code === 'current_limit') {
    const i = num(/at ([-\d.e+]+) A/);
    const v = num(/its ([-\d.e+]+) V setpoint/);
    if (i !== null && v !== null) message = `${name} is at its current limit of ${i} A, below its ${v} V setpoint.`;
  }
  return { code: note.code, severity: 'warning', message, parts, basis: 'analysis' };
}
