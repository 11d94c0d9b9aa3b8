/**
 * A user's version that could not be saved as a revision (409: someone saved a newer one), kept in this
 * browser's localStorage per diagram until it is saved on top, saved as a copy, or discarded. The compare
 * view reads it as the "unsaved" side, so nothing the user drew is lost when they leave the editor.
 */
import type { DiagramDocument } from '@shared/diagram';

export interface UnsavedRevision {
  content: DiagramDocument;
  /** The revision the user's edit started from (null: none). */
  baseRevision: number | null;
  /** The revision that was latest when the save was refused. */
  latestRevision: number | null;
  message: string;
  savedAt: number;
}

export const unsavedKey = (diagramId: string) => `bankwright:unsaved-revision:${diagramId}`;

export function stashUnsaved(diagramId: string, value: UnsavedRevision): boolean {
  try {
    window.localStorage.setItem(unsavedKey(diagramId), JSON.stringify(value));
    return true;
  } catch {
    return false;
  }
}

export function readUnsaved(diagramId: string): UnsavedRevision | null {
  try {
    const raw = window.localStorage.getItem(unsavedKey(diagramId));
    if (!raw) return null;
    const v = JSON.parse(raw) as UnsavedRevision;
    return v && typeof v === 'object' && v.content && Array.isArray(v.content.parts) ? v : null;
  } catch {
    return null;
  }
}

export function clearUnsaved(diagramId: string) {
  try {
    window.localStorage.removeItem(unsavedKey(diagramId));
  } catch {
    /* ignore */
  }
}
