/// <reference lib="webworker" />
/**
 * The analysis panels' worker: sizing suggestions, the take-off layouts, and the analysis itself when the
 * editor's results do not carry it. Answers carry the request's `seq`; the page drops stale ones.
 */
import { runJob, type AnalysisRequest, type AnalysisResponse } from './engine';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<AnalysisRequest>) => {
  const { job, seq } = e.data;
  try {
    scope.postMessage({ job, seq, ok: true, output: runJob(e.data) } satisfies AnalysisResponse);
  } catch (err) {
    scope.postMessage({ job, seq, ok: false, message: err instanceof Error ? err.message : String(err) } satisfies AnalysisResponse);
  }
};
