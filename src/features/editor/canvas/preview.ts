/**
 * A candidate layout previewed on the canvas before it is applied (the take-off explorer's rows).
 *
 * The preview lives in a store of its own, beside the editor's: it never touches the document, the
 * undo history or the saved working copy. The canvas draws what would change over the drawing — a
 * moved lead end as a highlighted ghost cable to its new terminal with the cable as drawn faded, a
 * changed length as a highlighted run with its new length — and a bar with "Apply" and "Cancel
 * preview". Escape, "Cancel preview", or any electrical change of the document clears it; "Apply"
 * applies the candidate as one undoable edit.
 */
import { create } from 'zustand';
import type { DiagramDocument, TerminalRef } from '@shared/diagram';
import { useEditorStore } from '../store';
import { sameElectrical } from '../results/useLiveResults';

/** What the candidate changes on one cable. */
export interface CableChange {
  /** The cable's `from` end moves to this terminal. */
  from?: TerminalRef;
  /** The cable's `to` end moves to this terminal. */
  to?: TerminalRef;
  /** New length, m (the length as drawn beside it). */
  length_m?: { was: number; now: number };
}

export interface CanvasPreview {
  /** Which panel asked, and which of its candidates (e.g. "takeoff", "p2p:bat3,bat2"). */
  source: string;
  key: string;
  /** What is previewed, in words ("positive from Battery 3, negative from Battery 2"). */
  title: string;
  /** The candidate document. */
  doc: DiagramDocument;
  /** Per cable id: what differs from the document as drawn. */
  cables: Record<string, CableChange>;
  /** Applies the candidate as one undoable edit; null where the user may not edit. */
  apply: (() => boolean) | null;
}

interface PreviewState {
  preview: CanvasPreview | null;
}

export const usePreviewStore = create<PreviewState>()(() => ({ preview: null }));

const sameEnd = (a: TerminalRef, b: TerminalRef) => a.part === b.part && a.terminal === b.terminal;

/** What `next` changes on the cables of `base`: moved ends and new lengths. */
export function cableChanges(base: DiagramDocument, next: DiagramDocument): Record<string, CableChange> {
  const was = new Map(base.cables.map((c) => [c.id, c]));
  const out: Record<string, CableChange> = {};
  for (const c of next.cables) {
    const b = was.get(c.id);
    if (!b) continue;
    const change: CableChange = {};
    if (!sameEnd(b.from, c.from)) change.from = c.from;
    if (!sameEnd(b.to, c.to)) change.to = c.to;
    if (Math.abs(b.props.length_m - c.props.length_m) > 1e-9) change.length_m = { was: b.props.length_m, now: c.props.length_m };
    if (Object.keys(change).length) out[c.id] = change;
  }
  return out;
}

/** Show `next` on the canvas as a preview over the editor's document. */
export function showPreview(p: { source: string; key: string; title: string; doc: DiagramDocument; apply: (() => boolean) | null }) {
  const base = useEditorStore.getState().doc;
  usePreviewStore.setState({ preview: { ...p, cables: cableChanges(base, p.doc) } });
}

/** Clear the preview (of one source only, when given). */
export function clearPreview(source?: string) {
  const p = usePreviewStore.getState().preview;
  if (p && (source === undefined || p.source === source)) usePreviewStore.setState({ preview: null });
}

/** Apply the previewed candidate (one undoable edit) and clear the preview; false when nothing was applied. */
export function applyPreview(): boolean {
  const p = usePreviewStore.getState().preview;
  if (!p?.apply) return false;
  const done = p.apply();
  if (done) usePreviewStore.setState({ preview: null });
  return done;
}

// A preview is of the document as it was: an electrical change (an edit, undo, another diagram) ends it.
useEditorStore.subscribe((s, prev) => {
  if (s.doc !== prev.doc && usePreviewStore.getState().preview && !sameElectrical(s.doc, prev.doc)) usePreviewStore.setState({ preview: null });
});
