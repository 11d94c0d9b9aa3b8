/**
 * Fuse and cable sizing for each battery (or string) branch — what each suggestion rests on:
 *
 * - Current the fuse must carry: the largest of
 *   - the unit's share in the load case × the design margin (settings.designMargin; common practice
 *     1.25–1.5; NEC 210.20(A) 125 % of continuous load),
 *   - its share at the inverters' rated power,
 *   - its current in the worst N-1 case: any one other unit disconnected (its BMS or fuse open) — common
 *     practice, a bank keeps working with one battery out.
 * - The rating is the next standard rating (NEC 240.6(A)) at or above that current, in a fuse class that
 *   is made at that rating (tables/fuses.ts), rated for the bank's highest voltage (its charging voltage,
 *   not the nominal) and able to interrupt the prospective current at the battery's post: the larger of
 *   the battery's own short-circuit current and the sum of the other units' (currents of batteries in
 *   parallel add — first principles; conservative, path resistance left out).
 * - At most the unit's maximum continuous current: when no standard rating fits between the two, the
 *   suggestion is a conflict (the bank needs more batteries or less load) and is never applied.
 * - Conductor: the smallest size in the team's size system (IEC 60228 mm² for metric, AWG/kcmil for US)
 *   whose derated ampacity carries the fuse rating (NEC 240.4, recalled) and keeps the branch's own drop
 *   within settings.voltageDropLimit_pct. A cable is never made smaller than drawn: a larger cable stays.
 * Suggestions are a starting point for the designer, not an approval to install.
 */
import { type DiagramCable, type DiagramDocument, type DiagramPart } from '../document/schema';
import { type ConductorSize, MM2_SIZES, conductorArea_mm2, usStandardSizes } from '../../units/conductor';
import type { UnitSystem } from '../../units/format';
import { sizeLabel } from '../../units/format';
import { bankChargeVoltage, inverterDcPowers_W } from '../analysis/bank';
import { type AnalysisContext, type CableAmpacity, buildContext, cableAmpacity, modeNetwork } from '../analysis/context';
import type { AnalysisIssue } from '../analysis/types';
import { prepareNetwork, type PreparedNetwork } from '../network/solve';
import { contingencyStudy } from '../analysis/contingency';
import { batteryShortCircuit_A, stringMembers } from '../parts/battery';
import { type CableRunProps, cableRunConductorResistance_ohm, cableRunDefaults, cableTemperature_C } from '../parts/cable';
import { FUSE_CLASSES, type FuseClassId, STANDARD_FUSE_RATINGS_A, classListsRating } from '../tables/fuses';
import { batteryOcv_V } from '../parts/battery';
import { POST_LINK_LENGTH_M, applySizing } from './apply';


export interface BranchSizing {
  /** The battery or series-string part. */
  source: string;
  /** Its current in the load case, A. */
  share_A: number;
  /** Its current scaled to the inverters' rated power, A. */
  fullPower_A: number;
  /** Its largest current with any one other unit disconnected, A, and which unit that was (null with one unit). */
  nMinusOne_A: number;
  nMinusOneWithout: string | null;
  /** max(share × margin, full-power share, N-1 current), A. */
  required_A: number;
  /** The unit's maximum continuous current, A (the fuse's upper bound). */
  maxContinuous_A: number;
  /** Highest bank voltage the fuse must be rated for (charging voltage), V. */
  bankMax_V: number;
  /** Prospective current the fuse at the post must interrupt, A. */
  prospective_A: number;
  /** 'ok', or 'conflict' when no fuse fits (never applied). */
  status: 'ok' | 'conflict';
  fuse: {
    /** The unit's own fuse, or null when a fuse is to be added at the positive post. */
    part: string | null;
    rating_A: number;
    fuseClass: FuseClassId;
    /** Its present rating and class (existing fuse). */
    present_A?: number;
    presentClass?: FuseClassId;
  };
  /** Conductor for every cable of the branch (positive and negative): what applying sets. */
  cables: { id: string; conductor: ConductorSize; present: ConductorSize }[];
  /** The smallest conductor that carries the rating within the drop limit (information; null when none does). */
  minimumConductor: ConductorSize | null;
  /** Conductor for the post-to-fuse link when a fuse is added. */
  linkConductor: ConductorSize;
  /** Derated ampacity of the minimum conductor (shortest-rated run of the branch), A. */
  ampacity_A: number;
  /** Set when that run's insulation is rated below the table, so its own column was read. */
  ampacityLimitedBy?: 'insulation';
  /** share × branch resistance with the applied conductors, % of the system voltage. */
  branchDrop_pct: number;
  reasoning: string;
}

export type SizingResult = { ok: true; branches: BranchSizing[] } | { ok: false; errors: AnalysisIssue[] };

export interface SizingOptions {
  /** The team's unit system: conductor sizes are offered from its series. Default: the branch's own. */
  unitSystem?: UnitSystem;
}

/** Fuse classes in the order they are offered (the first that fits). */
const CLASS_PREFERENCE: FuseClassId[] = ['class_t', 'battery_terminal', 'anl', 'breaker_dc', 'strip', 'blade'];

/**
 * Sizes tried, smallest first, in one size system: AWG from 14 AWG (the smallest the ampacity tables
 * list) except 3 AWG, which battery cable is rarely made in (common practice), then kcmil; or the IEC
 * 60228 metric series from 1.5 mm².
 */
export function candidateConductors(system: 'metric' | 'us'): ConductorSize[] {
  if (system === 'metric') return MM2_SIZES.filter((s) => s >= 1.5).map((size) => ({ system: 'mm2', size }) as ConductorSize);
  const us = usStandardSizes().filter((c) => !(c.system === 'awg' && c.size === '3'));
  return us.slice(us.findIndex((c) => c.system === 'awg' && c.size === '14'));
}

function branchCables(ctx: AnalysisContext, source: string): DiagramCable[] {
  const ids = [...ctx.topo.branch(source, 'pos').cables, ...ctx.topo.branch(source, 'neg').cables];
  return [...new Set(ids)].map((id) => ctx.topo.cables.get(id)!);
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : x.toFixed(1));

/** The bank's highest voltage a fuse must be rated for: its charging voltage, at least the system voltage, V. */
export function bankMaxVoltage_V(ctx: AnalysisContext): number {
  const charge = bankChargeVoltage(ctx.topo, ctx.bankNominal_V, (id) => ctx.topo.parts.get(id)?.label || id);
  return Math.max(ctx.settings.systemVoltage_V, charge?.volts ?? 0);
}

/** A unit's prospective short-circuit current at its terminals, A (a string: its OCV over its summed internal resistance). */
function unitShortCircuit_A(p: DiagramPart): number {
  if (p.type === 'battery') return batteryShortCircuit_A(p.props);
  if (p.type === 'series_string') {
    const m = stringMembers(p.props);
    const r = m.reduce((s, b) => s + b.r_internal_ohm, 0);
    return m.reduce((s, b) => s + batteryOcv_V(b), 0) / r;
  }
  return 0;
}

/** Each unit's largest current with any one other unit disconnected (the N-1 study), and which one that was. */
function nMinusOne(ctx: AnalysisContext, prep: PreparedNetwork): Map<string, { current_A: number; without: string | null }> {
  const out = new Map<string, { current_A: number; without: string | null }>();
  for (const u of ctx.units) out.set(u.id, { current_A: 0, without: null });
  for (const c of contingencyStudy(ctx, prep)?.cases ?? []) {
    if (!c.ok) continue;
    for (const [id, i] of Object.entries(c.sources)) {
      const o = out.get(id);
      if (o && i > o.current_A) out.set(id, { current_A: i, without: c.unit });
    }
  }
  return out;
}

const ratingLabel = (a: number) => `${a} A`;

/** Rounds of sizing on the sized design before the suggestions settle (cable and fuse changes move the shares). */
const SETTLE_ROUNDS = 3;

/**
 * Sizing suggestions for every battery / string branch of a diagram. Sizing changes the design it is
 * computed on (a larger cable takes more of the load; a new fuse adds resistance), so the suggestions are
 * computed again on the sized design until they ask for nothing more (at most SETTLE_ROUNDS rounds): what
 * is offered is the settled design, and sizing it again suggests no further change.
 */
export function suggestSizing(doc: DiagramDocument, options: SizingOptions = {}): SizingResult {
  const first = suggestOnce(doc, options);
  if (!first.ok) return first;
  let cur = doc;
  let res = first;
  for (let round = 0; round < SETTLE_ROUNDS; round++) {
    if (!res.branches.some((b) => sizingChanges(b, cur))) break;
    const next = applySizing(cur, res.branches);
    const again = suggestOnce(next, options);
    if (!again.ok) break;
    cur = next;
    res = again;
  }
  if (cur === doc) return first;
  // The settled ratings and conductors, expressed against the document as it is drawn.
  return {
    ok: true,
    branches: first.branches.map((b0) => {
      const bk = res.branches.find((x) => x.source === b0.source);
      if (!bk || b0.status !== 'ok' || bk.status !== 'ok') return b0;
      const size = (id: string) => cur.cables.find((c) => c.id === id)?.props.conductor;
      const link = cur.cables.find((c) => c.from.part === b0.source && c.from.terminal === 'pos');
      return {
        ...bk,
        fuse: { ...bk.fuse, part: b0.fuse.part, present_A: b0.fuse.present_A, presentClass: b0.fuse.presentClass },
        cables: b0.cables.map((c) => ({ ...c, conductor: size(c.id) ?? c.conductor })),
        linkConductor: b0.fuse.part ? b0.linkConductor : link?.props.conductor ?? b0.linkConductor,
      };
    }),
  };
}

/** One round of sizing on `doc` as it stands. */
function suggestOnce(doc: DiagramDocument, options: SizingOptions): SizingResult {
  const built = buildContext(doc);
  if (!built.ok) return { ok: false, errors: built.errors };
  const ctx = built.ctx;
  const prep = prepareNetwork(modeNetwork(ctx, 'load'));
  const base = 'ok' in prep ? prep : prep.base;
  if (!base.ok) return { ok: false, errors: [{ code: base.error.code, message: base.error.message, parts: [] }] };
  const s = ctx.settings;
  const inv = inverterDcPowers_W(ctx);
  const actual = inv.reduce((a, b) => a + b.actual_W, 0);
  const rated = inv.reduce((a, b) => a + Math.max(b.rated_W, b.actual_W), 0);
  const fullScale = actual > 0 ? rated / actual : 1;
  const n1 = 'ok' in prep ? new Map<string, { current_A: number; without: string | null }>() : nMinusOne(ctx, prep);
  const bankMax_V = bankMaxVoltage_V(ctx);
  const isc = new Map(ctx.units.map((u) => [u.id, unitShortCircuit_A(ctx.topo.parts.get(u.id)!)]));
  const iscTotal = [...isc.values()].reduce((a, b) => a + b, 0);
  const branches: BranchSizing[] = [];
  for (const u of ctx.units) {
    const part = ctx.topo.parts.get(u.id)!;
    const label = part.label || u.id;
    const share = Math.max(0, base.element_currents_A[u.elements[0]] ?? 0);
    const full = share * fullScale;
    const contingency = n1.get(u.id) ?? { current_A: 0, without: null };
    // With one other unit out, this one carries more — but never beyond its own limit: its BMS opens first.
    const n1Capped = Math.min(contingency.current_A, u.maxContinuous_A);
    const running = Math.max(share, full);
    const required = Math.max(share * s.designMargin, full, n1Capped);
    const own = isc.get(u.id) ?? 0;
    const prospective = Math.max(own, iscTotal - own);
    const existing = u.fuses.length ? (ctx.topo.parts.get(u.fuses[0]) as Extract<DiagramPart, { type: 'fuse' }>) : null;

    // The next standard rating at or above `required` that a suitable class is made in, within the unit's limit.
    const fits = (id: FuseClassId, rating: number) => {
      const c = FUSE_CLASSES[id];
      return c.voltage_V >= bankMax_V && c.interrupting_A >= prospective && classListsRating(id, rating);
    };
    const order = existing ? [existing.props.fuseClass, ...CLASS_PREFERENCE.filter((c) => c !== existing.props.fuseClass)] : CLASS_PREFERENCE;
    const pickFrom = (ratings: readonly number[]) => {
      for (const r of ratings) {
        const cls = order.find((c) => fits(c, r));
        if (cls) return { rating: r, fuseClass: cls };
      }
      return null;
    };
    const limit = u.maxContinuous_A * (1 + 1e-6);
    const problems: string[] = [];
    const notes: string[] = [];
    let pick = pickFrom(STANDARD_FUSE_RATINGS_A.filter((r) => r >= required * (1 - 1e-6) && r <= limit));
    if (!pick) {
      // No rating between the margin and the unit's limit: the largest within the limit that still carries the running current.
      pick = pickFrom(STANDARD_FUSE_RATINGS_A.filter((r) => r >= running * (1 - 1e-6) && r <= limit).reverse());
      if (pick) {
        notes.push(`No standard rating lies between ${fmt(required)} A and ${label}'s ${fmt(u.maxContinuous_A)} A continuous limit, so the fuse is held to ${ratingLabel(pick.rating)}: ${(pick.rating / Math.max(running, 1e-9)).toFixed(2)} × its current instead of ${s.designMargin} ×. The battery runs close to its limit — consider more batteries in parallel or less load.`);
      } else if (STANDARD_FUSE_RATINGS_A.some((r) => r >= running * (1 - 1e-6) && r <= limit)) {
        problems.push(`No listed fuse class is made at a rating from ${fmt(running)} A to ${fmt(u.maxContinuous_A)} A, rated for ${fmt(bankMax_V)} V DC and able to interrupt ${Math.round(prospective).toLocaleString('en-US')} A; choose a device from its maker's data.`);
      } else {
        problems.push(`${label} carries ${fmt(running)} A, above its maximum continuous current of ${fmt(u.maxContinuous_A)} A: no fuse can both carry it and stay within the battery's limit. The bank needs more batteries in parallel or less load.`);
      }
    }
    const rating = pick?.rating ?? existing?.props.rating_A ?? 0;
    const fuseClass: FuseClassId = pick?.fuseClass ?? existing?.props.fuseClass ?? 'class_t';
    if (contingency.current_A > u.maxContinuous_A + 1e-9) {
      notes.push(`With ${ctx.topo.parts.get(contingency.without!)?.label || contingency.without} disconnected it would carry ${fmt(contingency.current_A)} A, above its ${fmt(u.maxContinuous_A)} A limit (its BMS would open first), so the N-1 figure is taken at that limit.`);
    }

    // Conductors, in the team's size system.
    const cables = branchCables(ctx, u.id);
    const sized = cables.filter((c) => c.props.length_m > 0);
    const firstProps: CableRunProps = (sized[0] ?? cables[0])?.props ?? ctx.doc.cables.find((c) => c.from.part === u.id || c.to.part === u.id)?.props ?? cableRunDefaults();
    const system: 'metric' | 'us' = options.unitSystem ?? (firstProps.conductor.system === 'mm2' ? 'metric' : 'us');
    const runs = sized.length ? sized.map((c) => c.props) : [{ ...firstProps, length_m: POST_LINK_LENGTH_M }];
    const dropOf = (sizeFor: (c: CableRunProps) => ConductorSize) =>
      (share * runs.reduce((sum, c) => sum + cableRunConductorResistance_ohm({ ...c, conductor: sizeFor(c) }, cableTemperature_C(c, s.ambient_C)) + (c.lugFrom_ohm ?? 0) + (c.lugTo_ohm ?? 0), 0)) / s.systemVoltage_V * 100;
    let minimum: ConductorSize | null = null;
    let minAmp = 0;
    let minBasis: CableAmpacity | null = null;
    let limitedBy: 'ampacity' | 'drop' = 'ampacity';
    for (const size of pick ? candidateConductors(system) : []) {
      const reads = runs.map((c) => cableAmpacity({ ...c, conductor: size }, s));
      const amps = Math.min(...reads.map((a) => a?.amps ?? 0));
      if (!(amps >= rating)) continue;
      if (sized.length && dropOf(() => size) > s.voltageDropLimit_pct) {
        limitedBy = 'drop';
        continue;
      }
      minimum = size;
      minAmp = amps;
      minBasis = reads.find((a) => a !== null && a.amps === amps) ?? null;
      break;
    }
    // Never smaller than drawn: each cable keeps its size when that is at least the minimum's area.
    const keepOrMin = (present: ConductorSize): ConductorSize =>
      minimum && conductorArea_mm2(present) + 1e-9 < conductorArea_mm2(minimum) ? minimum : present;
    if (pick && !minimum && sized.length) problems.push(`No listed conductor carries ${ratingLabel(rating)} within a ${s.voltageDropLimit_pct} % drop: shorten the runs or split the load over more batteries.`);
    const applied = cables.map((c) => ({ id: c.id, conductor: keepOrMin(c.props.conductor), present: c.props.conductor }));
    const linkConductor = minimum ? keepOrMin(firstProps.conductor) : firstProps.conductor;
    const drop = sized.length ? dropOf((c) => keepOrMin(c.conductor)) : 0;
    const insulationNote = minBasis?.limitedBy === 'insulation' && minBasis.note ? `, ${minBasis.note}` : '';
    const upsized = applied.filter((c) => conductorArea_mm2(c.conductor) > conductorArea_mm2(c.present) + 1e-9);
    const other = contingency.without ? ctx.topo.parts.get(contingency.without)?.label || contingency.without : null;

    const reasons = [
      `${label} carries ${fmt(share)} A in the load case${fullScale > 1.0001 ? ` (${fmt(full)} A at the inverters' rated power)` : ''}${other ? ` and ${fmt(contingency.current_A)} A with ${other} disconnected (N-1)` : ''}.`,
      `The fuse must carry the largest of ${fmt(share)} A × ${s.designMargin} = ${fmt(share * s.designMargin)} A${fullScale > 1.0001 ? `, ${fmt(full)} A` : ''}${other ? `, ${fmt(n1Capped)} A` : ''}: ${fmt(required)} A.`,
      !pick ? '' : `The next standard rating (NEC 240.6(A)) a suitable class is made at is ${ratingLabel(rating)} ${FUSE_CLASSES[fuseClass].name} — rated ${FUSE_CLASSES[fuseClass].voltage_V} V DC (the bank reaches ${fmt(bankMax_V)} V charging) and ${FUSE_CLASSES[fuseClass].interrupting_A.toLocaleString('en-US')} A interrupting (prospective at the post about ${Math.round(prospective).toLocaleString('en-US')} A), within the battery's ${fmt(u.maxContinuous_A)} A continuous limit.`,
      !minimum
        ? ''
        : `${sizeLabel(minimum)} is the smallest ${system === 'metric' ? 'IEC 60228' : 'AWG/kcmil'} conductor whose derated ampacity (${fmt(minAmp)} A, ${s.ampacityTable}${insulationNote}) carries ${ratingLabel(rating)} (NEC 240.4)${limitedBy === 'drop' ? ` and keeps the branch drop within ${s.voltageDropLimit_pct} %` : ''}${
            !cables.length ? '.' : upsized.length ? `; ${upsized.length === cables.length ? 'the branch cables are' : `${upsized.length} of the branch cables are`} enlarged to it.` : '; the cables as drawn are at least that size and are kept.'
          }`,
      existing || !pick ? '' : `${label} has no fuse of its own: one is added at its positive post (${POST_LINK_LENGTH_M * 1000} mm of conductor assumed — set the real length), and everything now on the post moves to the fuse's bank side.`,
      ...notes,
      ...problems,
    ].filter(Boolean).join(' ');

    branches.push({
      source: u.id,
      share_A: share,
      fullPower_A: full,
      nMinusOne_A: contingency.current_A,
      nMinusOneWithout: contingency.without,
      required_A: required,
      maxContinuous_A: u.maxContinuous_A,
      bankMax_V,
      prospective_A: prospective,
      status: problems.length ? 'conflict' : 'ok',
      fuse: {
        part: existing?.id ?? null,
        rating_A: rating,
        fuseClass,
        ...(existing ? { present_A: existing.props.rating_A, presentClass: existing.props.fuseClass } : {}),
      },
      cables: applied,
      minimumConductor: minimum,
      linkConductor,
      ampacity_A: minAmp,
      ...(minBasis?.limitedBy === 'insulation' ? { ampacityLimitedBy: 'insulation' as const } : {}),
      branchDrop_pct: drop,
      reasoning: reasons,
    });
  }
  return { ok: true, branches };
}

/** Whether applying a suggestion would change the document. */
export function sizingChanges(b: BranchSizing, doc: DiagramDocument): boolean {
  if (b.status !== 'ok') return false;
  const part = b.fuse.part ? doc.parts.find((p) => p.id === b.fuse.part) : undefined;
  const fuse = !part || part.type !== 'fuse' || part.props.rating_A !== b.fuse.rating_A || part.props.fuseClass !== b.fuse.fuseClass;
  return fuse || b.cables.some((c) => c.conductor.system !== c.present.system || c.conductor.size !== c.present.size);
}
