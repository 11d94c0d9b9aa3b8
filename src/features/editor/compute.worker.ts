/// <reference lib="webworker" />
/**
 * Runs the electrical core off the main thread. Messages in: { seq, doc, options }; out: EditorResults
 * for that seq (the page drops answers older than the newest request it sent).
 */
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisOptions } from './store';
import { computeCanvas } from './results/compute';
import type { EditorResults } from './results/types';

export interface ComputeRequest {
  seq: number;
  doc: DiagramDocument;
  options: AnalysisOptions;
}
export type ComputeResponse = { ok: true; results: EditorResults } | { ok: false; seq: number; message: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<ComputeRequest>) => {
  const { seq, doc, options } = e.data;
  const t0 = performance.now();
  try {
    const { canvas, raw } = computeCanvas(doc, options);
    const results: EditorResults = { seq, mode: options.mode, canvas, raw, elapsed_ms: performance.now() - t0 };
    scope.postMessage({ ok: true, results } satisfies ComputeResponse);
  } catch (err) {
    scope.postMessage({ ok: false, seq, message: err instanceof Error ? err.message : String(err) } satisfies ComputeResponse);
  }
};
