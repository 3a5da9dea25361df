/**
 * A file (or the built-in demo) → a Table, inside the worker. Text files are streamed from
 * `File.stream()` chunk by chunk into core's table reader, never held as one string; spreadsheets
 * go through read-excel-file (its worker-free build, since this already is a worker) and then core
 * `tableFromRows`. A gzip-compressed text file is unpacked as it streams (DecompressionStream).
 */
import { spreadsheetCellText } from '../core/spreadsheet-cell.ts';
import readXlsxFile from 'read-excel-file/web-worker';
import { retryAsWindows1252, startsLikeGzip, type EncodingName } from '../core/decode.ts';
import { readInParallel } from '../core/parallel-read.ts';
import { createTableReader, readTableFromSource, tableFromRows, type Delimiter, type ReadResult } from '../core/read-table.ts';
import { LevelwiseError } from '../core/errors.ts';
import { DEMO_FILE_NAME, generateHouseholdEnergyCsv } from '../demo/household-energy.ts';
import { NumberProfiles } from '../core/number-profiles.ts';
import { releaseChunk } from '../core/release-buffers.ts';
import type { ColumnProfile, ProfileOptions, TextProfilesListener } from '../core/profile.ts';
import { pageLimit, tooLargeForPage, tooLargeUnpacked } from './page-limits.ts';
import { Cancelled, type TableSource } from './protocol.ts';
import type { Table } from '../core/columns.ts';
import { MIN_SEGMENT_BYTES, openSegmentPool, PARALLEL_FROM_BYTES, profileOrHere, SegmentWorkerFailure, readingThreadCount } from './segment-pool.ts';

export interface ReadProgress {
  (done: number, total: number | null): void;
}

export interface SourceRead {
  readonly read: ReadResult;
  /**
   * The table's profiles when `profiling` was asked for and the file was read on several threads,
   * whose workers then profiled its number columns; null otherwise (the caller profiles the table).
   */
  readonly profiles: ColumnProfile[] | null;
  readonly fileName: string;
  readonly file: Blob;
  readonly sheet: { readonly name: string; readonly names: readonly string[] } | null;
  /** The file was gzip-compressed, and unpacked while read. */
  readonly compressed?: boolean;
}

export interface ReadSourceOptions {
  readonly delimiter?: Delimiter | null;
  readonly signal: AbortSignal;
  readonly onProgress: ReadProgress;
  /** Replaces the page's file size limit (page-limits.ts); tests lower it. */
  readonly maxBytes?: number;
  /** Profile the table with these options where that is cheaper while reading (SourceRead.profiles). */
  readonly profiling?: ProfileOptions | null;
  /** Told when the read is done and the profiling (SourceRead.profiles) starts. */
  readonly onProfiling?: () => void;
  /**
   * Given the text columns' profiles (null for the others) as soon as they are made, while the
   * number columns' are still being made on the segment workers.
   */
  readonly onTextProfiles?: TextProfilesListener;
}

/** The start of every ZIP container, XLSX included ("PK\3\4"). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];

export async function readSource(source: TableSource, options: ReadSourceOptions): Promise<SourceRead> {
  if (source.kind === 'demo') {
    const file = new Blob([generateHouseholdEnergyCsv({ rows: source.rows })], { type: 'text/csv' });
    return { ...(await readText(file, options)), fileName: DEMO_FILE_NAME, file, sheet: null };
  }
  const { file } = source;
  const spreadsheet = await isSpreadsheet(file);
  // Refused on its size alone, before reading: a file too large for the tab would end it.
  const limit = pageLimit(spreadsheet ? 'workbook' : 'text', options.maxBytes);
  if (file.size > limit) throw tooLargeForPage(file.name, file.size, spreadsheet ? 'workbook' : 'text', limit);
  if (spreadsheet) return readSpreadsheet(file, source.sheet ?? null, options);
  if (await isGzip(file)) return { read: await readGzipText(file, limit, options), profiles: null, fileName: file.name, file, sheet: null, compressed: true };
  return { ...(await readText(file, options)), fileName: file.name, file, sheet: null };
}

async function isGzip(file: Blob): Promise<boolean> {
  return startsLikeGzip(new Uint8Array(await file.slice(0, 2).arrayBuffer()));
}

/**
 * A gzip-compressed text file, unpacked as it streams and read on this thread (a compressed file
 * cannot be cut into segments for other workers). The bar follows the compressed bytes read. Its
 * unpacked size shows only while reading: past the page's limit the read stops, with the same way
 * out as for a big file.
 */
function readGzipText(file: File, limit: number, { delimiter, signal, onProgress }: ReadSourceOptions): Promise<ReadResult> {
  const unpacked = (): AsyncGenerator<Uint8Array> => {
    let packed = 0;
    const counted = file.stream().pipeThrough(
      new TransformStream<Uint8Array, Uint8Array>({
        transform(chunk, controller) {
          packed += chunk.length;
          controller.enqueue(chunk);
        },
      }),
    );
    // The DOM's typings want a BufferSource stream in; File.stream() gives Uint8Arrays, which are one.
    const stream = counted.pipeThrough(new DecompressionStream('gzip') as unknown as TransformStream<Uint8Array, Uint8Array>);
    let total = 0;
    return streamChunks(stream, signal, (chunk) => {
      total += chunk.length;
      if (total > limit) throw tooLargeUnpacked(file.name, file.size, limit);
      onProgress(Math.min(packed, file.size), file.size);
    }, (error) => damagedGzip(file.name, error));
  };
  return readTableFromSource(unpacked, { delimiter: delimiter ?? null });
}

function damagedGzip(name: string, error: unknown): LevelwiseError {
  return new LevelwiseError('bad-gzip', `“${name}” is gzip-compressed, but it could not be unpacked (${messageOf(error)}): its data is damaged or cut short, or it holds several compressed parts one after the other.`, {
    hint: 'Unpack it with your file manager or gzip and open the CSV inside; the command line (levelwise) reads such files as they are.',
  });
}

const WORKBOOK_NAME = /\.(xlsx|xlsm)$/i;

/**
 * How much more of a big file this worker reads than each segment worker (core readInParallel's
 * headStartBytes): a segment worker starts once the header is read and runs the reader cold. With
 * halves of the 123 MB benchmark file in Chromium 150 on 2 cores, this worker waited 135–270 ms for
 * the other half; with 6 or 10 MB more, 3–80 ms, and the file summary came ~100 ms sooner.
 */
const HEAD_START_BYTES = 8 << 20;
/**
 * A segment worker done with its share takes over the second half of what this worker has left,
 * when that half is at least this (core readInParallel's handOverFromBytes): the head start is a
 * guess, and on a shared host the segment worker was sometimes done 0.6 s before this one.
 */
const HAND_OVER_FROM_BYTES = 4 << 20;

async function isSpreadsheet(file: File): Promise<boolean> {
  if (WORKBOOK_NAME.test(file.name)) return true;
  const head = new Uint8Array(await file.slice(0, 4).arrayBuffer());
  return ZIP_MAGIC.every((b, i) => head[i] === b);
}

/** A text file's table, and its profiles when they were made while reading (SourceRead.profiles). */
interface TextRead {
  readonly read: ReadResult;
  readonly profiles: ColumnProfile[] | null;
}

async function readText(file: Blob, { delimiter, signal, onProgress, profiling = null, onProfiling, onTextProfiles }: ReadSourceOptions): Promise<TextRead> {
  const onOneThread = async (): Promise<TextRead> => ({
    read: await readTableFromSource(() => chunksOf(file, signal, onProgress), { delimiter: delimiter ?? null, totalBytes: file.size }),
    profiles: null,
  });
  const workers = file.size >= PARALLEL_FROM_BYTES ? readingThreadCount() - 1 : 0;
  if (workers <= 0) return onOneThread();
  // One count of the bytes read, here and in the segment workers, so that the bar only moves on.
  const progress = { here: 0, others: 0 };
  const report = (): void => onProgress(Math.min(progress.here + progress.others, file.size), file.size);
  return retryAsWindows1252(
    () => {
      progress.here = 0;
      progress.others = 0;
      return chunksOf(file, signal, (done) => {
        progress.here = done;
        report();
      });
    },
    (chunks, encoding) =>
      readInSegments(file, chunks, { delimiter: delimiter ?? null, encoding }, workers, signal, profiling === null ? null : { options: profiling, onStart: onProfiling ?? (() => undefined), onTextProfiles }, (bytes) => {
        progress.others += bytes;
        report();
      }),
    null,
  ).catch((error: unknown) => {
    // A segment worker that could not run (no module workers here): read on this thread instead.
    if (error instanceof SegmentWorkerFailure && !signal.aborted) return onOneThread();
    throw error;
  });
}

/**
 * A big file on several cores (segment-pool.ts): its first segment here, the others in segment
 * workers started as soon as the header is read. A file the reader cannot cut (not UTF-8, one
 * column, lone CR line breaks) is read here to its end, as before. With `profiling`, the segment
 * workers go on to profile the number columns from the parts while this thread joins the table
 * and profiles the rest (core number-profiles.ts, profileTableSharing).
 */
async function readInSegments(
  file: Blob,
  chunks: AsyncIterable<Uint8Array>,
  settings: { delimiter: Delimiter | null; encoding: EncodingName | null },
  workers: number,
  signal: AbortSignal,
  profiling: { readonly options: ProfileOptions; readonly onStart: () => void; readonly onTextProfiles: TextProfilesListener | undefined } | null,
  onSegmentBytes: (bytes: number) => void,
): Promise<TextRead> {
  const pool = openSegmentPool(file, workers, signal, onSegmentBytes);
  try {
    // Set from the callback below; `as` keeps TypeScript from narrowing it to null for good.
    let numberProfiles = null as NumberProfiles | null;
    const onPart = (parts: readonly Table[]): void => {
      if (profiling !== null && parts.length > 1) numberProfiles = new NumberProfiles(parts, profiling.options, pool.profilers);
    };
    const parallel = readInParallel(file.size, pool.runners, {
      minSegmentBytes: MIN_SEGMENT_BYTES,
      headStartBytes: HEAD_START_BYTES,
      handOverFromBytes: HAND_OVER_FROM_BYTES,
      packValues: true,
      onPart,
      // The profile reads no dictionary's codes: they are joined when first read (the preview, after the summary).
      cellsWhenRead: profiling !== null,
    });
    const reader = createTableReader({ ...settings, stopAt: parallel.firstStop, totalBytes: parallel.firstReserve, packValues: true });
    for await (const chunk of chunks) {
      reader.push(chunk);
      parallel.pushed(reader);
      if (reader.stoppedAt !== null) break;
    }
    const read = await parallel.finish(reader.finish());
    const shared = numberProfiles;
    if (profiling === null || shared === null) return { read, profiles: null };
    // The parts are joined and given up now: columns the workers start from here on go from the
    // table. No worker's answer (which starts the next column) comes between the join and this line:
    // the join ends finish(), and the await resumes here in the same task, before any message.
    shared.joinedInto(read.table);
    profiling.onStart();
    const profiles = await profileOrHere(shared, read.table, profiling.options, signal, profiling.onTextProfiles);
    return { read, profiles };
  } finally {
    pool.close();
  }
}

/**
 * Longest stretch of reading, in ms, without a look at the worker's message queue. Reads of a
 * File's stream often resolve as microtasks, so without a pause a `cancel` (or a preview request)
 * would wait until the whole file was read.
 */
export const READ_PAUSE_EVERY_MS = 50;

/** The file's bytes as they stream in; reports progress and stops when the request is cancelled. */
function chunksOf(file: Blob, signal: AbortSignal, onProgress: ReadProgress): AsyncGenerator<Uint8Array> {
  let done = 0;
  return streamChunks(file.stream(), signal, (chunk) => {
    done += chunk.length;
    onProgress(done, file.size);
  });
}

/**
 * A stream's chunks, each first shown to `onChunk`; pauses for the worker's messages and stops when
 * the request is cancelled. `failure` names an error of the stream itself (not of its consumer).
 * A chunk's memory is given back when the next is asked for (core release-buffers.ts): the
 * consumer must not keep a chunk past that, as the table reader does not.
 */
async function* streamChunks(
  stream: ReadableStream<Uint8Array>,
  signal: AbortSignal,
  onChunk: (chunk: Uint8Array) => void,
  failure: (error: unknown) => unknown = (error) => error,
): AsyncGenerator<Uint8Array> {
  const reader = stream.getReader();
  let pausedAt = performance.now();
  let finished = false;
  try {
    for (;;) {
      if (performance.now() - pausedAt >= READ_PAUSE_EVERY_MS) {
        await new Promise<void>((resolve) => setTimeout(resolve, 0));
        pausedAt = performance.now();
      }
      if (signal.aborted) throw new Cancelled();
      let next: ReadableStreamReadResult<Uint8Array>;
      try {
        next = await reader.read();
      } catch (error) {
        finished = true;
        throw failure(error);
      }
      if (next.done) {
        finished = true;
        return;
      }
      onChunk(next.value);
      yield next.value;
      // Asked for the next chunk, the reader is done with this one (it copies what it keeps).
      releaseChunk(next.value);
    }
  } finally {
    // Left early (cancelled, refused, or the reader stopped): the stream, and any it is piped from, stops too.
    if (!finished) void reader.cancel().catch(() => undefined);
    reader.releaseLock();
  }
}

async function readSpreadsheet(file: File, wanted: string | null, { signal, onProgress }: ReadSourceOptions): Promise<SourceRead> {
  onProgress(0, file.size);
  let sheets: Awaited<ReturnType<typeof readXlsxFile>>;
  try {
    sheets = await readXlsxFile(file, { trim: false });
  } catch (error) {
    // Named like a workbook, it is a damaged one; named otherwise (an archive called .csv), it is no workbook at all.
    if (!WORKBOOK_NAME.test(file.name)) {
      throw new LevelwiseError('not-text', `“${file.name}” is not a text table: its first bytes say it is a ZIP archive, and it is not an XLSX workbook either (${messageOf(error)}).`, {
        hint: 'If it holds CSV files, unpack it and open one of them; if it is a workbook, save it again as .xlsx.',
      });
    }
    throw new LevelwiseError('bad-spreadsheet', `“${file.name}” could not be read as an XLSX workbook: ${messageOf(error)}.`, {
      hint: 'Open it in a spreadsheet program and save it again as .xlsx, or export the sheet as CSV.',
    });
  }
  if (signal.aborted) throw new Cancelled();
  onProgress(file.size, file.size);
  const names = sheets.map((s) => s.sheet);
  const chosen = wanted === null ? sheets[0] : sheets.find((s) => s.sheet === wanted);
  if (chosen === undefined) {
    throw new LevelwiseError('no-sheet', wanted === null ? `“${file.name}” holds no sheets.` : `“${file.name}” has no sheet named “${wanted}”.`, {
      hint: names.length > 0 ? `Choose one of: ${names.join(', ')}.` : 'Choose a workbook with at least one sheet.',
    });
  }
  const rows = chosen.data.map((row) => row.map(spreadsheetCellText));
  return { read: tableFromRows(rows), profiles: null, fileName: file.name, file, sheet: { name: chosen.sheet, names } };
}


function messageOf(error: unknown): string {
  return error instanceof Error ? error.message.replace(/\.$/, '') : String(error);
}
