/**
 * The protection checks an installer makes first: a main overcurrent device in every feed, a battery
 * disconnect, the battery fuse close to its post (marine rule set), the bank's C-rate against its
 * batteries' continuous limits, and cable runs too short to be real. Findings are design observations,
 * never an approval to install.
 */
import type { DiagramPart } from '../document/schema';
import { terminalsOf } from '../document/schema';
import { bankChargeVoltage as chargeVoltageOf } from '../analysis/bank';
import { ownFuses, terminalKey } from '../analysis/topology';
import type { Finding } from '../analysis/types';
import { PART_TYPES } from '../parts/registry';
import { nextStandardRating } from '../tables/fuses';
import { sizeLabel } from '../../units/format';
import { amps, cap, list, mmAndIn, name } from './helpers';
import type { Rule, RuleInput } from './registry';

// --- Connectivity ---------------------------------------------------------------------------------------

interface TerminalRef {
  part: string;
  terminal: string;
}

const isBatteryUnit = (p: DiagramPart | undefined) => p?.type === 'battery' || p?.type === 'series_string';
const isLoad = (p: DiagramPart) => PART_TYPES[p.type].role === 'load';

/**
 * The battery units whose positive post `start` reaches through conductors: cables, and the pass-through
 * parts (role 'conductor' in the part registry: busbars, lugs, shunts, switches, fuses) for which
 * `conducts` is true. Batteries, loads and chargers are not passed through from one terminal to another.
 */
function reachedPositives(input: RuleInput, start: TerminalRef, conducts: (p: DiagramPart) => boolean): string[] {
  const { topo } = input;
  const seen = new Set<string>([terminalKey(start.part, start.terminal)]);
  const queue: TerminalRef[] = [start];
  const found: string[] = [];
  const visit = (t: TerminalRef) => {
    const k = terminalKey(t.part, t.terminal);
    if (seen.has(k)) return;
    seen.add(k);
    queue.push(t);
  };
  for (let h = 0; h < queue.length; h++) {
    const cur = queue[h];
    const part = topo.parts.get(cur.part);
    // A battery's post is reached (and, as a junction of cables, passed on from; never through the battery).
    if (h > 0 && isBatteryUnit(part) && cur.terminal === 'pos') found.push(cur.part);
    if (h > 0 && part && PART_TYPES[part.type].role === 'conductor' && conducts(part)) {
      for (const t of terminalsOf(part)) visit({ part: part.id, terminal: t });
    }
    for (const c of topo.cablesAt.get(terminalKey(cur.part, cur.terminal)) ?? []) {
      const other = c.from.part === cur.part && c.from.terminal === cur.terminal ? c.to : c.from;
      visit(other);
    }
  }
  return [...new Set(found)];
}

const closedSwitch = (p: DiagramPart) => p.type !== 'switch' || p.props.closed;

/** "Battery 1 (bat1), Battery 2 (bat2) and 2 more". */
function someNames(input: RuleInput, ids: string[], most = 4): string {
  const shown = ids.slice(0, most).map((id) => name(input, id));
  return ids.length > most ? `${shown.join(', ')} and ${ids.length - most} more` : list(shown);
}

/** The feeds that need a main overcurrent device: every load (registry role 'load') and every charger. */
function feeds(input: RuleInput): DiagramPart[] {
  return [...input.topo.parts.values()].filter((p) => isLoad(p) || p.type === 'charger');
}

/** A feed's current, A: from the load case when it solved, else estimated from the part's own figures. */
function feedCurrent_A(input: RuleInput, p: DiagramPart): number | null {
  const solved = input.load?.parts[p.id]?.current_A;
  if (solved !== undefined && Math.abs(solved) > 0) return Math.abs(solved);
  const v = input.ctx?.bankNominal_V || input.doc.settings.systemVoltage_V;
  switch (p.type) {
    case 'inverter':
      return p.props.power_W / (v * p.props.efficiency); // first principles: I = P / (V × efficiency)
    case 'dc_load':
      return p.props.mode === 'current' ? p.props.current_A : p.props.mode === 'power' ? p.props.power_W / v : v / p.props.r_ohm;
    case 'charger':
      return p.props.current_limit_A;
    default:
      return null;
  }
}

// --- Main overcurrent device ---------------------------------------------------------------------------

/** Continuous loads: the overcurrent device at least 125 % of the continuous current (NEC 210.20(A), 215.3). */
const CONTINUOUS_FACTOR = 1.25;

export const mainOvercurrentMissing: Rule = {
  id: 'main-overcurrent-missing',
  title: 'No main fuse or DC breaker between the bank and a load or charger',
  severity: 'error',
  basis: 'NEC 240.21 (overcurrent protection where the conductor receives its supply) and ABYC E-11 (each ungrounded conductor protected at its source), from memory',
  needs: 'document',
  check(input) {
    const { topo } = input;
    const own = new Set(topo.sources.flatMap((s) => ownFuses(topo, s.id)));
    const out: Finding[] = [];
    for (const feed of feeds(input)) {
      const start = { part: feed.id, terminal: 'pos' };
      const supplying = reachedPositives(input, start, closedSwitch);
      if (supplying.length === 0) continue;
      // With one battery unit, its own fuse carries the whole feed: it is the main device. With two or
      // more, a battery's own fuse carries that battery's share only, so the feed needs its own device.
      const batteryFuses = supplying.length > 1 ? own : new Set<string>();
      const unprotected = reachedPositives(input, start, (p) => (p.type === 'fuse' ? batteryFuses.has(p.id) : closedSwitch(p)));
      if (unprotected.length === 0) continue;
      const i = feedCurrent_A(input, feed);
      const feedCables = topo.branch(feed.id, 'pos').cables;
      const fault = input.faults
        ? Math.max(0, ...input.faults.cases.filter((c) => feedCables.includes(c.part)).map((c) => c.faultCurrent_A))
        : 0;
      const what = feed.type === 'charger' ? 'charger output' : 'feed';
      const draws = i === null ? '' : feed.type === 'charger' ? ` (charger limit ${amps(i)})` : ` (it draws about ${amps(i)})`;
      const shared = supplying.length > 1 ? `, past the batteries' own fuses,` : '';
      const faultText = fault > 0 ? ` A short on ${name(input, feedCables[0])} would draw about ${amps(fault)} from the bank with nothing to stop it.` : ` A short on its cable would be fed by the bank with nothing to stop it.`;
      const rating = i === null ? null : nextStandardRating(i * CONTINUOUS_FACTOR);
      out.push({
        id: this.id, severity: this.severity, basis: this.basis,
        parts: [feed.id, ...feedCables, ...unprotected],
        message: `No main fuse or DC circuit breaker in the positive ${what} of ${name(input, feed.id)}${draws}: its positive conductor reaches ${someNames(input, unprotected)}${shared} without one.${faultText}`,
        suggestion:
          `Fit a main fuse or DC circuit breaker in the positive conductor, as close to the bank (busbar or battery post) as practical` +
          (i !== null && rating !== null ? `, rated at least ${amps(i * CONTINUOUS_FACTOR)} (125 % of ${amps(i)}): ${rating} A is the next standard rating (NEC 240.6(A))` : '') +
          `; the feed cable's ampacity at least the rating, and the interrupting rating above the bank's fault current.`,
      });
    }
    return out;
  },
};

// --- Battery disconnect --------------------------------------------------------------------------------

/** NEC 480.7 asks for a disconnecting means on battery systems over 60 V DC (from memory). */
export const DISCONNECT_REQUIRED_ABOVE_V = 60;

export const batteryDisconnectMissing: Rule = {
  id: 'battery-disconnect-missing',
  title: 'No battery disconnect between the bank and the loads',
  severity: 'warning',
  basis: 'NEC 480.7 (disconnecting means above 60 V DC, from memory); ABYC E-11 (battery switch, from memory); common practice below 60 V',
  needs: 'document',
  check(input) {
    const { topo } = input;
    const loads = [...topo.parts.values()].filter(isLoad);
    const missing: { load: string; batteries: string[] }[] = [];
    for (const load of loads) {
      const reached = reachedPositives(input, { part: load.id, terminal: 'pos' }, (p) => p.type !== 'switch');
      if (reached.length) missing.push({ load: load.id, batteries: reached });
    }
    if (!missing.length) return [];
    const bank_V = Math.max(input.ctx?.bankNominal_V ?? 0, input.doc.settings.systemVoltage_V);
    const marine = input.doc.settings.ruleSet === 'marine';
    const high = bank_V > DISCONNECT_REQUIRED_ABOVE_V;
    const severity = high || marine ? 'error' : 'warning';
    const batteries = [...new Set(missing.flatMap((m) => m.batteries))];
    const why = high
      ? `Above ${DISCONNECT_REQUIRED_ABOVE_V} V DC a disconnecting means is required (NEC 480.7, from memory); this bank is ${bank_V.toFixed(1)} V.`
      : marine
        ? 'The marine rule set asks for a battery switch in the positive conductor, readily accessible and as close to the batteries as practical (ABYC E-11, from memory).'
        : `This ${bank_V.toFixed(1)} V bank is below the ${DISCONNECT_REQUIRED_ABOVE_V} V above which NEC 480.7 requires one (from memory), but a disconnect to isolate the bank for service and in an emergency is common practice.`;
    return [{
      id: this.id, severity, basis: this.basis,
      parts: [...missing.map((m) => m.load), ...batteries],
      message: `No battery disconnect (switch) between the bank and ${someNames(input, missing.map((m) => m.load))}: the positive feed reaches ${someNames(input, batteries)} without passing one. ${why}`,
      suggestion: 'Fit a battery switch rated for the bank\u2019s current in the positive conductor between the bank (after the main fuse) and the loads.',
    }];
  },
};

// --- Battery fuse distance (marine) -----------------------------------------------------------------------

/** The battery conductor's fuse within 7 in (175 mm) of the battery, along the conductor (ABYC E-11). */
export const MARINE_FUSE_DISTANCE_M = 0.175;
const MARINE_LIMIT_TEXT = '175 mm (7 in)';

/** A binary min-heap on a numeric key (Dijkstra's frontier). */
class MinHeap<T> {
  private items: { item: T; key: number }[] = [];
  get size(): number {
    return this.items.length;
  }
  push(item: T, key: number): void {
    const a = this.items;
    a.push({ item, key });
    for (let i = a.length - 1; i > 0; ) {
      const up = (i - 1) >> 1;
      if (a[up].key <= a[i].key) break;
      [a[up], a[i]] = [a[i], a[up]];
      i = up;
    }
  }
  pop(): { item: T; key: number } | undefined {
    const a = this.items;
    const top = a[0];
    const last = a.pop();
    if (a.length && last) {
      a[0] = last;
      for (let i = 0; ; ) {
        const l = 2 * i + 1;
        const r = l + 1;
        let m = i;
        if (l < a.length && a[l].key < a[m].key) m = l;
        if (r < a.length && a[r].key < a[m].key) m = r;
        if (m === i) break;
        [a[m], a[i]] = [a[i], a[m]];
        i = m;
      }
    }
    return top;
  }
}

/**
 * The nearest fuse to a terminal along the conductors, and the conductor length to it, m (the sum of
 * cable lengths; joints and busbars count as zero). Null when no fuse is reached.
 */
function nearestFuse(input: RuleInput, start: TerminalRef): { fuse: string; length_m: number } | null {
  const { topo } = input;
  const dist = new Map<string, number>([[terminalKey(start.part, start.terminal), 0]]);
  const done = new Set<string>();
  const frontier = new MinHeap<TerminalRef>();
  frontier.push(start, 0);
  while (frontier.size) {
    const { item: t, key: d } = frontier.pop()!;
    const k = terminalKey(t.part, t.terminal);
    if (done.has(k)) continue;
    done.add(k);
    const part = topo.parts.get(t.part);
    if (part?.type === 'fuse' && done.size > 1) return { fuse: part.id, length_m: d };
    const relax = (n: TerminalRef, nd: number) => {
      const nk = terminalKey(n.part, n.terminal);
      if (done.has(nk) || (dist.get(nk) ?? Infinity) <= nd) return;
      dist.set(nk, nd);
      frontier.push(n, nd);
    };
    if (done.size > 1 && part && part.type !== 'fuse' && PART_TYPES[part.type].role === 'conductor' && closedSwitch(part)) {
      for (const other of terminalsOf(part)) relax({ part: part.id, terminal: other }, d);
    }
    for (const c of topo.cablesAt.get(k) ?? []) {
      const other = c.from.part === t.part && c.from.terminal === t.terminal ? c.to : c.from;
      relax(other, d + c.props.length_m);
    }
  }
  return null;
}

export const batteryFuseDistance: Rule = {
  id: 'battery-fuse-distance',
  title: 'Battery fuse farther than 7 in (175 mm) from the battery',
  severity: 'warning',
  basis: 'ABYC E-11 (battery conductor fuse within 7 in / 175 mm of the battery, measured along the conductor; 72 in where sheathed, recalled); NEC Article 480 (from memory)',
  needs: 'document',
  ruleSet: 'marine',
  check(input) {
    const out: Finding[] = [];
    for (const s of input.topo.sources) {
      if (!(input.topo.cablesAt.get(terminalKey(s.id, 'pos')) ?? []).length) continue;
      const near = nearestFuse(input, { part: s.id, terminal: 'pos' });
      if (near && near.length_m <= MARINE_FUSE_DISTANCE_M + 1e-9) continue;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis,
        parts: near ? [s.id, near.fuse] : [s.id],
        message: near
          ? `The first fuse on the positive conductor of ${name(input, s.id)}, ${name(input, near.fuse)}, is ${mmAndIn(near.length_m)} of conductor from the post: more than ${MARINE_LIMIT_TEXT}.`
          : `The positive conductor of ${name(input, s.id)} reaches no fuse at all: the marine rule set asks for one within ${MARINE_LIMIT_TEXT} of the post.`,
        suggestion: 'Mount the fuse at the battery post (a terminal fuse) or shorten the conductor to it; a longer run is accepted only where the conductor is sheathed along its length (ABYC E-11, recalled).',
      });
    }
    return out;
  },
};

// --- Charging voltage ---------------------------------------------------------------------------------------

/** The bank's charging voltage (analysis/bank.ts), with the charger named by label. */
export function bankChargeVoltage(input: RuleInput): { volts: number; how: string } | null {
  return chargeVoltageOf(input.topo, input.ctx?.bankNominal_V, (id) => name(input, id));
}

// --- Bank C-rate --------------------------------------------------------------------------------------------

/**
 * The bank's current in the load case against its batteries' combined continuous limit, both also as
 * C-rates of the bank's capacity. Energy-equivalent at the bank's voltage (Σ I·V / V_bank), so units in
 * series and in parallel add up as they do in the bank figures. Null without a solved load case.
 */
export function bankContinuous(input: RuleInput): { units: number; current_A: number; limit_A: number; capacity_Ah: number; cRate: number; limitC: number } | null {
  const ctx = input.ctx;
  if (!ctx || !input.load || !(ctx.bankNominal_V > 0) || !ctx.units.length) return null;
  const v = ctx.bankNominal_V;
  const capacity_Ah = ctx.units.reduce((s, u) => s + (u.capacity_Ah * u.nominal_V) / v, 0);
  const limit_A = ctx.units.reduce((s, u) => s + (u.maxContinuous_A * u.nominal_V) / v, 0);
  const current_A = Math.abs(input.load.bankCurrent_A);
  if (!(capacity_Ah > 0)) return null;
  return { units: ctx.units.length, current_A, limit_A, capacity_Ah, cRate: current_A / capacity_Ah, limitC: limit_A / capacity_Ah };
}

export const bankOverContinuous: Rule = {
  id: 'bank-over-continuous',
  title: 'Bank C-rate above its batteries\u2019 combined continuous limit',
  severity: 'error',
  basis: 'battery ratings (each battery\u2019s max_continuous_A, else max C-rate × capacity, else the chemistry\u2019s typical C-rate, from memory); first principles (parallel limits add)',
  needs: 'load',
  check(input) {
    const b = bankContinuous(input);
    if (!b || b.current_A <= b.limit_A * (1 + 1e-9)) return [];
    return [{
      id: this.id, severity: this.severity, basis: this.basis, parts: input.ctx!.units.map((u) => u.id),
      message: `The bank delivers ${amps(b.current_A)} in the load case, ${b.cRate.toFixed(2)} C of its ${b.capacity_Ah.toFixed(0)} Ah, above its batteries' combined continuous limit of ${amps(b.limit_A)} (${b.limitC.toFixed(2)} C): no sharing of the load between them keeps every battery within its rating.`,
      suggestion: 'Add batteries in parallel, use batteries rated for more current, or reduce the load.',
    }];
  },
};

// --- Implausibly short cable -------------------------------------------------------------------------------

/** Shorter than this, a run with a conductor is taken for a joint drawn as a cable (common practice). */
export const SHORT_CABLE_M = 0.01;

export const shortCable: Rule = {
  id: 'short-cable',
  title: 'Cable of zero or implausibly short length',
  severity: 'note',
  basis: 'common practice (a cable run is at least a few centimetres; a bolted joint is not a cable)',
  needs: 'document',
  check(input) {
    const out: Finding[] = [];
    for (const c of input.topo.cables.values()) {
      if (c.props.length_m >= SHORT_CABLE_M) continue;
      out.push({
        id: this.id, severity: this.severity, basis: this.basis, parts: [c.id],
        message: `${c.label ? `${c.label}, between ${name(input, c.from.part)} and ${name(input, c.to.part)},` : cap(name(input, c.id))} is ${(c.props.length_m * 1000).toFixed(0)} mm long with a ${sizeLabel(c.props.conductor)} conductor: please confirm the length (under ${(SHORT_CABLE_M * 1000).toFixed(0)} mm).`,
        suggestion: 'Enter the measured length of the run. If the two parts are bolted together (a terminal fuse on the post), 0 mm is right: the joint then has no conductor, and this note only asks you to confirm it.',
      });
    }
    return out;
  },
};
