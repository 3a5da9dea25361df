/**
 * A whole table read on several threads. The file is cut into one segment per thread. The calling
 * thread reads the first segment with the ordinary table reader and `stopAt` (it finds the header,
 * encoding and delimiter); as soon as its reader knows them (`TableReader.segmenting`), the other
 * segments start on the other threads (read-segment.ts), and their tables are joined to the first
 * in file order (concat-tables.ts) once all are read. A thread done with its segment while the
 * calling thread still has far to go takes over the end of the calling thread's share, as one more
 * segment (`handOverFromBytes`): the shares are guesses made before any thread has run.
 *
 * The threads themselves are the caller's: Web Workers in the page, worker threads in Node. Each
 * is a `SegmentRunner` that reads one segment of the same source and hands back its table.
 *
 * The result is the table one thread reads, storage included: test/core/concat-tables.property.test.ts
 * runs this orchestration on random files cut into tiny segments (through read-in-segments.ts).
 */
import { concatTables } from './concat-tables.ts';
import type { Table } from './columns.ts';
import { RELEASES_AT_ONCE } from './release-buffers.ts';
import type { ColumnHints, ReadResult, TableReader } from './read-table.ts';
import { createSegmentReader, rebaseRows, type SegmentReader, type SegmentResult } from './read-segment.ts';
import type { Delimiter } from './parse.ts';
import { segmentJobs, SegmentOrder, type SegmentJob } from './segment-order.ts';

/** What a thread needs to read a segment (all of it can be cloned to another thread). */
export interface SegmentRequest {
  readonly job: SegmentJob;
  readonly names: readonly string[];
  readonly delimiter: Delimiter;
  readonly encodingGuessed: boolean;
  readonly columnHints: ColumnHints | null;
  readonly dictionaryCap?: number;
  /** See ReadOptions.packValues: for segments whose tables are written out on the thread that takes them. */
  readonly packValues?: boolean;
}

/** Reads one segment on its thread; rejects with the reader's error (a LevelwiseError for bad bytes). */
export type SegmentRunner = (request: SegmentRequest) => Promise<SegmentResult>;

/** The segment reader for `request` on a thread, in a file of `fileBytes` bytes. */
export function segmentReaderFor(request: SegmentRequest, fileBytes: number): SegmentReader {
  const { job } = request;
  return createSegmentReader({
    names: request.names,
    delimiter: request.delimiter,
    firstByte: job.firstByte,
    stopAt: job.stopAt,
    ...(job.afterRecord === true ? { afterRecord: true } : {}),
    encodingGuessed: request.encodingGuessed,
    totalBytes: Math.min(job.stopAt, fileBytes) - job.firstByte,
    ...(request.columnHints === null ? {} : { columnHints: request.columnHints }),
    ...(request.dictionaryCap === undefined ? {} : { dictionaryCap: request.dictionaryCap }),
    ...(request.packValues === true ? { packValues: true } : {}),
  });
}

export interface ParallelReadOptions {
  readonly dictionaryCap?: number;
  /**
   * Segments keep identifier-like columns as bytes (ReadOptions.packValues): they cross without a
   * string per value, join without a lookup when sorted, and are profiled from their bytes. The
   * calling thread's reader should be made with it too.
   */
  readonly packValues?: boolean;
  /**
   * Bytes the calling thread reads more than each other thread (default 0): it starts first, while
   * the others start up and wait for the header, so with equal shares it would finish first and
   * wait for them. At most an equal share of the rest; ignored with `segmentBytes`.
   */
  readonly headStartBytes?: number;
  /** No segment smaller than this (default 1 byte). */
  readonly minSegmentBytes?: number;
  /** Segments of this size instead of one per thread (more segments than runners: for tests). */
  readonly segmentBytes?: number;
  /**
   * When a runner is idle and no segment waits for one, the calling thread hands it the second half
   * of what it has left to read, as one more segment, if that half is at least this many bytes
   * (default: never). The shares are cut before anyone knows how fast each thread will run: on a
   * shared host the thread done first waited 0.1–0.6 s for the other.
   */
  readonly handOverFromBytes?: number;
  /**
   * Sees the parts before they are joined, in file order, rows numbered from the file's start: for
   * tests, and for work on a column's parts elsewhere while this thread joins them (the command
   * line profiles number columns so). The parts must not be changed; the first is joined in place,
   * and each is given up as its columns are joined (with cellsWhenRead, when their cells are first
   * read): once `finish` has returned, read the table, never the parts.
   */
  readonly onPart?: (parts: readonly Table[]) => void;
  /**
   * Join the columns' cells only when read (ConcatOptions.cellsWhenRead): for a table read to be
   * profiled, whose dictionaries' codes the profile does not read. The command line that only
   * drafts a recipe then never joins them; the page has its summary before they are joined (for
   * its preview, after).
   */
  readonly cellsWhenRead?: boolean;
  /**
   * What the calling thread's reader reserves storage for (`firstReserve`): 'whole-file' (the
   * default where memory is freed only by a collection) or 'own-share' (the default where it can be
   * given back at once; see ParallelRead.firstReserve). For tests, to take either way anywhere.
   */
  readonly reserve?: 'whole-file' | 'own-share';
}

export interface ParallelRead {
  /** The `stopAt` for the calling thread's table reader: the end of the first segment, as first cut. */
  readonly firstStop: number;
  /**
   * The `totalBytes` for that reader, which it reserves storage for. The whole file where a part's
   * memory goes only at the next collection (Node 20): the other parts then join the first in its
   * own storage, and the first part is never held twice. Its own share where memory can be given
   * back at once (release-buffers.ts) and the parts are given up as they are joined: the join then
   * copies each column into new storage and releases the parts' arrays at once, so that the room
   * for the other parts and the parts themselves are never held together (in Chromium 150, the
   * peak while reading a million-row file went from ~290 to ~230 MB). A file the first reader
   * ends up reading whole (one it cannot cut) then grows its storage as it goes.
   */
  readonly firstReserve: number;
  /**
   * Call after each chunk pushed to that reader: starts the other segments once it can, and may
   * move the reader's stop earlier (`handOverFromBytes`).
   */
  pushed(reader: Pick<TableReader, 'segmenting' | 'bytesRead' | 'stopEarlier'>): void;
  /** With the first segment's result: the whole table (the first result itself when it was not cut). */
  finish(first: ReadResult): Promise<ReadResult>;
  /** How the segments were placed so far: joined (the first included), read again, left out. */
  readonly placements: { readonly taken: number; readonly redone: number; readonly skipped: number };
}

/**
 * Reading `fileBytes` on this thread and `runners`: by default one segment each; with
 * `segmentBytes`, as many segments as that makes, each runner taking the next when it is free.
 * Segments of less than `minSegmentBytes` are not worth a thread: fewer runners are used then.
 */
export function readInParallel(fileBytes: number, runners: readonly SegmentRunner[], options: ParallelReadOptions = {}): ParallelRead {
  const threads = Math.max(1, Math.min(runners.length + 1, Math.floor(fileBytes / (options.minSegmentBytes ?? 1))));
  // The calling thread reads its head start on top of an equal share: S + head, others S each;
  // never more than twice what another reads (a small file still gives every thread its part).
  const head = Math.min(options.headStartBytes ?? 0, Math.floor(fileBytes / (threads + 1)));
  const share = Math.ceil((fileBytes - head) / threads);
  const segmentBytes = options.segmentBytes ?? share;
  const firstStop = threads > 1 ? (options.segmentBytes ?? share + head) : Infinity;
  const jobs = threads > 1 ? segmentJobs(firstStop, fileBytes, segmentBytes) : [];
  /** Where the calling thread's reader stops now (earlier than firstStop once it handed some over). */
  let currentStop = firstStop;
  let started = false;
  let request: ((job: SegmentJob) => SegmentRequest) | null = null;
  // Runners free for the next job, and jobs waiting for one: segments read again first, then the
  // others in file order (an index, not shift(): there may be thousands).
  const free: SegmentRunner[] = [];
  const again: (() => void)[] = [];
  const backlog: (() => void)[] = [];
  let nextInBacklog = 0;

  const run = async (job: SegmentJob, readAgain = false): Promise<SegmentResult> => {
    while (free.length === 0) await new Promise<void>((resolve) => (readAgain ? again : backlog).push(resolve));
    const runner = free.pop()!;
    try {
      return await runner(request!(job));
    } finally {
      free.push(runner);
      const next = again.pop() ?? (nextInBacklog < backlog.length ? backlog[nextInBacklog++] : undefined);
      next?.();
    }
  };
  let results: Promise<SegmentResult>[] = [];

  /** Hands the second half of what the calling thread has left to an idle runner, when worth it. */
  const handOver = (reader: Pick<TableReader, 'bytesRead' | 'stopEarlier'>): void => {
    const least = options.handOverFromBytes;
    const idle = free.length > 0 && again.length === 0 && nextInBacklog >= backlog.length;
    if (least === undefined || !idle || !Number.isFinite(currentStop)) return;
    const half = Math.floor((currentStop - reader.bytesRead) / 2);
    if (half < least) return;
    const cut = currentStop - half;
    if (!reader.stopEarlier(cut)) return;
    // As segmentJobs cuts: the calling thread stops at the first record from `cut` on, and the new
    // segment starts a byte early, to find that record.
    const job: SegmentJob = { firstByte: cut - 1, stopAt: currentStop };
    currentStop = cut;
    const result = run(job);
    result.catch(() => undefined);
    jobs.unshift(job);
    results.unshift(result);
  };

  const placements = { taken: 1, redone: 0, skipped: 0 };
  const ownShare = (options.reserve ?? (RELEASES_AT_ONCE ? 'own-share' : 'whole-file')) === 'own-share';
  return {
    firstStop,
    firstReserve: ownShare ? Math.min(firstStop, fileBytes) : fileBytes,
    placements,
    pushed(reader) {
      if (started) return handOver(reader);
      const segmenting = reader.segmenting;
      if (segmenting === null || jobs.length === 0) return;
      started = true;
      request = (job) => ({
        job,
        names: segmenting.names,
        delimiter: segmenting.delimiter,
        encodingGuessed: segmenting.encodingGuessed,
        columnHints: null,
        ...(options.dictionaryCap === undefined ? {} : { dictionaryCap: options.dictionaryCap }),
        ...(options.packValues === true ? { packValues: true } : {}),
      });
      free.push(...runners.slice(0, threads - 1));
      results = jobs.map((job) => run(job));
      // Failures of segments read in vain must not go unhandled while an earlier one is awaited.
      results.forEach((result) => result.catch(() => undefined));
    },
    async finish(first) {
      if (first.stoppedAt === null) return first;
      if (!started) throw new Error('the first segment stopped, but the others were never started');
      const order = new SegmentOrder({ end: first.stoppedAt, rows: first.totalRows, lineBreaks: first.lineBreaks });
      const parts: Table[] = [first.table];
      let emptyLinesSkipped = first.emptyLinesSkipped;
      // In file order; a segment read again goes in front of the rest.
      const queue = jobs.map((job, i): [SegmentJob, Promise<SegmentResult>] => [job, results[i]!]).reverse();
      results = []; // each result is let go once placed
      while (queue.length > 0) {
        const [job, pending] = queue.pop()!;
        const segment = await pending;
        const placement = order.place(job, segment);
        if (placement.kind === 'take') {
          placements.taken++;
          parts.push(rebaseRows(segment.table, placement.rowOffset, placement.lineOffset));
          emptyLinesSkipped += segment.emptyLinesSkipped;
        } else if (placement.kind === 'skip') {
          placements.skipped++;
        } else {
          // A segment read again starts where the one before it stopped: it always lines up.
          placements.redone++;
          const readAgain = run(placement.job, true);
          readAgain.catch(() => undefined);
          queue.push([placement.job, readAgain]);
        }
      }
      options.onPart?.(parts);
      // The first part's storage has room for the whole file where it was reserved so (firstReserve):
      // the others join it there. Else the join copies it too, column by column, releasing as it goes.
      // Each part came in a message from another thread, and what keeps such a message alive is not
      // ours to know: in Chromium 150 the second half of a million-row file (49 MB of typed arrays)
      // stayed held in the worker after the join, through every collection asked for over 7.5 s.
      // Released as they are joined (concatTables releaseParts), their memory goes at once.
      const table = concatTables(parts, {
        ...(options.dictionaryCap === undefined ? {} : { dictionaryCap: options.dictionaryCap }),
        reuseFirst: true,
        cellsWhenRead: options.cellsWhenRead === true,
        releaseParts: true,
      });
      return { ...first, table, totalRows: table.rowCount, emptyLinesSkipped, stoppedAt: null, lineBreaks: order.lineBreaks, bytes: fileBytes };
    },
  };
}
