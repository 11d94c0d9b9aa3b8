/**
 * Canvas figures from the electrical core: compile the diagram, solve the network, and read per-part
 * and per-cable currents. Runs inside the compute worker (and in tests); pure, no DOM.
 *
 * The canvas figures are the bank as drawn (the load case); `analyzeDiagram` (the core's analysis
 * entry) runs in the chosen mode for the analysis panels (`raw`) and gives the findings and badges.
 */
import type { DiagramDocument } from '@shared/diagram';
import { compileDiagram } from '@shared/electrical/compile';
import { solveNetwork } from '@shared/electrical/network/solve';
import { ampacity } from '@shared/electrical/tables/ampacity';
import { analyzeDiagram, type AnalysisResult } from '@shared/electrical/analysis';
import type { AnalysisOptions } from '../store';
import type { CanvasFinding, CanvasSummary, Severity } from './types';

const emptySummary = (findings: CanvasFinding[]): CanvasSummary => ({
  solved: false, batteries: {}, cables: {}, fuses: {}, loads: {}, imbalance_pct: null, wiringLoss_W: 0, internalLoss_W: 0, findings, badges: badgesOf(findings),
});

/** Canvas figures plus the core's analysis in the chosen mode; its findings replace the structural ones. */
export function computeCanvas(doc: DiagramDocument, options: AnalysisOptions): { canvas: CanvasSummary; raw: unknown } {
  const { canvas } = solveAsDrawn(doc);
  let raw: AnalysisResult | null = null;
  try {
    raw = analyzeDiagram(doc, { mode: options.mode, ...(options.fault ? { fault: options.fault } : {}) });
  } catch {
    raw = null; // the figures above still stand; the panels show no analysis
  }
  if (raw) {
    const findings: CanvasFinding[] = raw.findings.map((f) => ({ code: f.id, severity: f.severity, message: f.message, parts: f.parts }));
    const seen = new Set(findings.map((f) => `${f.code}|${f.parts.join(',')}`));
    // Structural errors the rules did not already report stay visible.
    for (const f of canvas.findings) if (f.severity === 'error' && !seen.has(`${f.code}|${f.parts.join(',')}`)) findings.push(f);
    canvas.findings = findings;
    canvas.badges = badgesOf(findings);
  }
  return { canvas, raw };
}

/** Figures of the bank as drawn: compile, solve, read currents per part and cable. */
export function solveAsDrawn(doc: DiagramDocument): { canvas: CanvasSummary; raw: unknown } {
  const compiled = compileDiagram(doc);
  if (!compiled.ok) {
    const findings = compiled.errors.map((e) => ({ code: e.code, severity: 'error' as const, message: e.message, parts: e.parts }));
    return { canvas: emptySummary(findings), raw: { compiled } };
  }
  const solved = solveNetwork(compiled.network);
  const notes: CanvasFinding[] = compiled.notes.map((n) => ({ code: n.code, severity: 'note', message: n.message, parts: n.parts }));
  if (!solved.ok) {
    const owners = (solved.error.elements ?? []).map((e) => compiled.map.elementOwner[e]?.id).filter((x): x is string => !!x);
    return {
      canvas: emptySummary([...notes, { code: solved.error.code, severity: 'error', message: solved.error.message, parts: [...new Set(owners)] }]),
      raw: { compiled, solved },
    };
  }
  const V = solved.node_voltages_V;
  const I = solved.element_currents_A;
  const { map } = compiled;
  const canvas: CanvasSummary = { ...emptySummary(notes), solved: true };

  // Batteries and strings: current of the (first) battery element; a string's members carry one current.
  let total = 0;
  const currents: [string, number][] = [];
  let bankTerminal_V = -Infinity;
  for (const p of doc.parts) {
    if (p.type !== 'battery' && p.type !== 'series_string') continue;
    const el = map.parts[p.id]?.elements.find((e) => e === p.id || /\/b\d+$/.test(e));
    if (!el) continue;
    const i = I[el] ?? 0;
    currents.push([p.id, i]);
    total += i;
    const nodes = map.parts[p.id].nodes;
    bankTerminal_V = Math.max(bankTerminal_V, (V[nodes.pos] ?? 0) - (V[nodes.neg] ?? 0));
  }
  for (const [id, i] of currents) canvas.batteries[id] = { current_A: i, share: Math.abs(total) > 1e-9 ? i / total : 0 };
  if (currents.length >= 2) {
    const values = currents.map(([, i]) => i);
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    canvas.imbalance_pct = Math.abs(mean) > 1e-9 ? ((Math.max(...values) - Math.min(...values)) / Math.abs(mean)) * 100 : 0;
  }

  for (const c of doc.cables) {
    const i = I[c.id] ?? 0;
    const a = ampacity({
      size: c.props.conductor, table: doc.settings.ampacityTable, ambient_C: c.props.ambient_C ?? doc.settings.ambient_C,
      bundledConductors: c.props.installation === 'bundled' ? c.props.bundledConductors : 1,
      engineSpace: c.props.installation === 'engine_space',
    });
    const amp = a.ok ? a.amps : null;
    canvas.cables[c.id] = { current_A: i, ampacity_A: amp, loading: amp ? Math.abs(i) / amp : null };
  }

  for (const p of doc.parts) {
    if (p.type === 'fuse') {
      const i = I[p.id] ?? 0;
      canvas.fuses[p.id] = { current_A: i, loading: Math.abs(i) / p.props.rating_A };
    } else if (p.type === 'inverter' || p.type === 'dc_load') {
      const nodes = map.parts[p.id]?.nodes;
      const el = map.parts[p.id]?.elements[0];
      if (!nodes || !el) continue;
      const v = (V[nodes.pos] ?? 0) - (V[nodes.neg] ?? 0);
      const drop = Number.isFinite(bankTerminal_V) ? ((bankTerminal_V - v) / doc.settings.systemVoltage_V) * 100 : 0;
      canvas.loads[p.id] = { voltage_V: v, drop_pct: drop, current_A: I[el] ?? 0 };
    }
  }

  for (const [el, loss] of Object.entries(solved.element_losses_W)) {
    const owner = map.elementOwner[el];
    const part = owner?.kind === 'part' ? doc.parts.find((p) => p.id === owner.id) : undefined;
    if (part && (part.type === 'battery' || part.type === 'series_string') && !el.includes('/j')) canvas.internalLoss_W += loss;
    else if (part && (part.type === 'charger' || part.type === 'inverter' || part.type === 'dc_load')) continue;
    else canvas.wiringLoss_W += loss;
  }
  for (const n of solved.notes) {
    const owners = n.elements.map((e) => map.elementOwner[e]?.id).filter((x): x is string => !!x);
    canvas.findings.push({ code: n.code, severity: 'warning', message: n.message, parts: [...new Set(owners)] });
  }
  canvas.badges = badgesOf(canvas.findings);
  return { canvas, raw: { compiled: { ok: true, notes: compiled.notes }, solved } };
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
