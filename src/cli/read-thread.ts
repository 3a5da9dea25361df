/**
 * Reading a text file on a second thread while the first encodes and writes: `levelwise apply`
 * spends about as long reading rows into batches (core's table reader) as encoding and writing
 * them, so on a machine with two cores the two halves overlap. The batches cross as Tables whose
 * typed arrays are transferred, not copied; only the dictionaries' strings are cloned.
 *
 * The reading thread runs the same code as the rest of the command line: the bundle that
 * bin/levelwise.js loads, started again as a worker, which finds its job in `workerData`. When the
 * command line runs from its TypeScript sources (no bundle), there is no file a worker could load,
 * and reading stays on one thread (`canReadInThread`).
 *
 * At most MAX_BATCHES_AHEAD batches wait for the encoding thread, so memory stays flat however
 * long the file: the reading thread waits on a shared counter when it is that far ahead.
 */
import { openSync, readSync, closeSync } from 'node:fs';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import type { Table } from '../core/columns.ts';
import type { EncodingName } from '../core/decode.ts';
import { isLevelwiseError, LevelwiseError } from '../core/errors.ts';
import { createTableReader, type Delimiter } from '../core/read-table.ts';

const JOB = 'levelwise-read-batches';
const MAX_BATCHES_AHEAD = 3;
const CHUNK_BYTES = 1 << 20;
const WAIT_MS = 200;

interface ReadJob {
  readonly job: typeof JOB;
  readonly path: string;
  readonly delimiter: Delimiter | null;
  readonly encoding: EncodingName | null;
  readonly batchRows: number;
  /** Int32 [0]: batches posted and not yet taken by the encoding thread. */
  readonly ahead: SharedArrayBuffer;
}

type FromReader =
  | { readonly type: 'batch'; readonly table: Table; readonly firstRow: number; readonly bytesRead: number }
  | { readonly type: 'done'; readonly names: readonly string[]; readonly totalRows: number; readonly encoding: EncodingName; readonly delimiter: Delimiter }
  | { readonly type: 'failed'; readonly code: string | null; readonly message: string; readonly hint: string; readonly stack?: string };

export interface ThreadReadResult {
  readonly names: readonly string[];
  readonly totalRows: number;
  readonly encoding: EncodingName;
  readonly delimiter: Delimiter;
}

/** Whether this command line can start a reading thread: it runs from a bundled JavaScript file. */
export function canReadInThread(): boolean {
  return import.meta.url.endsWith('.mjs') || import.meta.url.endsWith('.js');
}

/**
 * Reads the file at `path` on a second thread; `onBatch` receives each batch in order, and the
 * next batch waits until the promise it returns has settled.
 */
export async function readBatchesInThread(
  path: string,
  settings: { delimiter: Delimiter | null; encoding: EncodingName | null; batchRows: number },
  onBatch: (table: Table, firstRow: number, bytesRead: number) => Promise<void>,
): Promise<ThreadReadResult> {
  const ahead = new SharedArrayBuffer(4);
  const counter = new Int32Array(ahead);
  const job: ReadJob = { job: JOB, path, delimiter: settings.delimiter, encoding: settings.encoding, batchRows: settings.batchRows, ahead };
  const worker = new Worker(new URL(import.meta.url), { workerData: job });
  const messages = messageQueue(worker);
  try {
    for (;;) {
      const message = await messages.next();
      if (message.type === 'failed') throw readerFailure(message);
      if (message.type === 'done') return { names: message.names, totalRows: message.totalRows, encoding: message.encoding, delimiter: message.delimiter };
      await onBatch(message.table, message.firstRow, message.bytesRead);
      Atomics.sub(counter, 0, 1);
      Atomics.notify(counter, 0);
    }
  } finally {
    await worker.terminate();
  }
}

/** Messages from the worker in order, as promises; an exit without 'done' is a failure. */
function messageQueue(worker: Worker): { next(): Promise<FromReader> } {
  const arrived: FromReader[] = [];
  let waiting: ((message: FromReader) => void) | null = null;
  const deliver = (message: FromReader): void => {
    if (waiting === null) arrived.push(message);
    else {
      const resolve = waiting;
      waiting = null;
      resolve(message);
    }
  };
  worker.on('message', deliver);
  worker.on('error', (error: Error) => deliver({ type: 'failed', code: null, message: error.message, hint: '', ...(error.stack ? { stack: error.stack } : {}) }));
  worker.on('exit', (exitCode) => deliver({ type: 'failed', code: null, message: `the reading thread stopped (exit code ${exitCode})`, hint: '' }));
  return {
    next: () => {
      const message = arrived.shift();
      if (message !== undefined) return Promise.resolve(message);
      return new Promise((resolve) => (waiting = resolve));
    },
  };
}

function readerFailure(message: Extract<FromReader, { type: 'failed' }>): Error {
  if (message.code !== null) return new LevelwiseError(message.code, message.message, { hint: message.hint });
  const error = new Error(`reading thread: ${message.message}`);
  if (message.stack !== undefined) error.stack = message.stack;
  return error;
}

// ---------------------------------------------------------------------------------------------
// The reading thread

function runReadJob(job: ReadJob, port: NonNullable<typeof parentPort>): void {
  const counter = new Int32Array(job.ahead);
  let bytesRead = 0;
  const post = (table: Table, firstRow: number): void => {
    // Wait while the encoding thread has enough batches in hand. The wait is timed so that a
    // thread being terminated (the encoding side failed) never stays blocked in it.
    for (let ahead = Atomics.load(counter, 0); ahead >= MAX_BATCHES_AHEAD; ahead = Atomics.load(counter, 0)) Atomics.wait(counter, 0, ahead, WAIT_MS);
    Atomics.add(counter, 0, 1);
    port.postMessage({ type: 'batch', table, firstRow, bytesRead } satisfies FromReader, transferables(table));
  };
  try {
    const reader = createTableReader({ delimiter: job.delimiter, encoding: job.encoding, batchRows: job.batchRows, onBatch: post });
    const buffer = new Uint8Array(CHUNK_BYTES);
    const fd = openSync(job.path, 'r');
    try {
      for (let read = readSync(fd, buffer); read > 0; read = readSync(fd, buffer)) {
        bytesRead += read;
        reader.push(buffer.subarray(0, read));
      }
    } finally {
      closeSync(fd);
    }
    const result = reader.finish();
    port.postMessage({ type: 'done', names: result.table.names, totalRows: result.totalRows, encoding: result.encoding, delimiter: result.delimiter } satisfies FromReader);
  } catch (error) {
    const failed: FromReader = isLevelwiseError(error)
      ? { type: 'failed', code: error.code, message: error.message, hint: error.hint }
      : { type: 'failed', code: null, message: error instanceof Error ? error.message : String(error), hint: '', ...(error instanceof Error && error.stack ? { stack: error.stack } : {}) };
    port.postMessage(failed);
  }
}

/** The buffers of a batch's typed arrays, each its own: moved to the other thread, not copied. */
function transferables(table: Table): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  const add = (array: { buffer: ArrayBufferLike }): void => {
    if (array.buffer instanceof ArrayBuffer) buffers.add(array.buffer);
  };
  add(table.lineOfRow);
  for (const column of table.columns) add(column.kind === 'text' ? column.codes : column.values);
  return [...buffers];
}

function isReadJob(data: unknown): data is ReadJob {
  return typeof data === 'object' && data !== null && (data as { job?: unknown }).job === JOB;
}

if (!isMainThread && parentPort !== null && isReadJob(workerData)) runReadJob(workerData, parentPort);
