/**
 * The analysis panels' results.
 * - The analysis in the chosen mode: the core's result the editor's compute worker already sends with the
 *   canvas figures (`results.raw`); computed here only when that is missing.
 * - Sizing suggestions and the take-off layouts: computed here, in the panels' own worker (debounced,
 *   only while a panel that shows them is mounted), or directly where there is no Worker (tests).
 * Only electrical content triggers a new run: moving a part on the canvas changes nothing here.
 */
import { useEffect } from 'react';
import { create } from 'zustand';
import type { DiagramDocument } from '@shared/diagram';
import type { AnalysisResult } from '@shared/electrical';
import type { SizingWithPlan } from '@shared/electrical/sizing';
import { useEditorStore, type AnalysisOptions } from '../store';
import type { AnalysisRequest, AnalysisResponse, Job, TakeoffExploration } from './engine';

export type CoreStatus = 'idle' | 'computing' | 'ready' | 'error';

export interface Slot<T> {
  /** Key of the inputs `output` is for. */
  key: string | null;
  output: T | null;
  status: CoreStatus;
  message?: string;
}

type CoreState = Record<Job, Slot<unknown>>;

const empty = (): Slot<unknown> => ({ key: null, output: null, status: 'idle' });
export const useCoreResults = create<CoreState>()(() => ({ analyze: empty(), sizing: empty(), takeoff: empty() }));

/** Pause after the last electrical change before computing, ms. */
export const ANALYSIS_DEBOUNCE_MS = 120;
/** Keep the worker this long after the last panel closed (switching tabs unmounts one and mounts the other), ms. */
const IDLE_STOP_MS = 5000;
const JOBS: Job[] = ['analyze', 'sizing', 'takeoff'];

/** A value is the core's analysis result (the editor's compute worker passes it as `results.raw`). */
export function isAnalysisResult(x: unknown): x is AnalysisResult {
  if (!x || typeof x !== 'object') return false;
  const r = x as { ok?: unknown; mode?: unknown; findings?: unknown };
  return typeof r.ok === 'boolean' && typeof r.mode === 'string' && Array.isArray(r.findings);
}

/** What the results depend on: everything but positions, waypoints and annotations. */
export function electricalKey(doc: DiagramDocument): string {
  return JSON.stringify([
    doc.settings,
    doc.parts.map((p) => [p.id, p.type, p.label, p.props]),
    doc.cables.map((c) => [c.id, c.from, c.to, c.label ?? '', c.props]),
  ]);
}

const optionsKey = (o: AnalysisOptions) => JSON.stringify([o.mode, o.mode === 'fault' ? o.fault ?? null : null]);

const refs: Record<Job, number> = { analyze: 0, sizing: 0, takeoff: 0 };
const seqs: Record<Job, number> = { analyze: 0, sizing: 0, takeoff: 0 };
const timers: Partial<Record<Job, ReturnType<typeof setTimeout>>> = {};
const pendingKeys: Record<Job, Map<number, string>> = { analyze: new Map(), sizing: new Map(), takeoff: new Map() };
let worker: Worker | null = null;
let unsubscribe: (() => void) | null = null;
let stopTimer: ReturnType<typeof setTimeout> | undefined;
let lastDocKey: { doc: DiagramDocument; key: string } | null = null;

function docKey(doc: DiagramDocument): string {
  if (lastDocKey?.doc !== doc) lastDocKey = { doc, key: electricalKey(doc) };
  return lastDocKey.key;
}

function inputKey(job: Job): string {
  const { doc, analysis, unitSystem } = useEditorStore.getState();
  return job === 'analyze' ? `${optionsKey(analysis)}|${docKey(doc)}` : job === 'sizing' ? `${unitSystem}|${docKey(doc)}` : docKey(doc);
}

const setSlot = (job: Job, slot: Slot<unknown>) => useCoreResults.setState({ [job]: slot } as Partial<CoreState>);

function onAnswer(data: AnalysisResponse, key: string) {
  if (data.seq !== seqs[data.job]) return; // a newer request is on its way
  if (data.ok) setSlot(data.job, { key, output: data.output, status: 'ready' });
  else setSlot(data.job, { ...useCoreResults.getState()[data.job], status: 'error', message: data.message });
}

function ensureWorker(): Worker | null {
  if (worker || typeof Worker === 'undefined') return worker;
  try {
    worker = new Worker(new URL('./analysis.worker.ts', import.meta.url), { type: 'module' });
  } catch {
    return null;
  }
  worker.onmessage = (e: MessageEvent<AnalysisResponse>) => {
    const key = pendingKeys[e.data.job].get(e.data.seq) ?? '';
    pendingKeys[e.data.job].delete(e.data.seq);
    onAnswer(e.data, key);
  };
  worker.onerror = (e: ErrorEvent) => {
    // Start a fresh worker on the next request; report the failure for what was asked.
    worker?.terminate();
    worker = null;
    for (const job of JOBS) {
      pendingKeys[job].clear();
      const slot = useCoreResults.getState()[job];
      if (slot.status === 'computing') setSlot(job, { ...slot, status: 'error', message: `The analysis stopped unexpectedly${e.message ? ` (${e.message})` : ''}. It runs again on the next change.` });
    }
  };
  return worker;
}

function post(job: Job) {
  const { doc, analysis, unitSystem } = useEditorStore.getState();
  const key = inputKey(job);
  const seq = ++seqs[job];
  const w = ensureWorker();
  if (w) {
    pendingKeys[job].set(seq, key);
    w.postMessage({ job, seq, doc, options: analysis, unitSystem } satisfies AnalysisRequest);
    return;
  }
  // No worker (component tests, very old browsers): compute on this thread, the core loaded on demand.
  import('./engine')
    .then(({ runJob }) => onAnswer({ job, seq, ok: true, output: runJob({ job, doc, options: analysis, unitSystem }) }, key))
    .catch((err: unknown) => onAnswer({ job, seq, ok: false, message: err instanceof Error ? err.message : String(err) }, key));
}

function schedule(job: Job) {
  if (refs[job] === 0) return;
  const slot = useCoreResults.getState()[job];
  if (slot.key === inputKey(job) && slot.status === 'ready') return;
  clearTimeout(timers[job]);
  if (slot.status !== 'computing') setSlot(job, { ...slot, status: 'computing' });
  timers[job] = setTimeout(() => post(job), ANALYSIS_DEBOUNCE_MS);
}

function start() {
  clearTimeout(stopTimer);
  if (unsubscribe) return;
  unsubscribe = useEditorStore.subscribe((s, prev) => {
    if (s.doc === prev.doc && s.analysis === prev.analysis && s.unitSystem === prev.unitSystem) return;
    for (const job of JOBS) if (s.doc !== prev.doc || (job === 'analyze' && s.analysis !== prev.analysis) || (job === 'sizing' && s.unitSystem !== prev.unitSystem)) schedule(job);
  });
}

function stop() {
  unsubscribe?.();
  unsubscribe = null;
  worker?.terminate();
  worker = null;
  for (const job of JOBS) {
    clearTimeout(timers[job]);
    pendingKeys[job].clear();
    const slot = useCoreResults.getState()[job];
    // An unanswered request is lost with the worker: forget it so the next mount asks again.
    if (slot.status === 'computing') setSlot(job, { ...slot, status: 'idle', key: null });
  }
}

/** Keep `job` computed while the calling component is mounted and `enabled`. */
export function useCoreJob(job: Job, enabled = true) {
  useEffect(() => {
    if (!enabled) return;
    refs[job] += 1;
    start();
    schedule(job);
    return () => {
      refs[job] -= 1;
      if (JOBS.every((j) => refs[j] === 0)) stopTimer = setTimeout(stop, IDLE_STOP_MS);
    };
  }, [job, enabled]);
}

export interface AnalysisView {
  result: AnalysisResult | null;
  /** True while a newer result is on its way (the one shown is for an earlier state). */
  updating: boolean;
  error?: string;
}

/** The analysis in the chosen mode: the editor's results when they carry it, else computed here. */
export function useAnalysisResult(): AnalysisView {
  const raw = useEditorStore((s) => s.results?.raw);
  const resultsStatus = useEditorStore((s) => s.resultsStatus);
  // 'figures': fast canvas figures for the newest revision, the analysis still the last full one.
  const stage = useEditorStore((s) => (s.results ? s.results.stage ?? 'full' : null));
  const fromEditor = isAnalysisResult(raw) ? raw : null;
  // Compute here only when the editor's full results came without the analysis, or failed.
  const needOwn = !fromEditor && (stage === 'full' || resultsStatus === 'error');
  useCoreJob('analyze', needOwn);
  const own = useCoreResults((s) => s.analyze) as Slot<AnalysisResult>;
  if (fromEditor) return { result: fromEditor, updating: resultsStatus === 'computing' || stage === 'figures' };
  if (needOwn) return { result: own.output, updating: own.status === 'computing', error: own.status === 'error' ? own.message : undefined };
  return { result: null, updating: true };
}

/** Per-branch sizing suggestions of the editor's document. */
export function useSizing(enabled = true): Slot<SizingWithPlan> {
  useCoreJob('sizing', enabled);
  return useCoreResults((s) => s.sizing) as Slot<SizingWithPlan>;
}

/** The take-off layouts, computed while `enabled`. */
export function useTakeoffExploration(enabled: boolean): Slot<TakeoffExploration> {
  useCoreJob('takeoff', enabled);
  return useCoreResults((s) => s.takeoff) as Slot<TakeoffExploration>;
}

/** Whether a slot's output is for the editor's current document (not an earlier one). */
export function useIsCurrent(job: Job): boolean {
  const doc = useEditorStore((s) => s.doc);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const key = useCoreResults((s) => s[job].key);
  return key !== null && key === (job === 'sizing' ? `${unitSystem}|${docKey(doc)}` : docKey(doc));
}

/** Forget every result and stop the worker (tests). */
export function resetCoreResults() {
  stop();
  clearTimeout(stopTimer);
  for (const job of JOBS) refs[job] = 0;
  lastDocKey = null;
  useCoreResults.setState({ analyze: empty(), sizing: empty(), takeoff: empty() });
}
