/**
 * Fuse and cable sizing for each battery (or string) branch.
 *
 * For each unit: the expected current is its share in the load case; scaled to the inverters' rated
 * power when that is above the power analysed. The fuse is the next standard rating (NEC 240.6(A)) at or
 * above max(share × design margin, share at full power) — the margin is settings.designMargin (common
 * practice 1.25–1.5; NEC 210.20(A) 125 % of continuous load). The conductor is the smallest size, in the
 * branch's own size system, whose corrected ampacity carries that rating (NEC 240.4, recalled) and keeps
 * the branch's own voltage drop (share × branch resistance) within settings.voltageDropLimit_pct. Each run
 * keeps its own insulation, so a run with insulation rated below the table is sized on its own column.
 * Suggestions are a starting point for the designer, not an approval to install.
 */
import { type DiagramCable, type DiagramDocument, type DiagramPart, diagramSchema } from '../../diagram/schema';
import { type ConductorSize, MM2_SIZES, usStandardSizes } from '../../units/conductor';
import { sizeLabel } from '../../units/format';
import { inverterDcPowers_W } from '../analysis/bank';
import { type AnalysisContext, type CableAmpacity, buildContext, cableAmpacity } from '../analysis/context';
import { solveLoadCase } from '../analysis/analyze';
import { faultSweep, prepareFaults } from '../analysis/faults';
import type { AnalysisIssue } from '../analysis/types';
import { cableRunConductorResistance_ohm, cableTemperature_C } from '../parts/cable';
import { fuseDefaults, type FuseProps } from '../parts/passive';
import { FUSE_CLASSES, type FuseClassId, nextStandardRating } from '../tables/fuses';

export interface BranchSizing {
  /** The battery or series-string part. */
  source: string;
  /** Its current in the load case, A. */
  share_A: number;
  /** Its current scaled to the inverters' rated power, A. */
  fullPower_A: number;
  /** max(share × margin, full-power share), A. */
  required_A: number;
  fuse: {
    /** Existing fuse in the branch, or null when a fuse is to be added at the positive post. */
    part: string | null;
    rating_A: number;
    fuseClass: FuseClassId;
    /** Its present rating (existing fuse). */
    present_A?: number;
  };
  /** Conductor for every cable of the branch (positive and negative). */
  cables: { id: string; conductor: ConductorSize; present: ConductorSize }[];
  /** Corrected ampacity of the suggested conductor (shortest-rated run of the branch), A. */
  ampacity_A: number;
  /** Set when that run's insulation is rated below the table, so its own column was read. */
  ampacityLimitedBy?: 'insulation';
  /** share × branch resistance with the suggested conductor, % of the system voltage. */
  branchDrop_pct: number;
  reasoning: string;
}

export type SizingResult = { ok: true; branches: BranchSizing[] } | { ok: false; errors: AnalysisIssue[] };

const CLASS_PREFERENCE: FuseClassId[] = ['class_t', 'battery_terminal', 'anl', 'breaker_dc', 'strip', 'blade'];

/**
 * Sizes tried, smallest first, in the branch's own size system: the AWG sizes from 14 AWG (the smallest
 * the ampacity tables list) except 3 AWG, which battery cable is rarely made in (common practice), then
 * kcmil; or the IEC 60228 metric series from 1.5 mm².
 */
function candidates(present: ConductorSize): ConductorSize[] {
  if (present.system === 'mm2') return MM2_SIZES.filter((s) => s >= 1.5).map((size) => ({ system: 'mm2', size }) as ConductorSize);
  const us = usStandardSizes().filter((c) => !(c.system === 'awg' && c.size === '3'));
  return us.slice(us.findIndex((c) => c.system === 'awg' && c.size === '14'));
}

function branchCables(ctx: AnalysisContext, source: string): DiagramCable[] {
  const ids = [...ctx.topo.branch(source, 'pos').cables, ...ctx.topo.branch(source, 'neg').cables];
  return [...new Set(ids)].map((id) => ctx.topo.cables.get(id)!);
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : x.toFixed(1));

/** Sizing suggestions for every battery / string branch of a diagram. */
export function suggestSizing(doc: DiagramDocument): SizingResult {
  const built = buildContext(doc);
  if (!built.ok) return { ok: false, errors: built.errors };
  const ctx = built.ctx;
  const load = solveLoadCase(ctx);
  if ('error' in load) return { ok: false, errors: [load.error] };
  const op = load.op;
  const sweep = faultSweep(ctx, prepareFaults(ctx));
  const s = ctx.settings;
  const inv = inverterDcPowers_W(ctx);
  const actual = inv.reduce((a, b) => a + b.actual_W, 0);
  const rated = inv.reduce((a, b) => a + Math.max(b.rated_W, b.actual_W), 0);
  const fullScale = actual > 0 ? rated / actual : 1;
  const branches: BranchSizing[] = [];
  for (const u of ctx.units) {
    const share = Math.max(0, op.sources[u.id]?.current_A ?? 0);
    const full = share * fullScale;
    const required = Math.max(share * s.designMargin, full);
    const rating = nextStandardRating(required) ?? 6000;
    const existing = u.fuses.length ? (ctx.topo.parts.get(u.fuses[0]) as Extract<DiagramPart, { type: 'fuse' }>) : null;
    const cables = branchCables(ctx, u.id);
    const prospective = Math.max(0, ...cables.map((c) => sweep.maxByCable[c.id]?.current_A ?? 0), existing ? sweep.maxByFuse[existing.id]?.current_A ?? 0 : 0);
    const fits = (id: FuseClassId) => {
      const c = FUSE_CLASSES[id];
      return c.voltage_V >= s.systemVoltage_V && c.interrupting_A >= prospective && rating >= c.ratings_A.min && rating <= c.ratings_A.max;
    };
    const fuseClass = existing && fits(existing.props.fuseClass) ? existing.props.fuseClass : CLASS_PREFERENCE.find(fits) ?? 'class_t';
    // Smallest conductor (same system as the branch's first cable) that carries the rating and keeps the drop.
    const sized = cables.filter((c) => c.props.length_m > 0);
    const present = (sized[0] ?? cables[0])?.props.conductor ?? { system: 'awg', size: '2/0' };
    let pick: ConductorSize | null = null;
    let pickAmp = 0;
    let pickBasis: CableAmpacity | null = null;
    let pickDrop = 0;
    let limitedBy: 'ampacity' | 'drop' = 'ampacity';
    for (const size of candidates(present)) {
      // The shortest-rated run of the branch with this conductor, each run at its own insulation rating.
      const reads = sized.map((c) => cableAmpacity({ ...c.props, conductor: size }, s));
      const amps = Math.min(...reads.map((a) => a?.amps ?? 0));
      if (sized.length && !(amps >= rating)) continue;
      const r = sized.reduce((sum, c) => sum + cableRunConductorResistance_ohm({ ...c.props, conductor: size }, cableTemperature_C(c.props, s.ambient_C)) + (c.props.lugFrom_ohm ?? 0) + (c.props.lugTo_ohm ?? 0), 0);
      const drop = ((share * r) / s.systemVoltage_V) * 100;
      if (drop > s.voltageDropLimit_pct) {
        limitedBy = 'drop';
        continue;
      }
      pick = size;
      pickAmp = sized.length ? amps : Infinity;
      pickBasis = reads.find((a) => a !== null && a.amps === amps) ?? null;
      pickDrop = drop;
      break;
    }
    const conductor = pick ?? candidates(present).at(-1)!;
    const label = ctx.topo.parts.get(u.id)?.label || u.id;
    const insulationNote = pickBasis?.limitedBy === 'insulation' && pickBasis.note ? `, ${pickBasis.note}` : '';
    const reasoning = [
      `${label} carries ${fmt(share)} A in the load case${fullScale > 1.0001 ? ` (${fmt(full)} A at the inverters' rated power)` : ''}.`,
      `${fmt(share)} A × ${s.designMargin} = ${fmt(share * s.designMargin)} A${fullScale > 1.0001 ? `; the larger of that and ${fmt(full)} A is ${fmt(required)} A` : ''}, so the next standard rating is ${rating} A (NEC 240.6(A)).`,
      !sized.length
        ? `The branch has no cable run of its own (its connections are bolted directly), so no conductor is sized for it.`
        : pick
        ? `${sizeLabel(conductor)} is the smallest conductor whose corrected ampacity (${fmt(pickAmp)} A, ${s.ampacityTable}${insulationNote}) carries ${rating} A (NEC 240.4)${limitedBy === 'drop' ? ` and keeps the branch drop within ${s.voltageDropLimit_pct} %` : ''}; branch drop ${pickDrop.toFixed(2)} %.`
        : `No listed conductor carries ${rating} A within a ${s.voltageDropLimit_pct} % drop; the largest listed size is suggested — split the load over more batteries or shorten the runs.`,
      existing ? '' : `There is no fuse in this branch: a ${FUSE_CLASSES[fuseClass].name} fuse is added at the positive post.`,
    ].filter(Boolean).join(' ');
    branches.push({
      source: u.id,
      share_A: share,
      fullPower_A: full,
      required_A: required,
      fuse: { part: existing?.id ?? null, rating_A: rating, fuseClass, ...(existing ? { present_A: existing.props.rating_A } : {}) },
      cables: cables.map((c) => ({ id: c.id, conductor, present: c.props.conductor })),
      ampacity_A: Number.isFinite(pickAmp) ? pickAmp : 0,
      ...(pickBasis?.limitedBy === 'insulation' ? { ampacityLimitedBy: 'insulation' as const } : {}),
      branchDrop_pct: pickDrop,
      reasoning,
    });
  }
  return { ok: true, branches };
}

function uniqueId(doc: DiagramDocument, base: string): string {
  const used = new Set<string>([...doc.parts.map((p) => p.id), ...doc.cables.map((c) => c.id), ...doc.annotations.map((a) => a.id)]);
  if (!used.has(base)) return base;
  for (let i = 2; ; i++) if (!used.has(`${base}-${i}`)) return `${base}-${i}`;
}

/**
 * A new document with the suggestions applied: the branch's fuse re-rated (or a fuse added bolted to the
 * positive post when the branch has none) and its cables set to the suggested conductor.
 */
export function applySizing(doc: DiagramDocument, suggestion: BranchSizing | BranchSizing[]): DiagramDocument {
  const list = Array.isArray(suggestion) ? suggestion : [suggestion];
  let next: DiagramDocument = structuredClone(doc);
  for (const sug of list) {
    const sizes = new Map(sug.cables.map((c) => [c.id, c.conductor]));
    next.cables = next.cables.map((c) => (sizes.has(c.id) ? { ...c, props: { ...c.props, conductor: sizes.get(c.id)! } } : c));
    if (sug.fuse.part) {
      next.parts = next.parts.map((p) => {
        if (p.id !== sug.fuse.part || p.type !== 'fuse') return p;
        const props: FuseProps = p.props.fuseClass === sug.fuse.fuseClass ? { ...p.props, rating_A: sug.fuse.rating_A, cold_r_ohm: undefined } : fuseDefaults(sug.fuse.fuseClass, sug.fuse.rating_A);
        delete (props as Partial<FuseProps>).cold_r_ohm;
        return { ...p, props };
      });
      continue;
    }
    const battery = next.parts.find((p) => p.id === sug.source);
    const first = next.cables.find((c) => (c.from.part === sug.source && c.from.terminal === 'pos') || (c.to.part === sug.source && c.to.terminal === 'pos'));
    if (!battery || !first) continue;
    const fuseId = uniqueId(next, `fuse-${sug.source}`);
    const linkId = uniqueId(next, `c-${sug.source}-fuse`);
    const fusePart = {
      id: fuseId, type: 'fuse' as const, label: `Fuse ${battery.label || battery.id}`.trim(),
      position: { x: battery.position.x, y: battery.position.y - 100 }, rotation: 0 as const,
      props: fuseDefaults(sug.fuse.fuseClass, sug.fuse.rating_A),
    };
    next.parts = [...next.parts, fusePart];
    next.cables = next.cables.map((c) => {
      if (c.id !== first.id) return c;
      const atFrom = c.from.part === sug.source && c.from.terminal === 'pos';
      return { ...c, ...(atFrom ? { from: { part: fuseId, terminal: 'b' } } : { to: { part: fuseId, terminal: 'b' } }) };
    });
    next.cables.push({
      id: linkId, from: { part: sug.source, terminal: 'pos' }, to: { part: fuseId, terminal: 'a' },
      props: { ...first.props, conductor: sizes.get(first.id) ?? first.props.conductor, length_m: 0, lugFrom_ohm: undefined, lugTo_ohm: undefined },
      label: 'Fuse on the post',
    });
    next = { ...next };
  }
  return diagramSchema.parse(JSON.parse(JSON.stringify(next)));
}
