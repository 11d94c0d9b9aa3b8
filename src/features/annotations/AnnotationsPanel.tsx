/**
 * The annotation editor: a panel over the canvas listing the layer's callouts, installation steps,
 * notes and highlights, with forms to add, change and remove them. Callouts, steps and highlights take
 * their parts from the canvas selection. Edits touch only the annotation layer.
 */
import { useMemo, useState, type FormEvent } from 'react';
import { useReactFlow } from '@xyflow/react';
import { useShallow } from 'zustand/react/shallow';
import {
  ANNOTATION_KIND_NAMES, ANNOTATION_LIMITS, drawableAnnotations, freshAnnotationId, nextStepNumber, referencedParts,
  type Annotation, type AnnotationKind,
} from '@shared/diagram/annotations';
import { PART_TYPES } from '@shared/electrical/parts';
import { Button } from '@/components/Button';
import { CloseIcon, PencilIcon, TrashIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { useEditorStore } from '@/features/editor/store';
import { annotationSave, editAnnotations, redoAnnotations, undoAnnotations, useAnnotationUi } from './state';

const ID_PREFIX: Record<AnnotationKind, string> = { callout: 'callout', step: 'step', note: 'anote', highlight: 'hl' };
const SAVE_WORDS = { saved: 'Annotations saved', pending: 'Unsaved annotation changes', saving: 'Saving annotations…', conflict: 'Not saved: conflict', error: 'Annotations not saved' };

function summary(a: Annotation): string {
  switch (a.kind) {
    case 'highlight':
      return a.label || `${a.partIds.length} part${a.partIds.length === 1 ? '' : 's'}`;
    case 'step':
      return `${a.number}. ${a.text}`;
    default:
      return a.text;
  }
}

interface Draft {
  kind: AnnotationKind;
  /** Annotation being changed, or null for a new one. */
  id: string | null;
  text: string;
  number: number;
  partIds: string[];
}

function useViewCentre() {
  const rf = useReactFlow();
  return () => {
    const el = document.querySelector('.bw-canvas');
    const r = el?.getBoundingClientRect();
    if (!r) return { x: 0, y: 0 };
    const p = rf.screenToFlowPosition({ x: r.left + r.width / 2, y: r.top + r.height / 3 });
    return { x: Math.round(p.x / 10) * 10, y: Math.round(p.y / 10) * 10 };
  };
}

function AnnotationForm({ draft, onDone }: { draft: Draft; onDone: () => void }) {
  const [d, setD] = useState(draft);
  const [error, setError] = useState<string | null>(null);
  const parts = useEditorStore((s) => s.doc.parts);
  const electrical = parts.filter((p) => p.type !== 'note');
  const centre = useViewCentre();
  const needsText = d.kind !== 'highlight';
  const label = (id: string) => {
    const p = parts.find((x) => x.id === id);
    return p ? p.label || PART_TYPES[p.type].name : `${id} (removed)`;
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const text = d.text.trim();
    if (needsText && !text) return setError('Write the text first.');
    if ((d.kind === 'highlight' || d.kind === 'callout') && d.partIds.length === 0) return setError('Select the part(s) on the canvas first.');
    if (d.kind === 'step' && !(Number.isInteger(d.number) && d.number >= 1 && d.number <= ANNOTATION_LIMITS.maxStepNumber)) {
      return setError(`A step number is a whole number from 1 to ${ANNOTATION_LIMITS.maxStepNumber}.`);
    }
    const doc = useEditorStore.getState().doc;
    const existing = drawableAnnotations(doc.annotations);
    if (d.kind === 'step' && existing.some((a) => a.kind === 'step' && a.number === d.number && a.id !== d.id)) {
      return setError(`There is already a step ${d.number}.`);
    }
    const id = d.id ?? freshAnnotationId(doc, ID_PREFIX[d.kind]);
    const previous = d.id ? doc.annotations.find((a) => a.id === d.id) : undefined;
    let next: Annotation;
    switch (d.kind) {
      case 'callout':
        next = { id, kind: 'callout', partId: d.partIds[0], text };
        break;
      case 'step':
        next = { id, kind: 'step', number: d.number, text, partIds: d.partIds };
        break;
      case 'note':
        next = { id, kind: 'note', position: (previous as { position?: { x: number; y: number } } | undefined)?.position ?? centre(), text };
        break;
      case 'highlight':
        next = { id, kind: 'highlight', partIds: d.partIds, ...(text ? { label: text } : {}) };
        break;
    }
    const ok = editAnnotations(`${d.id ? 'Edit' : 'Add'} ${ANNOTATION_KIND_NAMES[d.kind].toLowerCase()}`, (list) => {
      const i = list.findIndex((a) => a.id === id);
      if (i >= 0) list[i] = next;
      else list.push(next);
    });
    if (!ok && !d.id) return setError('This annotation could not be added.');
    useAnnotationUi.setState({ activeId: id });
    onDone();
  };

  return (
    <form onSubmit={submit} className="space-y-2 rounded-md border border-note-200 bg-note-50/50 p-2" aria-label={`${d.id ? 'Edit' : 'New'} ${ANNOTATION_KIND_NAMES[d.kind].toLowerCase()}`}>
      <p className="text-xs font-semibold text-note-700">{d.id ? 'Edit' : 'New'} {ANNOTATION_KIND_NAMES[d.kind].toLowerCase()}</p>
      {d.kind === 'callout' ? (
        <label className="bw-field">
          <span className="bw-field-label">Part</span>
          <select className="bw-input" value={d.partIds[0] ?? ''} onChange={(e) => setD({ ...d, partIds: e.target.value ? [e.target.value] : [] })}>
            <option value="">Choose a part…</option>
            {electrical.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label || PART_TYPES[p.type].name}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      {d.kind === 'step' ? (
        <label className="bw-field">
          <span className="bw-field-label">Step number</span>
          <input className="bw-input w-20" type="number" min={1} max={ANNOTATION_LIMITS.maxStepNumber} value={d.number} onChange={(e) => setD({ ...d, number: Number(e.target.value) })} />
        </label>
      ) : null}
      <label className="bw-field">
        <span className="bw-field-label">{d.kind === 'highlight' ? 'Label (optional)' : d.kind === 'step' ? 'What to do' : 'Text'}</span>
        {d.kind === 'highlight' ? (
          <input className="bw-input" value={d.text} maxLength={ANNOTATION_LIMITS.maxLabelLength} onChange={(e) => setD({ ...d, text: e.target.value })} data-autofocus />
        ) : (
          <textarea className="bw-input" rows={2} value={d.text} maxLength={ANNOTATION_LIMITS.maxTextLength} onChange={(e) => setD({ ...d, text: e.target.value })} data-autofocus />
        )}
      </label>
      {d.kind === 'step' || d.kind === 'highlight' ? (
        <div className="text-[11px] text-graphite-600">
          <span className="font-medium">Parts:</span> {d.partIds.length ? d.partIds.map(label).join(', ') : 'none'}{' '}
          <button
            type="button"
            className="underline"
            onClick={() => {
              const s = useEditorStore.getState();
              const ids = new Set(s.doc.parts.filter((p) => p.type !== 'note').map((p) => p.id));
              setD({ ...d, partIds: s.selection.filter((id) => ids.has(id)) });
            }}
          >
            Use the canvas selection
          </button>
        </div>
      ) : null}
      {error ? <p role="alert" className="text-xs font-medium text-fault-700">{error}</p> : null}
      <div className="flex gap-1">
        <Button size="sm" variant="primary" type="submit">
          {d.id ? 'Save' : 'Add'}
        </Button>
        <Button size="sm" variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

export function AnnotationsPanel() {
  const { open, mayAnnotate, annotateOnly, canUndo, canRedo, saveStatus, saveError, activeId } = useAnnotationUi(
    useShallow((s) => ({
      open: s.panelOpen, mayAnnotate: s.mayAnnotate, annotateOnly: s.annotateOnly, canUndo: s.past.length > 0, canRedo: s.future.length > 0,
      saveStatus: s.saveStatus, saveError: s.saveError, activeId: s.activeId,
    })),
  );
  const entries = useEditorStore((s) => s.doc.annotations);
  const annotations = useMemo(() => drawableAnnotations(entries), [entries]);
  const [draft, setDraft] = useState<Draft | null>(null);
  if (!open) return null;

  const start = (kind: AnnotationKind) => {
    const s = useEditorStore.getState();
    const ids = new Set(s.doc.parts.filter((p) => p.type !== 'note').map((p) => p.id));
    const selected = s.selection.filter((id) => ids.has(id));
    setDraft({ kind, id: null, text: '', number: nextStepNumber(annotations), partIds: kind === 'callout' ? selected.slice(0, 1) : selected });
  };
  const change = (a: Annotation) =>
    setDraft({
      kind: a.kind, id: a.id, text: a.kind === 'highlight' ? (a.label ?? '') : a.text, number: a.kind === 'step' ? a.number : 1,
      partIds: referencedParts(a),
    });
  const remove = (a: Annotation) => {
    editAnnotations(`Delete ${ANNOTATION_KIND_NAMES[a.kind].toLowerCase()}`, (list) => {
      const i = list.findIndex((x) => x.id === a.id);
      if (i >= 0) list.splice(i, 1);
    });
    if (activeId === a.id) useAnnotationUi.setState({ activeId: null });
  };

  return (
    <section aria-label="Annotations" className="absolute top-2 right-2 z-20 flex max-h-[calc(100%-12rem)] w-80 flex-col rounded-lg border border-graphite-200 bg-white shadow-lg">
      <header className="flex items-center gap-1 border-b border-graphite-100 px-3 py-2">
        <h2 className="flex-1 text-[13px] font-semibold">Annotations</h2>
        {annotateOnly ? (
          <>
            <Button size="sm" variant="ghost" disabled={!canUndo} onClick={undoAnnotations}>
              Undo
            </Button>
            <Button size="sm" variant="ghost" disabled={!canRedo} onClick={redoAnnotations}>
              Redo
            </Button>
          </>
        ) : null}
        <button type="button" className="rounded p-1 hover:bg-graphite-100" aria-label="Close annotations" onClick={() => useAnnotationUi.getState().setPanelOpen(false)}>
          <CloseIcon size={14} />
        </button>
      </header>
      <div className="min-h-0 flex-1 space-y-2 overflow-y-auto p-3">
        <p className="text-[11px] leading-4 text-graphite-500">
          Marks for the crew briefing. They never change the electrical model; select parts on the canvas first for a callout, step or highlight.
        </p>
        {/* The trainer's only save indicator (the toolbar says "Read only"): shown in every state, "saved" included. */}
        {annotateOnly ? (
          saveStatus === 'error' || saveStatus === 'conflict' ? (
            <Notice signal="error">
              {SAVE_WORDS[saveStatus]}. {saveError}{' '}
              {saveStatus === 'error' ? (
                <button type="button" className="underline" onClick={annotationSave.retry}>
                  Try again
                </button>
              ) : null}
            </Notice>
          ) : (
            <p role="status" className="text-xs text-graphite-600">{SAVE_WORDS[saveStatus]}</p>
          )
        ) : null}
        {mayAnnotate && !draft ? (
          <div className="flex flex-wrap gap-1" role="group" aria-label="Add an annotation">
            <Button size="sm" onClick={() => start('callout')}>+ Callout</Button>
            <Button size="sm" onClick={() => start('step')}>+ Step</Button>
            <Button size="sm" onClick={() => start('note')}>+ Note</Button>
            <Button size="sm" onClick={() => start('highlight')}>+ Highlight</Button>
          </div>
        ) : null}
        {draft ? <AnnotationForm key={`${draft.kind}:${draft.id ?? 'new'}`} draft={draft} onDone={() => setDraft(null)} /> : null}
        {annotations.length === 0 ? (
          <p className="text-xs text-graphite-600">No annotations yet.</p>
        ) : (
          <ul className="space-y-1" aria-label="Annotation list">
            {annotations.map((a) => (
              <li key={a.id} className={`flex items-start gap-1 rounded-md border px-2 py-1 text-xs ${a.id === activeId ? 'border-copper-300 bg-copper-50' : 'border-graphite-100'}`}>
                <button
                  type="button"
                  className="min-w-0 flex-1 text-left"
                  onClick={() => {
                    useAnnotationUi.setState({ activeId: a.id });
                    const refs = referencedParts(a);
                    if (refs.length) useEditorStore.getState().focusParts(refs);
                  }}
                >
                  <span className="block text-[10px] font-semibold tracking-wide text-note-700 uppercase">{ANNOTATION_KIND_NAMES[a.kind]}</span>
                  <span className="line-clamp-2">{summary(a)}</span>
                </button>
                {mayAnnotate ? (
                  <>
                    <button type="button" className="rounded p-1 hover:bg-graphite-100" aria-label={`Edit ${ANNOTATION_KIND_NAMES[a.kind].toLowerCase()} ${a.id}`} onClick={() => change(a)}>
                      <PencilIcon size={13} />
                    </button>
                    <button type="button" className="rounded p-1 text-fault-700 hover:bg-fault-50" aria-label={`Delete ${ANNOTATION_KIND_NAMES[a.kind].toLowerCase()} ${a.id}`} onClick={() => remove(a)}>
                      <TrashIcon size={13} />
                    </button>
                  </>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </div>
    </section>
  );
}
