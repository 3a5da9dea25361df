/**
 * Reading a file in segments on this one thread, through the same orchestration as reading on
 * several (parallel-read.ts), with runners that read their segment here from the bytes in memory.
 * Its result is what `readTable` gives for the same bytes; the tests hold it to that on random
 * files cut into tiny segments, which is how the threaded paths' placing and joining is checked.
 */
import type { Table } from './columns.ts';
import { placeBadUtf8In } from './bad-utf8.ts';
import { isLevelwiseError } from './errors.ts';
import { readInParallel, segmentReaderFor, type SegmentRequest, type SegmentRunner } from './parallel-read.ts';
import type { SegmentResult } from './read-segment.ts';
import { createTableReader, readTable, type ReadResult } from './read-table.ts';

export interface SegmentedReadOptions {
  readonly dictionaryCap?: number;
  /** Identifier-like columns kept as bytes, in every segment (ReadOptions.packValues), as the page and the command line read. */
  readonly packValues?: boolean;
  /** Sees each part joined, the first included, in file order, rows already numbered from the file's start. */
  readonly onPart?: (part: Table) => void;
  /** Columns' cells joined only when read (ParallelReadOptions.cellsWhenRead), as the command line reads a table to profile. */
  readonly cellsWhenRead?: boolean;
  /**
   * The first reader hands the rest of its segment over to idle runners (ParallelReadOptions.handOverFromBytes),
   * pushing `pushBytes` at a time and letting the runners finish between pushes, as threads would.
   */
  readonly handOver?: { readonly fromBytes: number; readonly pushBytes: number };
  /** What the first reader reserves storage for (ParallelReadOptions.reserve); by default as this engine would. */
  readonly reserve?: 'whole-file' | 'own-share';
}

export interface SegmentedReadResult extends ReadResult {
  /** How the segments were placed: parts joined (the first included), segments read again, segments left out. */
  readonly segments: { readonly taken: number; readonly redone: number; readonly skipped: number };
}

/** Bytes handed to a reader at a time. */
const PUSH_BYTES = 1 << 16;

/**
 * Reads `bytes` as `readTable` does, in segments of about `segmentBytes`. A source that cannot be
 * cut by its line breaks (not UTF-8, CR line breaks, one column: see ReadOptions.stopAt) is read
 * whole by the first reader; one that turns out not to be UTF-8 is read again whole as
 * Windows-1252, as readTable does.
 */
export async function readInSegments(bytes: Uint8Array, segmentBytes: number, options: SegmentedReadOptions = {}): Promise<SegmentedReadResult> {
  if (!(Number.isInteger(segmentBytes) && segmentBytes >= 1)) throw new Error(`segmentBytes must be a whole number of at least 1, not ${segmentBytes}`);
  const cap = options.dictionaryCap === undefined ? {} : { dictionaryCap: options.dictionaryCap };
  try {
    return await readSegments(bytes, segmentBytes, options);
  } catch (error) {
    if (!isLevelwiseError(error, 'encoding-restart')) throw placeBadUtf8In(error, bytes);
    const whole = readTable(bytes, { ...cap, encoding: 'windows-1252' });
    options.onPart?.(whole.table);
    return { ...whole, segments: { taken: 1, redone: 0, skipped: 0 } };
  }
}

async function readSegments(bytes: Uint8Array, segmentBytes: number, options: SegmentedReadOptions): Promise<SegmentedReadResult> {
  const cap = {
    ...(options.dictionaryCap === undefined ? {} : { dictionaryCap: options.dictionaryCap }),
    ...(options.packValues === true ? { packValues: true } : {}),
  };
  // Two runners taking segments in turn; each reads its segment from the bytes, here.
  const runner: SegmentRunner = async (request) => readSegment(bytes, request);
  const parts: Table[] = [];
  const later = options.cellsWhenRead === true ? { cellsWhenRead: true } : {};
  const handOver = options.handOver === undefined ? {} : { handOverFromBytes: options.handOver.fromBytes };
  const reserve = options.reserve === undefined ? {} : { reserve: options.reserve };
  const parallel = readInParallel(bytes.length, [runner, runner], { ...cap, ...later, ...handOver, ...reserve, segmentBytes, onPart: (joined) => parts.push(...joined) });
  // Sized as the page and the command line size it (ParallelRead.firstReserve).
  const reader = createTableReader({ ...cap, stopAt: parallel.firstStop, totalBytes: parallel.firstReserve });
  const pushBytes = options.handOver?.pushBytes ?? PUSH_BYTES;
  for (let at = 0; at < bytes.length && reader.stoppedAt === null; at += pushBytes) {
    reader.push(bytes.subarray(at, at + pushBytes));
    parallel.pushed(reader);
    if (options.handOver !== undefined) await new Promise((resolve) => setTimeout(resolve, 0));
  }
  const first = reader.finish();
  const result = await parallel.finish(first);
  // Only now: a read started again as Windows-1252 shows its parts only.
  if (parts.length === 0) parts.push(result.table);
  for (const part of parts) options.onPart?.(part);
  return { ...result, columnHints: null, segments: { ...parallel.placements } };
}

/** Reads the segment of `request`, pushing the file's bytes until it stops or the file ends. */
function readSegment(bytes: Uint8Array, request: SegmentRequest): SegmentResult {
  const { job } = request;
  const reader = segmentReaderFor(request, bytes.length);
  let at = job.firstByte;
  while (at < bytes.length) {
    const end = Math.min(bytes.length, at + PUSH_BYTES);
    const goOn = reader.push(bytes.subarray(at, end));
    at = end;
    if (!goOn) break;
  }
  return reader.finish(at >= bytes.length);
}
