// Entry of the results-summary worker thread: registers tsx (the server runs TypeScript through it) and
// loads the worker body. Plain .mjs because a worker thread does not inherit the parent's loader.
import { register } from 'tsx/esm/api';

register();
await import('./summary-worker-body.ts');
