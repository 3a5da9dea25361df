/**
 * A stand-in for the worker that runs the same session in the current thread: for tests in Node,
 * and as the page's fallback where module workers are unavailable. Messages are delivered on a
 * later task, as a real worker would, but not cloned or transferred.
 */
import type { WorkerPort } from './client.ts';
import type { FromWorker, ToWorker } from './protocol.ts';
import { createSession } from './session.ts';

export function createInPagePort(): WorkerPort {
  const listeners: ((event: MessageEvent<FromWorker>) => void)[] = [];
  const session = createSession((message) => {
    setTimeout(() => {
      for (const listener of listeners) listener({ data: message } as MessageEvent<FromWorker>);
    }, 0);
  });
  return {
    postMessage(message: ToWorker) {
      setTimeout(() => session.receive(message), 0);
    },
    addEventListener(type: 'message' | 'error', listener: ((event: MessageEvent<FromWorker>) => void) | ((event: ErrorEvent) => void)) {
      // Errors inside the session become 'failed' answers, so there is never an 'error' event to forward.
      if (type === 'message') listeners.push(listener as (event: MessageEvent<FromWorker>) => void);
    },
  };
}
