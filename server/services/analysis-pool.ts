/**
 * A small pool of worker threads for the electrical analyses (results summaries of saved revisions and
 * POST /api/diagrams/:id/check), so a large diagram's solve never blocks the request thread.
 *
 * - `workers` threads (default: one per core, at most 4), started on first use or by `warm()`.
 * - One queue in arrival order, at most `maxQueued` jobs waiting: beyond that a job is refused at once
 *   with 503 `busy` and Retry-After, instead of piling up behind a few big checks.
 * - A job running longer than `timeoutMs` is ended by terminating its worker (a synchronous solve cannot
 *   be interrupted otherwise): 504 `analysis_timeout`. A fresh worker takes its place.
 * - A worker that crashes fails its job with 500 `analysis_failed` and is replaced.
 * - When no worker can be started at all (no worker support), jobs run inline on the request thread.
 *
 * docs/decisions/009-analysis-workers.md.
 */
import os from 'node:os';
import { Worker } from 'node:worker_threads';
import { DomainError } from './errors';
import type { AnalysisJob, JobOutcome } from './analysis-jobs';
import { errorSummary, log } from '../http/logger';

export interface AnalysisPoolOptions {
  workers?: number;
  maxQueued?: number;
  timeoutMs?: number;
  /** Worker entry (tests point it elsewhere); default ./analysis-worker.mjs. */
  workerUrl?: URL;
}

interface Queued {
  job: AnalysisJob;
  resolve: (o: JobOutcome) => void;
  reject: (e: Error) => void;
}

interface Slot {
  worker: Worker;
  /** The worker has loaded the core (its first message); jobs go only to ready workers. */
  ready: boolean;
  job: Queued | null;
  timer: NodeJS.Timeout | null;
}

export const DEFAULT_POOL = {
  workers: Math.max(1, Math.min(4, os.availableParallelism())),
  maxQueued: 100,
  timeoutMs: 60_000,
} as const;

const RETRY_AFTER_SECONDS = 2;
const MAX_BOOT_FAILURES = 3;

export function busyError(maxQueued: number): DomainError {
  return new DomainError(
    'unavailable',
    'busy',
    `The server is analysing ${maxQueued} other diagrams already. Try again in a few seconds.`,
    { retryAfterSeconds: RETRY_AFTER_SECONDS },
    RETRY_AFTER_SECONDS,
  );
}

export function timeoutError(timeoutMs: number): DomainError {
  return new DomainError('timeout', 'analysis_timeout', `The analysis took longer than the server's limit of ${Math.round(timeoutMs / 1000)} s and was stopped. Split the diagram or simplify it, then retry.`, {
    timeoutSeconds: timeoutMs / 1000,
  });
}

export type AnalysisPool = ReturnType<typeof createAnalysisPool>;

export function createAnalysisPool(options: AnalysisPoolOptions = {}) {
  const size = Math.max(1, options.workers ?? DEFAULT_POOL.workers);
  const maxQueued = Math.max(0, options.maxQueued ?? DEFAULT_POOL.maxQueued);
  const timeoutMs = options.timeoutMs ?? DEFAULT_POOL.timeoutMs;
  const workerUrl = options.workerUrl ?? new URL('./analysis-worker.mjs', import.meta.url);
  const slots: Slot[] = [];
  const queue: Queued[] = [];
  let inline = false;
  let closed = false;
  /** Workers that died before they were ready, in a row: after MAX_BOOT_FAILURES, analyse inline. */
  let bootFailures = 0;
  let inlineRunner: Promise<(job: AnalysisJob) => JobOutcome> | null = null;

  function runInline(q: Queued) {
    // Loaded only here: the request thread does not import the electrical core otherwise.
    inlineRunner ??= import('./analysis-jobs').then((m) => m.runAnalysisJob);
    inlineRunner.then((run) => q.resolve(run(q.job))).catch((e) => q.reject(e as Error));
  }

  function finish(slot: Slot) {
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = null;
    slot.job = null;
    slot.worker.unref(); // an idle worker never keeps the process alive
    dispatch();
  }

  function replace(slot: Slot) {
    const i = slots.indexOf(slot);
    if (i >= 0) slots.splice(i, 1);
    void slot.worker.terminate().catch(() => {});
    if (!closed) dispatch();
  }

  function spawn(): Slot | null {
    let worker: Worker;
    try {
      worker = new Worker(workerUrl);
    } catch (err) {
      log().error({ event: 'analysis.worker_start_failed', err: errorSummary(err) }, 'analysis worker could not start; analysing inline');
      inline = true;
      return null;
    }
    worker.unref();
    const slot: Slot = { worker, ready: false, job: null, timer: null };
    worker.on('message', (msg: { ready?: true; outcome?: JobOutcome; error?: string }) => {
      if (msg.ready) {
        slot.ready = true;
        bootFailures = 0;
        dispatch();
        return;
      }
      const q = slot.job;
      if (!q) return;
      finish(slot);
      if (msg.outcome) q.resolve(msg.outcome);
      else q.reject(new DomainError('failed', 'analysis_failed', 'The analysis failed on the server.'));
      if (msg.error) log().error({ event: 'analysis.job_failed' }, 'analysis job failed');
    });
    const gone = (why: string) => {
      if (!slots.includes(slot)) return;
      const q = slot.job;
      if (slot.timer) clearTimeout(slot.timer);
      slot.job = null;
      log().error({ event: 'analysis.worker_stopped', why: String(why).slice(0, 80) }, 'analysis worker stopped');
      if (!slot.ready && ++bootFailures >= MAX_BOOT_FAILURES) {
        log().error({ event: 'analysis.inline' }, 'analysis workers do not start; analysing inline on the request thread');
        inline = true;
      }
      q?.reject(new DomainError('failed', 'analysis_failed', 'The analysis stopped on the server. Try again.'));
      replace(slot);
    };
    worker.on('error', (err) => gone(err.message));
    worker.on('exit', (code) => gone(`exited with code ${code}`));
    slots.push(slot);
    return slot;
  }

  function dispatch() {
    while (queue.length > 0) {
      if (inline) {
        runInline(queue.shift()!);
        continue;
      }
      const slot = slots.find((s) => s.ready && s.job === null);
      if (!slot) {
        // Start another worker when every one is busy; the job waits until one is ready.
        if (slots.length < size && slots.every((s) => s.ready)) spawn();
        if (inline) continue;
        return;
      }
      const q = queue.shift()!;
      slot.job = q;
      slot.worker.ref();
      const s = slot;
      s.timer = setTimeout(() => {
        if (s.job !== q) return;
        s.job = null;
        s.timer = null;
        q.reject(timeoutError(timeoutMs));
        replace(s);
      }, timeoutMs);
      s.worker.postMessage(q.job);
    }
  }

  return {
    size,
    maxQueued,
    timeoutMs,
    /** Runs a job in a worker; rejects with 503 busy when `maxQueued` jobs are already waiting. */
    run(job: AnalysisJob): Promise<JobOutcome> {
      if (closed) return Promise.reject(new DomainError('unavailable', 'busy', 'The server is stopping.'));
      const idle = slots.some((s) => s.ready && s.job === null) || (slots.length < size && !inline);
      if (queue.length >= maxQueued && !idle) {
        return Promise.reject(busyError(maxQueued));
      }
      return new Promise<JobOutcome>((resolve, reject) => {
        queue.push({ job, resolve, reject });
        dispatch();
      });
    },
    /** Starts the workers now, so the first job does not wait for the core to load in them. */
    warm() {
      while (!inline && slots.length < size) if (!spawn()) break;
    },
    /** Jobs waiting and running (for tests and logs). */
    stats() {
      return { waiting: queue.length, running: slots.filter((s) => s.job !== null).length, workers: slots.length };
    },
    async close() {
      closed = true;
      for (const q of queue.splice(0)) q.reject(new DomainError('unavailable', 'busy', 'The server is stopping.'));
      await Promise.all(slots.splice(0).map((s) => s.worker.terminate().catch(() => {})));
    },
  };
}

let shared: AnalysisPool | null = null;

/** The process's pool (created on first use with the defaults, or configured once by the server). */
export function analysisPool(options?: AnalysisPoolOptions): AnalysisPool {
  shared ??= createAnalysisPool(options);
  return shared;
}
