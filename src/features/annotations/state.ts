/**
 * Annotation layer state and edits.
 *
 * Edits change only `doc.annotations`. For a role that may edit the diagram they go through the editor
 * store's `edit` (one undo step each, saved with the working copy). For a role that may annotate but
 * not edit (a trainer, for whom the editor is read only) they are applied to the document here, kept in
 * a small history of their own, and saved through the annotations-only route (./api.ts).
 */
import { useEffect } from 'react';
import { create } from 'zustand';
import { applyPatches, produceWithPatches, type Patch } from 'immer';
import { can, type Role } from '@shared/roles';
import { pruneDanglingReferences } from '@shared/diagram/annotations';
import type { DiagramAnnotation } from '@shared/diagram';
import { errorMessage, isApiError } from '@/lib/api';
import { useEditorStore } from '@/features/editor/store';
import { useSaveState } from '@/features/editor/workingCopy';
import { saveAnnotations } from './api';

const VISIBLE_KEY = 'bankwright:annotations-visible';

export type AnnotationSaveStatus = 'saved' | 'pending' | 'saving' | 'conflict' | 'error';

interface Step {
  label: string;
  patches: Patch[];
  inversePatches: Patch[];
}

interface AnnotationUiState {
  /** Shown on the canvas (the user's choice, kept on this device). */
  visible: boolean;
  /** Set while an export captures the canvas with annotations, whatever `visible` says. */
  forceVisible: boolean;
  /** Set while an export captures the canvas without annotations. */
  forceHidden: boolean;
  panelOpen: boolean;
  /** The annotation picked in the panel (outlined on the canvas). */
  activeId: string | null;
  /** The editor is read only but this role may annotate: edits go through the annotations route. */
  annotateOnly: boolean;
  mayAnnotate: boolean;
  past: Step[];
  future: Step[];
  saveStatus: AnnotationSaveStatus;
  saveError: string | null;
  setVisible: (visible: boolean) => void;
  setPanelOpen: (open: boolean) => void;
}

function readVisible(): boolean {
  try {
    return window.localStorage.getItem(VISIBLE_KEY) !== '0';
  } catch {
    return true;
  }
}

export const useAnnotationUi = create<AnnotationUiState>()((set) => ({
  visible: typeof window === 'undefined' ? true : readVisible(),
  forceVisible: false,
  forceHidden: false,
  panelOpen: false,
  activeId: null,
  annotateOnly: false,
  mayAnnotate: false,
  past: [],
  future: [],
  saveStatus: 'saved',
  saveError: null,
  setVisible: (visible) => {
    try {
      window.localStorage.setItem(VISIBLE_KEY, visible ? '1' : '0');
    } catch {
      /* ignore */
    }
    set({ visible });
  },
  setPanelOpen: (panelOpen) => set({ panelOpen }),
}));

/** Whether the layer is drawn now. */
export const selectLayerShown = (s: AnnotationUiState) => !s.forceHidden && (s.visible || s.forceVisible);

/** Set who is editing: called by the editor layout with the caller's role. */
export function useAnnotationRole(role: Role) {
  const readOnly = useEditorStore((s) => s.readOnly);
  useEffect(() => {
    const mayAnnotate = can(role, 'diagram.annotate');
    useAnnotationUi.setState({ mayAnnotate, annotateOnly: readOnly && mayAnnotate, past: [], future: [], saveStatus: 'saved', saveError: null });
  }, [role, readOnly]);
}

let saveTimer: ReturnType<typeof setTimeout> | undefined;
let inFlight = false;
/** How long after the last annotation edit an annotations-only save starts, ms. */
export const ANNOTATION_SAVE_DEBOUNCE_MS = 800;

async function saveNow() {
  clearTimeout(saveTimer);
  const { diagramId, doc } = useEditorStore.getState();
  if (!diagramId || inFlight) return;
  inFlight = true;
  useAnnotationUi.setState({ saveStatus: 'saving', saveError: null });
  try {
    const res = await saveAnnotations(diagramId, pruneDanglingReferences(doc), useSaveState.getState().baseVersion);
    useSaveState.getState().set({ baseVersion: res.workingCopyVersion, lastSavedAt: res.updatedAt });
    const changed = useEditorStore.getState().doc.annotations !== doc.annotations;
    useAnnotationUi.setState({ saveStatus: changed ? 'pending' : 'saved' });
    if (changed) schedule();
  } catch (err) {
    const conflict = isApiError(err) && err.code === 'working_copy_conflict';
    useAnnotationUi.setState({
      saveStatus: conflict ? 'conflict' : 'error',
      saveError: conflict ? 'Someone saved this diagram since you opened it. Copy your annotation text, then reload the page.' : errorMessage(err),
    });
  } finally {
    inFlight = false;
  }
}

function schedule() {
  clearTimeout(saveTimer);
  useAnnotationUi.setState({ saveStatus: 'pending' });
  saveTimer = setTimeout(() => void saveNow(), ANNOTATION_SAVE_DEBOUNCE_MS);
}

export const annotationSave = { saveNow, retry: () => void saveNow() };

/**
 * Change the annotation list as one step. Returns false when nothing changed or the role may not
 * annotate. The recipe gets the document's `annotations` draft.
 */
export function editAnnotations(label: string, recipe: (annotations: DiagramAnnotation[]) => void): boolean {
  const store = useEditorStore.getState();
  if (!store.readOnly) return store.edit(label, (d) => recipe(d.annotations));
  const ui = useAnnotationUi.getState();
  if (!ui.annotateOnly) return false;
  const [doc, patches, inversePatches] = produceWithPatches(store.doc, (d) => recipe(d.annotations));
  if (patches.length === 0) return false;
  useEditorStore.setState({ doc, docRevision: store.docRevision + 1 });
  useAnnotationUi.setState({ past: [...ui.past, { label, patches, inversePatches }].slice(-100), future: [] });
  schedule();
  return true;
}

/** Undo / redo of annotation-only edits (the trainer's history); editors use the editor's own undo. */
export function undoAnnotations() {
  const ui = useAnnotationUi.getState();
  const step = ui.past[ui.past.length - 1];
  if (!step) return;
  const store = useEditorStore.getState();
  useEditorStore.setState({ doc: applyPatches(store.doc, step.inversePatches), docRevision: store.docRevision + 1 });
  useAnnotationUi.setState({ past: ui.past.slice(0, -1), future: [...ui.future, step] });
  schedule();
}

export function redoAnnotations() {
  const ui = useAnnotationUi.getState();
  const step = ui.future[ui.future.length - 1];
  if (!step) return;
  const store = useEditorStore.getState();
  useEditorStore.setState({ doc: applyPatches(store.doc, step.patches), docRevision: store.docRevision + 1 });
  useAnnotationUi.setState({ future: ui.future.slice(0, -1), past: [...ui.past, step] });
  schedule();
}
