/** Worker thread body: computes results summaries off the request thread (see ./summaries.ts). */
import { parentPort } from 'node:worker_threads';
import type { DiagramDocument } from '../../shared/diagram/schema';
import { summarizeResults } from './results-summary';

parentPort!.on('message', (job: { id: number; doc: DiagramDocument }) => {
  try {
    parentPort!.postMessage({ id: job.id, summary: summarizeResults(job.doc) });
  } catch (err) {
    parentPort!.postMessage({ id: job.id, error: (err as Error).message ?? String(err) });
  }
});
