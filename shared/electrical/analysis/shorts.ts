/**
 * Shorts drawn in the diagram: a battery's (or string's, or charger's) terminals joined by conductors
 * alone, or batteries joined + to − in a ring. The compiler reports them as structural errors; this
 * study names the conductors that close each short and solves the network with the short in it for the
 * prospective current through them.
 *
 * The network is the fault network of faults.ts with the short drawn in: loads off (the batteries feed
 * the short), enabled chargers at their current limit, every cable and in-line part at its real
 * resistance (a 0 m run or a 0 Ω joint at SHORT_STUDY_FLOOR_OHM). For one battery shorted by one run,
 * the nodal solution is I = V_oc / (R_internal + R_path) (first principles); with batteries in parallel
 * the others feed the short through their own paths too.
 */
import type { DiagramDocument } from '../document/schema';
import { compileWithShorts, terminalWord } from '../compile/compile';
import { solveNetworkFast } from '../network/fast';
import type { Network, SolveOutcome } from '../network/types';
import { PART_TYPES } from '../parts/registry';
import { amps } from './format';
import type { AnalysisIssue, DrawnShort, ShortCircuitFigures } from './types';

export interface ShortStudy {
  shorts: DrawnShort[];
  figures: ShortCircuitFigures;
  /** The compile errors of the shorts, with the shorting conductors among their parts and the current in their messages. */
  errors: AnalysisIssue[];
}

const LOAD_TYPES = new Set(['inverter', 'dc_load']);

/** Solve, leaving out what a floating node cuts off (a run that led only to a load). */
function solveStudy(net: Network): SolveOutcome {
  let current = net;
  for (let tries = 0; ; tries++) {
    const sol = solveNetworkFast(current);
    if (sol.ok || sol.error.code !== 'floating_node' || !sol.error.nodes?.length || tries >= 3) return sol;
    const cut = new Set(sol.error.nodes);
    current = {
      ground: current.ground,
      elements: current.elements.filter((el) => {
        const [a, b] = el.kind === 'resistor' || el.kind === 'load_resistor' ? [el.a, el.b] : el.kind === 'current_source' ? [el.from, el.to] : [el.pos, el.neg];
        return !cut.has(a) && !cut.has(b);
      }),
    };
  }
}

/**
 * The shorts of a diagram whose only structural errors are shorts (null otherwise, or when the network
 * with the short in it does not solve).
 */
export function studyShorts(doc: DiagramDocument): ShortStudy | null {
  const compiled = compileWithShorts(doc);
  if (!compiled.ok) return null;
  const { network, map, shorts } = compiled;
  const partsById = new Map(doc.parts.map((p) => [p.id, p]));
  const net: Network = {
    ground: network.ground,
    elements: network.elements.filter((el) => {
      const owner = map.elementOwner[el.id];
      return !(owner?.kind === 'part' && LOAD_TYPES.has(partsById.get(owner.id)?.type ?? ''));
    }),
  };
  const sol = solveStudy(net);
  if (!sol.ok) return null;
  const I = sol.element_currents_A;
  const mag = (id: string) => Math.abs(I[id] ?? 0);

  const figures: ShortCircuitFigures = { sources: {}, cables: {}, parts: {} };
  for (const c of doc.cables) if (c.id in I) figures.cables[c.id] = I[c.id];
  for (const p of doc.parts) {
    const els = map.parts[p.id]?.elements ?? [];
    if (p.type === 'battery' || p.type === 'series_string') {
      const first = els.find((e) => network.elements.some((x) => x.id === e && x.kind === 'battery'));
      if (first !== undefined) figures.sources[p.id] = I[first] ?? 0;
    } else if (PART_TYPES[p.type].role === 'conductor' && els.length) {
      figures.parts[p.id] = Math.max(...els.map(mag));
    }
  }
  const currentOf = (id: string) => (id in figures.cables ? Math.abs(figures.cables[id]) : figures.parts[id] ?? 0);

  // Shorts that share a conductor are one short fed from several sides (batteries in parallel feeding a
  // run across one of them): one finding, naming every source and conductor.
  const groupOf = shorts.map((_, i) => i);
  const root = (i: number): number => (groupOf[i] === i ? i : (groupOf[i] = root(groupOf[i])));
  const byConductor = new Map<string, number>();
  shorts.forEach((e, i) => {
    for (const c of e.conductors ?? []) {
      const j = byConductor.get(c);
      if (j === undefined) byConductor.set(c, i);
      else groupOf[root(i)] = root(j);
    }
  });
  const out: DrawnShort[] = [];
  const errors: AnalysisIssue[] = [];
  for (let g = 0; g < shorts.length; g++) {
    if (root(g) !== g) continue;
    const members = shorts.filter((_, i) => root(i) === g);
    const sources = [...new Set(members.flatMap((e) => e.parts))];
    // Largest current first: the run that closes the short, then those that feed it.
    const conductors = [...new Set(members.flatMap((e) => e.conductors ?? []))].sort((a, b) => currentOf(b) - currentOf(a));
    const currents_A: Record<string, number> = {};
    for (const id of conductors) currents_A[id] = currentOf(id);
    const through = conductors[0];
    const short: DrawnShort = { code: members[0].code as DrawnShort['code'], sources, conductors, currents_A, current_A: currents_A[through] ?? 0, through };
    out.push(short);
    // The short itself: the member closed by the fewest conductors (the run across a battery); the
    // other sources feed it through the rest.
    const direct = members.reduce((a, b) => ((b.conductors?.length ?? 0) < (a.conductors?.length ?? 0) ? b : a));
    errors.push({ code: short.code, message: shortMessage(doc, short, direct.parts, direct.conductors ?? []), parts: [...sources, ...conductors] });
  }
  return { shorts: out, figures, errors };
}

/** A part or cable as named in messages: its label; a cable without one by its ends. */
export function itemName(doc: DiagramDocument, id: string): string {
  const part = (pid: string) => {
    const q = doc.parts.find((x) => x.id === pid);
    return q ? q.label || PART_TYPES[q.type].name : 'a part';
  };
  if (doc.parts.some((x) => x.id === id)) return part(id);
  const c = doc.cables.find((x) => x.id === id);
  if (!c) return id;
  if (c.label) return c.label;
  const end = (e: { part: string; terminal: string }) => `${part(e.part)} ${terminalWord(doc.parts.find((x) => x.id === e.part)?.type ?? '', e.terminal)}`;
  return `the ${c.props.role === 'jumper' ? 'jumper' : 'cable'} from ${end(c.from)} to ${end(c.to)}`;
}

/** "A", "A and B", "A, B and 3 more". */
export function nameList(names: string[], max = 3): string {
  if (names.length <= 1) return names.join('');
  if (names.length > max) return `${names.slice(0, max - 1).join(', ')} and ${names.length - max + 1} more`;
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

function shortMessage(doc: DiagramDocument, s: DrawnShort, directSources: string[], directConductors: string[]): string {
  const names = (ids: string[]) => nameList(ids.map((id) => itemName(doc, id)));
  const feeders = s.sources.filter((id) => !directSources.includes(id));
  const feedConductors = s.conductors.filter((id) => !directConductors.includes(id));
  const joins = directConductors.length === 1 ? 'joins' : 'join';
  const fed = feeders.length ? `; ${names(feeders)} feed${feeders.length === 1 ? 's' : ''} it through ${names(feedConductors)}` : '';
  const basis = s.code === 'zero_resistance_loop' ? 'the charger at its current limit, with any battery on the same conductors' : 'open-circuit voltage over the internal and path resistances';
  const it = s.conductors.length === 1 ? 'it' : itemName(doc, s.through);
  const figure = `about ${amps(s.current_A)} would flow through ${it} (prospective current: ${basis})`;
  const pointer = 'The fault analysis shows the current at every fuse and cable with this short in place.';
  switch (s.code) {
    case 'shorted_source':
      return `Short circuit: ${names(directConductors)} ${joins} the positive and negative of ${names(directSources)} with no load between${fed} — ${figure}. ${pointer}`;
    case 'reversed_polarity':
      return `Reversed polarity: ${names(directConductors)} ${joins} a positive of ${names(directSources)} to a negative — a short circuit through the batteries${fed}; ${figure}. ${pointer}`;
    case 'zero_resistance_loop':
      return `Short circuit: ${names(directConductors)} ${joins} the positive and negative of ${names(directSources)} with no resistance${fed} — ${figure}. ${pointer}`;
  }
}
