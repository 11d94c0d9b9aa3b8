/**
 * Rules on what the bank must survive beyond the load case as drawn:
 * - n-minus-one: with any one unit disconnected (its BMS or fuse open), the others' currents against
 *   their fuse ratings, cable ampacities and maximum continuous currents (the N-1 study,
 *   analysis/contingency.ts);
 * - inverter-surge: an inverter's surge current against each battery's pulse limit and the fuses that
 *   carry it.
 * Findings are design observations, never an approval to install.
 */
import type { AnalysisContext } from '../analysis/context';
import type { Finding } from '../analysis/types';
import { unitLimits } from '../parts/battery';
import { inverterSurge_s, inverterSurge_W } from '../parts/loads';
import { PART_TYPES } from '../parts/registry';
import type { Rule, RuleInput } from './registry';

/** "166.7 A", "1,250 A". */
function amps(x: number): string {
  const a = Math.abs(x);
  return a >= 1000 ? `${Math.round(x).toLocaleString('en-US')} A` : a >= 100 ? `${x.toFixed(0)} A` : `${x.toFixed(1)} A`;
}
const pct = (x: number) => `${x.toFixed(0)} %`;
const watts = (x: number) => (x >= 1000 ? `${(x / 1000).toFixed(x % 1000 === 0 ? 0 : 1)} kW` : `${x.toFixed(0)} W`);
const seconds = (x: number) => `${Number(x.toPrecision(3))} s`;

/** What a terminal faces, in the trade's words: + / −, a fuse's battery or bank side, a busbar's tap. */
function terminalWord(input: RuleInput, part: string, terminal: string): string {
  if (terminal === 'pos') return '+';
  if (terminal === 'neg') return '\u2212';
  if (input.topo.parts.get(part)?.type === 'fuse') return terminal === 'a' ? 'battery side' : 'bank side';
  return terminal;
}

/** A part or cable as the user knows it: its label, else its kind and id; an unlabelled cable by its two ends. */
function label(input: RuleInput, id: string): string {
  const p = input.topo.parts.get(id);
  if (p) return p.label || `${PART_TYPES[p.type].name} ${p.id}`;
  const c = input.topo.cables.get(id);
  if (c) {
    if (c.label) return c.label;
    const endText = (e: { part: string; terminal: string }) => `${label(input, e.part)} (${terminalWord(input, e.part, e.terminal)})`;
    return `the cable ${endText(c.from)} to ${endText(c.to)}`;
  }
  return id;
}

/** Above a limit, allowing for rounding in the solution. */
const over = (i: number, limit: number) => i > limit * (1 + 1e-9);

// --- N-1 ----------------------------------------------------------------------------------------------------

interface Exceeded {
  kind: 'battery' | 'fuse' | 'cable';
  id: string;
  current_A: number;
  limit_A: number;
}

function limitText(e: Exceeded): string {
  switch (e.kind) {
    case 'battery':
      return `maximum continuous current of ${amps(e.limit_A)}`;
    case 'fuse':
      return `${amps(e.limit_A)} rating`;
    case 'cable':
      return `ampacity of ${amps(e.limit_A)}`;
  }
}

export const nMinusOne: Rule = {
  id: 'n-minus-one',
  title: 'With one battery disconnected, another part is over its limit',
  severity: 'warning',
  basis: 'common practice (a bank in parallel must keep working with any one battery\u2019s BMS or fuse open)',
  needs: 'n1',
  check(input) {
    const ctx = input.ctx!;
    const base = input.load!;
    const out: Finding[] = [];
    for (const c of input.contingency!.cases) {
      const unitName = label(input, c.unit);
      if (!c.ok) {
        out.push({
          id: this.id, severity: 'warning', basis: this.basis, parts: c.error.parts,
          message: `With ${unitName} disconnected, the rest of the bank could not be solved carrying the load: ${c.error.message}.`,
          suggestion: 'Check that every other battery can carry the load on its own wiring.',
        });
        continue;
      }
      // Parts already over their limit in the load case are reported by the load-case rules.
      const found: Exceeded[] = [];
      for (const [id, i] of Object.entries(c.sources)) {
        const u = ctx.unitById.get(id);
        if (!u || !over(i, u.maxContinuous_A) || over(base.sources[id]?.current_A ?? 0, u.maxContinuous_A)) continue;
        found.push({ kind: 'battery', id, current_A: i, limit_A: u.maxContinuous_A });
      }
      for (const f of input.topo.fuses) {
        const i = Math.abs(c.fuses[f.id] ?? 0);
        if (!over(i, f.props.rating_A) || over(Math.abs(base.parts[f.id]?.current_A ?? 0), f.props.rating_A)) continue;
        found.push({ kind: 'fuse', id: f.id, current_A: i, limit_A: f.props.rating_A });
      }
      for (const [id, signed] of Object.entries(c.cables)) {
        const amp = ctx.ampacity_A.get(id);
        const i = Math.abs(signed);
        if (amp === null || amp === undefined || !over(i, amp) || over(Math.abs(base.cables[id]?.current_A ?? 0), amp)) continue;
        found.push({ kind: 'cable', id, current_A: i, limit_A: amp });
      }
      if (!found.length && !c.loadsBelowCutoff.length) continue;
      found.sort((a, b) => b.current_A / b.limit_A - a.current_A / a.limit_A);
      const sentences: string[] = [];
      if (found.length) {
        const [worst, ...rest] = found;
        sentences.push(
          `With ${unitName} disconnected (its BMS or fuse open), ${label(input, worst.id)} carries ${amps(worst.current_A)}, ${pct((worst.current_A / worst.limit_A) * 100)} of its ${limitText(worst)}.`,
        );
        if (rest.length) {
          sentences.push(`Also over: ${rest.map((e) => `${label(input, e.id)} ${amps(e.current_A)} (${limitText(e)})`).join('; ')}.`);
        }
      } else {
        sentences.push(`With ${unitName} disconnected (its BMS or fuse open), the rest of the bank carries the load.`);
      }
      if (c.loadsBelowCutoff.length) {
        sentences.push(`${c.loadsBelowCutoff.map((id) => label(input, id)).join(', ')} then ${c.loadsBelowCutoff.length > 1 ? 'fall' : 'falls'} below ${c.loadsBelowCutoff.length > 1 ? 'their' : 'its'} low-voltage cut-off.`);
      }
      out.push({
        id: this.id,
        severity: found.some((e) => e.kind === 'battery') ? 'error' : 'warning',
        basis: this.basis,
        parts: [c.unit, ...found.map((e) => e.id), ...c.loadsBelowCutoff],
        message: sentences.join(' '),
        suggestion: 'Size each battery\u2019s fuse and cable for its current with one battery out (sizing does), or add capacity so the others stay within their limits.',
      });
    }
    return out;
  },
};

// --- Inverter surge -----------------------------------------------------------------------------------------

/** Bank voltage used for the inverter's DC current: the bank's nominal, else the system voltage. */
function bankVoltage(ctx: AnalysisContext): number {
  return ctx.bankNominal_V > 0 ? ctx.bankNominal_V : ctx.settings.systemVoltage_V;
}

/** Surge current over a fuse's rating above which the surge is a warning rather than a note (from memory). */
const SURGE_FUSE_WARNING_RATIO = 2;

export const inverterSurge: Rule = {
  id: 'inverter-surge',
  title: 'Inverter surge above a battery\u2019s pulse limit or a fuse\u2019s rating',
  severity: 'warning',
  basis:
    'first principles (I = P / (V × efficiency)); the surge divides between the batteries as the load-case current does ' +
    '(the network is nearly linear for resistive paths); battery pulse rating; common practice for fuses (the time–current curve must allow the surge)',
  needs: 'load',
  check(input) {
    const ctx = input.ctx!;
    const load = input.load!;
    const out: Finding[] = [];
    const vBank = bankVoltage(ctx);
    if (!(vBank > 0)) return out;
    // The bank current of the load case (Σ I·V_nom / V_bank: parallel currents add, series do not).
    const bank = load.bankCurrent_A;
    const flowing = bank > 1e-6;
    const sumCV = ctx.units.reduce((s, u) => s + u.capacity_Ah * u.nominal_V, 0);
    // Fuses in a load's own feed carry that load's current only.
    const feedFuses = new Map<string, Set<string>>();
    for (const l of input.topo.loads) {
      const set = new Set<string>();
      for (const t of ['pos', 'neg']) for (const id of input.topo.branch(l.id, t).inLineParts) if (input.topo.parts.get(id)?.type === 'fuse') set.add(id);
      feedFuses.set(l.id, set);
    }
    const unitFuse = new Map<string, string>();
    for (const u of ctx.units) for (const f of u.fuses) unitFuse.set(f, u.id);

    for (const inv of input.topo.loads) {
      if (inv.type !== 'inverter') continue;
      const surge_W = inverterSurge_W(inv.props);
      const surge_s = inverterSurge_s(inv.props);
      // Surge DC current at the bank's nominal voltage (first principles: I = P / (V × efficiency)).
      const iSurge = surge_W / (vBank * inv.props.efficiency);
      const iNow = Math.abs(load.parts[inv.id]?.current_A ?? 0);
      const extra = Math.max(0, iSurge - iNow);
      if (extra <= 0) continue;
      const k = flowing ? (bank + extra) / bank : 0;
      const head = `During ${label(input, inv.id)}\u2019s surge (${watts(surge_W)} for ${seconds(surge_s)}, about ${amps(iSurge)} from the bank at ${vBank.toFixed(1)} V and ${(inv.props.efficiency * 100).toFixed(0)} % efficiency)`;
      const unitSurge = new Map<string, number>();
      for (const u of ctx.units) {
        // Proportional to the load-case current; with no current in the load case, to capacity.
        const i = flowing ? Math.max(0, load.sources[u.id]?.current_A ?? 0) * k : sumCV > 0 ? (iSurge * vBank * u.capacity_Ah) / sumCV : 0;
        unitSurge.set(u.id, i);
        const lim = unitLimits(u.members);
        const pulseCovers = surge_s <= lim.pulse_s;
        const limit = pulseCovers ? lim.maxPulse_A : lim.maxContinuous_A;
        if (!over(i, limit)) continue;
        out.push({
          id: this.id, severity: this.severity, basis: this.basis, parts: [inv.id, u.id],
          message: pulseCovers
            ? `${head}, ${label(input, u.id)} would deliver about ${amps(i)}, above its pulse limit of ${amps(limit)} (for ${seconds(lim.pulse_s)}).`
            : `${head}, ${label(input, u.id)} would deliver about ${amps(i)} for longer than its ${seconds(lim.pulse_s)} pulse rating, above its maximum continuous current of ${amps(limit)}.`,
          suggestion: 'Add batteries in parallel, choose batteries with a higher pulse rating, or limit the inverter\u2019s surge (soft-start loads).',
        });
      }
      const own = feedFuses.get(inv.id)!;
      const others = new Set<string>();
      for (const [id, set] of feedFuses) if (id !== inv.id) for (const f of set) others.add(f);
      for (const f of input.topo.fuses) {
        let i: number;
        if (own.has(f.id)) i = iSurge;
        else if (unitFuse.has(f.id)) i = unitSurge.get(unitFuse.get(f.id)!) ?? 0;
        else if (others.has(f.id) || !flowing) continue;
        else i = Math.abs(load.parts[f.id]?.current_A ?? 0) * k;
        if (!over(i, f.props.rating_A)) continue;
        // Up to twice its rating a fuse usually holds for longer than an inverter's surge lasts (from memory;
        // UL 248 fuses carry 110 % indefinitely and open at 135 % within an hour or two): a note to check the
        // curve. Above twice its rating a fast fuse can open within seconds: a warning.
        const ratio = i / f.props.rating_A;
        out.push({
          id: this.id, severity: ratio > SURGE_FUSE_WARNING_RATIO ? 'warning' : 'note', basis: this.basis, parts: [inv.id, f.id],
          message: `${head}, ${label(input, f.id)} would carry about ${amps(i)}, ${pct((i / f.props.rating_A) * 100)} of its ${amps(f.props.rating_A)} rating: its time–current curve must allow ${seconds(surge_s)} at that current.`,
          suggestion: 'Check the fuse maker\u2019s time–current curve for this current and duration; choose a time-delay fuse or a higher rating (with a cable to match) if it would open.',
        });
      }
    }
    return out;
  },
};
