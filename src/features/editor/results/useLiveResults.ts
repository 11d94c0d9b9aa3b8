/**
 * Live results. Every electrical change of the document (not a move: positions, rotation, waypoints
 * and annotations change no figure) and every change of the analysis options goes to two compute
 * workers:
 * - the figures lane: at once when its worker is idle, else as soon as it answers (one request in
 *   flight, the newest state next), so an edit shows new canvas figures within one solve;
 * - the full lane: after a short pause, the analysis with every rule check, for the findings, the
 *   badges and the analysis panels.
 * Answers for older sequence numbers are dropped. An answer with nothing solved keeps the last figures,
 * greyed, with the reason (stale.ts). Performance marks ("bw-change", "bw-figures",
 * "bw-full") let the browser benchmark time an edit.
 */
import { useEffect } from 'react';
import { flushSync } from 'react-dom';
import type { DiagramDocument } from '@shared/diagram';
import { useEditorStore } from '../store';
import type { ComputeRequest, ComputeResponse } from '../compute.worker';
import type { ComputeStage } from './compute';
import { withStale } from './stale';
import type { EditorResults } from './types';

/** Pause after the last change before the full analysis, ms (batches a burst of typing into one rule check). */
export const FULL_DEBOUNCE_MS = 150;

/** Whether two documents have the same electrical content (reference checks: immer keeps unchanged objects). */
export function sameElectrical(a: DiagramDocument, b: DiagramDocument): boolean {
  if (a === b) return true;
  if (a.settings !== b.settings || a.parts.length !== b.parts.length || a.cables.length !== b.cables.length) return false;
  for (let i = 0; i < a.parts.length; i++) {
    const p = a.parts[i];
    const q = b.parts[i];
    if (p !== q && (p.id !== q.id || p.type !== q.type || p.props !== q.props || p.label !== q.label)) return false;
  }
  if (a.cables === b.cables) return true;
  for (let i = 0; i < a.cables.length; i++) {
    const c = a.cables[i];
    const d = b.cables[i];
    if (c !== d && (c.id !== d.id || c.props !== d.props || c.from !== d.from || c.to !== d.to || c.label !== d.label)) return false;
  }
  return true;
}

/**
 * Figures for the newest revision on top of the last full results (same mode): the findings, badges
 * and panel result stay those of the last full analysis until the next one lands.
 */
export function mergeFigures(prev: EditorResults | null, figures: EditorResults): EditorResults | null {
  if (!prev || prev.mode !== figures.mode || prev.raw === null) return null;
  const canvas = { ...figures.canvas, findings: prev.canvas.findings, badges: prev.canvas.badges };
  if (figures.mode === 'discharge') {
    // The discharge simulation runs in the full stage only.
    canvas.modeSummary = prev.canvas.modeSummary;
    canvas.marks = { ...figures.canvas.marks, ...prev.canvas.marks };
  }
  return { ...figures, stage: 'figures', canvas, raw: prev.raw };
}

const mark = (name: string, detail?: unknown) => {
  try {
    performance.mark(name, { detail });
  } catch {
    /* marks are a measuring aid only */
  }
};

/** Now in ms since the epoch, comparable with the worker's timing. */
const epochNow = () => performance.timeOrigin + performance.now();

interface Lane {
  stage: ComputeStage;
  worker: Worker;
  busy: boolean;
  pending: boolean;
  timer?: ReturnType<typeof setTimeout>;
  /** When the last request was posted and when postMessage returned (epoch ms), for the marks. */
  posted: [number, number];
}

export function useLiveResults(enabled = true) {
  useEffect(() => {
    if (!enabled || typeof Worker === 'undefined') return;
    let seq = 0;
    const lanes: Lane[] = (['figures', 'full'] as const).map((stage) => ({
      stage, worker: new Worker(new URL('../compute.worker.ts', import.meta.url), { type: 'module', name: `bankwright-${stage}` }), busy: false, pending: false, posted: [0, 0],
    }));

    const post = (lane: Lane) => {
      clearTimeout(lane.timer);
      const { doc, analysis } = useEditorStore.getState();
      lane.busy = true;
      lane.pending = false;
      const t0 = epochNow();
      lane.worker.postMessage({ seq, stage: lane.stage, doc, options: analysis } satisfies ComputeRequest);
      lane.posted = [t0, epochNow()];
    };
    const request = (lane: Lane) => {
      if (lane.busy) lane.pending = true;
      else if (lane.stage === 'figures') post(lane);
      else {
        clearTimeout(lane.timer);
        lane.timer = setTimeout(() => (lane.busy ? (lane.pending = true) : post(lane)), FULL_DEBOUNCE_MS);
      }
    };

    for (const lane of lanes) {
      lane.worker.onmessage = (e: MessageEvent<ComputeResponse>) => {
        const arrived = epochNow();
        const data = e.data;
        lane.busy = false;
        const answerSeq = data.ok ? data.results.seq : data.seq;
        if (lane.pending) request(lane);
        if (answerSeq !== seq) return; // stale: a newer request is on its way
        const store = useEditorStore.getState();
        if (!data.ok) {
          if (lane.stage === 'full') store.setResults(null, 'error');
          return;
        }
        // A change that solves nothing keeps the last figures, greyed (stale.ts).
        const results = withStale(store.results, data.results);
        if (lane.stage === 'full') {
          store.setResults(results, 'ready');
          mark('bw-full', { seq, worker_ms: data.results.elapsed_ms });
          return;
        }
        if (store.results?.seq === seq) return; // the full answer came first
        const merged = mergeFigures(store.results, results);
        if (!merged) return; // first results, or a new mode: wait for the full analysis
        // Rendered at once, in this task: the new figures reach the DOM without waiting for React's
        // scheduler (and a frame of the old figures) in between.
        flushSync(() => store.setResults(merged, 'computing'));
        // Where the time went, ms on this page's clock: post, worker in/out, arrival here, applied.
        const o = performance.timeOrigin;
        mark('bw-figures', {
          seq, worker_ms: data.results.elapsed_ms, posted: lane.posted[0] - o, postReturned: lane.posted[1] - o,
          received: data.timing.received - o, answered: data.timing.answered - o, arrived: arrived - o, applied: epochNow() - o,
        });
      };
      lane.worker.onerror = () => useEditorStore.getState().setResultsStatus('error');
    }

    const changed = () => {
      seq += 1;
      mark('bw-change', { seq });
      const store = useEditorStore.getState();
      if (store.resultsStatus !== 'computing') store.setResultsStatus('computing');
      for (const lane of lanes) request(lane);
    };
    changed();
    const unsubscribe = useEditorStore.subscribe((s, prev) => {
      if (s.analysis !== prev.analysis || !sameElectrical(s.doc, prev.doc)) changed();
    });
    return () => {
      unsubscribe();
      for (const lane of lanes) {
        clearTimeout(lane.timer);
        lane.worker.terminate();
      }
    };
  }, [enabled]);
}
