/**
 * The rule checks. Each is a small function over the diagram, the solved load case and the fault sweep;
 * see registry.ts for how to add one. Numbers in messages are rounded for reading; the figures keep full
 * precision.
 */
import { type CableAmpacity, cableAmpacity } from '../analysis/context';
import { branchesToBusbar, postToPostChains } from '../analysis/topology';
import type { Finding } from '../analysis/types';
import { CHEMISTRIES } from '../tables/batteries';
import type { Rule, RuleInput } from './registry';
import { inverterSurge, nMinusOne } from './contingency';
import { allBatteries, amps, cap, distinct, name, pct, volts } from './helpers';
import {
  bankChargeVoltage, bankContinuous, bankOverContinuous, batteryDisconnectMissing, batteryFuseDistance,
  mainOvercurrentMissing, shortCable,
} from './protection';

export { amps } from './helpers';

// --- Document rules ------------------------------------------------------------------------------------

const structural: Rule = {
  id: 'structure',
  title: 'Wiring errors that stop the analysis',
  severity: 'error',
  basis: 'first principles',
  needs: 'document',
  check: (input) =>
    input.compileErrors.map((e) => ({
      id: `structure-${e.code.replace(/_/g, '-')}`,
      severity: 'error' as const,
      parts: e.parts,
      message: e.message,
      basis: 'first principles',
    })),
};

const mixedChemistry: Rule = {
  id: 'mixed-chemistry',
  title: 'Batteries of different chemistries in one bank',
  severity: 'error',
  basis: 'common practice (each chemistry has its own charge voltages and resting curve)',
  needs: 'document',
  check(input) {
    const all = allBatteries(input);
    const chems = distinct(all.map((x) => x.b.chemistry));
    if (chems.length < 2) return [];
    return [{
      id: this.id, severity: this.severity, basis: this.basis,
      parts: distinct(all.map((x) => x.part)),
      message: `The bank mixes ${chems.map((c) => CHEMISTRIES[c].name).join(' and ')}: they charge to different voltages and do not share current evenly.`,
      suggestion: 'Use one chemistry per bank, or separate the banks with their own chargers.',
    }];
  },
};

const mixedNominal: Rule = {
  id: 'mixed-nominal-voltage',
  title: 'Batteries of different nominal voltage',
  severity: 'warning',
  basis: 'common practice',
  needs: 'document',
  check(input) {
    const all = allBatteries(input);
    const vs = distinct(all.map((x) => x.b.nominal_V));
    if (vs.length < 2) return [];
    return [{
      id: this.id, severity: this.severity, basis: this.basis,
      parts: distinct(all.map((x) => x.part)),
      message: `Batteries of ${vs.map((v) => `${v} V`).join(', ')} nominal are used together.`,
      suggestion: 'Build the bank from batteries of one nominal voltage.',
    }];
  },
};

/** Six months, in days: the usual limit on the age difference of lead-acid batteries in one bank (common practice). */
const MAX_AGE_SPREAD_DAYS = 182.5;

const mixedCapacityOrAge: Rule = {
  id: 'mixed-capacity-or-age',
  title: 'Batteries of different capacity or (lead-acid) age',
  severity: 'warning',
  basis: 'common practice (lead-acid: no more than about 6 months apart in age)',
  needs: 'document',
  check(input) {
    const out: Finding[] = [];
    const all = allBatteries(input);
    const caps = distinct(all.map((x) => x.b.capacity_Ah));
    if (caps.length > 1) {
      out.push({
        id: this.id, severity: this.severity, basis: 'common practice',
        parts: distinct(all.map((x) => x.part)),
        message: `Capacities differ (${caps.map((c) => `${c} Ah`).join(', ')}): the smaller batteries cycle deeper unless their resistance is in proportion.`,
        suggestion: 'Use batteries of one capacity, or check the share figures for each battery.',
      });
    }
    const lead = all.filter((x) => CHEMISTRIES[x.b.chemistry].mixingAgeRuleApplies);
    const ageDays = lead
      .map((x) => ({ part: x.part, days: x.b.installDate ? Date.parse(x.b.installDate) / 86_400_000 : x.b.age_years !== undefined ? -x.b.age_years * 365.25 : null }))
      .filter((x): x is { part: string; days: number } => x.days !== null && Number.isFinite(x.days));
    if (ageDays.length > 1) {
      const lo = Math.min(...ageDays.map((x) => x.days));
      const hi = Math.max(...ageDays.map((x) => x.days));
      if (hi - lo > MAX_AGE_SPREAD_DAYS) {
        out.push({
          id: this.id, severity: this.severity, basis: this.basis,
          parts: distinct(ageDays.map((x) => x.part)),
          message: `Lead-acid batteries in this bank are ${((hi - lo) / 30.44).toFixed(0)} months apart in age (more than 6 months): the older ones hold the newer ones back.`,
          suggestion: 'Replace lead-acid batteries as a set.',
        });
      }
    }
    return out;
  },
};

const parallelWithoutFuse: Rule = {
  id: 'parallel-battery-without-fuse',
  title: 'A battery in parallel without its own fuse',
  severity: 'warning',
  basis: 'ABYC E-11 (battery conductor protected close to the battery, 7 in); common practice for each battery in parallel',
  needs: 'document',
  check(input) {
    if (!input.ctx || input.ctx.units.length < 2) return [];
    return input.ctx.units.filter((u) => u.fuses.length === 0).map((u) => ({
      id: this.id, severity: this.severity, basis: this.basis, parts: [u.id],
      message: `${cap(name(input, u.id))} is in parallel with ${input.ctx!.units.length - 1} other${input.ctx!.units.length > 2 ? 's' : ''} but has no fuse of its own: a fault in it would be fed by the rest of the bank.`,
      suggestion: 'Fit a fuse at its positive post (sizing suggests a rating).',
    }));
  },
};

/** Cables a fuse protects: the runs on both sides up to the first junction. */
function protectedCables(input: RuleInput, fuseId: string): string[] {
  return distinct([...input.topo.branch(fuseId, 'a').cables, ...input.topo.branch(fuseId, 'b').cables]);
}

/**
 * How a cable's ampacity was read, for messages: "nec-310.16-75C, corrected", or with the insulation
 * limit named ("nec-310.16-75C, 60 °C insulation: read from the 60 °C column, corrected").
 */
function ampacityBasis(input: RuleInput, a: Pick<CableAmpacity, 'limitedBy' | 'note'> & { derating?: CableAmpacity['derating'] }): string {
  const table = input.doc.settings.ampacityTable;
  const base = a.limitedBy === 'insulation' && a.note ? `${table}, ${a.note}, corrected` : `${table}, corrected`;
  const terminal = a.derating?.factors.find((f) => f.kind === 'terminal' && f.factor < 1);
  return terminal ? `${base}; ${terminal.name.charAt(0).toLowerCase()}${terminal.name.slice(1)} (NEC 110.14(C))` : base;
}

const terminalLimited = (a: { derating?: CableAmpacity['derating'] } | null | undefined) =>
  !!a?.derating?.factors.some((f) => f.kind === 'terminal' && f.factor < 1);

/** A suggestion for a cable whose ampacity is short, naming what limited it. */
function ampacitySuggestion(limitedBy: 'table' | 'insulation', byTerminals: boolean, orFuse: boolean): string {
  const options = ['a larger cable'];
  if (limitedBy === 'insulation') options.push('cable with higher-rated insulation');
  if (byTerminals) options.push('terminations rated for a higher temperature');
  if (orFuse) options.push('a smaller fuse');
  return `Use ${options.length > 1 ? `${options.slice(0, -1).join(', ')} or ${options[options.length - 1]}` : options[0]}.`;
}

const fuseAboveAmpacity: Rule = {
  id: 'fuse-above-ampacity',
  title: 'Fuse rating above the ampacity of the cable it protects',
  severity: 'error',
  basis: 'NEC 240.4 (conductor protected at or below its ampacity; recalled)',
  needs: 'document',
  check(input) {
    const out: Finding[] = [];
    for (const f of input.topo.fuses) {
      for (const cid of protectedCables(input, f.id)) {
        const c = input.topo.cables.get(cid)!;
        const amp = cableAmpacity(c.props, input.doc.settings);
        if (amp === null || f.props.rating_A <= amp.amps + 1e-9) continue;
        out.push({
          id: this.id, severity: this.severity, basis: this.basis, parts: [f.id, cid],
          message: `${cap(name(input, f.id))} is rated ${amps(f.props.rating_A)} but ${name(input, cid)} carries only ${amps(amp.amps)} (${ampacityBasis(input, amp)}).`,
          suggestion: ampacitySuggestion(amp.limitedBy, terminalLimited(amp), true),
        });
      }
    }
    return out;
  },
};

const fuseVoltageRating: Rule = {
  id: 'fuse-voltage-rating',
  title: 'Fuse DC voltage rating below the bank\u2019s charging voltage',
  severity: 'error',
  basis: 'common practice (a DC fuse is rated at least the highest voltage of its circuit: the charging voltage, not the nominal)',
  needs: 'document',
  check(input) {
    const sys = input.doc.settings.systemVoltage_V;
    const charge = bankChargeVoltage(input);
    const out: Finding[] = [];
    for (const f of input.topo.fuses) {
      const v = f.props.voltage_rating_V;
      if (charge && charge.volts >= sys && v < charge.volts) {
        out.push({
          id: this.id, severity: this.severity, basis: this.basis, parts: [f.id],
          message: `${cap(name(input, f.id))} is rated ${v} V DC, below the bank's charging voltage of ${charge.volts.toFixed(1)} V (${charge.how}).`,
          suggestion: `Choose a fuse rated at least ${Math.ceil(charge.volts)} V DC (Class T fuses are made for 125–160 V DC and more).`,
        });
      } else if (v < sys) {
        out.push({
          id: this.id, severity: this.severity, basis: this.basis, parts: [f.id],
          message: `${cap(name(input, f.id))} is rated ${v} V DC, below the ${sys} V system voltage.`,
          suggestion: 'Choose a fuse class rated for the system voltage and the charging voltage above it.',
        });
      }
    }
    return out;
  },
};

const postToPostCount: Rule = {
  id: 'post-to-post-count',
  title: 'Too many batteries jumpered post to post',
  severity: 'warning',
  basis: 'common practice',
  needs: 'document',
  check(input) {
    const max = input.doc.settings.maxPostToPost;
    return postToPostChains(input.topo).filter((g) => g.length > max).map((g) => ({
      id: this.id, severity: this.severity, basis: this.basis, parts: g,
      message: `${g.length} batteries are chained post to post (more than ${max}): the batteries far from the take-off carry less of the load.`,
      suggestion: 'Wire the batteries to a positive and a negative busbar with equal-length cables.',
    }));
  },
};

const busbarLengthSpread: Rule = {
  id: 'busbar-cable-length-spread',
  title: 'Unequal battery cable lengths to a busbar',
  severity: 'warning',
  basis: 'common practice (equal resistance to each battery)',
  needs: 'document',
  check(input) {
    const tol = input.doc.settings.busbarLengthTolerance_pct;
    const out: Finding[] = [];
    for (const bus of input.topo.busbars) {
      const runs = branchesToBusbar(input.topo, bus.id);
      if (runs.length < 2) continue;
      const lo = Math.min(...runs.map((r) => r.length_m));
      const hi = Math.max(...runs.map((r) => r.length_m));
      const spread = lo > 0 ? ((hi - lo) / lo) * 100 : hi > 0 ? Infinity : 0;
      if (spread <= tol) continue;
      const shortest = runs.find((r) => r.length_m === lo)!;
      const longest = runs.find((r) => r.length_m === hi)!;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis,
        parts: [bus.id, ...distinct(runs.flatMap((r) => r.cables))],
        message: `Cable runs to ${name(input, bus.id)} range from ${lo.toFixed(2)} m (${name(input, shortest.source)}) to ${hi.toFixed(2)} m (${name(input, longest.source)}), ${Number.isFinite(spread) ? pct(spread) : 'unbounded'} apart (tolerance ${tol} %).`,
        suggestion: 'Make the battery cables the same length (the optimizer can equalise them).',
      });
    }
    return out;
  },
};

const bothLeadsOneBattery: Rule = {
  id: 'both-leads-one-battery',
  title: 'Both main leads taken from one battery',
  severity: 'warning',
  basis: 'first principles (the take-off battery carries the most current); common practice: diagonal take-off or busbars',
  needs: 'document',
  check(input) {
    if (input.topo.sources.length < 2) return [];
    const out: Finding[] = [];
    for (const load of input.topo.loads) {
      const p = input.topo.branch(load.id, 'pos').end;
      const n = input.topo.branch(load.id, 'neg').end;
      const part = input.topo.parts.get(p.part);
      if (p.part !== n.part || !part || (part.type !== 'battery' && part.type !== 'series_string')) continue;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis, parts: [load.id, p.part],
        message: `${cap(name(input, load.id))} takes both its positive and negative from ${name(input, p.part)}: that battery carries more than its share.`,
        suggestion: 'Take the negative from the battery at the other end of the bank (diagonal), or use busbars.',
      });
    }
    return out;
  },
};

// --- Load-case rules ---------------------------------------------------------------------------------------

const fuseBelowDesignCurrent: Rule = {
  id: 'fuse-below-design-current',
  title: 'Fuse rating below the expected current × design margin',
  severity: 'warning',
  basis: 'NEC 210.20(A) / 215.3 (125 % of continuous load); common practice 1.25–1.5 over each battery\u2019s share',
  needs: 'load',
  check(input) {
    const margin = input.doc.settings.designMargin;
    const out: Finding[] = [];
    for (const f of input.topo.fuses) {
      const i = Math.abs(input.load!.parts[f.id]?.current_A ?? 0);
      if (f.props.rating_A + 1e-9 >= i * margin) continue;
      out.push({
        id: this.id, severity: i > f.props.rating_A ? 'error' : this.severity, basis: this.basis, parts: [f.id],
        message: `${cap(name(input, f.id))} carries ${amps(i)} in the load case; × ${margin} margin needs at least ${amps(i * margin)}, but it is rated ${amps(f.props.rating_A)}.`,
        suggestion: 'Use the next standard rating above the expected current × margin (see sizing), and a cable to match.',
      });
    }
    return out;
  },
};

const cableOverAmpacity: Rule = {
  id: 'cable-over-ampacity',
  title: 'Cable current above its ampacity',
  severity: 'error',
  basis: 'NEC 310.16 / 33 CFR 183.425 ampacity tables with temperature and bundling correction',
  needs: 'load',
  check(input) {
    const out: Finding[] = [];
    for (const [id, c] of Object.entries(input.load!.cables)) {
      if (c.ampacity_A === null || Math.abs(c.current_A) <= c.ampacity_A) continue;
      const limited = c.ampacityLimitedBy === 'insulation';
      const byTerminals = terminalLimited({ derating: c.ampacityDerating });
      const terminal = c.ampacityDerating?.factors.find((x) => x.kind === 'terminal' && x.factor < 1);
      const notes = [...(limited && c.ampacityNote ? [c.ampacityNote] : []), ...(terminal ? [terminal.name] : [])];
      out.push({
        id: this.id, severity: this.severity, parts: [id],
        basis: ampacityBasis(input, { limitedBy: limited ? 'insulation' : 'table', note: c.ampacityNote, derating: c.ampacityDerating }),
        message: `${cap(name(input, id))} carries ${amps(Math.abs(c.current_A))}, above its ampacity of ${amps(c.ampacity_A)} (${pct(c.utilisation_pct ?? 0)}${notes.map((n) => `; ${n}`).join('')}).`,
        suggestion: ampacitySuggestion(limited ? 'insulation' : 'table', byTerminals, false),
      });
    }
    return out;
  },
};

const voltageDrop: Rule = {
  id: 'voltage-drop',
  title: 'Voltage drop above the limit',
  severity: 'warning',
  basis: 'NEC 210.19(A) informational note (3 % branch circuit); ABYC E-11 (3 % for critical circuits)',
  needs: 'load',
  check(input) {
    const limit = input.doc.settings.voltageDropLimit_pct;
    const out: Finding[] = [];
    for (const load of input.topo.loads) {
      const f = input.load!.parts[load.id];
      if (!f || f.drop_pct === undefined || f.drop_pct <= limit) continue;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis, parts: [load.id],
        message: `${cap(name(input, load.id))} sees ${volts(f.voltage_V ?? 0)}: a wiring drop of ${volts(f.drop_V ?? 0)}, ${pct(f.drop_pct)} of ${input.doc.settings.systemVoltage_V} V (limit ${limit} %).`,
        suggestion: 'Shorten the runs or use larger conductors.',
      });
    }
    return out;
  },
};

const batteryOverContinuous: Rule = {
  id: 'battery-over-continuous',
  title: 'Battery current above its continuous discharge limit',
  severity: 'error',
  basis: 'battery rating (max_continuous_A, else max C-rate × capacity, else the chemistry\u2019s typical C-rate, from memory)',
  needs: 'load',
  check(input) {
    const out: Finding[] = [];
    const bank = bankContinuous(input);
    for (const [id, s] of Object.entries(input.load!.sources)) {
      if (s.current_A <= s.maxContinuous_A) continue;
      const limitC = s.maxContinuous_A / s.capacity_Ah;
      const bankNote = bank && bank.units > 1
        ? ` The bank as a whole runs at ${bank.cRate.toFixed(2)} C against its batteries' combined limit of ${bank.limitC.toFixed(2)} C.`
        : '';
      const bankWithin = bank !== null && bank.units > 1 && bank.current_A <= bank.limit_A;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis, parts: [id],
        message: `${cap(name(input, id))} delivers ${amps(s.current_A)} (${s.cRate.toFixed(2)} C), above its continuous limit of ${amps(s.maxContinuous_A)} (${limitC.toFixed(2)} C).${bankNote}`,
        suggestion: bankWithin
          ? 'The bank is large enough: balance it so this battery carries less (equal cable runs, diagonal take-off or busbars; see the optimizer).'
          : 'Add batteries in parallel or reduce the load.',
      });
    }
    return out;
  },
};

const imbalance: Rule = {
  id: 'current-imbalance',
  title: 'Current shares out of balance',
  severity: 'warning',
  basis: 'common practice',
  needs: 'load',
  check(input) {
    const lim = input.doc.settings.imbalanceThreshold_pct;
    const op = input.load!;
    if (op.imbalance_pct <= lim) return [];
    const entries = Object.entries(op.sources).filter(([, s]) => s.idealShare_pct > 0);
    const ratio = (s: (typeof entries)[number][1]) => s.share_pct / s.idealShare_pct;
    const hi = entries.reduce((a, b) => (ratio(b[1]) > ratio(a[1]) ? b : a));
    const lo = entries.reduce((a, b) => (ratio(b[1]) < ratio(a[1]) ? b : a));
    return [{
      id: this.id, severity: this.severity, basis: this.basis, parts: [hi[0], lo[0]],
      message: `Bank imbalance ${pct(op.imbalance_pct)} (limit ${lim} %): ${name(input, hi[0])} carries ${amps(hi[1].current_A)} (${pct(hi[1].share_pct)} against an ideal ${pct(hi[1].idealShare_pct)}), ${name(input, lo[0])} ${amps(lo[1].current_A)} (${pct(lo[1].share_pct)}).`,
      suggestion: 'Move the take-off (see the optimizer), or equalise cable lengths to the busbars.',
    }];
  },
};

// --- Fault rules -------------------------------------------------------------------------------------------

const interruptingRating: Rule = {
  id: 'interrupting-rating',
  title: 'Interrupting rating below the prospective fault current',
  severity: 'error',
  basis: 'common practice (interrupting rating at least the prospective short-circuit current; ABYC E-11 wording recalled)',
  needs: 'faults',
  check(input) {
    const out: Finding[] = [];
    const sweep = input.faults!;
    for (const f of input.topo.fuses) {
      const m = sweep.maxByFuse[f.id];
      if (!m || m.current_A <= f.props.interrupting_A) continue;
      const c = sweep.cases[m.case];
      out.push({
        id: this.id, severity: this.severity, basis: this.basis, parts: [f.id, ...(c ? [c.part] : [])],
        message: `${cap(name(input, f.id))} may have to break ${amps(m.current_A)}${c ? ` (${c.label})` : ''}, above its interrupting rating of ${amps(f.props.interrupting_A)}.`,
        suggestion: 'Use a fuse class with a higher DC interrupting rating (e.g. Class T).',
      });
    }
    return out;
  },
};

/** Every rule, in the order findings of equal severity are listed. */
export const RULES: readonly Rule[] = [
  structural,
  mainOvercurrentMissing,
  batteryDisconnectMissing,
  mixedChemistry,
  mixedNominal,
  mixedCapacityOrAge,
  parallelWithoutFuse,
  batteryFuseDistance,
  fuseAboveAmpacity,
  fuseVoltageRating,
  interruptingRating,
  fuseBelowDesignCurrent,
  cableOverAmpacity,
  voltageDrop,
  batteryOverContinuous,
  bankOverContinuous,
  nMinusOne,
  inverterSurge,
  postToPostCount,
  busbarLengthSpread,
  imbalance,
  bothLeadsOneBattery,
  shortCable,
];
