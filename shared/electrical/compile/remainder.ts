/**
 * The connected remainder of a diagram: what is left to solve when some parts are not connected.
 *
 * A part with a terminal that no cable reaches (a busbar's spare studs excepted) carries no current: a
 * battery with one open post is not part of the bank, a load with an open negative draws nothing, a fuse
 * with an open side passes nothing. Such a part is left out. Its wired terminals stay where they are as
 * joints: two cables landed on the post of a battery that is left out still join there (the lead to the
 * main fuse and the jumper to the next battery, say). A cable whose end is on a left-out part and meets
 * nothing else there leads nowhere, and is left out too. That can open a terminal of the next part along
 * — the fuse between a left-out battery and its busbar, the lead of a left-out load — so the pruning
 * repeats until every part left has all its terminals wired; cables that no longer reach any part left
 * are dropped last. What remains solves exactly as the drawn diagram would: a run that ends in an open
 * terminal carries no current (first principles, Kirchhoff's current law at the open end).
 *
 * The remainder's cables can keep an end on a part that was left out: that end is a joint of cables only
 * (the compiler names the node after the part's terminal, the topology finds no part there).
 */
import type { DiagramCable, DiagramDocument, DiagramPart } from '../document/schema';
import { PART_TYPES, type PartDefinition } from '../parts/registry';
import { UnionFind } from './union-find';

export interface ConnectedRemainder {
  /** The diagram without the parts and cables left out. */
  doc: DiagramDocument;
  /** Every part and cable id left out, in document order (parts first). */
  notConnected: string[];
  /** The parts left out because a terminal of theirs is open as drawn. */
  loose: string[];
  /** Each of those parts' open terminals. */
  openTerminals: Record<string, string[]>;
  /** The parts and cables left out only because they lead to a part that is (`notConnected` less `loose`). */
  deadEnds: string[];
}

const definitionOf = (p: DiagramPart) => PART_TYPES[p.type] as unknown as PartDefinition;
const key = (end: DiagramCable['from']) => `${end.part}\u0000${end.terminal}`;

export function connectedRemainder(doc: DiagramDocument): ConnectedRemainder {
  const electrical = doc.parts.filter((p) => definitionOf(p).role !== 'none');
  const terminals = new Map(electrical.map((p) => [p.id, definitionOf(p).terminals(p.props)]));
  const kept = new Set(electrical.map((p) => p.id));
  const real = (end: DiagramCable['from']) => terminals.get(end.part)?.includes(end.terminal) ?? false;
  let cables = doc.cables.filter((c) => real(c.from) && real(c.to));
  const loose: string[] = [];
  const openTerminals: Record<string, string[]> = {};
  for (let round = 0; ; round++) {
    const count = new Map<string, number>();
    for (const c of cables) for (const k of [key(c.from), key(c.to)]) count.set(k, (count.get(k) ?? 0) + 1);
    const drop: string[] = [];
    for (const p of electrical) {
      if (!kept.has(p.id)) continue;
      const own = terminals.get(p.id)!;
      const open = own.filter((t) => !count.has(key({ part: p.id, terminal: t })));
      // A busbar's spare studs are normal; a busbar with none of its studs wired is left out.
      if (open.length === 0 || (p.type === 'busbar' && open.length < own.length)) continue;
      drop.push(p.id);
      if (round === 0) openTerminals[p.id] = open;
    }
    for (const id of drop) kept.delete(id);
    if (round === 0) loose.push(...drop);
    // An end on a left-out part where no other cable lands leads nowhere.
    const dangles = (end: DiagramCable['from']) => !kept.has(end.part) && count.get(key(end)) === 1;
    const next = cables.filter((c) => !dangles(c.from) && !dangles(c.to));
    if (drop.length === 0 && next.length === cables.length) break;
    cables = next;
  }
  // Cables joined only to one another, away from every part left (a loop between left-out parts), go too.
  const joined = new UnionFind();
  for (const c of cables) joined.union(key(c.from), key(c.to));
  for (const p of electrical) {
    if (!kept.has(p.id)) continue;
    const own = terminals.get(p.id)!;
    for (const t of own) joined.union(`part\u0000${p.id}`, key({ part: p.id, terminal: t }));
  }
  const withPart = new Set([...kept].map((id) => joined.find(`part\u0000${id}`)));
  cables = cables.filter((c) => withPart.has(joined.find(key(c.from))));

  const keptCables = new Set(cables.map((c) => c.id));
  const notConnected = [...electrical.filter((p) => !kept.has(p.id)).map((p) => p.id), ...doc.cables.filter((c) => !keptCables.has(c.id)).map((c) => c.id)];
  const looseSet = new Set(loose);
  return {
    doc: { ...doc, parts: doc.parts.filter((p) => definitionOf(p).role === 'none' || kept.has(p.id)), cables },
    notConnected,
    loose,
    openTerminals,
    deadEnds: notConnected.filter((id) => !looseSet.has(id)),
  };
}
