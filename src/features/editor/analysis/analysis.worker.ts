/// <reference lib="webworker" />
/**
 * The analysis panels' worker: the full analysis with sizing on every change, and the take-off layouts
 * when the explorer asks. Answers carry the request's `seq`; the page drops stale ones.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisOptions } from '../store';
import { exploreTakeoff, runAnalysis, type AnalysisOutput, type TakeoffExploration } from './engine';

export type AnalysisRequest =
  | { type: 'analyze'; seq: number; doc: DiagramDocument; options: AnalysisOptions }
  | { type: 'takeoff'; seq: number; doc: DiagramDocument };

export type AnalysisResponse =
  | { type: 'analyze'; seq: number; ok: true; output: AnalysisOutput }
  | { type: 'takeoff'; seq: number; ok: true; output: TakeoffExploration }
  | { type: 'analyze' | 'takeoff'; seq: number; ok: false; message: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<AnalysisRequest>) => {
  const req = e.data;
  try {
    if (req.type === 'analyze') scope.postMessage({ type: 'analyze', seq: req.seq, ok: true, output: runAnalysis(req.doc, req.options) } satisfies AnalysisResponse);
    else scope.postMessage({ type: 'takeoff', seq: req.seq, ok: true, output: exploreTakeoff(req.doc) } satisfies AnalysisResponse);
  } catch (err) {
    scope.postMessage({ type: req.type, seq: req.seq, ok: false, message: err instanceof Error ? err.message : String(err) } satisfies AnalysisResponse);
  }
};
