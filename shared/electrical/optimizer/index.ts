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
 * Options are ranked by bank imbalance (0.1 % steps), then total loss. `applyTakeoff` returns the
 * document with a choice applied, for the editor to preview and apply. Not an approval to install.
 */
import { type DiagramDocument, diagramSchema } from '../../diagram/schema';
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

export type TakeoffResult =
  | { ok: true; layout: 'post_to_post' | 'busbar'; options: TakeoffOption[]; best: TakeoffOption; explanation: string; document: DiagramDocument }
  | { ok: false; errors: AnalysisIssue[] };

const OPEN_OHM = 1e9;

function score(ctx: AnalysisContext, sol: SolveOutcome): { imbalance_pct: number; losses_W: number; maxCurrent_A: number } | null {
  if (!sol.ok) return null;
  const I = sol.element_currents_A;
  const { imbalance_pct } = shareImbalance(ctx, (id) => I[id] ?? 0);
  let losses = 0;
  for (const w of Object.values(sol.element_losses_W)) losses += w;
  const maxCurrent_A = Math.max(0, ...ctx.units.map((u) => Math.abs(I[u.elements[0]] ?? 0)));
  return { imbalance_pct, losses_W: losses, maxCurrent_A };
}

const rank = (a: TakeoffOption, b: TakeoffOption) =>
  Math.round(a.imbalance_pct * 10) - Math.round(b.imbalance_pct * 10) || a.losses_W - b.losses_W || Number(b.current) - Number(a.current);

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
  return finish(ctx, doc, 'post_to_post', options);
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
  return finish(ctx, doc, 'busbar', options);
}

function finish(ctx: AnalysisContext, doc: DiagramDocument, layout: 'post_to_post' | 'busbar', options: TakeoffOption[]): TakeoffResult {
  if (!options.length) return { ok: false, errors: [{ code: 'no_options', message: 'No take-off layout could be solved', parts: [] }] };
  options.sort(rank);
  const best = options[0];
  const now = options.find((o) => o.current) ?? best;
  const explanation = best.current
    ? `The layout as drawn is already the best of ${options.length} evaluated: imbalance ${best.imbalance_pct.toFixed(1)} %, losses ${best.losses_W.toFixed(1)} W.`
    : `${best.description[0].toUpperCase()}${best.description.slice(1)} brings the imbalance from ${now.imbalance_pct.toFixed(1)} % to ${best.imbalance_pct.toFixed(1)} % and the losses from ${now.losses_W.toFixed(1)} W to ${best.losses_W.toFixed(1)} W; the busiest battery carries ${best.maxCurrent_A.toFixed(1)} A instead of ${now.maxCurrent_A.toFixed(1)} A (best of ${options.length} layouts evaluated).`;
  void ctx;
  return { ok: true, layout, options, best, explanation, document: applyTakeoff(doc, best.choice) };
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
