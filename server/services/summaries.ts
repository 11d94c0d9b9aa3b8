/**
 * Results summaries for saved revisions, computed in one worker thread so a large diagram's analysis
 * (seconds for a 2,000-part bank) never blocks the server's request thread. Jobs are queued in the worker
 * in order. When the worker cannot start (or dies), the summary is computed inline instead.
 */
import { Worker } from 'node:worker_threads';
import type { DiagramDocument } from '../../shared/diagram/schema';
import { summarizeResults, type RevisionResultsSummary } from './results-summary';

type Pending = { resolve: (s: RevisionResultsSummary) => void; reject: (e: Error) => void; doc: DiagramDocument };

let worker: Worker | null = null;
let workerBroken = false;
let nextId = 1;
const pending = new Map<number, Pending>();

function failAll(err: Error) {
  // Recompute the outstanding jobs inline rather than failing the saves.
  for (const [id, p] of pending) {
    pending.delete(id);
    try {
      p.resolve(summarizeResults(p.doc));
    } catch (e) {
      p.reject(e as Error);
    }
  }
  console.error('[summaries] worker stopped:', err.message);
}

function startWorker(): Worker | null {
  if (worker || workerBroken) return worker;
  try {
    const w = new Worker(new URL('./summary-worker.mjs', import.meta.url));
    w.unref(); // an idle worker never keeps the process alive; it is ref'd while jobs are out
    w.on('message', (msg: { id: number; summary?: RevisionResultsSummary; error?: string }) => {
      const p = pending.get(msg.id);
      if (!p) return;
      pending.delete(msg.id);
      if (pending.size === 0) w.unref();
      if (msg.summary) p.resolve(msg.summary);
      else p.reject(new Error(msg.error ?? 'summary failed'));
    });
    const onGone = (err: Error) => {
      if (worker === w) worker = null;
      workerBroken = true;
      failAll(err);
    };
    w.on('error', onGone);
    w.on('exit', (code) => {
      if (pending.size > 0 || code !== 0) onGone(new Error(`exited with code ${code}`));
      if (worker === w) worker = null;
    });
    worker = w;
  } catch (err) {
    workerBroken = true;
    console.error('[summaries] worker could not start, computing inline:', (err as Error).message);
  }
  return worker;
}

/** The results summary of a valid diagram document. */
export function computeResultsSummary(doc: DiagramDocument): Promise<RevisionResultsSummary> {
  const w = startWorker();
  if (!w) return Promise.resolve().then(() => summarizeResults(doc));
  const id = nextId++;
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject, doc });
    w.ref();
    w.postMessage({ id, doc });
  });
}

/** Start the worker now (at server start), so the first save does not wait for the core to load. */
export function warmResultsSummaries(): void {
  startWorker();
}
