/**
 * Diff marks for the two compare canvases and the change list, from `diffDiagrams` (A = before, B = after).
 * A mark names the status by a word and a glyph, so colour only repeats it:
 *   added    "+"  "Added"    — solid outline, only on B
 *   removed  "−"  "Removed"  — dashed outline, only on A
 *   moved    "↗"  "Moved"    — on both sides
 *   changed  "Δ"  "Changed"  — on both sides, with the changed fields' summaries (and "moved" when it also moved)
 */
import type { DiagramDiff } from '@shared/diagram/diff';
import type { DiagramDocument } from '@shared/diagram';
import { PART_TYPES } from '@shared/electrical/parts';

export type DiffStatus = 'added' | 'removed' | 'moved' | 'changed';

export const STATUS_TEXT: Record<DiffStatus, { glyph: string; word: string }> = {
  added: { glyph: '+', word: 'Added' },
  removed: { glyph: '−', word: 'Removed' },
  moved: { glyph: '↗', word: 'Moved' },
  changed: { glyph: 'Δ', word: 'Changed' },
};

export interface DiffMark {
  status: DiffStatus;
  /** Field summaries for "changed" (reconnections first for cables). */
  details: string[];
  /** A changed part that also moved or turned. */
  alsoMoved?: boolean;
}

export interface ChangeItem {
  /** Unique within the list: "<kind>:<id>". */
  key: string;
  kind: 'part' | 'cable' | 'annotation' | 'settings' | 'name';
  id: string;
  status: DiffStatus;
  /** What it is, e.g. "Battery 4 (battery)", "Main negative (cable)". */
  title: string;
  details: string[];
  /** Part ids to frame when the item is clicked (cables are framed by the parts at their ends). */
  frame: string[];
}

export interface CompareMarks {
  /** Marks on side A's canvas, by part or cable id. */
  a: Map<string, DiffMark>;
  /** Marks on side B's canvas. */
  b: Map<string, DiffMark>;
  items: ChangeItem[];
}

const partTitle = (label: string, type: string) => `${label || PART_TYPES[type as keyof typeof PART_TYPES]?.name || type} (${PART_TYPES[type as keyof typeof PART_TYPES]?.name.toLowerCase() ?? type})`;

function cableTitle(id: string, label: string | undefined, doc: DiagramDocument) {
  const c = doc.cables.find((x) => x.id === id);
  const ends = c ? `${c.from.part}.${c.from.terminal} – ${c.to.part}.${c.to.terminal}` : id;
  return label ? `${label} (cable ${ends})` : `Cable ${ends}`;
}

function cableEnds(id: string, ...docs: DiagramDocument[]): string[] {
  const out = new Set<string>();
  for (const doc of docs) {
    const c = doc.cables.find((x) => x.id === id);
    if (c) {
      out.add(c.from.part);
      out.add(c.to.part);
    }
  }
  return [...out];
}

export function compareMarks(diff: DiagramDiff, a: DiagramDocument, b: DiagramDocument): CompareMarks {
  const ma = new Map<string, DiffMark>();
  const mb = new Map<string, DiffMark>();
  const items: ChangeItem[] = [];

  for (const p of diff.parts.added) {
    mb.set(p.id, { status: 'added', details: [] });
    items.push({ key: `part:${p.id}`, kind: 'part', id: p.id, status: 'added', title: partTitle(p.label, p.type), details: [], frame: [p.id] });
  }
  for (const p of diff.parts.removed) {
    ma.set(p.id, { status: 'removed', details: [] });
    // A part whose type changed under one id is both removed and added: keep both keys apart.
    const key = diff.parts.added.some((x) => x.id === p.id) ? `part:${p.id}:removed` : `part:${p.id}`;
    items.push({ key, kind: 'part', id: p.id, status: 'removed', title: partTitle(p.label, p.type), details: [], frame: [p.id] });
  }
  for (const p of diff.parts.changed) {
    const mark: DiffMark = { status: 'changed', details: p.summary, ...(p.moved ? { alsoMoved: true } : {}) };
    ma.set(p.id, mark);
    mb.set(p.id, mark);
    items.push({ key: `part:${p.id}`, kind: 'part', id: p.id, status: 'changed', title: partTitle(p.label, p.type), details: p.moved ? [...p.summary, 'Also moved'] : p.summary, frame: [p.id] });
  }
  for (const p of diff.parts.moved) {
    const mark: DiffMark = { status: 'moved', details: [] };
    ma.set(p.id, mark);
    mb.set(p.id, mark);
    const turned = p.from.rotation !== p.to.rotation ? [`Turned ${p.from.rotation}° → ${p.to.rotation}°`] : [];
    items.push({ key: `part:${p.id}`, kind: 'part', id: p.id, status: 'moved', title: partTitle(p.label, p.type), details: turned, frame: [p.id] });
  }

  for (const c of diff.cables.added) {
    mb.set(c.id, { status: 'added', details: [] });
    items.push({ key: `cable:${c.id}`, kind: 'cable', id: c.id, status: 'added', title: cableTitle(c.id, c.label, b), details: [], frame: cableEnds(c.id, b) });
  }
  for (const c of diff.cables.removed) {
    ma.set(c.id, { status: 'removed', details: [] });
    items.push({ key: `cable:${c.id}`, kind: 'cable', id: c.id, status: 'removed', title: cableTitle(c.id, c.label, a), details: [], frame: cableEnds(c.id, a) });
  }
  for (const c of diff.cables.changed) {
    const mark: DiffMark = { status: 'changed', details: c.summary };
    ma.set(c.id, mark);
    mb.set(c.id, mark);
    items.push({ key: `cable:${c.id}`, kind: 'cable', id: c.id, status: 'changed', title: cableTitle(c.id, c.label, b), details: c.summary, frame: cableEnds(c.id, a, b) });
  }
  for (const c of diff.cables.moved) {
    const mark: DiffMark = { status: 'moved', details: [] };
    ma.set(c.id, mark);
    mb.set(c.id, mark);
    items.push({ key: `cable:${c.id}`, kind: 'cable', id: c.id, status: 'moved', title: cableTitle(c.id, c.label, b), details: ['Route changed'], frame: cableEnds(c.id, b) });
  }

  if (diff.settings.length) {
    items.push({ key: 'settings:bank', kind: 'settings', id: 'settings', status: 'changed', title: 'Bank settings', details: diff.settings.map((s) => s.summary), frame: [] });
  }
  if (diff.name) items.push({ key: 'name:doc', kind: 'name', id: 'name', status: 'changed', title: 'Diagram name', details: [diff.name.summary], frame: [] });
  for (const x of diff.annotations.added) items.push({ key: `annotation:${x.id}`, kind: 'annotation', id: x.id, status: 'added', title: `Annotation ${x.id} (${x.kind})`, details: [], frame: [] });
  for (const x of diff.annotations.removed) items.push({ key: `annotation:${x.id}`, kind: 'annotation', id: x.id, status: 'removed', title: `Annotation ${x.id} (${x.kind})`, details: [], frame: [] });
  for (const x of diff.annotations.changed) {
    items.push({ key: `annotation:${x.id}`, kind: 'annotation', id: x.id, status: 'changed', title: `Annotation ${x.id} (${x.kind})`, details: x.changes.map((c) => c.summary), frame: [] });
  }
  return { a: ma, b: mb, items };
}

/** Counts per status over the change list, for the legend. */
export function statusCounts(items: ChangeItem[]): Record<DiffStatus, number> {
  const out: Record<DiffStatus, number> = { added: 0, removed: 0, moved: 0, changed: 0 };
  for (const i of items) out[i.status] += 1;
  return out;
}
