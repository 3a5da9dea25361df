// A reading thread (read-thread.ts) started from the TypeScript sources rather than the bundle (the
// benchmark, tests): a worker thread does not inherit the main thread's TypeScript loader, so it
// registers tsx's loader first, then loads read-thread.ts, which finds its role in workerData.
import { register } from 'tsx/esm/api';
import { workerData } from 'node:worker_threads';

register();
await import(workerData.entry);
