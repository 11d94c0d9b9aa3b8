/**
 * The editor's one store (zustand + immer). The diagram document is the domain source of truth; React
 * Flow's nodes and edges are derived from it (see canvas/derive.ts) and never stored here, since immer
 * freezes what it produces.
 *
 * Every document edit goes through `edit`, which records immer patches: one history step per edit, with
 * edits that share a `coalesce` key merged into one step (a drag is one step; typing in a field within a
 * short pause is one step).
 */
import { useCallback, useEffect, useLayoutEffect, useRef, type DependencyList } from 'react';
import { create } from 'zustand';
import { enablePatches, produce, produceWithPatches, applyPatches, type Patch } from 'immer';
import { cableRunDefaults, defaultPartProps, PART_TYPES, type CableRunProps, type PartType } from '@shared/electrical/parts';
import {
  emptyDiagram, terminalsOf, type DiagramCable, type DiagramDocument, type DiagramPart, type DiagramSettings, type TerminalRef,
} from '@shared/diagram';
import { pruneDanglingReferences } from '@shared/diagram/annotations';
import type { UnitSystem } from '@shared/units';
import type { AnalysisMode, FaultSelection } from '@shared/electrical/analysis';
import type { EditorResults } from './results/types';

enablePatches();

export type { AnalysisMode, FaultSelection };
export interface AnalysisOptions {
  mode: AnalysisMode;
  /** For mode 'fault': the one fault to show in full (a battery or a cable); without it, the sweep. */
  fault?: FaultSelection;
}
export type ResultsStatus = 'idle' | 'computing' | 'ready' | 'error';

export interface HistoryStep {
  label: string;
  patches: Patch[];
  inversePatches: Patch[];
  coalesce?: string;
  at: number;
}

export interface Clipboard {
  parts: DiagramPart[];
  cables: DiagramCable[];
}

export interface XY {
  x: number;
  y: number;
}

/** How long typing into one field keeps coalescing into the same history step, ms. */
export const COALESCE_WINDOW_MS = 1200;
const PASTE_OFFSET = 40;
const MAX_HISTORY = 300;

export interface EditorState {
  diagramId: string | null;
  doc: DiagramDocument;
  /** Increments on every document change (edits, undo, redo, load). */
  docRevision: number;
  readOnly: boolean;
  unitSystem: UnitSystem;
  /** Selected part and cable ids (parts and cables share one id space). */
  selection: string[];
  past: HistoryStep[];
  future: HistoryStep[];
  clipboard: Clipboard | null;
  pasteCount: number;
  analysis: AnalysisOptions;
  results: EditorResults | null;
  resultsStatus: ResultsStatus;
  /** A request for the canvas to frame these ids; `seq` changes with each request. */
  focusRequest: { ids: string[]; seq: number } | null;
  /** Parts added in this session that the user has not moved by hand ("Arrange new parts" lays these out). */
  freshParts: string[];

  load: (doc: DiagramDocument, opts?: { diagramId?: string | null; readOnly?: boolean; unitSystem?: UnitSystem }) => void;
  setReadOnly: (readOnly: boolean) => void;
  setUnitSystem: (unitSystem: UnitSystem) => void;
  /** Apply an edit to the document as one history step (or merged into the last one with the same `coalesce` key). */
  edit: (label: string, recipe: (draft: DiagramDocument) => void, opts?: { coalesce?: string }) => boolean;
  undo: () => void;
  redo: () => void;
  replaceDocument: (doc: DiagramDocument, label: string) => void;

  addPart: (type: PartType, position: XY, opts?: { props?: unknown; label?: string; select?: boolean }) => string | null;
  addCable: (from: TerminalRef, to: TerminalRef, props?: Partial<CableRunProps>) => string | null;
  updatePart: (id: string, patch: { label?: string; props?: unknown; rotation?: DiagramPart['rotation'] }, coalesce?: string) => void;
  updateCable: (id: string, patch: { label?: string; props?: Partial<CableRunProps> }, coalesce?: string) => void;
  /** Reconnect one end of a cable to another terminal. */
  moveCableEnd: (id: string, end: 'from' | 'to', to: TerminalRef) => void;
  updateSettings: (patch: Partial<DiagramSettings>, coalesce?: string) => void;
  /** Move parts; pass the same `dragKey` for every move of one drag so the drag is one step. */
  moveParts: (moves: { id: string; position: XY }[], dragKey?: string) => void;
  rotateSelection: () => void;
  /** Forget "fresh" parts (after arranging them). */
  clearFresh: (ids?: string[]) => void;
  deleteSelection: () => void;
  deleteIds: (ids: string[]) => void;
  copySelection: () => void;
  paste: () => string[];
  duplicateSelection: () => string[];

  select: (ids: string[], opts?: { additive?: boolean }) => void;
  setSelected: (id: string, selected: boolean) => void;
  /** Apply many select/deselect changes at once (React Flow's selection changes). */
  setSelectedMany: (changes: { id: string; selected: boolean }[]) => void;
  clearSelection: () => void;
  /** Select these parts (or cables) and ask the canvas to fit the view to them. */
  focusParts: (ids: string[]) => void;
  /** Ask the canvas to fit the whole drawing. */
  requestFit: () => void;

  setAnalysis: (options: AnalysisOptions) => void;
  setResults: (results: EditorResults | null, status: ResultsStatus) => void;
  setResultsStatus: (status: ResultsStatus) => void;
}

const ID_PREFIX: Record<PartType, string> = {
  battery: 'bat', series_string: 'string', lug: 'lug', busbar: 'bus', fuse: 'fuse', switch: 'sw', shunt: 'shunt',
  inverter: 'inv', dc_load: 'load', charger: 'chg', note: 'note',
};

function usedIds(doc: DiagramDocument): Set<string> {
  return new Set([...doc.parts.map((p) => p.id), ...doc.cables.map((c) => c.id), ...doc.annotations.map((a) => a.id)]);
}

/** A fresh id "<prefix><n>" not in `used` (adds it to `used`). */
export function freshId(prefix: string, used: Set<string>): string {
  let n = 1;
  while (used.has(`${prefix}${n}`)) n++;
  const id = `${prefix}${n}`;
  used.add(id);
  return id;
}

/** The next free label "Battery 3" for a type. */
function nextLabel(doc: DiagramDocument, type: PartType): string {
  const name = PART_TYPES[type].name.split(' / ')[0];
  const taken = new Set(doc.parts.map((p) => p.label));
  let n = doc.parts.filter((p) => p.type === type).length + 1;
  while (taken.has(`${name} ${n}`)) n++;
  return type === 'note' ? '' : `${name} ${n}`;
}

const isBatteryLike = (p: DiagramPart | undefined) => p?.type === 'battery' || p?.type === 'series_string';

/** Default props of a new cable between two terminals: a cable run, or a short jumper between two batteries. */
export function defaultCableProps(doc: DiagramDocument, from: TerminalRef, to: TerminalRef): CableRunProps {
  const a = doc.parts.find((p) => p.id === from.part);
  const b = doc.parts.find((p) => p.id === to.part);
  const base = cableRunDefaults();
  // A post-to-post jumper is short: 0.3 m is a usual length between neighbouring batteries (common practice).
  return isBatteryLike(a) && isBatteryLike(b) ? { ...base, role: 'jumper', length_m: 0.3 } : base;
}

function pruneSelection(selection: string[], doc: DiagramDocument): string[] {
  const ids = usedIds(doc);
  const kept = selection.filter((id) => ids.has(id));
  return kept.length === selection.length ? selection : kept;
}

/** Parts and the cables between them among `ids`, deep-copied out of the frozen document. */
function extract(doc: DiagramDocument, ids: string[]): Clipboard {
  const set = new Set(ids);
  const parts = doc.parts.filter((p) => set.has(p.id));
  const partIds = new Set(parts.map((p) => p.id));
  const cables = doc.cables.filter((c) => partIds.has(c.from.part) && partIds.has(c.to.part));
  return structuredClone({ parts, cables });
}

/** Position patches of one drag merged: the first inverse and the last forward patch per path (a drag is one step however long). */
function mergeReplaces(older: Patch[], newer: Patch[], keep: 'first' | 'last'): Patch[] {
  const byPath = new Map<string, Patch>();
  for (const p of keep === 'last' ? [...older, ...newer] : [...newer, ...older]) byPath.set(p.path.join('/'), p);
  return [...byPath.values()];
}
const allReplaces = (ps: Patch[]) => ps.every((p) => p.op === 'replace');

export const useEditorStore = create<EditorState>()((set, get) => {
  /** Record a new document as one history step, or merged into the last one with the same `coalesce` key. */
  const commit = (label: string, doc: DiagramDocument, patches: Patch[], inversePatches: Patch[], coalesce?: string, opts: { keepSelection?: boolean } = {}) => {
    const s = get();
    const now = Date.now();
    const last = s.past[s.past.length - 1];
    const drag = !!coalesce && coalesce.startsWith('drag:');
    const merge = !!coalesce && !!last && last.coalesce === coalesce && (drag || now - last.at < COALESCE_WINDOW_MS);
    let past: HistoryStep[];
    if (!merge) past = [...s.past, { label, patches, inversePatches, coalesce, at: now }].slice(-MAX_HISTORY);
    else {
      const compact = drag && allReplaces(patches) && allReplaces(last.patches);
      const step: HistoryStep = compact
        ? { ...last, patches: mergeReplaces(last.patches, patches, 'last'), inversePatches: mergeReplaces(last.inversePatches, inversePatches, 'first'), at: now }
        : { ...last, patches: [...last.patches, ...patches], inversePatches: [...inversePatches, ...last.inversePatches], at: now };
      past = [...s.past.slice(0, -1), step];
    }
    set({ doc, past, future: [], docRevision: s.docRevision + 1, selection: opts.keepSelection ? s.selection : pruneSelection(s.selection, doc) });
  };

  /** Insert clipboard contents with fresh ids, offset; returns the new ids. */
  const insertCopies = (clip: Clipboard, offset: number, label: string): string[] => {
    const newIds: string[] = [];
    get().edit(label, (d) => {
      const used = usedIds(d);
      const idMap = new Map<string, string>();
      for (const p of clip.parts) {
        const id = freshId(ID_PREFIX[p.type], used);
        idMap.set(p.id, id);
        d.parts.push({ ...structuredClone(p), id, position: { x: p.position.x + offset, y: p.position.y + offset } } as DiagramPart);
        newIds.push(id);
      }
      for (const c of clip.cables) {
        const id = freshId('c', used);
        d.cables.push({
          ...structuredClone(c), id,
          from: { part: idMap.get(c.from.part)!, terminal: c.from.terminal },
          to: { part: idMap.get(c.to.part)!, terminal: c.to.terminal },
          ...(c.waypoints ? { waypoints: c.waypoints.map((w) => ({ x: w.x + offset, y: w.y + offset })) } : {}),
        });
        newIds.push(id);
      }
    });
    if (newIds.length) {
      const partIds = new Set(get().doc.parts.map((p) => p.id));
      set((s) => ({ selection: newIds, freshParts: [...s.freshParts, ...newIds.filter((id) => partIds.has(id))] }));
    }
    return newIds;
  };

  return {
    diagramId: null,
    doc: emptyDiagram(),
    docRevision: 0,
    readOnly: false,
    unitSystem: 'metric',
    selection: [],
    past: [],
    future: [],
    clipboard: null,
    pasteCount: 0,
    analysis: { mode: 'load' },
    results: null,
    resultsStatus: 'idle',
    focusRequest: null,
    freshParts: [],

    load: (doc, opts = {}) =>
      set((s) => ({
        doc: produce(doc, () => {}),
        docRevision: s.docRevision + 1,
        diagramId: opts.diagramId !== undefined ? opts.diagramId : s.diagramId,
        readOnly: opts.readOnly ?? s.readOnly,
        unitSystem: opts.unitSystem ?? s.unitSystem,
        selection: [],
        past: [],
        future: [],
        results: null,
        resultsStatus: 'idle',
        freshParts: [],
      })),
    setReadOnly: (readOnly) => set({ readOnly }),
    setUnitSystem: (unitSystem) => set({ unitSystem }),

    edit: (label, recipe, opts = {}) => {
      const s = get();
      if (s.readOnly) return false;
      const [doc, patches, inversePatches] = produceWithPatches(s.doc, recipe);
      if (patches.length === 0) return false;
      commit(label, doc, patches, inversePatches, opts.coalesce);
      return true;
    },

    undo: () => {
      const s = get();
      const step = s.past[s.past.length - 1];
      if (!step || s.readOnly) return;
      const doc = applyPatches(s.doc, step.inversePatches);
      set({
        doc, past: s.past.slice(0, -1), future: [...s.future, { ...step, coalesce: undefined }],
        docRevision: s.docRevision + 1, selection: pruneSelection(s.selection, doc),
      });
    },

    redo: () => {
      const s = get();
      const step = s.future[s.future.length - 1];
      if (!step || s.readOnly) return;
      const doc = applyPatches(s.doc, step.patches);
      set({
        doc, future: s.future.slice(0, -1), past: [...s.past, { ...step, coalesce: undefined }],
        docRevision: s.docRevision + 1, selection: pruneSelection(s.selection, doc),
      });
    },

    replaceDocument: (next, label) => {
      get().edit(label, (d) => {
        d.formatVersion = next.formatVersion;
        if (next.name !== undefined) d.name = next.name;
        d.settings = structuredClone(next.settings);
        d.parts = structuredClone(next.parts);
        d.cables = structuredClone(next.cables);
        d.annotations = structuredClone(next.annotations);
      });
      set({ selection: [] });
    },

    addPart: (type, position, opts = {}) => {
      let id: string | null = null;
      const ok = get().edit(`Add ${PART_TYPES[type].name.toLowerCase()}`, (d) => {
        id = freshId(ID_PREFIX[type], usedIds(d));
        const props = opts.props ?? defaultPartProps(type);
        d.parts.push({ id, type, label: opts.label ?? nextLabel(d, type), position: { x: position.x, y: position.y }, rotation: 0, props } as DiagramPart);
      });
      if (ok && id) set((s) => ({ freshParts: [...s.freshParts, id!], ...(opts.select !== false ? { selection: [id!] } : {}) }));
      return ok ? id : null;
    },

    addCable: (from, to, props) => {
      const s = get();
      if (from.part === to.part && from.terminal === to.terminal) return null;
      let id: string | null = null;
      const ok = s.edit('Add cable', (d) => {
        id = freshId('c', usedIds(d));
        d.cables.push({ id, from: { ...from }, to: { ...to }, props: { ...defaultCableProps(d, from, to), ...props } });
      });
      return ok ? id : null;
    },

    updatePart: (id, patch, coalesce) => {
      get().edit('Edit part', (d) => {
        const p = d.parts.find((x) => x.id === id);
        if (!p) return;
        if (patch.label !== undefined) p.label = patch.label;
        if (patch.rotation !== undefined) p.rotation = patch.rotation;
        if (patch.props !== undefined) {
          p.props = structuredClone(patch.props) as never;
          // A busbar that lost taps drops the cables on the taps that no longer exist.
          const terminals = new Set(terminalsOf(p));
          const lost = (c: DiagramCable) => (c.from.part === id && !terminals.has(c.from.terminal)) || (c.to.part === id && !terminals.has(c.to.terminal));
          // Only when some are lost: a new cables array re-derives every edge on the canvas.
          if (d.cables.some(lost)) d.cables = d.cables.filter((c) => !lost(c));
        }
      }, { coalesce });
    },

    updateCable: (id, patch, coalesce) => {
      get().edit('Edit cable', (d) => {
        const c = d.cables.find((x) => x.id === id);
        if (!c) return;
        if (patch.label !== undefined) c.label = patch.label;
        if (patch.props) Object.assign(c.props, structuredClone(patch.props));
      }, { coalesce });
    },

    moveCableEnd: (id, end, to) => {
      get().edit('Reconnect cable', (d) => {
        const c = d.cables.find((x) => x.id === id);
        if (!c) return;
        const other = end === 'from' ? c.to : c.from;
        if (other.part === to.part && other.terminal === to.terminal) return;
        c[end] = { part: to.part, terminal: to.terminal };
      });
    },

    updateSettings: (patch, coalesce) => {
      get().edit('Edit bank settings', (d) => {
        Object.assign(d.settings, patch);
      }, { coalesce });
    },

    moveParts: (moves, dragKey) => {
      const s = get();
      if (moves.length === 0 || s.readOnly) return;
      // The hot path of a drag (one call per pointer move): a new parts array with only the moved parts
      // replaced, and their position patches, without an immer draft of every part.
      const byId = new Map(moves.map((m) => [m.id, m.position]));
      let parts: DiagramPart[] | null = null;
      const patches: Patch[] = [];
      const inversePatches: Patch[] = [];
      s.doc.parts.forEach((p, i) => {
        const to = byId.get(p.id);
        if (!to || (p.position.x === to.x && p.position.y === to.y)) return;
        parts ??= s.doc.parts.slice();
        const position = Object.freeze({ x: to.x, y: to.y });
        parts[i] = Object.freeze({ ...p, position }) as DiagramPart;
        patches.push({ op: 'replace', path: ['parts', i, 'position'], value: { x: to.x, y: to.y } });
        inversePatches.push({ op: 'replace', path: ['parts', i, 'position'], value: { x: p.position.x, y: p.position.y } });
      });
      if (parts) {
        const doc = Object.freeze({ ...s.doc, parts: Object.freeze(parts) as DiagramPart[] });
        commit(moves.length === 1 ? 'Move part' : `Move ${moves.length} parts`, doc, patches, inversePatches, dragKey ? `drag:${dragKey}` : 'nudge', { keepSelection: true });
      }
      const fresh = get().freshParts;
      if (fresh.length && fresh.some((id) => byId.has(id))) set({ freshParts: fresh.filter((id) => !byId.has(id)) });
    },
    clearFresh: (ids) => set((s) => ({ freshParts: ids ? s.freshParts.filter((id) => !ids.includes(id)) : [] })),

    rotateSelection: () => {
      const sel = new Set(get().selection);
      get().edit('Rotate', (d) => {
        for (const p of d.parts) if (sel.has(p.id)) p.rotation = ((p.rotation + 90) % 360) as DiagramPart['rotation'];
      });
    },

    deleteSelection: () => get().deleteIds(get().selection),

    deleteIds: (ids) => {
      if (ids.length === 0) return;
      const del = new Set(ids);
      const n = ids.length;
      get().edit(n === 1 ? 'Delete' : `Delete ${n} items`, (d) => {
        d.parts = d.parts.filter((p) => !del.has(p.id));
        const partIds = new Set(d.parts.map((p) => p.id));
        d.cables = d.cables.filter((c) => !del.has(c.id) && partIds.has(c.from.part) && partIds.has(c.to.part));
        // Annotations on the deleted parts go (or lose those parts) in the same step, so undo restores them too.
        const annotations = pruneDanglingReferences(d);
        if (annotations !== d.annotations) d.annotations = annotations;
      });
      set({ selection: [] });
    },

    copySelection: () => {
      const s = get();
      const clip = extract(s.doc, s.selection);
      if (clip.parts.length) set({ clipboard: clip, pasteCount: 0 });
    },

    paste: () => {
      const s = get();
      if (!s.clipboard || s.readOnly) return [];
      const n = s.pasteCount + 1;
      set({ pasteCount: n });
      return insertCopies(s.clipboard, PASTE_OFFSET * n, 'Paste');
    },

    duplicateSelection: () => {
      const s = get();
      const clip = extract(s.doc, s.selection);
      if (!clip.parts.length) return [];
      return insertCopies(clip, PASTE_OFFSET, 'Duplicate');
    },

    select: (ids, opts = {}) =>
      set((s) => ({ selection: opts.additive ? [...new Set([...s.selection, ...ids])] : [...ids] })),
    setSelected: (id, selected) =>
      set((s) => {
        const has = s.selection.includes(id);
        if (has === selected) return {};
        return { selection: selected ? [...s.selection, id] : s.selection.filter((x) => x !== id) };
      }),
    setSelectedMany: (changes) =>
      set((s) => {
        const next = new Set(s.selection);
        for (const c of changes) {
          if (c.selected) next.add(c.id);
          else next.delete(c.id);
        }
        if (next.size === s.selection.length && s.selection.every((id) => next.has(id))) return {};
        return { selection: [...next] };
      }),
    clearSelection: () => set((s) => (s.selection.length ? { selection: [] } : {})),
    focusParts: (ids) => set((s) => ({ selection: [...ids], focusRequest: { ids: [...ids], seq: (s.focusRequest?.seq ?? 0) + 1 } })),

    requestFit: () => set((s) => ({ focusRequest: { ids: [], seq: (s.focusRequest?.seq ?? 0) + 1 } })),

    // Results of another mode are not shown under the new one (nor handed to the panels as if they were).
    setAnalysis: (options) =>
      set((s) => {
        const same = s.analysis.mode === options.mode && s.analysis.fault?.kind === options.fault?.kind && s.analysis.fault?.id === options.fault?.id;
        return same ? { analysis: { ...options } } : { analysis: { ...options }, results: null, resultsStatus: 'computing' };
      }),
    setResults: (results, status) => set({ results, resultsStatus: status }),
    setResultsStatus: (status) => set({ resultsStatus: status }),
  };
});

/**
 * The live results and the unit system in a store of their own, kept in step with the editor store.
 * The canvas figures (hundreds of node and cable components) subscribe here, so a document change —
 * each frame of a drag — does not run their selectors; only new results or a unit change do.
 */
export interface CanvasView {
  results: EditorResults | null;
  unitSystem: UnitSystem;
}
export const useCanvasView = create<CanvasView>()(() => ({ results: useEditorStore.getState().results, unitSystem: useEditorStore.getState().unitSystem }));
useEditorStore.subscribe((s, prev) => {
  if (s.results !== prev.results || s.unitSystem !== prev.unitSystem) useCanvasView.setState({ results: s.results, unitSystem: s.unitSystem });
});

/**
 * A canvas figure: a flat object (numbers, strings, booleans, null) selected from the live results,
 * kept as the same object while its fields are equal so the component re-renders only when what it
 * shows changes. Like zustand's useShallow, with a plain field loop: hundreds of figures run their
 * selectors on every result, and the generic comparison (entries and iterators) was a measurable
 * part of applying a result.
 */
export function useCanvasFigure<T extends Record<string, string | number | boolean | null>>(select: (s: CanvasView) => T | null): T | null {
  const last = useRef<T | null>(null);
  return useCanvasView((s) => {
    const next = select(s);
    const prev = last.current;
    if (prev !== null && next !== null) {
      let same = true;
      for (const k in next) {
        if (prev[k] !== next[k]) {
          same = false;
          break;
        }
      }
      if (same) return prev;
    }
    last.current = next;
    return next;
  });
}

/**
 * Keeps figure text in the DOM in step with the live results without a React render: `texts(s)` are
 * the strings shown (unchanged strings skip the write), `write(texts, s)` puts them into elements the
 * component renders empty (no children, no title), so React and the writes never touch the same
 * thing. Runs after every render of the component (its elements may be new) and on every results
 * change. For the figures that change on nearly every solve, in their hundreds (cable labels, fuse
 * figures, battery strips).
 */
export function useResultsText(texts: (s: CanvasView) => readonly string[], write: (texts: readonly string[], s: CanvasView) => void, deps: DependencyList): void {
  const painted = useRef<string | null>(null);
  // The caller's deps cover texts and write.
  const paint = useCallback((s: CanvasView) => {
    const shown = texts(s);
    const key = shown.join('\u0000');
    if (key === painted.current) return;
    painted.current = key;
    write(shown, s);
  }, deps);
  useLayoutEffect(() => {
    painted.current = null;
    paint(useCanvasView.getState());
  });
  useEffect(() => useCanvasView.subscribe(paint), [paint]);
}

/** Undo/redo availability (for toolbar buttons). */
export const selectCanUndo = (s: EditorState) => !s.readOnly && s.past.length > 0;
export const selectCanRedo = (s: EditorState) => !s.readOnly && s.future.length > 0;
