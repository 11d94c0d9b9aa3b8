/**
 * Diagram → network compiler. Turns a diagram document into the resistive network the solver takes
 * (shared/electrical/network/types.ts), with a map from every part and cable to its elements and nodes,
 * after structural checks that name the parts involved.
 *
 * Nodes: every part terminal is a node "<partId>.<terminal>"; internal nodes of a part are
 * "<partId>._<name>". Cables are resistors between terminal nodes. Elements with zero resistance
 * (a 0 Ω lug or switch) merge their two nodes; the merged node keeps the first name.
 * Element ids: a part with one element uses the part id; a part with several uses "<partId>/<local>"
 * (busbar "<id>/seg1"…, string "<id>/b1"…, "<id>/j1"…). A cable's conductor uses the cable id, its lug
 * joints "<cableId>/lugFrom" and "<cableId>/lugTo".
 */
import type { DiagramDocument, DiagramPart } from '../document/schema';
import type { Network, NetworkElement } from '../network/types';
import { type CableRunProps, cableRunConductorResistance_ohm, cableTemperature_C } from '../parts/cable';
import { PART_TYPES, type PartDefinition } from '../parts/registry';
import { stringMembers } from '../parts/battery';
import { tableResistance_ohm_per_m } from '../tables/conductors';
import { UnionFind } from './union-find';

export type CompileErrorCode =
  | 'empty_diagram'
  | 'no_source'
  | 'floating_part'
  | 'unconnected_terminal'
  | 'shorted_source'
  | 'reversed_polarity'
  | 'unequal_parallel_voltage'
  | 'zero_resistance_loop'
  | 'disconnected_circuit'
  | 'invalid_value';

export interface CompileIssue {
  code: string;
  message: string;
  /** Ids of the parts (and cables) involved. */
  parts: string[];
}

export interface CompileError extends CompileIssue {
  code: CompileErrorCode;
  /**
   * A short (shorted_source, reversed_polarity, or a zero_resistance_loop that joins a source's own
   * terminals): the cables and in-line parts that close it — every conductor on a path between the
   * shorted sources' terminals that runs through conductors alone (the sources' own internal jumpers
   * left out).
   */
  conductors?: string[];
}

/** Compile error codes that are a source shorted by conductors: the network still solves, with the short in it. */
export const SHORT_CODES: ReadonlySet<CompileErrorCode> = new Set(['shorted_source', 'reversed_polarity', 'zero_resistance_loop']);
/** Compile error codes for parts left unconnected. */
export const LOOSE_CODES: ReadonlySet<CompileErrorCode> = new Set(['floating_part', 'unconnected_terminal']);

export interface CompileMap {
  parts: Record<string, { elements: string[]; nodes: Record<string, string> }>;
  cables: Record<string, { elements: string[]; from_node: string; to_node: string; conductor_ohm: number; r_ohm: number; temp_C: number }>;
  /** Which part or cable each element came from. */
  elementOwner: Record<string, { kind: 'part' | 'cable'; id: string }>;
}

export type CompileResult =
  | { ok: true; network: Network; map: CompileMap; systemVoltage: number; notes: CompileIssue[] }
  | { ok: false; errors: CompileError[] };

/**
 * A diagram whose only structural errors are shorts, compiled with the shorts in it (see
 * `compileWithShorts`): zero-resistance conductors are kept as SHORT_STUDY_FLOOR_OHM resistors rather
 * than merged, so every shorting conductor carries its own current.
 */
export type ShortedCompileResult =
  | { ok: true; network: Network; map: CompileMap; shorts: CompileError[] }
  | { ok: false; errors: CompileError[] };

/**
 * Resistance given to a zero-resistance conductor (a 0 m run without lugs, a 0 Ω joint) in a short
 * study, Ω: far below any battery's internal resistance (milliohms), so the prospective current is
 * unchanged to the digits shown, and each conductor keeps a current of its own.
 */
export const SHORT_STUDY_FLOOR_OHM = 1e-6;

const MAX_ERRORS = 50;

const terminalNode = (partId: string, terminal: string) => `${partId}.${terminal}`;

function localToGlobal(partId: string, local: string): string {
  return `${partId}.${local}`; // terminals "pos", internal "_p1" alike
}

function elementNodes(e: NetworkElement): string[] {
  switch (e.kind) {
    case 'battery': case 'constant_power': case 'voltage_source':
      return [e.pos, e.neg];
    case 'resistor': case 'load_resistor':
      return [e.a, e.b];
    case 'current_source':
      return [e.from, e.to];
  }
}

function renameNodes(e: NetworkElement, f: (n: string) => string): NetworkElement {
  switch (e.kind) {
    case 'battery': case 'constant_power': case 'voltage_source':
      return { ...e, pos: f(e.pos), neg: f(e.neg) };
    case 'resistor': case 'load_resistor':
      return { ...e, a: f(e.a), b: f(e.b) };
    case 'current_source':
      return { ...e, from: f(e.from), to: f(e.to) };
  }
}

const fin = Number.isFinite;
const finOrAbsent = (x: number | undefined) => x === undefined || Number.isFinite(x);

/** True when every number of the element is finite (optional ones may be absent). */
function numbersFinite(e: NetworkElement): boolean {
  switch (e.kind) {
    case 'battery': return fin(e.ocv_V) && fin(e.r_ohm);
    case 'resistor': case 'load_resistor': return fin(e.r_ohm);
    case 'current_source': return fin(e.amps);
    case 'constant_power': return fin(e.watts) && finOrAbsent(e.v_min_V);
    case 'voltage_source': return fin(e.volts) && finOrAbsent(e.i_max_A) && finOrAbsent(e.r_ohm);
  }
}

const definitionOf = (p: DiagramPart) => PART_TYPES[p.type] as unknown as PartDefinition;

/** Compile a validated diagram document into a solver network. */
export function compileDiagram(doc: DiagramDocument): CompileResult {
  const r = compile(doc, false);
  return 'shorts' in r ? { ok: false, errors: r.shorts } : r;
}

/**
 * Compile a diagram whose only structural errors are sources shorted by conductors (SHORT_CODES), with
 * the shorts left in the network, for a study of the prospective current through them. Fails like
 * `compileDiagram` on any other error (and on a diagram with no short).
 */
export function compileWithShorts(doc: DiagramDocument): ShortedCompileResult {
  const r = compile(doc, true);
  if ('shorts' in r) return r;
  return r.ok ? { ok: false, errors: [] } : r;
}

function compile(doc: DiagramDocument, keepShorts: boolean): CompileResult | Extract<ShortedCompileResult, { ok: true }> {
  const errors: CompileError[] = [];
  const notes: CompileIssue[] = [];
  const ctx = { ambient_C: doc.settings.ambient_C, systemVoltage_V: doc.settings.systemVoltage_V };
  const electrical = doc.parts.filter((p) => definitionOf(p).role !== 'none');

  if (electrical.length === 0) {
    return { ok: false, errors: [{ code: 'empty_diagram', message: 'The diagram has no electrical parts', parts: [] }] };
  }
  const sourceParts = electrical.filter((p) => p.type === 'battery' || p.type === 'series_string' || (p.type === 'charger' && p.props.enabled));
  if (sourceParts.length === 0) {
    errors.push({ code: 'no_source', message: 'The diagram has no battery, series string or charger to supply it', parts: [] });
  }

  // --- Connections: floating parts and unconnected terminals -----------------------------------------
  // Each terminal's node name is built once; the same string then keys every map below.
  const partTerminals = new Map<string, { terminals: readonly string[]; nodes: Record<string, string>; nodeOf: Map<string, string> }>();
  for (const p of electrical) {
    const terminals = definitionOf(p).terminals(p.props);
    const nodes: Record<string, string> = {};
    const nodeOf = new Map<string, string>();
    for (const t of terminals) nodeOf.set(t, (nodes[t] = terminalNode(p.id, t)));
    partTerminals.set(p.id, { terminals, nodes, nodeOf });
  }
  const endNode = (end: { part: string; terminal: string }) =>
    partTerminals.get(end.part)?.nodeOf.get(end.terminal) ?? terminalNode(end.part, end.terminal);
  const cablesAt = new Map<string, number>();
  for (const c of doc.cables) {
    const a = endNode(c.from);
    const b = endNode(c.to);
    cablesAt.set(a, (cablesAt.get(a) ?? 0) + 1);
    cablesAt.set(b, (cablesAt.get(b) ?? 0) + 1);
  }
  const floating = new Set<string>();
  for (const p of electrical) {
    const { terminals, nodeOf } = partTerminals.get(p.id)!;
    const open = terminals.filter((t) => !cablesAt.has(nodeOf.get(t)!));
    if (open.length === terminals.length) {
      floating.add(p.id);
      errors.push({ code: 'floating_part', message: `${partName(p)} is not connected: no terminal is wired`, parts: [p.id] });
      continue;
    }
    if (p.type === 'busbar' || open.length === 0) continue; // spare busbar studs are normal
    errors.push({ code: 'unconnected_terminal', message: `${partName(p)} is not connected: ${terminalWords(p, open)}`, parts: [p.id] });
  }

  // --- Elements ----------------------------------------------------------------------------------------
  const raw: { el: NetworkElement; owner: { kind: 'part' | 'cable'; id: string }; nominal_V?: number }[] = [];
  const map: CompileMap = { parts: {}, cables: {}, elementOwner: {} };

  for (const p of electrical) {
    const def = definitionOf(p);
    const model = def.model(p.props, ctx);
    const single = model.elements.length === 1;
    const nominals = memberNominals(p);
    model.elements.forEach((e, i) => {
      const terminal = partTerminals.get(p.id)!.nodeOf;
      const el = renameNodes(e, (n) => terminal.get(n) ?? localToGlobal(p.id, n));
      el.id = single ? p.id : `${p.id}/${e.id}`;
      raw.push({ el, owner: { kind: 'part', id: p.id }, ...(e.kind === 'battery' ? { nominal_V: nominals[i] } : {}) });
    });
    if (p.type === 'switch' && !p.props.closed) {
      notes.push({ code: 'open_switch', message: `${describe(p)} is open; modelled as a very high resistance`, parts: [p.id] });
    }
    map.parts[p.id] = { elements: [], nodes: partTerminals.get(p.id)!.nodes };
  }

  for (const c of doc.cables) {
    const props: CableRunProps = c.props;
    const temp_C = cableTemperature_C(props, doc.settings.ambient_C);
    const conductor_ohm = cableRunConductorResistance_ohm(props, temp_C);
    if (props.resistanceBasis === 'table' && (props.material !== 'copper' || tableResistance_ohm_per_m(props.conductor, temp_C) === null)) {
      notes.push({ code: 'no_table_value', message: `Cable ${c.label || c.id}: no published table value for this conductor; computed resistance used`, parts: [c.id] });
    }
    const fromTerminal = endNode(c.from);
    const toTerminal = endNode(c.to);
    let fromNode = fromTerminal;
    let toNode = toTerminal;
    const own = { kind: 'cable' as const, id: c.id };
    let r_total = conductor_ohm;
    if (props.lugFrom_ohm !== undefined) {
      const inner = `${c.id}._from`;
      raw.push({ el: { id: `${c.id}/lugFrom`, kind: 'resistor', a: fromNode, b: inner, r_ohm: props.lugFrom_ohm, role: 'lug' }, owner: own });
      fromNode = inner;
      r_total += props.lugFrom_ohm;
    }
    if (props.lugTo_ohm !== undefined) {
      const inner = `${c.id}._to`;
      raw.push({ el: { id: `${c.id}/lugTo`, kind: 'resistor', a: inner, b: toNode, r_ohm: props.lugTo_ohm, role: 'lug' }, owner: own });
      toNode = inner;
      r_total += props.lugTo_ohm;
    }
    raw.push({ el: { id: c.id, kind: 'resistor', a: fromNode, b: toNode, r_ohm: conductor_ohm, role: props.role }, owner: own });
    map.cables[c.id] = {
      elements: [], from_node: fromTerminal, to_node: toTerminal,
      conductor_ohm, r_ohm: r_total, temp_C,
    };
  }

  for (const { el, owner } of raw) {
    if (!numbersFinite(el)) {
      errors.push({ code: 'invalid_value', message: `Element ${el.id} has a value that is not a finite number`, parts: [owner.id] });
    }
  }

  // Before any merging: the elements as drawn, for naming the conductors of a short and for its study.
  const drawn = raw.map(({ el, owner }) => ({ el, owner }));

  // --- Zero-resistance elements merge nodes ----------------------------------------------------------------
  const zero = new UnionFind();
  const anyZero = raw.some((r) => r.el.kind === 'resistor' && r.el.r_ohm === 0);
  if (anyZero) for (const { el } of raw) for (const n of elementNodes(el)) zero.add(n);
  const kept: typeof raw = [];
  for (const r of raw) {
    if (r.el.kind === 'resistor' && r.el.r_ohm === 0) zero.union(r.el.a, r.el.b);
    else kept.push(r);
  }
  const node = anyZero ? (n: string) => zero.find(n) : (n: string) => n;
  const elements = kept;
  if (anyZero) {
    for (const r of elements) {
      const [a, b] = elementNodes(r.el);
      if (node(a) !== a || node(b) !== b) r.el = renameNodes(r.el, node);
    }
  }

  // --- Ideal voltage sources in a loop of zero resistance ----------------------------------------------------
  const ideal = new UnionFind();
  const idealParts: { part: string; pos: string; neg: string }[] = [];
  for (const { el, owner } of elements) {
    if (el.kind !== 'voltage_source' || (el.r_ohm ?? 0) > 0) continue;
    idealParts.push({ part: owner.id, pos: el.pos, neg: el.neg });
    if (!ideal.union(el.pos, el.neg)) {
      const root = ideal.find(el.pos);
      const involved = idealParts.filter((s) => ideal.find(s.pos) === root).map((s) => s.part);
      errors.push({
        code: 'zero_resistance_loop',
        message: 'Sources with no internal resistance form a loop with nothing to limit the current between them (give the charger an internal resistance, or remove one)',
        parts: unique(involved),
      });
    }
  }

  // --- Battery voltages around loops of conductors: reversed polarity, unequal strings, shorts ------------------
  errors.push(...checkSourceLoops(elements, doc));

  // --- One connected circuit with the ground -----------------------------------------------------------------
  const groundPart = sourceParts.find((p) => p.type !== 'charger') ?? sourceParts[0] ?? electrical[0];
  const groundTerminal = definitionOf(groundPart).terminals(groundPart.props).includes('neg') ? 'neg' : definitionOf(groundPart).terminals(groundPart.props)[0];
  const ground = node(terminalNode(groundPart.id, groundTerminal));
  const conn = new UnionFind();
  for (const { el } of elements) {
    const [a, b] = elementNodes(el);
    conn.union(a, b);
  }
  conn.add(ground);
  const cut = new Set<string>();
  for (const p of electrical) {
    if (floating.has(p.id)) continue;
    const nodes = Object.values(map.parts[p.id].nodes).filter((n) => cablesAt.has(n));
    if (nodes.some((n) => conn.find(node(n)) !== conn.find(ground))) cut.add(p.id);
  }
  if (cut.size > 0) {
    errors.push({
      code: 'disconnected_circuit',
      message: `These parts are not connected to the bank that holds ${describe(groundPart)}; join them or remove them`,
      parts: [...cut],
    });
  }

  if (errors.length > 0) {
    for (const e of errors) {
      if (!SHORT_CODES.has(e.code)) continue;
      // A loop of ideal sources is a short only where it joins one source's own terminals.
      const shorted = e.code === 'zero_resistance_loop' ? e.parts.filter((id) => idealParts.some((s) => s.part === id && node(s.pos) === node(s.neg))) : e.parts;
      const conductors = shorted.length ? shortingConductors(drawn, shorted) : [];
      if (conductors.length) e.conductors = conductors;
    }
    if (keepShorts && errors.every((e) => SHORT_CODES.has(e.code) && e.conductors)) return shortStudyNetwork(drawn, map, terminalNode(groundPart.id, groundTerminal), errors);
    return { ok: false, errors: errors.slice(0, MAX_ERRORS) };
  }

  for (const { el, owner } of elements) {
    map.elementOwner[el.id] = owner;
    (owner.kind === 'part' ? map.parts[owner.id] : map.cables[owner.id]).elements.push(el.id);
  }
  if (anyZero) {
    for (const p of Object.values(map.parts)) for (const t of Object.keys(p.nodes)) p.nodes[t] = node(p.nodes[t]);
    for (const c of Object.values(map.cables)) {
      c.from_node = node(c.from_node);
      c.to_node = node(c.to_node);
    }
  }
  const nodeSet = new Set<string>();
  for (const { el } of elements) for (const n of elementNodes(el)) nodeSet.add(n);

  return {
    ok: true,
    network: { ground, nodes: [...nodeSet], elements: elements.map((e) => e.el) },
    map,
    systemVoltage: doc.settings.systemVoltage_V,
    notes,
  };
}

/**
 * The network of a short study: the elements as drawn, zero-resistance conductors kept as
 * SHORT_STUDY_FLOOR_OHM resistors (not merged), so each shorting conductor has a current of its own.
 */
function shortStudyNetwork(
  drawn: { el: NetworkElement; owner: { kind: 'part' | 'cable'; id: string } }[],
  map: CompileMap,
  ground: string,
  shorts: CompileError[],
): Extract<ShortedCompileResult, { ok: true }> {
  const elements: NetworkElement[] = [];
  const nodes = new Set<string>();
  for (const { el, owner } of drawn) {
    const e = el.kind === 'resistor' && el.r_ohm === 0 ? { ...el, r_ohm: SHORT_STUDY_FLOOR_OHM } : el;
    elements.push(e);
    for (const n of elementNodes(e)) nodes.add(n);
    map.elementOwner[e.id] = owner;
    (owner.kind === 'part' ? map.parts[owner.id] : map.cables[owner.id]).elements.push(e.id);
  }
  return { ok: true, network: { ground, nodes: [...nodes], elements }, map, shorts };
}

/**
 * The conductors that short `sources`: every conductor (a resistor that is not an open switch) lying
 * on a path between a source's terminals through conductors alone. Such a path and the source form a
 * loop, so the conductor and the source's element sit in one biconnected block of the graph whose edges
 * are the conductors and the sources' own elements (two edges lie on a common simple cycle exactly when
 * they are in one block). Returns the owners of those conductors, the sources themselves left out.
 */
function shortingConductors(drawn: { el: NetworkElement; owner: { kind: 'part' | 'cable'; id: string } }[], sources: string[]): string[] {
  const own = new Set(sources);
  const edges: { a: string; b: string; owner: string; seed: boolean }[] = [];
  for (const { el, owner } of drawn) {
    if (el.kind === 'resistor' && el.role !== 'switch_open') edges.push({ a: el.a, b: el.b, owner: owner.id, seed: false });
    else if ((el.kind === 'battery' || el.kind === 'voltage_source') && own.has(owner.id)) edges.push({ a: el.pos, b: el.neg, owner: owner.id, seed: true });
  }
  const block = biconnectedBlocks(edges);
  const seeded = new Set<number>();
  edges.forEach((e, i) => {
    if (e.seed && block[i] >= 0) seeded.add(block[i]);
  });
  const out: string[] = [];
  edges.forEach((e, i) => {
    if (!e.seed && block[i] >= 0 && seeded.has(block[i]) && !own.has(e.owner)) out.push(e.owner);
  });
  return unique(out);
}

/**
 * The biconnected block of each edge of an undirected multigraph (Tarjan's algorithm, iterative): an
 * index per edge, −1 for a self-loop.
 */
function biconnectedBlocks(edges: { a: string; b: string }[]): number[] {
  const index = new Map<string, number>();
  const id = (n: string) => {
    let i = index.get(n);
    if (i === undefined) index.set(n, (i = index.size));
    return i;
  };
  const ends = edges.map((e) => [id(e.a), id(e.b)] as const);
  const adj: { to: number; edge: number }[][] = Array.from({ length: index.size }, () => []);
  ends.forEach(([a, b], e) => {
    if (a === b) return;
    adj[a].push({ to: b, edge: e });
    adj[b].push({ to: a, edge: e });
  });
  const block = new Array<number>(edges.length).fill(-1);
  const disc = new Int32Array(index.size).fill(-1);
  const low = new Int32Array(index.size);
  const stack: number[] = [];
  let time = 0;
  let blocks = 0;
  for (let root = 0; root < index.size; root++) {
    if (disc[root] >= 0) continue;
    disc[root] = low[root] = time++;
    const frames: { node: number; via: number; next: number }[] = [{ node: root, via: -1, next: 0 }];
    while (frames.length) {
      const f = frames[frames.length - 1];
      if (f.next < adj[f.node].length) {
        const { to, edge } = adj[f.node][f.next++];
        if (edge === f.via) continue;
        if (disc[to] < 0) {
          stack.push(edge);
          disc[to] = low[to] = time++;
          frames.push({ node: to, via: edge, next: 0 });
        } else if (disc[to] < disc[f.node]) {
          stack.push(edge); // a back edge
          low[f.node] = Math.min(low[f.node], disc[to]);
        }
        continue;
      }
      frames.pop();
      const parent = frames[frames.length - 1];
      if (!parent) continue;
      low[parent.node] = Math.min(low[parent.node], low[f.node]);
      if (low[f.node] >= disc[parent.node]) {
        // The edges above f.via on the stack, and f.via, form one block.
        for (;;) {
          const e = stack.pop()!;
          block[e] = blocks;
          if (e === f.via) break;
        }
        blocks++;
      }
    }
  }
  return block;
}

/** A part as named in messages: its label, else its type's name. */
function partName(p: DiagramPart): string {
  return p.label || PART_TYPES[p.type].name;
}

/** A terminal in words, as the editor names it: "positive", "battery side" (a fuse's a), "tap t3", "terminal a". */
export function terminalWord(type: string, terminal: string): string {
  if (terminal === 'pos') return 'positive';
  if (terminal === 'neg') return 'negative';
  if (type === 'fuse' && (terminal === 'a' || terminal === 'b')) return terminal === 'a' ? 'battery side' : 'bank side';
  if (type === 'busbar') return `tap ${terminal}`;
  return `terminal ${terminal}`;
}

/** Open terminals in words: "negative terminal", "positive and negative terminals", "battery side". */
function terminalWords(p: DiagramPart, open: readonly string[]): string {
  const words = open.map((t) => terminalWord(p.type, t));
  const joined = words.length > 1 ? `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}` : words[0];
  return open.every((t) => t === 'pos' || t === 'neg') ? `${joined} terminal${open.length > 1 ? 's' : ''}` : joined;
}

/** A part as named in messages: by its label, never its id (see partName). */
const describe = partName;

function unique<T>(xs: T[]): T[] {
  return [...new Set(xs)];
}

/** Nominal voltage of each battery element a part's model produces, in model order. */
function memberNominals(p: DiagramPart): number[] {
  if (p.type === 'battery') return [p.props.nominal_V];
  if (p.type === 'series_string') {
    // Model order: b1, j1, b2, j2, …; only battery elements are looked up, by their index.
    const out: number[] = [];
    for (const m of stringMembers(p.props)) {
      out.push(m.nominal_V);
      if (p.props.interconnect) out.push(NaN);
    }
    return out;
  }
  return [];
}

/**
 * Walk the batteries' nominal voltages over the groups of nodes joined by conductors (cables, busbars,
 * fuses, closed switches, shunts, lugs, jumpers). Each group gets one potential; a loop whose
 * battery voltages do not add up to zero is a wiring fault: a short through a battery, batteries joined
 * + to − in a ring (reversed polarity), or sources of unequal voltage in parallel (first principles).
 */
function checkSourceLoops(
  elements: { el: NetworkElement; owner: { kind: 'part' | 'cable'; id: string }; nominal_V?: number }[],
  doc: DiagramDocument,
): CompileError[] {
  const group = new UnionFind();
  for (const { el } of elements) {
    for (const n of elementNodes(el)) group.add(n);
    if (el.kind === 'resistor' && el.role !== 'switch_open') group.union(el.a, el.b);
  }
  type Edge = { neg: string; pos: string; v: number; part: string };
  const edges: Edge[] = [];
  for (const { el, owner, nominal_V } of elements) {
    if (el.kind === 'battery' && nominal_V !== undefined) edges.push({ neg: group.find(el.neg), pos: group.find(el.pos), v: nominal_V, part: owner.id });
  }
  const adj = new Map<string, { to: string; dv: number; edge: number }[]>();
  const link = (from: string, to: string, dv: number, edge: number) => {
    if (!adj.has(from)) adj.set(from, []);
    adj.get(from)!.push({ to, dv, edge });
  };
  edges.forEach((e, i) => {
    link(e.neg, e.pos, e.v, i);
    link(e.pos, e.neg, -e.v, i);
  });

  const potential = new Map<string, number>();
  const parent = new Map<string, { from: string; edge: number; dv: number } | null>();
  const seenEdge = new Set<number>();
  const errors: CompileError[] = [];
  const reported = new Set<string>();
  const partsById = new Map(doc.parts.map((p) => [p.id, p]));

  for (const start of adj.keys()) {
    if (potential.has(start)) continue;
    potential.set(start, 0);
    parent.set(start, null);
    const queue = [start];
    while (queue.length) {
      const u = queue.shift()!;
      for (const { to, dv, edge } of adj.get(u)!) {
        if (seenEdge.has(edge)) continue;
        seenEdge.add(edge);
        if (!potential.has(to)) {
          potential.set(to, potential.get(u)! + dv);
          parent.set(to, { from: u, edge, dv });
          queue.push(to);
          continue;
        }
        const mismatch = potential.get(u)! + dv - potential.get(to)!;
        // The traversal around the loop: from `to` up to the common ancestor, down to u, then u → to.
        const loop = loopEdges(parent, u, to);
        loop.push({ edge, dv });
        const total = loop.reduce((s, l) => s + Math.abs(l.dv), 0);
        if (Math.abs(mismatch) <= 0.1 + 0.005 * total) continue; // equal voltages in parallel: fine
        const parts = unique(loop.map((l) => edges[l.edge].part));
        const key = [...parts].sort().join('|');
        if (reported.has(key)) continue;
        reported.add(key);
        const sameDirection = loop.every((l) => l.dv > 0) || loop.every((l) => l.dv < 0);
        const names = parts.map((id) => { const p = partsById.get(id); return p ? describe(p) : id; }).join(', ');
        if (parts.length === 1) {
          errors.push({ code: 'shorted_source', message: `${names}: positive and negative are joined by conductors alone — a short circuit`, parts });
        } else if (sameDirection) {
          errors.push({ code: 'reversed_polarity', message: `${names}: a battery's positive is joined to another's negative in a parallel group (reversed polarity — a short circuit through the batteries)`, parts });
        } else {
          errors.push({ code: 'unequal_parallel_voltage', message: `${names}: batteries or strings of unequal nominal voltage are connected in parallel (${Math.abs(mismatch).toFixed(1)} V apart)`, parts });
        }
      }
    }
  }
  return errors;
}

/** Edges from `to` up to the lowest common ancestor and down to `u`, with dv in that direction of travel. */
function loopEdges(
  parent: Map<string, { from: string; edge: number; dv: number } | null>,
  u: string,
  to: string,
): { edge: number; dv: number }[] {
  const ancestorsOfU = new Map<string, number>();
  const upU: { edge: number; dv: number; node: string }[] = [];
  for (let n: string | undefined = u, depth = 0; n !== undefined; depth++) {
    ancestorsOfU.set(n, depth);
    const p = parent.get(n);
    if (!p) break;
    upU.push({ edge: p.edge, dv: p.dv, node: n });
    n = p.from;
  }
  const upTo: { edge: number; dv: number }[] = [];
  let n = to;
  while (!ancestorsOfU.has(n)) {
    const p = parent.get(n)!;
    upTo.push({ edge: p.edge, dv: -p.dv }); // travelling child → parent
    n = p.from;
  }
  const lcaDepth = ancestorsOfU.get(n)!;
  const downToU = upU.slice(0, lcaDepth).reverse().map((e) => ({ edge: e.edge, dv: e.dv })); // parent → child
  return [...upTo, ...downToU];
}
