/**
 * Reading a text file on several threads, one per core up to four.
 *
 * `apply` and `check` (readBatchesInThread): this thread encodes and writes while reading threads
 * (one per core but this thread's, `batchReadingThreads`) read the file in segments (core
 * read-segment.ts), and takes their rows in file order (core segment-order.ts):
 * 1. This thread reads the file's start (header, encoding, delimiter, the first rows) with the
 *    table reader's `stopAt` while the reading threads start up (~0.1 s), and hands out the
 *    segments before it encodes those rows. A small file is read to the end right there. A file
 *    that cannot be cut (not UTF-8, lone CR line breaks, one column) is read from its start to its
 *    end by the first reading thread instead, so that reading and encoding still overlap.
 * 2. The rest is cut into segments of SEGMENT_BYTES, handed round the threads. When the segment
 *    this thread wants next has not come yet, it reads the next one not handed out itself rather
 *    than wait (one at a time), so the reading is shared as the encoding leaves room for it. A
 *    segment that began inside a quoted field (it does not start where the one before stopped) is
 *    read again from the right place, here, so quoted line breaks cost time, never correctness.
 * At most SEGMENTS_AHEAD segments per thread are handed out and not yet taken, and one read here,
 * so memory stays flat however long the file.
 *
 * `profile` and `draft` (readTableInThreads): the whole table, in one segment per thread, this one
 * reading the first, joined by core parallel-read.ts as the page's worker does.
 *
 * Tables cross as typed arrays transferred, not copied; only dictionaries' strings are cloned. The
 * segments of `apply` and `check` keep identifier-like columns as their bytes (ReadOptions
 * packValues): a million identifiers then cross as two arrays, and this thread makes no string of
 * them unless something reads them (the writer copies their bytes).
 * The threads run this file: bin/levelwise.js bundles it on its own beside the command line's
 * bundle (a thread starts in a third of the time without the command line's packages), and the
 * thread finds its role in `workerData` (from the TypeScript sources, read-thread-sources.mjs loads
 * this file). The command line itself reads on threads only from its bundle (`canReadInThread`);
 * from its sources it reads on one, the reference the tests compare the threads with. After a
 * whole-table read, the threads also profile the columns kept as numbers, sharing them with this
 * thread as each comes free (`profiling`, core number-profiles.ts).
 */
import { availableParallelism } from 'node:os';
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { arrivedTable, crossingTable, tableBuffers, type Table } from '../core/columns.ts';
import type { EncodingName } from '../core/decode.ts';
import { isLevelwiseError, LevelwiseError } from '../core/errors.ts';
import { createTableReader, type ColumnHints, type Delimiter, type ReadResult } from '../core/read-table.ts';
import { rebaseRows, type SegmentResult } from '../core/read-segment.ts';
import { COLUMNS_IN_HAND, NumberProfiles, profileNumberParts, requestBuffers, type NumberPartsProfiler, type NumberPartsRequest } from '../core/number-profiles.ts';
import { readInParallel, segmentReaderFor, type SegmentRequest, type SegmentRunner } from '../core/parallel-read.ts';
import { segmentJobs, SegmentOrder, type SegmentJob } from '../core/segment-order.ts';
import { profileTable, type ColumnProfile, type ProfileOptions } from '../core/profile.ts';
import { useWebAssembly } from '../core/webassembly.ts';

const ROLE = 'levelwise-reading-thread';
const CHUNK_BYTES = 1 << 20;
/** A whole-table read's first chunk: the header and the first rows, after which the other threads start. */
const FIRST_CHUNK_BYTES = 64 << 10;
/**
 * The size of a segment: ~65,000 rows of the benchmark's file, so that a segment's start-up is paid
 * rarely. Every segment makes its dictionaries afresh, and this thread resolves each of their
 * values; at 1M rows, 4 MB segments took ~0.4 s more CPU time than 8 MB, and 16 MB ~0.2 s less
 * (eight interleaved rounds), but held ~25 MB more at 1M rows and grew 1.27× from 1M to 4M rows.
 */
const SEGMENT_BYTES = Number(process.env.LEVELWISE_SEGMENT_BYTES) || 8 << 20;
/**
 * Where the reading of the file's start stops (`apply`, `check`; segments start from there). The
 * segments are sized and stored like these rows (ColumnHints): from 64 kB (~500 rows) the number
 * columns had not yet reached number storage, and every segment found that out again (`apply`'s
 * peak RSS at 4M rows went from ~340 to ~360 MB).
 */
const FIRST_STOP = Math.min(1 << 20, SEGMENT_BYTES);
/**
 * How much more of a whole table this thread reads than each reading thread: they start ~60–70 ms
 * later (a thread starting, then waiting for the header), ~6 MB of reading. On 2 cores, `draft`
 * finished 25–35 ms sooner with the first segment 3 % over half of the 123 MB file than with
 * halves, and later again with 5 % (three rounds of traces).
 */
const HEAD_START_BYTES = 6 << 20;
/**
 * A reading thread done with its share takes over the second half of what this thread has left,
 * when that half is at least this (core readInParallel's handOverFromBytes): the head start is a
 * guess, and in traces the thread done first waited 0.1–0.6 s for the other.
 */
const HAND_OVER_FROM_BYTES = 4 << 20;
/** A whole table is read on one thread below this size: starting threads would cost more than it saves. */
const PARALLEL_FROM_BYTES = Number(process.env.LEVELWISE_PARALLEL_FROM_BYTES) || 16 << 20;
/**
 * Segments handed to a thread and not yet taken by this one. With 2, the reading thread went idle
 * (~0.15 s in a trace) while this one was reading a segment of its own and then encoding.
 */
const SEGMENTS_AHEAD = 3;

/** Threads that read, this one included when it reads too: one per core, at most four. */
function readingThreads(): number {
  return askedReadingThreads() ?? Math.max(1, Math.min(4, availableParallelism()));
}

/**
 * Reading threads for `apply` and `check`, where this thread encodes and writes meanwhile: one per
 * core but this one's, at least one. On 2 cores, one reading thread against two, 11 interleaved
 * pairs at 1M rows: wall clock 3.29–3.41 against 3.40–3.49 s (medians of two sets), CPU time
 * ~1.1 s less, peak RSS ~215 against ~290 MB: two reading threads and this one took turns on two
 * cores, and each ran slower for it.
 */
function batchReadingThreads(): number {
  return askedReadingThreads() ?? Math.max(1, Math.min(4, availableParallelism() - 1));
}

/** LEVELWISE_READING_THREADS, for tests and measurements: that many reading threads whatever the cores; null when unset. */
function askedReadingThreads(): number | null {
  const asked = Number(process.env.LEVELWISE_READING_THREADS);
  return asked >= 1 ? Math.floor(asked) : null;
}

interface Settings {
  readonly delimiter: Delimiter | null;
  readonly encoding: EncodingName | null;
  readonly batchRows: number;
}

/** What a thread is asked to read. */
type ToReader =
  | { readonly type: 'start'; readonly id: number; readonly settings: Settings; readonly stopAt: number }
  | { readonly type: 'segment'; readonly id: number; readonly request: SegmentRequest }
  | ({
      readonly type: 'profile-parts';
      readonly id: number;
      /** Per column of the table: UNCLAIMED, BEGUN by the reading thread or TAKEN_BACK by the calling one (shared memory). */
      readonly claims: Int32Array;
    } & NumberPartsRequest);

/** States of a column in a profile-parts request's `claims`. */
const UNCLAIMED = 0;
const BEGUN = 1;
const TAKEN_BACK = 2;

type FromReader =
  | {
      readonly type: 'batch';
      readonly id: number;
      readonly table: Table;
      readonly firstRow: number;
      readonly bytesRead: number;
      /** The last answer to its request (a batch held back until after 'started'). */
      readonly last?: boolean;
    }
  | ({
      readonly type: 'started';
      readonly id: number;
      /** Batches of the start's last rows, sent after this answer (see readStart). */
      readonly heldBatches: number;
    } & StartFacts)
  | ({ readonly type: 'segment'; readonly id: number; readonly bytesRead: number } & SegmentResult)
  | { readonly type: 'profile'; readonly id: number; readonly profile: ColumnProfile }
  /** The column of a profile-parts request was taken back before this thread began it. */
  | { readonly type: 'taken-back'; readonly id: number }
  | { readonly type: 'failed'; readonly code: string | null; readonly message: string; readonly hint: string; readonly stack?: string };

export interface ThreadReadResult {
  readonly names: readonly string[];
  readonly totalRows: number;
  readonly encoding: EncodingName;
  readonly delimiter: Delimiter;
}

/** Whether this command line can start reading threads: it runs from a bundled JavaScript file. */
export function canReadInThread(): boolean {
  return import.meta.url.endsWith('.mjs') || import.meta.url.endsWith('.js');
}

/** What reading the file's start found, whichever thread read it: what the segments need to know. */
interface StartFacts {
  readonly names: readonly string[];
  readonly rows: number;
  readonly encoding: EncodingName;
  readonly encodingGuessed: boolean;
  readonly delimiter: Delimiter;
  /** null: the file was read to its end (small, or one that cannot be cut). */
  readonly stoppedAt: number | null;
  readonly lineBreaks: number;
  readonly columnHints: ColumnHints | null;
}

function startFacts(result: ReadResult): StartFacts {
  const { totalRows: rows, encoding, encodingGuessed, delimiter, stoppedAt, lineBreaks, columnHints } = result;
  return { names: result.table.names, rows, encoding, encodingGuessed, delimiter, stoppedAt, lineBreaks, columnHints };
}

/** The file's start read, its last rows not yet handed on. */
interface StartRead extends StartFacts {
  /** Hands the start's last rows to onBatch (after the segments have gone out). */
  readonly takeHeldBatches: () => Promise<void>;
}

/** A segment in file order: being read by a reading thread (the id its answer carries), or read here. */
type Outstanding = { readonly job: SegmentJob; readonly id: number } | { readonly job: SegmentJob; readonly read: SegmentRead };

/**
 * Reads the file at `path` on other threads, this one helping; `onBatch` receives each batch in
 * file order, its rows numbered from the file's start, and the next batch waits until the promise
 * it returns has settled.
 */
export async function readBatchesInThread(
  path: string,
  settings: Settings,
  onBatch: (table: Table, firstRow: number, bytesRead: number) => Promise<void>,
): Promise<ThreadReadResult> {
  const fileBytes = fstatOf(path);
  const fd = openSync(path, 'r');
  // A file no longer than the start is read here whole: a thread would only start and stop.
  const workers = fileBytes > FIRST_STOP ? Array.from({ length: batchReadingThreads() }, () => startReadingThread(path)) : [];
  const inbox = new Inbox(workers);
  const buffer = new Uint8Array(CHUNK_BYTES);
  try {
    // 1. The file's start: here, while the threads start; on a thread when the file cannot be cut,
    //    so that reading it to the end and encoding it overlap.
    const started = readStartHere(fd, buffer, settings, fileBytes, onBatch) ?? (await readStartOnThread(inbox, settings, onBatch));
    const result = { names: started.names, encoding: started.encoding, delimiter: started.delimiter };
    if (started.stoppedAt === null) {
      await started.takeHeldBatches();
      return { ...result, totalRows: started.rows };
    }

    // 2. The rest in segments, taken in file order.
    const order = new SegmentOrder({ end: started.stoppedAt, rows: started.rows, lineBreaks: started.lineBreaks });
    const queue: SegmentJob[] = segmentJobs(started.stoppedAt, fileBytes, SEGMENT_BYTES);
    const segmentRequest = (job: SegmentJob): SegmentRequest => ({
      job,
      names: started.names,
      delimiter: started.delimiter,
      encodingGuessed: started.encodingGuessed,
      columnHints: started.columnHints,
      packValues: true,
    });
    const readHere = (job: SegmentJob): Outstanding => ({ job, read: readSegmentFrom(fd, buffer, segmentRequest(job), fileBytes) });
    const outstanding: Outstanding[] = [];
    const handOut = (): void => {
      let onThreads = outstanding.filter((o) => 'id' in o).length;
      while (queue.length > 0 && onThreads++ < SEGMENTS_AHEAD * workers.length) {
        const job = queue.shift()!;
        outstanding.push({ job, id: inbox.send(inbox.leastBusy(), { type: 'segment', id: 0, request: segmentRequest(job) }) });
      }
    };
    handOut();
    // The start's last batch only now: encoding it first (~0.15 s, cold) kept the segments waiting.
    await started.takeHeldBatches();
    while (outstanding.length > 0) {
      // Lets the threads' answers in, so that the wait below is seen for what it is.
      await new Promise<void>((resolve) => setImmediate(resolve));
      const next = outstanding[0]!;
      if ('id' in next && !inbox.answered(next.id) && queue.length > 0 && !outstanding.some((o) => 'read' in o)) {
        // Rather than wait, this thread reads the next segment not handed out (at most one ahead).
        outstanding.push(readHere(queue.shift()!));
        continue;
      }
      outstanding.shift();
      const segment = 'read' in next ? next.read : await segmentAnswer(inbox, next.id);
      const placement = order.check(next.job, segment.start);
      if (placement.kind === 'take') {
        order.advance(segment);
        await onBatch(rebaseRows(segment.table, placement.rowOffset, placement.lineOffset), placement.rowOffset, segment.bytesRead);
      } else if (placement.kind === 'redo') {
        // It began inside a quoted field: read again from the true boundary, here (it is wanted next).
        outstanding.unshift(readHere(placement.job));
      }
      handOut();
    }
    return { ...result, totalRows: order.rows };
  } finally {
    closeSync(fd);
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
}

/**
 * Reads the file's start on this thread (the header, encoding, delimiter and the first rows, up to
 * FIRST_STOP), its batches held for `takeHeldBatches`. Returns null, having handed nothing to
 * `onBatch`, when the file cannot be cut into segments (not UTF-8, lone CR line breaks, one
 * column) and is longer than FIRST_STOP: a reading thread then reads it whole.
 */
function readStartHere(
  fd: number, buffer: Uint8Array, settings: Settings, fileBytes: number, onBatch: (table: Table, firstRow: number, bytesRead: number) => Promise<void>,
): StartRead | null {
  const held: [Table, number][] = [];
  const reader = createTableReader({
    delimiter: settings.delimiter,
    encoding: settings.encoding,
    batchRows: settings.batchRows,
    stopAt: FIRST_STOP,
    onBatch: (table, firstRow) => void held.push([table, firstRow]),
  });
  let bytesRead = 0;
  // Chunks no larger than the stop, so that the reader can stop near it; past the first, the
  // header is known (up to FIRST_STOP long, as a reading thread would have it) and whether the
  // file can be cut with it.
  const chunk = Math.min(buffer.length, FIRST_STOP);
  for (let read = readSync(fd, buffer, 0, chunk, 0); read > 0; read = readSync(fd, buffer, 0, chunk, bytesRead)) {
    bytesRead += read;
    reader.push(buffer.subarray(0, read));
    if (reader.stoppedAt !== null) break;
    if (reader.segmenting === null && bytesRead < fileBytes) return null;
  }
  return {
    ...startFacts(reader.finish()),
    takeHeldBatches: async () => {
      for (const [table, firstRow] of held.splice(0)) await onBatch(table, firstRow, bytesRead);
    },
  };
}

/** The file's start read by the first reading thread, its batches handed to `onBatch` as they come. */
async function readStartOnThread(inbox: Inbox, settings: Settings, onBatch: (table: Table, firstRow: number, bytesRead: number) => Promise<void>): Promise<StartRead> {
  const firstId = inbox.send(0, { type: 'start', id: 0, settings, stopAt: FIRST_STOP });
  for (;;) {
    const message = await inbox.next(firstId);
    if (message.type === 'batch') await onBatch(message.table, message.firstRow, message.bytesRead);
    else if (message.type === 'started') {
      const { heldBatches } = message;
      const takeHeldBatches = async (): Promise<void> => {
        for (let b = 0; b < heldBatches; b++) {
          const held = await inbox.next(firstId);
          if (held.type !== 'batch') throw new Error(`reading thread: unexpected ${held.type} message`);
          await onBatch(held.table, held.firstRow, held.bytesRead);
        }
      };
      return { ...message, takeHeldBatches };
    } else throw new Error(`reading thread: unexpected ${message.type} message`);
  }
}

/** A reading thread's answer to a segment request, its table usable here. */
async function segmentAnswer(inbox: Inbox, id: number): Promise<SegmentRead> {
  const answer = await inbox.next(id);
  if (answer.type !== 'segment') throw new Error(`reading thread: unexpected ${answer.type} message`);
  return { ...answer, table: arrivedTable(answer.table) };
}

/** A whole table read on threads, and its profile when asked for. */
export interface ThreadTableResult extends ReadResult {
  readonly profiles: ColumnProfile[] | null;
}

/**
 * The whole table of the file at `path` (profile, draft), read on this thread and the reading
 * threads, one segment each, joined in file order (core parallel-read.ts). `onBytes` is told the
 * bytes read so far, for progress. With `profiling`, the table is profiled before the threads go,
 * its number columns on them where they are free (core profileTableSharing), and its cells are
 * joined only if something reads them (core ConcatOptions.cellsWhenRead).
 */
export async function readTableInThreads(
  path: string,
  settings: Omit<Settings, 'batchRows'>,
  onBytes: (bytes: number) => void = () => undefined,
  profiling: ProfileOptions | null = null,
): Promise<ThreadTableResult> {
  const fileBytes = fstatOf(path);
  const count = fileBytes >= PARALLEL_FROM_BYTES ? readingThreads() - 1 : 0;
  const workers = Array.from({ length: count }, () => startReadingThread(path));
  const inbox = new Inbox(workers);
  let done = 0;
  const runners: SegmentRunner[] = workers.map((_, w) => async (request) => {
    const id = inbox.send(w, { type: 'segment', id: 0, request });
    const answer = await inbox.next(id);
    if (answer.type !== 'segment') throw new Error(`reading thread: unexpected ${answer.type} message`);
    done += answer.bytesRead - request.job.firstByte;
    onBytes(Math.min(done, fileBytes));
    return { ...answer, table: arrivedTable(answer.table) };
  });
  // Number columns are profiled on the reading threads from their parts while this thread joins the table.
  // Set from the callback below; `as` keeps TypeScript from narrowing it to null for good.
  let numberProfiles = null as NumberProfiles | null;
  const onPart = (parts: readonly Table[]): void => {
    if (profiling === null || workers.length === 0) return;
    // A column is begun by its thread or taken back by this one, whichever comes first (compare and swap).
    const claims = new Int32Array(new SharedArrayBuffer(4 * (parts[0]?.columns.length ?? 0)));
    // The request's parts are copies made for it: moved, not copied again.
    const profilers = workers.map((_, w): NumberPartsProfiler => (request) => answerOf(inbox, w, { type: 'profile-parts', id: 0, ...request, claims }, requestBuffers(request)));
    numberProfiles = new NumberProfiles(parts, profiling, profilers, COLUMNS_IN_HAND, (index) => Atomics.compareExchange(claims, index, UNCLAIMED, TAKEN_BACK) === UNCLAIMED);
  };
  // A table read to be profiled has its cells joined only if something reads them: draft and
  // profile read none but those of the rare cells that are not numbers.
  const parallel = readInParallel(fileBytes, runners, { packValues: true, onPart, headStartBytes: HEAD_START_BYTES, handOverFromBytes: HAND_OVER_FROM_BYTES, cellsWhenRead: profiling !== null });
  try {
    const reader = createTableReader({ delimiter: settings.delimiter, encoding: settings.encoding, totalBytes: parallel.firstReserve, stopAt: parallel.firstStop, packValues: true });
    // Chunks no larger than the first segment, so that the reader can stop near its end; the first
    // one small, so that the header is known and the other threads start at once.
    const buffer = new Uint8Array(Math.min(CHUNK_BYTES, parallel.firstStop));
    const fd = openSync(path, 'r');
    try {
      let position = 0;
      for (let read = readSync(fd, buffer, 0, Math.min(FIRST_CHUNK_BYTES, buffer.length), 0); read > 0; read = readSync(fd, buffer, 0, buffer.length, position)) {
        position += read;
        done += read;
        reader.push(buffer.subarray(0, read));
        parallel.pushed(reader);
        onBytes(Math.min(done, fileBytes));
        if (reader.stoppedAt !== null) break;
        // Lets the reading threads' messages in, so that one done with its share is seen (handOverFromBytes).
        await new Promise<void>((resolve) => setImmediate(resolve));
      }
    } finally {
      closeSync(fd);
    }
    const result = await parallel.finish(reader.finish());
    const shared = numberProfiles;
    // The parts are given up as their columns are joined: columns started from here on go from the table.
    shared?.joinedInto(result.table);
    const profiles = profiling === null ? null : shared === null ? profileTable(result.table, profiling) : await shared.profile(result.table);
    return { ...result, profiles };
  } finally {
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
}

/** The profile a reading thread answers `request` with. */
async function answerOf(inbox: Inbox, worker: number, request: ToReader, transfer: readonly ArrayBuffer[]): Promise<ColumnProfile> {
  const answer = await inbox.next(inbox.send(worker, request, transfer));
  // 'taken-back': nobody waits for this answer (NumberProfiles.take left the column to this thread).
  if (answer.type !== 'profile') throw new Error(`reading thread: ${answer.type === 'taken-back' ? 'column taken back' : `unexpected ${answer.type} message`}`);
  return answer.profile;
}

/**
 * A reading thread runs this file: from the sources through read-thread-sources.mjs; from a build,
 * its own bundle of this file, which bin/levelwise.js writes beside the command line's.
 */
function startReadingThread(path: string): Worker {
  const workerData = { role: ROLE, path, entry: import.meta.url };
  if (import.meta.url.endsWith('.ts')) return new Worker(new URL('./read-thread-sources.mjs', import.meta.url), { workerData });
  return new Worker(new URL('./read-thread.mjs', import.meta.url), { workerData });
}

function fstatOf(path: string): number {
  const fd = openSync(path, 'r');
  try {
    return fstatSync(fd).size;
  } finally {
    closeSync(fd);
  }
}

/**
 * Messages from the reading threads, sorted by the request they answer; any thread's failure (or
 * exit) fails every wait.
 */
class Inbox {
  private readonly workers: readonly Worker[];
  private readonly queues = new Map<number, FromReader[]>();
  private readonly pending: number[];
  private readonly ownerOf = new Map<number, number>();
  private readonly waiting = new Map<number, { resolve: (message: FromReader) => void; reject: (error: Error) => void }>();
  private failure: Error | null = null;
  private nextId = 1;

  constructor(workers: readonly Worker[]) {
    this.workers = workers;
    this.pending = workers.map(() => 0);
    workers.forEach((worker) => {
      worker.on('message', (message: FromReader) => this.deliver(message));
      worker.on('error', (error: Error) => this.fail(error));
      worker.on('exit', (exitCode) => this.fail(new Error(`a reading thread stopped (exit code ${exitCode})`)));
    });
  }

  /** Sends a request to thread `worker`, moving `transfer` there; returns the id its answers carry. */
  send(worker: number, request: ToReader, transfer: readonly ArrayBuffer[] = []): number {
    const id = this.nextId++;
    this.queues.set(id, []);
    this.ownerOf.set(id, worker);
    this.pending[worker]!++;
    this.workers[worker]!.postMessage({ ...request, id }, transfer);
    return id;
  }

  /** The thread with the fewest requests not yet fully answered. */
  leastBusy(): number {
    let best = 0;
    for (let w = 1; w < this.pending.length; w++) if (this.pending[w]! < this.pending[best]!) best = w;
    return best;
  }

  /** Whether an answer to request `id` has come and not yet been taken. */
  answered(id: number): boolean {
    return (this.queues.get(id)?.length ?? 0) > 0;
  }

  /** The next answer to request `id`, in the order the thread sent them. */
  next(id: number): Promise<FromReader> {
    if (this.failure !== null) return Promise.reject(this.failure);
    const queue = this.queues.get(id);
    const message = queue?.shift();
    if (message !== undefined) {
      this.settled(id, message);
      return Promise.resolve(message);
    }
    return new Promise((resolve, reject) => this.waiting.set(id, { resolve, reject }));
  }

  private deliver(message: FromReader): void {
    if (message.type === 'failed') {
      this.fail(readerFailure(message));
      return;
    }
    const queue = this.queues.get(message.id);
    const waiting = this.waiting.get(message.id);
    if (waiting !== undefined) {
      this.waiting.delete(message.id);
      this.settled(message.id, message);
      waiting.resolve(message);
      return;
    }
    queue?.push(message);
  }

  /** A request's last answer has been taken: its thread has one request fewer. */
  private settled(id: number, message: FromReader): void {
    if (!isLast(message)) return;
    const worker = this.ownerOf.get(id);
    if (worker !== undefined) this.pending[worker]!--;
    this.ownerOf.delete(id);
    this.queues.delete(id);
  }

  private fail(error: Error): void {
    this.failure ??= error;
    for (const waiting of this.waiting.values()) waiting.reject(this.failure);
    this.waiting.clear();
  }
}

function isLast(message: FromReader): boolean {
  if (message.type === 'batch') return message.last === true;
  if (message.type === 'started') return message.heldBatches === 0;
  return true;
}

function readerFailure(message: Extract<FromReader, { type: 'failed' }>): Error {
  if (message.code !== null) return new LevelwiseError(message.code, message.message, { hint: message.hint });
  const error = new Error(`reading thread: ${message.message}`);
  if (message.stack !== undefined) error.stack = message.stack;
  return error;
}

// ---------------------------------------------------------------------------------------------
// A reading thread: answers requests one after the other.

function serve(path: string, port: NonNullable<typeof parentPort>): void {
  if (process.env['LEVELWISE_NO_WASM'] === '1') useWebAssembly(false);
  const fd = openSync(path, 'r');
  const buffer = new Uint8Array(CHUNK_BYTES);
  port.on('message', (request: ToReader) => {
    try {
      if (request.type === 'start') readStart(request, fd, buffer, port);
      else if (request.type === 'segment') readSegment(request, fd, buffer, port);
      else if (Atomics.compareExchange(request.claims, request.index, UNCLAIMED, BEGUN) === TAKEN_BACK) port.postMessage({ type: 'taken-back', id: request.id } satisfies FromReader);
      else port.postMessage({ type: 'profile', id: request.id, profile: profileNumberParts(request, true) } satisfies FromReader);
    } catch (error) {
      port.postMessage(failed(error));
    }
  });
}

function readStart(request: Extract<ToReader, { type: 'start' }>, fd: number, buffer: Uint8Array, port: NonNullable<typeof parentPort>): void {
  let bytesRead = 0;
  const { settings } = request;
  // The batches finish() makes (the start's last rows) go after 'started': the encoding thread
  // takes batches as they come, and would encode them before handing out the segments.
  let finishing = false;
  const held: Extract<FromReader, { type: 'batch' }>[] = [];
  const reader = createTableReader({
    delimiter: settings.delimiter,
    encoding: settings.encoding,
    batchRows: settings.batchRows,
    stopAt: request.stopAt,
    onBatch: (table, firstRow) => {
      const batch = { type: 'batch', id: request.id, table, firstRow, bytesRead } as const;
      if (finishing) held.push(batch);
      else post(port, batch);
    },
  });
  // Chunks no larger than the stop, so that the reader can stop near it.
  const chunk = Math.min(buffer.length, request.stopAt);
  for (let read = readSync(fd, buffer, 0, chunk, 0); read > 0; read = readSync(fd, buffer, 0, chunk, bytesRead)) {
    bytesRead += read;
    reader.push(buffer.subarray(0, read));
    if (reader.stoppedAt !== null) break;
  }
  finishing = true;
  const result = reader.finish();
  port.postMessage({ type: 'started', id: request.id, ...startFacts(result), heldBatches: held.length } satisfies FromReader);
  held.forEach((batch, b) => post(port, { ...batch, last: b === held.length - 1 }));
}

function readSegment({ id, request }: Extract<ToReader, { type: 'segment' }>, fd: number, buffer: Uint8Array, port: NonNullable<typeof parentPort>): void {
  const read = readSegmentFrom(fd, buffer, request, fstatSync(fd).size);
  const message: FromReader = { type: 'segment', id, ...read, table: crossingTable(read.table) };
  port.postMessage(message, tableBuffers(message.table));
}

/** A segment read, and the file byte its reading stopped at (for progress). */
type SegmentRead = SegmentResult & { readonly bytesRead: number };

/** Reads the segment `request` asks for from the file open as `fd`, on whichever thread calls it. */
function readSegmentFrom(fd: number, buffer: Uint8Array, request: SegmentRequest, fileBytes: number): SegmentRead {
  let position = request.job.firstByte;
  const reader = segmentReaderFor(request, fileBytes);
  let atEnd = false;
  for (;;) {
    const read = readSync(fd, buffer, 0, buffer.length, position);
    if (read === 0) {
      atEnd = true;
      break;
    }
    position += read;
    if (!reader.push(buffer.subarray(0, read))) break;
  }
  return { ...reader.finish(atEnd), bytesRead: position };
}

function post(port: NonNullable<typeof parentPort>, message: Extract<FromReader, { type: 'batch' }>): void {
  port.postMessage(message, tableBuffers(message.table));
}

function failed(error: unknown): FromReader {
  return isLevelwiseError(error)
    ? { type: 'failed', code: error.code, message: error.message, hint: error.hint }
    : { type: 'failed', code: null, message: error instanceof Error ? error.message : String(error), hint: '', ...(error instanceof Error && error.stack ? { stack: error.stack } : {}) };
}

function isReadingThread(data: unknown): data is { role: typeof ROLE; path: string } {
  return typeof data === 'object' && data !== null && (data as { role?: unknown }).role === ROLE;
}

if (!isMainThread && parentPort !== null && isReadingThread(workerData)) serve(workerData.path, parentPort);
