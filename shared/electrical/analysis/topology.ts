/**
 * The diagram's wiring as the checks see it: which cables meet at each terminal, each battery's own
 * branch (the run of cables and in-line parts from its post to the first junction), the main leads of
 * each load, post-to-post chains and the batteries on each busbar. Pure functions on the document.
 */
import type { DiagramCable, DiagramDocument, DiagramPart, DiagramPartOf } from '../document/schema';

export type TerminalKey = string;
export const terminalKey = (part: string, terminal: string): TerminalKey => `${part}.${terminal}`;

/** Parts a branch passes straight through (two terminals, a and b). */
const IN_LINE_TYPES = new Set(['fuse', 'switch', 'shunt', 'lug']);

export type SourcePart = DiagramPartOf<'battery'> | DiagramPartOf<'series_string'>;
export type LoadPart = DiagramPartOf<'inverter'> | DiagramPartOf<'dc_load'>;

/**
 * A branch: from a part terminal through single cables and in-line parts (fuse, switch, shunt, lug) to
 * the first terminal where more than one cable meets, or a part that is not in-line (busbar, battery,
 * load). `end` is that terminal.
 */
export interface Branch {
  start: { part: string; terminal: string };
  cables: string[];
  inLineParts: string[];
  end: { part: string; terminal: string };
}

export interface DiagramTopology {
  parts: Map<string, DiagramPart>;
  cables: Map<string, DiagramCable>;
  cablesAt: Map<TerminalKey, DiagramCable[]>;
  /** Batteries and series strings (the bank's units), in document order. */
  sources: SourcePart[];
  loads: LoadPart[];
  chargers: DiagramPartOf<'charger'>[];
  fuses: DiagramPartOf<'fuse'>[];
  busbars: DiagramPartOf<'busbar'>[];
  branch(part: string, terminal: string): Branch;
}

export function diagramTopology(doc: DiagramDocument): DiagramTopology {
  const parts = new Map(doc.parts.map((p) => [p.id, p]));
  const cables = new Map(doc.cables.map((c) => [c.id, c]));
  const cablesAt = new Map<TerminalKey, DiagramCable[]>();
  for (const c of doc.cables) {
    for (const end of [c.from, c.to]) {
      const k = terminalKey(end.part, end.terminal);
      const list = cablesAt.get(k);
      if (list) list.push(c);
      else cablesAt.set(k, [c]);
    }
  }
  const memo = new Map<TerminalKey, Branch>();
  const branch = (part: string, terminal: string): Branch => {
    const key = terminalKey(part, terminal);
    const hit = memo.get(key);
    if (hit) return hit;
    const out: Branch = { start: { part, terminal }, cables: [], inLineParts: [], end: { part, terminal } };
    const seen = new Set<string>();
    let cur = { part, terminal };
    for (;;) {
      const here = cablesAt.get(terminalKey(cur.part, cur.terminal)) ?? [];
      if (here.length !== 1 || seen.has(here[0].id)) break;
      const c = here[0];
      seen.add(c.id);
      out.cables.push(c.id);
      const other = c.from.part === cur.part && c.from.terminal === cur.terminal ? c.to : c.from;
      cur = { part: other.part, terminal: other.terminal };
      const p = parts.get(other.part);
      if (!p || !IN_LINE_TYPES.has(p.type)) break;
      if ((cablesAt.get(terminalKey(other.part, other.terminal)) ?? []).length !== 1) break;
      if (out.inLineParts.includes(p.id)) break;
      out.inLineParts.push(p.id);
      cur = { part: p.id, terminal: other.terminal === 'a' ? 'b' : 'a' };
    }
    out.end = cur;
    memo.set(key, out);
    return out;
  };
  const of = <T extends DiagramPart['type']>(t: T) => doc.parts.filter((p): p is DiagramPartOf<T> => p.type === t);
  return {
    parts,
    cables,
    cablesAt,
    sources: doc.parts.filter((p): p is SourcePart => p.type === 'battery' || p.type === 'series_string'),
    loads: doc.parts.filter((p): p is LoadPart => p.type === 'inverter' || p.type === 'dc_load'),
    chargers: of('charger'),
    fuses: of('fuse'),
    busbars: of('busbar'),
    branch,
  };
}

/** The fuses in a source's own branches (positive and negative). */
export function ownFuses(topo: DiagramTopology, sourceId: string): string[] {
  const out: string[] = [];
  for (const t of ['pos', 'neg']) {
    for (const id of topo.branch(sourceId, t).inLineParts) if (topo.parts.get(id)?.type === 'fuse') out.push(id);
  }
  return out;
}

/**
 * Groups of sources joined post to post: a cable straight from one source's terminal to the same
 * terminal of another source (pos to pos, neg to neg). Returns groups of two or more, in document order.
 */
export function postToPostChains(topo: DiagramTopology): string[][] {
  const parent = new Map<string, string>();
  const find = (x: string): string => {
    let r = x;
    while (parent.get(r) !== r) r = parent.get(r)!;
    parent.set(x, r);
    return r;
  };
  const isSource = (id: string) => {
    const t = topo.parts.get(id)?.type;
    return t === 'battery' || t === 'series_string';
  };
  for (const s of topo.sources) parent.set(s.id, s.id);
  for (const c of topo.cables.values()) {
    if (c.from.part !== c.to.part && c.from.terminal === c.to.terminal && isSource(c.from.part) && isSource(c.to.part)) {
      parent.set(find(c.from.part), find(c.to.part));
    }
  }
  const groups = new Map<string, string[]>();
  for (const s of topo.sources) {
    const r = find(s.id);
    if (!groups.has(r)) groups.set(r, []);
    groups.get(r)!.push(s.id);
  }
  return [...groups.values()].filter((g) => g.length > 1);
}

/** Cable runs (sum of cable lengths, m) from each source terminal whose branch ends on `busbarId`. */
export function branchesToBusbar(topo: DiagramTopology, busbarId: string): { source: string; terminal: string; cables: string[]; length_m: number }[] {
  const out: { source: string; terminal: string; cables: string[]; length_m: number }[] = [];
  for (const s of topo.sources) {
    for (const t of ['pos', 'neg']) {
      const b = topo.branch(s.id, t);
      if (b.end.part !== busbarId || b.cables.length === 0) continue;
      out.push({ source: s.id, terminal: t, cables: b.cables, length_m: b.cables.reduce((sum, id) => sum + topo.cables.get(id)!.props.length_m, 0) });
    }
  }
  return out;
}
