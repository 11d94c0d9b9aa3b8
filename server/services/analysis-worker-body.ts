/** Worker thread body: runs analysis jobs off the request thread (see ./analysis-pool.ts). */
import { parentPort } from 'node:worker_threads';
import { runAnalysisJob, type AnalysisJob } from './analysis-jobs';

parentPort!.on('message', (job: AnalysisJob) => {
  try {
    parentPort!.postMessage({ outcome: runAnalysisJob(job) });
  } catch (err) {
    parentPort!.postMessage({ error: (err as Error).stack ?? String(err) });
  }
});
// The core is loaded (the import above): the pool may send jobs.
parentPort!.postMessage({ ready: true });
