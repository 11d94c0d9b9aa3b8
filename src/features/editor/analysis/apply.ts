/**
 * Apply a document computed by the core (`applySizing`, `applyTakeoff`) to the editor as ONE undoable
 * edit. Only the parts and cables that differ are replaced, so the history step stays small and the
 * selection and canvas positions of untouched parts are kept.
 */
import type { DiagramDocument } from '@shared/diagram';
import { original } from 'immer';
import { useEditorStore } from '../store';

/** Structural equality of plain JSON values, independent of key order; undefined members are absent. */
export function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    return a.length === bb.length && a.every((x, i) => sameJson(x, bb[i]));
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  const ak = Object.keys(ao).filter((k) => ao[k] !== undefined);
  const bk = Object.keys(bo).filter((k) => bo[k] !== undefined);
  return ak.length === bk.length && ak.every((k) => sameJson(ao[k], bo[k]));
}

function syncById<T extends { id: string }>(draft: T[], next: readonly T[]) {
  const keep = new Set(next.map((x) => x.id));
  for (let i = draft.length - 1; i >= 0; i--) if (!keep.has(draft[i].id)) draft.splice(i, 1);
  const at = new Map(draft.map((x, i) => [x.id, i]));
  for (const item of next) {
    const i = at.get(item.id);
    if (i === undefined) draft.push(structuredClone(item));
    else if (!sameJson(original(draft[i] as never) ?? draft[i], item)) draft[i] = structuredClone(item);
  }
}

/** True when `next` differs electrically or structurally from `doc` (parts, cables, settings). */
export function documentsDiffer(doc: DiagramDocument, next: DiagramDocument): boolean {
  return !sameJson(doc.parts, next.parts) || !sameJson(doc.cables, next.cables) || !sameJson(doc.settings, next.settings);
}

/** Replace the editor's document by `next` as one history step; false when read-only or nothing changed. */
export function applyDocument(label: string, next: DiagramDocument): boolean {
  return useEditorStore.getState().edit(label, (d) => {
    syncById(d.parts, next.parts);
    syncById(d.cables, next.cables);
    if (!sameJson(original(d.settings) ?? d.settings, next.settings)) d.settings = structuredClone(next.settings);
  });
}
