/**
 * Live results: every document or analysis-option change (debounced) goes to the compute worker; the
 * newest answer lands in the store. Answers for older sequence numbers are dropped.
 */
import { useEffect } from 'react';
import { useEditorStore } from '../store';
import type { ComputeRequest, ComputeResponse } from '../compute.worker';

/** Pause after the last change before computing, ms (short enough to feel live, long enough to batch a drag's moves). */
export const COMPUTE_DEBOUNCE_MS = 40;

export function useLiveResults(enabled = true) {
  useEffect(() => {
    if (!enabled || typeof Worker === 'undefined') return;
    const worker = new Worker(new URL('../compute.worker.ts', import.meta.url), { type: 'module' });
    let seq = 0;
    let timer: ReturnType<typeof setTimeout> | undefined;

    worker.onmessage = (e: MessageEvent<ComputeResponse>) => {
      const data = e.data;
      const answerSeq = data.ok ? data.results.seq : data.seq;
      if (answerSeq !== seq) return; // stale: a newer request is on its way
      const store = useEditorStore.getState();
      if (data.ok) store.setResults(data.results, 'ready');
      else store.setResults(null, 'error');
    };
    worker.onerror = () => useEditorStore.getState().setResultsStatus('error');

    const post = () => {
      const { doc, analysis } = useEditorStore.getState();
      seq += 1;
      const req: ComputeRequest = { seq, doc, options: analysis };
      worker.postMessage(req);
    };
    const schedule = () => {
      clearTimeout(timer);
      useEditorStore.getState().setResultsStatus('computing');
      timer = setTimeout(post, COMPUTE_DEBOUNCE_MS);
    };
    schedule();
    const unsubscribe = useEditorStore.subscribe((s, prev) => {
      if (s.doc !== prev.doc || s.analysis !== prev.analysis) schedule();
    });
    return () => {
      unsubscribe();
      clearTimeout(timer);
      worker.terminate();
    };
  }, [enabled]);
}
