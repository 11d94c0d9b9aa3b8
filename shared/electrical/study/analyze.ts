/**
 * `analyzeDiagram(doc, options)`: one compile, the solved case of the chosen mode, the bank figures, the
 * fault sweep and the rule checks, as one JSON-serialisable result keyed by diagram ids. Never throws
 * on a valid document; compiler and solver errors come back as structured errors and findings.
 *
 * Modes (docs/cli.md, "check"):
 * - load: loads as drawn, chargers off.
 * - charge: chargers on, loads off — how the charger current splits between batteries and strings.
 * - equalize: loads and chargers off; batteries at their own states of charge joined: the initial
 *   current between them, compared against each battery's fuse and cable.
 * - fault: the sweep over every fault case (faults.ts), or one case in full with `fault`.
 * - discharge: states of charge stepped under the load until the first battery reaches its cut-off.
 * Findings always come from the load case and the fault sweep (the design checks), whatever the mode.
 *
 * Parts that are not connected do not stop it: the connected remainder is analysed and the result names
 * what was left out (`notConnected`), each loose part keeping an error finding. A short drawn in the
 * diagram stops it, with the shorting conductors and the prospective current through them (`shorts`,
 * `shortCircuit`). See analysis/partial.ts.
 *
 * It sits above both analysis/ (the solved cases and figures) and rules/ (the checks that read them), so
 * rules depend on analysis and never the other way round.
 */
import type { DiagramDocument } from '../document/schema';
import { prepareNetwork, solvePrepared, type PreparedNetwork } from '../network/fast';
import type { SolveOutcome } from '../network/types';
import { RULES } from '../rules/rules';
import { runRules } from '../rules/registry';
import { type AnalysisContext, modeNetwork } from '../analysis/context';
import { bankFigures } from '../analysis/bank';
import { contingencyStudy } from '../analysis/contingency';
import { dischargeAnalysis } from '../analysis/discharge';
import { DEFAULT_FAULT_OHM, faultSweep, prepareFaults, type PreparedFaults } from '../analysis/faults';
import { operatingPoint } from '../analysis/operating';
import { buildAround } from '../analysis/partial';
import { diagramTopology } from '../analysis/topology';
import type { AnalysisIssue, AnalysisOk, AnalysisResult, AnalyzeOptions, Finding, OperatingPoint } from '../analysis/types';
import { amps } from '../analysis/format';

function solveIssue(ctx: AnalysisContext, sol: Extract<SolveOutcome, { ok: false }>): AnalysisIssue {
  const parts = new Set<string>();
  for (const e of sol.error.elements ?? []) {
    const owner = ctx.map.elementOwner[e];
    if (owner) parts.add(owner.id);
  }
  return { code: sol.error.code, message: sol.error.message, parts: [...parts] };
}

/** The load case: loads as drawn, chargers off. */
export function solveLoadCase(ctx: AnalysisContext): { op: OperatingPoint } | { error: AnalysisIssue } {
  const r = solveLoadCasePrepared(ctx);
  return 'op' in r ? { op: r.op } : { error: r.error };
}

/** The load case with its prepared network (reused by the fault sweep when it can be). */
function solveLoadCasePrepared(ctx: AnalysisContext): { op: OperatingPoint; prep: PreparedNetwork } | { error: AnalysisIssue; prep: PreparedNetwork | null } {
  const prep = prepareNetwork(modeNetwork(ctx, 'load'));
  if ('ok' in prep) return { error: solveIssue(ctx, prep), prep: null };
  if (!prep.base.ok) return { error: solveIssue(ctx, prep.base), prep };
  return { op: operatingPoint(ctx, prep.base), prep };
}

function equalizeFindings(ctx: AnalysisContext, op: OperatingPoint): Finding[] {
  const out: Finding[] = [];
  for (const u of ctx.units) {
    const i = Math.abs(op.sources[u.id]?.current_A ?? 0);
    for (const f of u.fuses) {
      const fuse = ctx.topo.parts.get(f);
      if (fuse?.type === 'fuse' && i > fuse.props.rating_A) {
        out.push({
          id: 'equalization-current-over-fuse', severity: 'warning', parts: [u.id, f],
          message: `When joined, ${u.id} exchanges ${amps(i)} with the rest of the bank, above its ${amps(fuse.props.rating_A)} fuse.`,
          basis: 'first principles (I = ΔV / ΣR between batteries at different states of charge)',
          suggestion: 'Bring the batteries to the same state of charge (charge each one fully) before connecting them.',
        });
      }
    }
  }
  for (const [id, c] of Object.entries(op.cables)) {
    if (c.ampacity_A !== null && Math.abs(c.current_A) > c.ampacity_A) {
      out.push({
        id: 'equalization-current-over-ampacity', severity: 'warning', parts: [id],
        message: `When the batteries are joined, ${id} carries ${amps(Math.abs(c.current_A))}, above its ampacity of ${amps(c.ampacity_A)}${c.ampacityLimitedBy === 'insulation' ? ` (${c.ampacityNote})` : ''}.`,
        basis: 'first principles; ampacity from the selected table',
        suggestion: 'Equalise the states of charge before connecting.',
      });
    }
  }
  return out;
}

/** Analyse a valid diagram document. See the file header for the modes. */
export function analyzeDiagram(doc: DiagramDocument, options: AnalyzeOptions = {}): AnalysisResult {
  const mode = options.mode ?? 'load';
  const fault_ohm = options.faultResistance_ohm !== undefined && options.faultResistance_ohm > 0 ? options.faultResistance_ohm : DEFAULT_FAULT_OHM;
  const wantRules = options.rules !== false;
  // Loose parts are left out and the connected remainder solved; a drawn short is studied (partial.ts).
  const built = buildAround(doc);
  if (!built.ok) {
    const topo = diagramTopology(doc);
    const findings = wantRules ? runRules(RULES, { doc, topo, ctx: null, load: null, faults: null, compileErrors: built.errors }) : [];
    const { shorts, shortCircuit, notConnected } = built;
    return { ok: false, mode, stage: 'compile', errors: built.errors, findings, ...(shorts ? { shorts, shortCircuit } : {}), ...(notConnected ? { notConnected } : {}) };
  }
  // The rules see the remainder the figures are for (ctx.doc), and the loose parts' errors.
  const ctx = built.ctx;
  const notes: AnalysisIssue[] = [...ctx.compileNotes.map((n) => ({ code: n.code, message: n.message, parts: n.parts })), ...built.notes];

  // The load case feeds the rules and the bank's C-rate in every mode.
  const needLoad = wantRules || mode === 'load';
  const loadCase = needLoad ? solveLoadCasePrepared(ctx) : null;
  const load = loadCase && 'op' in loadCase ? loadCase.op : null;
  if (loadCase && 'error' in loadCase) {
    if (mode === 'load') {
      const findings = wantRules ? runRules(RULES, { doc: ctx.doc, topo: ctx.topo, ctx, load: null, faults: null, compileErrors: built.compileErrors }) : [];
      return { ok: false, mode, stage: 'solve', errors: [loadCase.error], findings };
    }
    notes.push({ ...loadCase.error, message: `Load case: ${loadCase.error.message}` });
  }

  let prepared: PreparedFaults | null = null;
  const needFaults = wantRules || mode === 'fault';
  if (needFaults) {
    prepared = prepareFaults(ctx, fault_ohm, loadCase?.prep);
    if (!prepared.fn) notes.push({ code: 'no_fault_study', message: 'The bank without its loads and chargers does not form one circuit; fault currents were not computed', parts: [] });
  }
  const faults = prepared?.fn ? faultSweep(ctx, prepared, fault_ohm) : null;

  const result: AnalysisOk = { ok: true, mode, bank: bankFigures(ctx, load), operating: null, findings: [], notes };
  if (built.notConnected.length) Object.assign(result, { notConnected: built.notConnected, openTerminals: built.openTerminals });
  if (faults) result.faults = faults;
  const fail = (error: AnalysisIssue): AnalysisResult => ({ ok: false, mode, stage: 'solve', errors: [error], findings: result.findings });

  // The N-1 study (each unit disconnected in turn) on the load case's factorization, for its rules.
  const contingency = wantRules && loadCase && 'op' in loadCase ? contingencyStudy(ctx, loadCase.prep) : null;
  if (wantRules) result.findings = runRules(RULES, { doc: ctx.doc, topo: ctx.topo, ctx, load, faults, contingency, compileErrors: built.compileErrors });

  switch (mode) {
    case 'load':
      result.operating = load;
      break;
    case 'charge': {
      const enabled = ctx.topo.chargers.filter((c) => c.props.enabled);
      if (!enabled.length) return { ok: false, mode, stage: 'options', errors: [{ code: 'no_charger', message: 'Charge mode needs an enabled charger in the diagram', parts: [] }], findings: result.findings };
      const prep = prepareNetwork(modeNetwork(ctx, 'charge'));
      const sol = 'ok' in prep ? prep : prep.base;
      if (!sol.ok) return fail(solveIssue(ctx, sol));
      const op = operatingPoint(ctx, sol);
      result.operating = op;
      const chargers: NonNullable<AnalysisOk['charge']>['chargers'] = {};
      let total = 0;
      for (const c of enabled) {
        const f = op.parts[c.id];
        chargers[c.id] = { current_A: f?.current_A ?? 0, voltage_V: f?.voltage_V ?? 0, mode: f?.chargerMode ?? 'cv' };
        total += f?.current_A ?? 0;
      }
      result.charge = { chargers, totalCharge_A: total };
      break;
    }
    case 'equalize': {
      const prep = prepareNetwork(modeNetwork(ctx, 'idle'));
      const sol = 'ok' in prep ? prep : prep.base;
      if (!sol.ok) return fail(solveIssue(ctx, sol));
      const op = operatingPoint(ctx, sol);
      result.operating = op;
      let maxI = 0;
      let between: string[] = [];
      const entries = Object.entries(op.sources);
      for (const [id, s] of entries) {
        if (Math.abs(s.current_A) > maxI) {
          maxI = Math.abs(s.current_A);
          between = [id];
        }
      }
      if (between.length && entries.length > 1) {
        // The partner: the unit with the opposite current of largest magnitude.
        const sign = Math.sign(op.sources[between[0]].current_A);
        const partner = entries.filter(([, s]) => Math.sign(s.current_A) === -sign).sort((a, b) => Math.abs(b[1].current_A) - Math.abs(a[1].current_A))[0];
        if (partner) between.push(partner[0]);
      }
      result.equalize = { maxCurrent_A: maxI, between };
      result.findings = [...result.findings, ...equalizeFindings(ctx, op)];
      break;
    }
    case 'fault': {
      if (!prepared?.fn) return { ok: false, mode, stage: 'solve', errors: [{ code: 'no_fault_study', message: 'The fault network could not be built', parts: [] }], findings: result.findings };
      if (options.fault) {
        const sel = options.fault;
        const spec = prepared.specs.find((s) => s.case.kind === sel.kind && (s.case.id === sel.id || (sel.kind === 'battery' && s.case.part === sel.id)));
        if (!spec) return { ok: false, mode, stage: 'options', errors: [{ code: 'unknown_fault', message: `No ${sel.kind} fault case "${sel.id}" in this diagram`, parts: [sel.id] }], findings: result.findings };
        const prep = prepareNetwork(prepared.net);
        if (!('ok' in prep)) {
          const sol = solvePrepared(prep, [spec.change]);
          if (!sol.ok) return fail(solveIssue(ctx, sol));
          result.operating = operatingPoint(ctx, sol);
          const fid = spec.change.kind === 'shunt' ? spec.change.id : spec.change.element;
          result.faultCase = { ...spec.case, faultCurrent_A: Math.abs(sol.element_currents_A[fid] ?? 0) };
        } else return fail(solveIssue(ctx, prep));
      }
      break;
    }
    case 'discharge':
      result.discharge = dischargeAnalysis(ctx, options.discharge);
      break;
  }
  return result;
}
