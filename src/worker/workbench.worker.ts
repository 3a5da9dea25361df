/**
 * The worker: a thin shell. Every message goes to the session (session.ts), which does the work
 * with core functions and answers through `postMessage`, transferring typed arrays.
 */
/// <reference lib="webworker" />
import type { ToWorker } from './protocol.ts';
import { createSession } from './session.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope; // the DOM lib types `self` as Window
const session = createSession((message, transfer) => scope.postMessage(message, transfer ?? []));
scope.addEventListener('message', (event: MessageEvent<ToWorker>) => session.receive(event.data));
