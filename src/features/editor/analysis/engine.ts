/**
 * What the analysis panels compute, as pure functions on the diagram document (run in the analysis
 * worker, or directly where there is no Worker, e.g. component tests):
 * - `runAnalysis`: the core's `analyzeDiagram` in the chosen mode (when the editor's results lack it).
 * - `runSizing`: the core's per-branch fuse and conductor suggestions.
 * - `exploreTakeoff`: the take-off layouts — the core's optimizer (post-to-post lead pairs, or busbar run
 *   lengths equalised) and, for a busbar bank, every pair of busbar taps for the load's two main leads.
 * Nothing here is an approval to install; the panels say so.
 */
import type { DiagramDocument, TerminalRef } from '@shared/diagram';
import {
  analyzeDiagram, buildContext, diagramTopology, optimizeTakeoff, rankLayouts, solveLoadCase, takeoffVerdict,
  type AnalysisResult, type AnalyzeOptions, type TakeoffChoice, type TakeoffGain,
} from '@shared/electrical';
import type { AnalysisOptions } from '../store';
import { sizeDiagram, type SizingWithPlan } from '@shared/electrical/sizing';
import type { UnitSystem } from '@shared/units';


/** The store's analysis options as the core's: a fault target only in fault mode and only of a kind the core knows. */
export function coreOptions(options: AnalysisOptions): AnalyzeOptions {
  const f = options.fault;
  const fault = options.mode === 'fault' && f && (f.kind === 'battery' || f.kind === 'cable') ? { kind: f.kind, id: f.id } : undefined;
  return { mode: options.mode, ...(fault ? { fault } : {}) };
}

/** The core's analysis in the chosen mode (used when the editor's compute worker did not provide it). */
export function runAnalysis(doc: DiagramDocument, options: AnalysisOptions): AnalysisResult {
  return analyzeDiagram(doc, coreOptions(options));
}

/** Per-branch fuse and conductor suggestions in the team's size series, with their checked plan. */
export function runSizing(doc: DiagramDocument, unitSystem?: UnitSystem): SizingWithPlan {
  return sizeDiagram(doc, unitSystem ? { unitSystem } : {});
}


/** One end of a cable moved to another terminal. */
export interface LeadMove {
  cable: string;
  end: 'from' | 'to';
  from: TerminalRef;
  to: TerminalRef;
}

export type TakeoffApply =
  | { kind: 'optimizer'; choice: TakeoffChoice }
  | { kind: 'leads'; moves: LeadMove[] };

export interface TakeoffCandidate {
  key: string;
  /** Which list it belongs to: the optimizer's layouts, or busbar taps for the main leads. */
  group: 'optimizer' | 'taps';
  description: string;
  imbalance_pct: number;
  losses_W: number;
  /** Largest battery (or string) current, A. */
  maxCurrent_A: number;
  /** The layout as drawn. */
  current: boolean;
  apply: TakeoffApply;
}

export type TakeoffExploration =
  | {
      ok: true;
      layout: 'post_to_post' | 'busbar';
      /** Ranked best first within each group. */
      candidates: TakeoffCandidate[];
      /**
       * Key of the best layout over both groups (ranked like the optimizer), or null when the layout as
       * drawn is itself the best: no layout lowers the imbalance by 0.1 % or, at the same imbalance, the loss.
       */
      best: string | null;
      /** Why `best` beats the layout as drawn (null: it does not). */
      gain: TakeoffGain;
      explanation: string;
      elapsed_ms: number;
    }
  | { ok: false; message: string; elapsed_ms: number };

/** Busbar taps tried per lead pair: all pairs up to this many, otherwise each lead alone with the other as drawn. */
const MAX_TAP_PAIRS = 64;

/** The load's main leads that end on a busbar tap: the cable, which of its ends is on the busbar, the busbar's taps. */
function busbarLeads(doc: DiagramDocument) {
  const topo = diagramTopology(doc);
  const load = topo.loads[0];
  if (!load) return [];
  const out: { pole: 'pos' | 'neg'; cable: string; end: 'from' | 'to'; busbar: string; tap: string; taps: string[] }[] = [];
  for (const pole of ['pos', 'neg'] as const) {
    const br = topo.branch(load.id, pole);
    const bus = topo.parts.get(br.end.part);
    const last = br.cables.at(-1);
    if (!bus || bus.type !== 'busbar' || !last) continue;
    const c = topo.cables.get(last)!;
    const end = c.from.part === bus.id && c.from.terminal === br.end.terminal ? 'from' : 'to';
    const taps = Array.from({ length: bus.props.tapCount }, (_, i) => `t${i + 1}`);
    out.push({ pole, cable: last, end, busbar: bus.id, tap: br.end.terminal, taps });
  }
  return out;
}

function withMoves(doc: DiagramDocument, moves: LeadMove[]): DiagramDocument {
  if (!moves.length) return doc;
  const byCable = new Map(moves.map((m) => [m.cable, m]));
  return {
    ...doc,
    cables: doc.cables.map((c) => {
      const m = byCable.get(c.id);
      return m ? { ...c, [m.end]: { ...m.to } } : c;
    }),
  };
}

function scoreLoadCase(doc: DiagramDocument) {
  const built = buildContext(doc);
  if (!built.ok) return null;
  const load = solveLoadCase(built.ctx);
  if (!('op' in load)) return null;
  const op = load.op;
  const maxCurrent_A = Math.max(0, ...Object.values(op.sources).map((s) => Math.abs(s.current_A)));
  return { imbalance_pct: op.imbalance_pct, losses_W: op.losses.total_W, maxCurrent_A };
}

function tapCandidates(doc: DiagramDocument): TakeoffCandidate[] {
  const leads = busbarLeads(doc);
  if (!leads.length) return [];
  const label = (id: string) => doc.parts.find((p) => p.id === id)?.label || id;
  const tapsFor = (i: number) => leads[i].taps;
  // Lead-tap combinations to evaluate.
  const combos: string[][] = [];
  const total = leads.reduce((n, l) => n * l.taps.length, 1);
  if (total <= MAX_TAP_PAIRS) {
    const walk = (i: number, acc: string[]) => {
      if (i === leads.length) return void combos.push(acc);
      for (const t of tapsFor(i)) walk(i + 1, [...acc, t]);
    };
    walk(0, []);
  } else {
    combos.push(leads.map((l) => l.tap));
    leads.forEach((l, i) => {
      for (const t of l.taps) if (t !== l.tap) combos.push(leads.map((m, j) => (j === i ? t : m.tap)));
    });
  }
  const out: TakeoffCandidate[] = [];
  for (const taps of combos) {
    const moves: LeadMove[] = [];
    leads.forEach((l, i) => {
      if (taps[i] !== l.tap) moves.push({ cable: l.cable, end: l.end, from: { part: l.busbar, terminal: l.tap }, to: { part: l.busbar, terminal: taps[i] } });
    });
    const sc = scoreLoadCase(withMoves(doc, moves));
    if (!sc) continue;
    out.push({
      key: `taps:${taps.join(',')}`,
      group: 'taps',
      description: leads.map((l, i) => `${l.pole === 'pos' ? 'positive' : 'negative'} on ${label(l.busbar)} ${taps[i]}`).join(', '),
      ...sc,
      current: moves.length === 0,
      apply: { kind: 'leads', moves },
    });
  }
  return out.sort(rankLayouts);
}

const choiceKey = (c: TakeoffChoice) =>
  c.kind === 'post_to_post' ? `p2p:${c.pos.battery},${c.neg.battery}` : `len:${JSON.stringify(c.lengths_m)}`;

export function exploreTakeoff(doc: DiagramDocument): TakeoffExploration {
  const t0 = performance.now();
  const opt = optimizeTakeoff(doc);
  if (!opt.ok) return { ok: false, message: opt.errors.map((e) => e.message).join('; '), elapsed_ms: performance.now() - t0 };
  const candidates: TakeoffCandidate[] = opt.options.map((o) => ({
    key: choiceKey(o.choice),
    group: 'optimizer',
    description: o.description,
    imbalance_pct: o.imbalance_pct,
    losses_W: o.losses_W,
    maxCurrent_A: o.maxCurrent_A,
    current: o.current,
    apply: { kind: 'optimizer', choice: o.choice },
  }));
  if (opt.layout === 'busbar') candidates.push(...tapCandidates(doc));
  // Both groups score the same load case the same way, so their layouts compare directly. The layout
  // as drawn is in each group; it counts once.
  const drawn = candidates.filter((c) => c.current).length;
  const verdict = takeoffVerdict([...candidates].sort(rankLayouts), candidates.length - Math.max(0, drawn - 1), (c) =>
    c.group === 'taps' ? `main leads with the ${c.description}` : c.description,
  );
  return {
    ok: true, layout: opt.layout, candidates, best: verdict.gain === null ? null : verdict.best.key, gain: verdict.gain,
    explanation: verdict.explanation, elapsed_ms: performance.now() - t0,
  };
}

export type Job = 'analyze' | 'sizing' | 'takeoff';
export interface AnalysisRequest {
  job: Job;
  seq: number;
  doc: DiagramDocument;
  options: AnalysisOptions;
  /** The user's unit system (sizing offers conductors from its series). */
  unitSystem?: UnitSystem;
}
export type AnalysisResponse = { job: Job; seq: number; ok: true; output: unknown } | { job: Job; seq: number; ok: false; message: string };

export function runJob(req: Pick<AnalysisRequest, 'job' | 'doc' | 'options' | 'unitSystem'>): unknown {
  switch (req.job) {
    case 'analyze':
      return runAnalysis(req.doc, req.options);
    case 'sizing':
      return runSizing(req.doc, req.unitSystem);
    case 'takeoff':
      return exploreTakeoff(req.doc);
  }
}
