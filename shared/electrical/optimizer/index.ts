/**
 * Take-off optimizer.
 *
 * - Post to post: every pair (battery for the positive main lead, battery for the negative main lead)
 *   along the chain is evaluated; the main leads keep their length and only their battery terminal
 *   moves. All pairs are variants of one prepared network: each battery post gets a candidate lead
 *   that is open (1 GΩ) unless the variant closes it to the lead's own resistance, so every pair is a
 *   low-rank change solved on one factorization (the solver's variant API).
 * - Busbars: the battery runs to each busbar are evaluated as drawn, equalised to the longest run on
 *   the positive busbar, on the negative busbar, and on both (the run's busbar-end cable is lengthened;
 *   its resistance scales with length).
 * Options are ranked by bank imbalance, then total loss, each as shown (0.1 % and 0.1 W steps), the
 * layout as drawn first among equals. A layout is called better than the one as drawn only when its
 * imbalance is lower by at least 0.1 percentage point as shown, or, the imbalance tied, its loss is
 * lower by at least 0.1 W (and the explanation says the loss decided it); otherwise the layout as drawn
 * is the best and the explanation says so. `applyTakeoff` returns the document with a choice applied,
 * for the editor to preview and apply. Not an approval to install.
 */
import { type DiagramDocument, diagramSchema } from '../document/schema';
import { type AnalysisContext, buildContext, modeNetwork } from '../analysis/context';
import { shareImbalance } from '../analysis/operating';
import { branchesToBusbar, postToPostChains } from '../analysis/topology';
import type { AnalysisIssue } from '../analysis/types';
import type { NetworkChange } from '../network/changes';
import { prepareNetwork, solvePrepared } from '../network/solve';
import type { Network, NetworkElement, SolveOutcome } from '../network/types';

export type TakeoffChoice =
  | { kind: 'post_to_post'; pos: { cable: string; battery: string }; neg: { cable: string; battery: string } }
  | { kind: 'cable_lengths'; label: string; lengths_m: Record<string, number> };

export interface TakeoffOption {
  choice: TakeoffChoice;
  imbalance_pct: number;
  losses_W: number;
  /** Largest battery current, A. */
  maxCurrent_A: number;
  /** True for the layout as drawn. */
  current: boolean;
  description: string;
}

/**
 * Why the best layout beats the one as drawn: a lower imbalance, or the same imbalance and a lower
 * loss; null when the layout as drawn is itself the best (nothing does better).
 */
export type TakeoffGain = 'imbalance' | 'loss' | null;

export type TakeoffResult =
  | {
      ok: true;
      layout: 'post_to_post' | 'busbar';
      /** Ranked, best first. */
      options: TakeoffOption[];
      /** The first ranked: the layout as drawn when `gain` is null. */
      best: TakeoffOption;
      gain: TakeoffGain;
      explanation: string;
      /** The document with `best` applied (the document as given when `gain` is null). */
      document: DiagramDocument;
    }
  | { ok: false; errors: AnalysisIssue[] };

/** What the ranking and the explanation read of a layout. */
export interface RankedLayout {
  description: string;
  imbalance_pct: number;
  losses_W: number;
  maxCurrent_A: number;
  current: boolean;
}

/** A figure in the steps it is shown in: imbalance to 0.1 %, loss to 0.1 W. */
const tenths = (x: number) => Math.round(x * 10);
const f1 = (x: number) => (Math.round(x * 10) / 10).toFixed(1);

/** Imbalance as shown, then loss as shown, then the layout as drawn first, then the exact loss. */
export const rankLayouts = (a: RankedLayout, b: RankedLayout) =>
  tenths(a.imbalance_pct) - tenths(b.imbalance_pct) || tenths(a.losses_W) - tenths(b.losses_W) || Number(b.current) - Number(a.current) || a.losses_W - b.losses_W;

const capital = (s: string) => (s ? s[0].toUpperCase() + s.slice(1) : s);

/**
 * The best of `ranked` (sorted with `rankLayouts`) against the layout as drawn, and a sentence saying
 * why. `subject` names a layout at the start of the sentence (its description by default); `count` is
 * how many distinct layouts were evaluated.
 */
export function takeoffVerdict<T extends RankedLayout>(ranked: readonly T[], count = ranked.length, subject: (o: T) => string = (o) => o.description): { best: T; gain: TakeoffGain; explanation: string } {
  const best = ranked[0];
  const now = ranked.find((o) => o.current);
  const of = `best of ${count} layout${count === 1 ? '' : 's'} evaluated`;
  if (!now) {
    return {
      best, gain: 'imbalance',
      explanation: `${capital(subject(best))} gives the lowest imbalance, ${f1(best.imbalance_pct)} %, with losses of ${f1(best.losses_W)} W (${of}; the layout as drawn could not be evaluated).`,
    };
  }
  if (best === now || best.current) {
    const equals = ranked.filter((o) => o !== now && !o.current && tenths(o.imbalance_pct) === tenths(now.imbalance_pct) && tenths(o.losses_W) === tenths(now.losses_W)).length;
    return {
      best: now, gain: null,
      explanation: `The layout as drawn is already the best of ${count} evaluated: imbalance ${f1(now.imbalance_pct)} %, losses ${f1(now.losses_W)} W.${
        equals ? ` ${equals === 1 ? 'One other layout does' : `${equals} other layouts do`} as well, none better.` : ' No other layout does as well.'}`,
    };
  }
  const busiest = tenths(best.maxCurrent_A) !== tenths(now.maxCurrent_A) ? `; the busiest battery carries ${f1(best.maxCurrent_A)} A instead of ${f1(now.maxCurrent_A)} A` : '';
  if (tenths(best.imbalance_pct) < tenths(now.imbalance_pct)) {
    const losses = tenths(best.losses_W) === tenths(now.losses_W) ? ` with the same losses, ${f1(best.losses_W)} W` : ` and the losses from ${f1(now.losses_W)} W to ${f1(best.losses_W)} W`;
    // Another layout reaches the same imbalance: the loss chose between them.
    const tied = ranked.filter((o) => !o.current && tenths(o.imbalance_pct) === tenths(best.imbalance_pct)).length;
    const tie = tied > 1 ? `; ${tied} layouts reach ${f1(best.imbalance_pct)} %, and the loss decided between them` : '';
    return { best, gain: 'imbalance', explanation: `${capital(subject(best))} brings the imbalance from ${f1(now.imbalance_pct)} % to ${f1(best.imbalance_pct)} %${losses}${busiest}${tie} (${of}).` };
  }
  return {
    best, gain: 'loss',
    explanation: `${capital(subject(best))} gives the same imbalance as the layout as drawn, ${f1(best.imbalance_pct)} %, with lower losses: ${f1(best.losses_W)} W instead of ${f1(now.losses_W)} W${busiest}. With the imbalance tied, the loss decided it (${of}).`,
  };
}

const OPEN_OHM = 1e9;

function score(ctx: AnalysisContext, sol: SolveOutcome): { imbalance_pct: number; losses_W: number; maxCurrent_A: number } | null {
  if (!sol.ok) return null;
  const I = sol.element_currents_A;
  const { imbalance_pct } = shareImbalance(ctx, (id) => I[id] ?? 0);
  let losses = 0;
  // Losses in the bank and its wiring; a load's own power is not a loss (as in the operating point).
  for (const [id, w] of Object.entries(sol.element_losses_W)) if (!ctx.loadElements.has(id)) losses += w;
  const maxCurrent_A = Math.max(0, ...ctx.units.map((u) => Math.abs(I[u.elements[0]] ?? 0)));
  return { imbalance_pct, losses_W: losses, maxCurrent_A };
}

const name = (ctx: AnalysisContext, id: string) => ctx.topo.parts.get(id)?.label || id;

/** The element of a cable that touches `node` (its conductor, or the lug joint at that end). */
function elementAt(ctx: AnalysisContext, cable: string, node: string): NetworkElement | undefined {
  const ids = new Set(ctx.map.cables[cable]?.elements ?? []);
  return ctx.network.elements.find((e) => ids.has(e.id) && e.kind === 'resistor' && (e.a === node || e.b === node));
}

function postToPost(ctx: AnalysisContext, doc: DiagramDocument): TakeoffResult | null {
  const load = ctx.topo.loads[0];
  if (!load) return null;
  const posBranch = ctx.topo.branch(load.id, 'pos');
  const negBranch = ctx.topo.branch(load.id, 'neg');
  const chain = postToPostChains(ctx.topo).find((g) => g.includes(posBranch.end.part) && g.includes(negBranch.end.part));
  if (!chain || !posBranch.cables.length || !negBranch.cables.length) return null;
  const leads = [
    { pole: 'pos' as const, cable: posBranch.cables.at(-1)!, battery: posBranch.end.part },
    { pole: 'neg' as const, cable: negBranch.cables.at(-1)!, battery: negBranch.end.part },
  ];
  // Candidate leads: one per battery and pole, open unless chosen.
  const base = modeNetwork(ctx, 'load');
  let elements = base.elements.slice();
  const cand = new Map<string, { id: string; r: number }>(); // `${pole}:${battery}` → candidate element
  for (const lead of leads) {
    const node = ctx.map.parts[lead.battery].nodes[lead.pole];
    const el = elementAt(ctx, lead.cable, node);
    if (!el || el.kind !== 'resistor') return null;
    elements = elements.filter((e) => e.id !== el.id);
    for (const b of chain) {
      const to = ctx.map.parts[b].nodes[lead.pole];
      const id = `${el.id}@${b}`;
      const swap = (n: string) => (n === node ? to : n);
      elements.push({ ...el, id, a: swap(el.a), b: swap(el.b), r_ohm: OPEN_OHM });
      cand.set(`${lead.pole}:${b}`, { id, r: el.r_ohm });
    }
  }
  const net: Network = { ground: base.ground, elements };
  const prep = prepareNetwork(net);
  if ('ok' in prep) return { ok: false, errors: [{ code: prep.error.code, message: prep.error.message, parts: [] }] };
  const options: TakeoffOption[] = [];
  for (const p of chain) {
    for (const n of chain) {
      const cp = cand.get(`pos:${p}`)!;
      const cn = cand.get(`neg:${n}`)!;
      const changes: NetworkChange[] = [
        { kind: 'short_element', element: cp.id, r_ohm: cp.r },
        { kind: 'short_element', element: cn.id, r_ohm: cn.r },
      ];
      const sc = score(ctx, solvePrepared(prep, changes));
      if (!sc) continue;
      options.push({
        choice: { kind: 'post_to_post', pos: { cable: leads[0].cable, battery: p }, neg: { cable: leads[1].cable, battery: n } },
        ...sc,
        current: p === leads[0].battery && n === leads[1].battery,
        description: `positive from ${name(ctx, p)}, negative from ${name(ctx, n)}`,
      });
    }
  }
  return finish(doc, 'post_to_post', options);
}

function busbars(ctx: AnalysisContext, doc: DiagramDocument): TakeoffResult | null {
  const pos = ctx.topo.busbars.map((b) => ({ bus: b.id, runs: branchesToBusbar(ctx.topo, b.id).filter((r) => r.terminal === 'pos') })).find((x) => x.runs.length > 1);
  const neg = ctx.topo.busbars.map((b) => ({ bus: b.id, runs: branchesToBusbar(ctx.topo, b.id).filter((r) => r.terminal === 'neg') })).find((x) => x.runs.length > 1);
  if (!pos && !neg) return null;
  const equalise = (side: typeof pos): Record<string, number> => {
    if (!side) return {};
    const longest = Math.max(...side.runs.map((r) => r.length_m));
    const out: Record<string, number> = {};
    for (const r of side.runs) {
      const last = r.cables.at(-1)!;
      const len = ctx.topo.cables.get(last)!.props.length_m;
      if (longest - r.length_m > 1e-12) out[last] = len + (longest - r.length_m);
    }
    return out;
  };
  const candidates: { label: string; lengths_m: Record<string, number> }[] = [
    { label: 'as drawn', lengths_m: {} },
    { label: 'positive runs equalised to the longest', lengths_m: equalise(pos) },
    { label: 'negative runs equalised to the longest', lengths_m: equalise(neg) },
    { label: 'all runs equalised to the longest', lengths_m: { ...equalise(pos), ...equalise(neg) } },
  ];
  const prep = prepareNetwork(modeNetwork(ctx, 'load'));
  if ('ok' in prep) return { ok: false, errors: [{ code: prep.error.code, message: prep.error.message, parts: [] }] };
  const options: TakeoffOption[] = [];
  const seen = new Set<string>();
  for (const c of candidates) {
    const key = JSON.stringify(c.lengths_m);
    if (seen.has(key)) continue;
    seen.add(key);
    const changes: NetworkChange[] = [];
    for (const [cable, len] of Object.entries(c.lengths_m)) {
      const old = ctx.topo.cables.get(cable)!.props.length_m;
      const r = ctx.map.cables[cable].conductor_ohm;
      if (old > 0 && r > 0) changes.push({ kind: 'short_element', element: cable, r_ohm: (r * len) / old });
    }
    const sc = score(ctx, solvePrepared(prep, changes));
    if (!sc) continue;
    options.push({ choice: { kind: 'cable_lengths', label: c.label, lengths_m: c.lengths_m }, ...sc, current: Object.keys(c.lengths_m).length === 0, description: c.label });
  }
  return finish(doc, 'busbar', options);
}

function finish(doc: DiagramDocument, layout: 'post_to_post' | 'busbar', options: TakeoffOption[]): TakeoffResult {
  if (!options.length) return { ok: false, errors: [{ code: 'no_options', message: 'No take-off layout could be solved', parts: [] }] };
  options.sort(rankLayouts);
  const { best, gain, explanation } = takeoffVerdict(options);
  return { ok: true, layout, options, best, gain, explanation, document: gain === null ? doc : applyTakeoff(doc, best.choice) };
}

/** Evaluate the take-off layouts of a diagram (post-to-post chain or busbar bank) and rank them. */
export function optimizeTakeoff(doc: DiagramDocument): TakeoffResult {
  const built = buildContext(doc);
  if (!built.ok) return { ok: false, errors: built.errors };
  const ctx = built.ctx;
  return postToPost(ctx, doc) ?? busbars(ctx, doc) ?? { ok: false, errors: [{ code: 'no_takeoff', message: 'The diagram has neither a post-to-post chain feeding a load nor battery runs to a busbar', parts: [] }] };
}

/** The document with a take-off choice applied (main leads moved, or cable lengths set). */
export function applyTakeoff(doc: DiagramDocument, choice: TakeoffChoice): DiagramDocument {
  const next = structuredClone(doc);
  if (choice.kind === 'post_to_post') {
    for (const [pole, lead] of [['pos', choice.pos], ['neg', choice.neg]] as const) {
      next.cables = next.cables.map((c) => {
        if (c.id !== lead.cable) return c;
        const fromBattery = c.from.terminal === pole && (next.parts.find((p) => p.id === c.from.part)?.type === 'battery' || next.parts.find((p) => p.id === c.from.part)?.type === 'series_string');
        return fromBattery ? { ...c, from: { part: lead.battery, terminal: pole } } : { ...c, to: { part: lead.battery, terminal: pole } };
      });
    }
  } else {
    next.cables = next.cables.map((c) => (c.id in choice.lengths_m ? { ...c, props: { ...c.props, length_m: choice.lengths_m[c.id] } } : c));
  }
  return diagramSchema.parse(next);
}
