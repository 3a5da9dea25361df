/**
 * The worker: a thin shell. Every message goes to the session (session.ts), which does the work
 * with core functions and answers through `postMessage`, transferring typed arrays.
 */
/// <reference lib="webworker" />
import type { ToWorker } from './protocol.ts';
import { readingThreadCount, warmSegmentWorkers } from './segment-pool.ts';
import { createSession } from './session.ts';
import { warmUpUntilMessage } from './warm-up.ts';

/** How long after start the segment workers are started: after the demo's first preview. */
const WARM_AFTER_MS = 2000;
const scope = self as unknown as DedicatedWorkerGlobalScope; // the DOM lib types `self` as Window
const session = createSession((message, transfer) => scope.postMessage(message, transfer ?? []));
scope.addEventListener('message', (event: MessageEvent<ToWorker>) => session.receive(event.data));

// Segment workers for big files, started once the page has settled, so that a big file's read
// does not wait for them (segment-pool.ts); and the reader run once here too (warm-up.ts), until
// the first message after that: a big file's first segment, read here, is then not read cold.
setTimeout(() => {
  warmSegmentWorkers(readingThreadCount() - 1);
  warmUpUntilMessage(scope);
}, WARM_AFTER_MS);
