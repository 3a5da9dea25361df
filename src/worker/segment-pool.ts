/**
 * Reading a big text file on several cores: the workbench's worker reads the first segment itself
 * and hands one segment to each of a few segment workers (segment.worker.ts), each reading its own
 * slice of the File, then joins their tables (core parallel-read.ts). Once they have read their
 * segments, the same workers profile the table's number columns while the workbench's worker joins
 * it (core number-profiles.ts).
 */
import type { SegmentRequest, SegmentRunner } from '../core/parallel-read.ts';
import type { SegmentResult } from '../core/read-segment.ts';
import { NumberProfiles, requestBuffers, type NumberPartsProfiler, type NumberPartsRequest } from '../core/number-profiles.ts';
import { profileTable, type ColumnProfile, type ProfileOptions, type TextProfilesListener } from '../core/profile.ts';
import { arrivedTable, type Table } from '../core/columns.ts';
import { LevelwiseError } from '../core/errors.ts';
import { Cancelled } from './protocol.ts';

/** What a segment worker is asked, without the id the pool gives each request. */
type ToSegmentWorkerRequest =
  | { readonly type: 'segment'; readonly file: Blob; readonly request: SegmentRequest }
  | { readonly type: 'profile'; readonly request: NumberPartsRequest };

export type ToSegmentWorker = ToSegmentWorkerRequest & { readonly id: number };

/** Answers carry the id of their request; progress is the pool's, whichever segment it is from. */
export type FromSegmentWorker =
  | { readonly type: 'progress'; readonly bytes: number }
  | { readonly type: 'done'; readonly id: number; readonly result: SegmentResult }
  | { readonly type: 'profile'; readonly id: number; readonly profile: ColumnProfile }
  | { readonly type: 'failed'; readonly id: number; readonly code: string | null; readonly message: string; readonly hint: string };

/** The reply that ends a request: its answer, or its failure. */
type FinalReply = Exclude<FromSegmentWorker, { type: 'progress' }>;
type Answer = Exclude<FinalReply, { type: 'failed' }>;

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
  /** The same workers, to profile number columns once their segments are read (core number-profiles.ts). */
  readonly profilers: readonly NumberPartsProfiler[];
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

/**
 * A pool of `count` segment workers. `file`: the File whose segments they read (null for a pool
 * that only profiles); `onBytes`: bytes read by them since the last call, for progress. A worker
 * may have several requests in hand: it answers each by its id, in the order it takes them.
 */
export function openSegmentPool(file: Blob | null, count: number, signal: AbortSignal, onBytes: (bytes: number) => void): SegmentPool {
  const workers: Worker[] = [];
  /** Requests not yet answered, by id. */
  const pending = new Map<number, { readonly worker: Worker; readonly settle: (reply: FinalReply | Error) => void }>();
  let nextId = 1;
  /** Cancelled, or a worker failed: no worker of this pool is kept for the next read. */
  let spoiled = false;
  const failWhere = (worker: Worker | null, error: Error): void => {
    for (const [id, request] of pending) {
      if (worker !== null && request.worker !== worker) continue;
      pending.delete(id);
      request.settle(error);
    }
  };
  const close = (): void => {
    signal.removeEventListener('abort', cancel);
    // A worker still reading would answer the next read with this one's segment: only idle ones are kept.
    const busy = pending.size > 0 || spoiled;
    for (const worker of workers) {
      worker.onmessage = null;
      worker.onerror = null;
      if (busy) worker.terminate();
      else idle.push(worker);
    }
    workers.length = 0;
    failWhere(null, new Cancelled());
  };
  const cancel = (): void => {
    spoiled = true;
    close();
  };
  signal.addEventListener('abort', cancel, { once: true });
  const listen = (worker: Worker): void => {
    worker.onerror = (event) => {
      spoiled = true;
      failWhere(worker, new SegmentWorkerFailure(event.message));
    };
    worker.onmessage = (event: MessageEvent<FromSegmentWorker>) => {
      const reply = event.data;
      if (reply.type === 'progress') {
        onBytes(reply.bytes);
        return;
      }
      const request = pending.get(reply.id);
      if (request === undefined) return;
      pending.delete(reply.id);
      if (reply.type === 'failed') spoiled = true;
      request.settle(reply);
    };
  };
  /** Posts a request to `worker`; resolves with what `answer` makes of its final reply. */
  const ask = <T>(worker: Worker, message: ToSegmentWorkerRequest, transfer: Transferable[], answer: (reply: Answer) => T): Promise<T> =>
    new Promise<T>((resolve, reject) => {
      if (signal.aborted) {
        reject(new Cancelled());
        return;
      }
      const id = nextId++;
      const settle = (reply: FinalReply | Error): void => {
        if (reply instanceof Error) reject(reply);
        else if (reply.type === 'failed') reject(reply.code === null ? new SegmentWorkerFailure(reply.message) : new LevelwiseError(reply.code, reply.message, { hint: reply.hint }));
        else {
          try {
            resolve(answer(reply));
          } catch (error) {
            reject(error instanceof Error ? error : new SegmentWorkerFailure(String(error)));
          }
        }
      };
      pending.set(id, { worker, settle });
      worker.postMessage({ ...message, id } as ToSegmentWorker, transfer);
    });
  const runner = (worker: Worker, file: Blob): SegmentRunner => (request) =>
    ask(worker, { type: 'segment', file, request }, [], (reply) => {
      if (reply.type !== 'done') throw new SegmentWorkerFailure(`a ${reply.type} answer to a segment`);
      return { ...reply.result, table: arrivedTable(reply.result.table) };
    });
  // The copies of the parts are this request's own: transferred, not copied again.
  const profiler = (worker: Worker): NumberPartsProfiler => (request) =>
    ask(worker, { type: 'profile', request }, requestBuffers(request), (reply) => {
      if (reply.type !== 'profile') throw new SegmentWorkerFailure(`a ${reply.type} answer to a profile`);
      return reply.profile;
    });
  for (let i = 0; i < count; i++) {
    const worker = idle.pop() ?? startSegmentWorker();
    listen(worker);
    workers.push(worker);
  }
  return { runners: file === null ? [] : workers.map((worker) => runner(worker, file)), profilers: workers.map(profiler), close };
}

/** Below this many rows a table's number columns are profiled here: sending them would cost about what it saves. */
export const SHARE_PROFILING_FROM_ROWS = 100_000;

/**
 * profileTable of a table already read (profiled again with other missing spellings), its number
 * columns shared with idle segment workers as a read shares them (core number-profiles.ts). Where
 * no worker can run, or the table is small, it is profileTable itself.
 */
export async function profileSharingWorkers(table: Table, options: ProfileOptions, signal: AbortSignal): Promise<ColumnProfile[]> {
  const numberColumns = table.columns.filter((column) => column.kind === 'number').length;
  const count = Math.min(readingThreadCount() - 1, numberColumns);
  if (count <= 0 || table.rowCount < SHARE_PROFILING_FROM_ROWS) return profileTable(table, options);
  const pool = openSegmentPool(null, count, signal, () => undefined);
  try {
    return await profileOrHere(new NumberProfiles([table], options, pool.profilers), table, options, signal);
  } finally {
    pool.close();
  }
}

/**
 * `shared.profile(table, onTextProfiles)`; when a segment worker breaks down meanwhile, profileTable
 * on this thread: the table is read, so nothing is read again.
 */
export async function profileOrHere(
  shared: NumberProfiles,
  table: Table,
  options: ProfileOptions,
  signal: AbortSignal,
  onTextProfiles?: TextProfilesListener,
): Promise<ColumnProfile[]> {
  try {
    return await shared.profile(table, onTextProfiles);
  } catch (error) {
    if (error instanceof SegmentWorkerFailure && !signal.aborted) return profileTable(table, options);
    throw error;
  }
}
