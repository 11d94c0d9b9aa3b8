/// <reference lib="webworker" />
/**
 * Runs the electrical core off the main thread. Messages in: { seq, stage, doc, options }; out:
 * EditorResults for that seq and stage (the page drops answers older than the newest request it sent).
 * The page runs two of these: one for the fast 'figures' stage, one for the 'full' analysis, so a slow
 * rule check never holds back the figures of the next edit.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisOptions } from './store';
import { computeCanvas, type ComputeStage } from './results/compute';
import type { EditorResults } from './results/types';

export interface ComputeRequest {
  seq: number;
  stage: ComputeStage;
  doc: DiagramDocument;
  options: AnalysisOptions;
}
/** When the worker took the request and when it answered, ms since the epoch (timeOrigin + now: comparable across threads). */
export interface ComputeTiming {
  received: number;
  answered: number;
}
export type ComputeResponse = ({ ok: true; results: EditorResults } | { ok: false; seq: number; stage: ComputeStage; message: string }) & { timing: ComputeTiming };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<ComputeRequest>) => {
  const at = () => performance.timeOrigin + performance.now();
  // Before reading `data`: the message is deserialised on first access.
  const received = at();
  const { seq, stage, doc, options } = e.data;
  const t0 = performance.now();
  try {
    const { canvas, raw } = computeCanvas(doc, options, stage);
    // The figures stage's rule-free result is not what the panels read: they keep the last full one.
    const results: EditorResults = { seq, stage, mode: options.mode, canvas, raw: stage === 'full' ? raw : null, elapsed_ms: performance.now() - t0 };
    scope.postMessage({ ok: true, results, timing: { received, answered: at() } } satisfies ComputeResponse);
  } catch (err) {
    scope.postMessage({ ok: false, seq, stage, message: err instanceof Error ? err.message : String(err), timing: { received, answered: at() } } satisfies ComputeResponse);
  }
};
