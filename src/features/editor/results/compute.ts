/**
 * Canvas figures from the electrical core, in the chosen analysis mode. Runs inside the compute worker
 * (and in tests); pure, no DOM.
 *
 * Two stages, so an edit shows new figures fast and the rule checks follow:
 * - 'figures': `analyzeDiagram` without the rule checks — one compile and the mode's one solve (the
 *   fault sweep in fault mode; the load case for discharge, whose simulation is left to the full stage);
 * - 'full': `analyzeDiagram` with every rule check, in the chosen mode; its result goes to the analysis
 *   panels (`raw`) and gives the findings and badges.
 *
 * What the canvas shows per mode:
 * - load: each battery's current and share, each cable's and fuse's current against ampacity / rating,
 *   each load's voltage and drop;
 * - charge: each battery's charge current (negative out of the battery) and share;
 * - equalize: the currents between the batteries when joined with loads and chargers off (signed, with
 *   the direction on each cable), against ampacity and fuse rating; the pair exchanging most is marked;
 * - fault: with one fault chosen, that battery or cable marked and the prospective current through every
 *   fuse and cable; without, the largest prospective current at each fuse and cable over every case and
 *   each battery's own internal-short current; fuses against their interrupting rating;
 * - discharge: the load case at t = 0, and (full stage) the battery that reaches its cut-off first.
 *
 * In every mode: parts the core left out because they are not connected are marked ('not-connected' for
 * an open terminal, 'open-circuit' for what leads only to one) and the rest has its figures; a short
 * drawn in the diagram marks its batteries and conductors ('short'), each conductor with its prospective
 * current (in fault mode, every current with the short in place). A result with nothing solved keeps the
 * last figures, greyed, on the page (stale.ts).
 */
import type { DiagramDocument } from '@shared/diagram';
import { type AnalysisMode, type AnalysisResult, type OperatingPoint } from '@shared/electrical/analysis';
import { analyzeDiagram } from '@shared/electrical/study';
import { itemName } from '@shared/electrical/analysis/shorts';
import { fmtAmps } from '../units';
import type { AnalysisOptions } from '../store';
import type { CanvasFinding, CanvasSummary, ModeSummary, Severity } from './types';
import { findingsOf, solverNoteFinding } from './findings';

export type ComputeStage = 'figures' | 'full';

const emptySummary = (mode: AnalysisMode, findings: CanvasFinding[] = []): CanvasSummary => ({
  mode, solved: false, modeIssue: null, modeSummary: { mode } as ModeSummary, marks: {},
  batteries: {}, cables: {}, fuses: {}, loads: {}, imbalance_pct: null, wiringLoss_W: 0, internalLoss_W: 0, findings, badges: badgesOf(findings),
});

/** The part or cable an element belongs to: compiled element ids are "<owner>" or "<owner>/<sub-element>". */
const ownerOf = (element: string) => element.split('/')[0];

/**
 * Canvas figures in `options.mode`. `raw` is the core's analysis result: in the full stage the one the
 * analysis panels read (with the rule checks), in the figures stage the rule-free one the figures came from.
 */
export function computeCanvas(doc: DiagramDocument, options: AnalysisOptions, stage: ComputeStage = 'full'): { canvas: CanvasSummary; raw: AnalysisResult | null } {
  const mode = options.mode;
  const rules = stage === 'full';
  const fault = mode === 'fault' && options.fault ? { fault: options.fault } : {};
  let raw: AnalysisResult | null = null;
  let loadForDischarge: AnalysisResult | null = null;
  try {
    if (mode === 'discharge') {
      loadForDischarge = analyzeDiagram(doc, { mode: 'load', rules: false });
      raw = stage === 'full' ? analyzeDiagram(doc, { mode: 'discharge' }) : loadForDischarge;
    } else {
      raw = analyzeDiagram(doc, { mode, rules, ...fault });
    }
  } catch (err) {
    // The core returns errors as data; a throw is a bug there. Say so rather than show stale figures.
    const message = err instanceof Error ? err.message : String(err);
    return { canvas: emptySummary(mode, [{ code: 'analysis_failed', severity: 'error', message: `The analysis failed: ${message}`, parts: [] }]), raw: null };
  }
  const canvas = canvasOf(doc, mode, raw, loadForDischarge);
  return { canvas, raw };
}

function canvasOf(doc: DiagramDocument, mode: AnalysisMode, res: AnalysisResult, loadCase: AnalysisResult | null): CanvasSummary {
  const findings = findingsOf(res);
  const canvas = emptySummary(mode, findings);
  markNotConnected(res, canvas);
  if (!res.ok) {
    if (res.shorts?.length) showShorts(doc, mode, res, canvas);
    if (res.stage === 'options') {
      canvas.modeIssue = res.errors.map((e) => e.message).join('; ');
      canvas.findings.push(...res.errors.map((e) => ({ code: e.code, severity: 'note' as const, message: e.message, parts: e.parts })));
    }
    canvas.badges = badgesOf(canvas.findings);
    return canvas;
  }

  const op = mode === 'discharge' ? (loadCase?.ok ? loadCase.operating : null) : res.operating;
  if (mode === 'discharge' && loadCase && !loadCase.ok) {
    canvas.modeIssue = `Load case: ${loadCase.errors.map((e) => e.message).join('; ')}`;
  }
  if (op) {
    fillFromOperating(doc, mode, op, canvas);
    for (const n of op.solverNotes) {
      canvas.findings.push(solverNoteFinding(n, doc));
    }
  }

  switch (mode) {
    case 'load':
      canvas.modeSummary = { mode };
      break;
    case 'charge':
      canvas.modeSummary = { mode, totalCharge_A: res.charge?.totalCharge_A ?? 0, chargers: Object.keys(res.charge?.chargers ?? {}).length };
      break;
    case 'equalize': {
      const between = res.equalize?.between ?? [];
      for (const id of between) canvas.marks[id] = 'largest-exchange';
      canvas.modeSummary = { mode, maxCurrent_A: res.equalize?.maxCurrent_A ?? 0, between };
      break;
    }
    case 'fault': {
      const sweep = res.faults;
      if (!sweep) {
        canvas.modeIssue = 'No fault study: the bank without its loads and chargers does not form one circuit.';
        break;
      }
      let worst: (typeof sweep.cases)[number] | null = null;
      for (const c of sweep.cases) if (!worst || c.faultCurrent_A > worst.faultCurrent_A) worst = c;
      const selected = res.faultCase ? { kind: res.faultCase.kind, part: res.faultCase.part, faultCurrent_A: res.faultCase.faultCurrent_A } : null;
      if (selected) canvas.marks[selected.part] = 'faulted';
      else {
        fillFromSweep(doc, sweep, canvas);
        if (worst) canvas.marks[worst.part] = 'worst-fault';
      }
      canvas.modeSummary = { mode, cases: sweep.cases.length, worst_A: sweep.worstFault_A, worstPart: worst?.part ?? null, selected };
      break;
    }
    case 'discharge': {
      const d = res.discharge;
      if (d?.firstEmpty) canvas.marks[ownerOf(d.firstEmpty)] = 'first-empty';
      canvas.modeSummary = d
        ? { mode, firstEmpty: d.firstEmpty ? ownerOf(d.firstEmpty) : null, duration_h: d.duration_h, usable_pct: d.usable_pct, stoppedBy: d.stoppedBy }
        : { mode, firstEmpty: null, duration_h: null, usable_pct: null, stoppedBy: null };
      break;
    }
  }
  canvas.badges = badgesOf(canvas.findings);
  return canvas;
}

/** Amperes, in kA from 1000 A (short-circuit currents). */
const fmtCurrent = (a: number) => (Math.abs(a) >= 1000 ? `${(a / 1000).toFixed(2)} kA` : fmtAmps(a));

/** Marks what the analysis left out: a part with an open terminal, and what leads only to one. */
function markNotConnected(res: AnalysisResult, canvas: CanvasSummary) {
  if (!res.notConnected?.length) return;
  const loose = new Set(res.ok ? Object.keys(res.openTerminals ?? {}) : res.errors.filter((e) => e.code === 'floating_part' || e.code === 'unconnected_terminal').flatMap((e) => e.parts));
  for (const id of res.notConnected) canvas.marks[id] = loose.has(id) ? 'not-connected' : 'open-circuit';
}

/**
 * A short drawn in the diagram: its sources and conductors marked, each conductor with its prospective
 * current. In fault mode the canvas shows every current with the short in place (fuses against their
 * interrupting rating); in the other modes the diagram has no figures of its own (the last ones stay,
 * greyed: stale.ts) and the status bar points at the fault mode.
 */
function showShorts(doc: DiagramDocument, mode: AnalysisMode, res: Extract<AnalysisResult, { ok: false }>, canvas: CanvasSummary) {
  const shorts = res.shorts ?? [];
  const currents: Record<string, number> = {};
  for (const s of shorts) {
    for (const id of s.sources) canvas.marks[id] = 'short';
    for (const [id, i] of Object.entries(s.currents_A)) {
      canvas.marks[id] = 'short';
      currents[id] = i;
    }
  }
  canvas.shorts = currents;
  const worst = shorts.reduce((a, b) => (b.current_A > a.current_A ? b : a));
  const where = `about ${fmtCurrent(worst.current_A)} through ${itemName(doc, worst.through)}`;
  const fuses = new Map(doc.parts.flatMap((p) => (p.type === 'fuse' ? [[p.id, p.props] as const] : [])));
  const fuseFigure = (id: string, i: number) => {
    const f = fuses.get(id)!;
    canvas.fuses[id] = { current_A: i, loading: i / f.rating_A, interrupting_A: f.interrupting_A, interruptingLoading: i / f.interrupting_A };
  };
  if (mode === 'fault' && res.shortCircuit) {
    const sc = res.shortCircuit;
    canvas.solved = true;
    for (const [id, i] of Object.entries(sc.sources)) canvas.batteries[id] = { current_A: i, share: 0 };
    for (const [id, i] of Object.entries(sc.cables)) canvas.cables[id] = { current_A: i, ampacity_A: null, loading: null };
    for (const [id, i] of Object.entries(sc.parts)) if (fuses.has(id)) fuseFigure(id, i);
    // The drawn short is the one fault shown in full: the batteries' strips say what each feeds into it, the runs show the current's direction.
    canvas.modeSummary = { mode, cases: 0, worst_A: worst.current_A, worstPart: worst.through, selected: { kind: 'cable', part: worst.through, faultCurrent_A: worst.current_A } };
    canvas.modeIssue = `Short circuit drawn: ${where}; the figures are the currents with it in place.`;
    return;
  }
  for (const [id, i] of Object.entries(currents)) {
    if (fuses.has(id)) fuseFigure(id, i);
    else if (doc.cables.some((c) => c.id === id)) canvas.cables[id] = { current_A: i, ampacity_A: null, loading: null };
  }
  canvas.modeIssue = `Short circuit drawn: ${where}; Fault mode shows every current with it in place.`;
}

/** Per-part and per-cable figures of one solved case. */
function fillFromOperating(doc: DiagramDocument, mode: AnalysisMode, op: OperatingPoint, canvas: CanvasSummary) {
  canvas.solved = true;
  // A share of the bank's current means something only where the batteries share one load or charger.
  const shares = mode === 'load' || mode === 'charge' || mode === 'discharge';
  const units = Object.entries(op.sources);
  for (const [id, s] of units) canvas.batteries[id] = { current_A: s.current_A, share: shares ? s.share_pct / 100 : 0 };
  canvas.imbalance_pct = shares && units.length >= 2 ? op.imbalance_pct : null;

  // In a fault the cables carry far above their ampacity by nature; the prospective current is the figure.
  const fault = mode === 'fault';
  for (const [id, c] of Object.entries(op.cables)) {
    canvas.cables[id] = { current_A: c.current_A, ampacity_A: fault ? null : c.ampacity_A, loading: fault || c.utilisation_pct === null ? null : c.utilisation_pct / 100 };
  }
  for (const p of doc.parts) {
    const f = op.parts[p.id];
    if (!f) continue;
    if (p.type === 'fuse') {
      const i = f.current_A ?? 0;
      canvas.fuses[p.id] = { current_A: i, loading: Math.abs(i) / p.props.rating_A };
      if (fault) Object.assign(canvas.fuses[p.id], { interrupting_A: p.props.interrupting_A, interruptingLoading: Math.abs(i) / p.props.interrupting_A });
    } else if ((p.type === 'inverter' || p.type === 'dc_load') && (mode === 'load' || mode === 'discharge')) {
      canvas.loads[p.id] = { voltage_V: f.voltage_V ?? 0, drop_pct: f.drop_pct ?? 0, current_A: f.current_A ?? 0 };
    }
  }
  const k = op.losses.byKind;
  canvas.internalLoss_W = k.battery;
  canvas.wiringLoss_W = op.losses.wiring_W;
}

/** The fault sweep's largest prospective currents per fuse and cable, and each battery's own internal-short current. */
function fillFromSweep(doc: DiagramDocument, sweep: NonNullable<Extract<AnalysisResult, { ok: true }>['faults']>, canvas: CanvasSummary) {
  canvas.solved = true;
  for (const c of sweep.cases) {
    if (c.kind !== 'battery') continue;
    const prev = canvas.batteries[c.part];
    if (!prev || c.faultCurrent_A > prev.current_A) canvas.batteries[c.part] = { current_A: c.faultCurrent_A, share: 0 };
  }
  for (const [id, m] of Object.entries(sweep.maxByCable)) canvas.cables[id] = { current_A: m.current_A, ampacity_A: null, loading: null };
  for (const p of doc.parts) {
    if (p.type !== 'fuse') continue;
    const i = sweep.maxByFuse[p.id]?.current_A ?? 0;
    canvas.fuses[p.id] = { current_A: i, loading: i / p.props.rating_A, interrupting_A: p.props.interrupting_A, interruptingLoading: i / p.props.interrupting_A };
  }
}

const RANK: Record<Severity, number> = { error: 3, warning: 2, note: 1 };

/** Count findings per part or cable id, keeping the worst severity. */
export function badgesOf(findings: CanvasFinding[]): CanvasSummary['badges'] {
  const out: CanvasSummary['badges'] = {};
  for (const f of findings) {
    for (const id of new Set(f.parts)) {
      const b = out[id];
      if (!b) out[id] = { count: 1, severity: f.severity };
      else {
        b.count += 1;
        if (RANK[f.severity] > RANK[b.severity]) b.severity = f.severity;
      }
    }
  }
  return out;
}
