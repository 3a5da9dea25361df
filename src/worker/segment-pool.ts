/**
 * Reading a big text file on several cores: the workbench's worker reads the first segment itself
 * and hands one segment to each of a few segment workers (segment.worker.ts), each reading its own
 * slice of the File, then joins their tables (core parallel-read.ts).
 */
import type { SegmentRequest, SegmentRunner } from '../core/parallel-read.ts';
import type { SegmentResult } from '../core/read-segment.ts';
import { arrivedTable } from '../core/columns.ts';
import { LevelwiseError } from '../core/errors.ts';
import { Cancelled } from './protocol.ts';

export interface ToSegmentWorker {
  readonly file: Blob;
  readonly request: SegmentRequest;
}

export type FromSegmentWorker =
  | { readonly type: 'progress'; readonly bytes: number }
  | { readonly type: 'done'; readonly result: SegmentResult }
  | { readonly type: 'failed'; readonly code: string | null; readonly message: string; readonly hint: string };

/** Files below this size are read on one thread: starting workers would cost more than it saves. */
export const PARALLEL_FROM_BYTES = 16 << 20;
/** No segment is made smaller than this. */
export const MIN_SEGMENT_BYTES = 8 << 20;
/** Threads at most, the workbench's worker included. */
const MAX_SEGMENT_WORKERS = 4;

/**
 * Threads to read a big file on, the workbench's worker included: one per core (two when the
 * browser does not say), four at most; 0 where workers cannot start.
 */
export function readingThreadCount(): number {
  if (typeof Worker === 'undefined' || typeof navigator === 'undefined') return 0;
  return Math.max(1, Math.min(MAX_SEGMENT_WORKERS, navigator.hardwareConcurrency || 2));
}

/** A segment worker that could not start or broke down (not a problem with the file). */
export class SegmentWorkerFailure extends Error {
  constructor(what: string) {
    super(`a segment worker failed: ${what}`);
    this.name = 'SegmentWorkerFailure';
  }
}

export interface SegmentPool {
  readonly runners: readonly SegmentRunner[];
  /** Stops every worker (also on cancel); answers still awaited fail with Cancelled. */
  close(): void;
}

/**
 * Idle segment workers, kept from one read to the next: a worker takes ~0.2 s to start in
 * Chromium, which would otherwise delay every segment but the first.
 */
const idle: Worker[] = [];

function startSegmentWorker(): Worker {
  return new Worker(new URL('./segment.worker.ts', import.meta.url), { type: 'module', name: 'levelwise-segment' });
}

/** Starts `count` segment workers ahead of need (when the workbench starts), so that none waits for one. */
export function warmSegmentWorkers(count: number): void {
  while (idle.length < count) idle.push(startSegmentWorker());
}

/** `onBytes`: bytes read by the segment workers since the last call, for progress. */
export function openSegmentPool(file: Blob, count: number, signal: AbortSignal, onBytes: (bytes: number) => void): SegmentPool {
  const workers: Worker[] = [];
  const failAll = new Set<(error: Error) => void>();
  /** Cancelled, or a worker failed: no worker of this pool is kept for the next read. */
  let spoiled = false;
  const close = (): void => {
    signal.removeEventListener('abort', cancel);
    // A worker still reading would answer the next read with this one's segment: only idle ones are kept.
    const busy = failAll.size > 0 || spoiled;
    for (const worker of workers) {
      if (busy) worker.terminate();
      else idle.push(worker);
    }
    workers.length = 0;
    for (const fail of failAll) fail(new Cancelled());
    failAll.clear();
  };
  const cancel = (): void => {
    spoiled = true;
    close();
  };
  signal.addEventListener('abort', cancel, { once: true });
  const runner = (worker: Worker): SegmentRunner => (request) =>
    new Promise<SegmentResult>((resolve, reject) => {
      if (signal.aborted) {
        reject(new Cancelled());
        return;
      }
      const fail = (error: Error): void => {
        spoiled = true;
        failAll.delete(fail);
        worker.onmessage = null;
        reject(error);
      };
      failAll.add(fail);
      worker.onerror = (event) => fail(new SegmentWorkerFailure(event.message));
      worker.onmessage = (event: MessageEvent<FromSegmentWorker>) => {
        const message = event.data;
        if (message.type === 'progress') onBytes(message.bytes);
        else if (message.type === 'failed') fail(message.code === null ? new SegmentWorkerFailure(message.message) : new LevelwiseError(message.code, message.message, { hint: message.hint }));
        else {
          failAll.delete(fail);
          worker.onmessage = null;
          resolve({ ...message.result, table: arrivedTable(message.result.table) });
        }
      };
      worker.postMessage({ file, request } satisfies ToSegmentWorker);
    });
  for (let i = 0; i < count; i++) workers.push(idle.pop() ?? startSegmentWorker());
  return { runners: workers.map(runner), close };
}
