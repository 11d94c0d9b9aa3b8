// Entry of an analysis worker thread (./analysis-pool.ts): registers tsx (the server runs TypeScript
// through it) and loads the worker body. Plain .mjs because a worker thread does not inherit the
// parent's loader.
import { register } from 'tsx/esm/api';

register();
await import('./analysis-worker-body.ts');
