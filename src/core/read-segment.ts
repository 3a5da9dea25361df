/**
 * Reading one segment of a big file, so that segments can be read on several threads at once.
 *
 * A file is cut at nominal byte offsets. The first segment is read by the ordinary table reader
 * with `stopAt` (read-table.ts): it reads the header, chooses the encoding, delimiter and line
 * break, and stops at the first record that starts at or after the first cut. Every other segment
 * is read here: its bytes are pushed from one byte before its cut, it skips to just after the first
 * line break it meets outside quotes, as far as the bytes tell (likelyRecordStart), and reads
 * records up to the first that starts at or after the next cut.
 *
 * A line break inside a quoted field looks like a record start to a segment that begins there.
 * Segments therefore say where they started and where they stopped, and the caller keeps a segment
 * only when it starts exactly where the one before it stopped (the previous segment, reading from
 * a true record start, knows the true boundary). A segment that does not line up is read again
 * from the true boundary (see segment-order.ts), so quoted line breaks cost time, never correctness.
 *
 * Rows and lines of a segment are counted from its own start (row 0, line 1); the caller rebases
 * them (rebaseRows) once the segments before it are known.
 */
import type { Table } from './columns.ts';
import { invalidUtf8 } from './decode.ts';
import { ESTIMATE_AFTER_ROWS, ROW_ESTIMATE_MARGIN, RowCollector, type ColumnHints, type ReadOptions } from './read-table.ts';
import { RecordParser, type Delimiter } from './parse.ts';
import { InvalidUtf8Error } from './utf8-text.ts';

export interface SegmentOptions {
  /** The file's column names (from the first segment). */
  readonly names: readonly string[];
  readonly delimiter: Delimiter;
  /** The file byte of the first byte pushed: one before the segment's cut. */
  readonly firstByte: number;
  /** The next cut: no record starting at or after this file byte is read. */
  readonly stopAt: number;
  /** Byte `firstByte` is known to end a record (SegmentJob.afterRecord): the segment starts right after it. */
  readonly afterRecord?: boolean;
  /** Whether UTF-8 was a guess (bad bytes then mean reading the whole file again as Windows-1252). */
  readonly encodingGuessed: boolean;
  readonly dictionaryCap?: number;
  readonly batchRows?: number;
  readonly onBatch?: ReadOptions['onBatch'];
  /** What the columns were like in the first segment's batches (ReadResult.columnHints). */
  readonly columnHints?: ColumnHints;
  /** The segment's size in bytes, for sizing its storage (see ReadOptions.totalBytes). */
  readonly totalBytes?: number;
  /** See ReadOptions.packValues. */
  readonly packValues?: boolean;
}

export interface SegmentResult {
  /** Its rows (row 0 = the segment's first record); in batch mode the header only. */
  readonly table: Table;
  /** The file byte of its first record. */
  readonly start: number;
  /** The file byte of the first record it did not read: the next cut's boundary, or the file's end. */
  readonly end: number;
  readonly rows: number;
  /** Line breaks read, quoted ones included, from `start` to `end`. */
  readonly lineBreaks: number;
  readonly emptyLinesSkipped: number;
}

const LF = 0x0a;
const CR = 0x0d;
const QUOTE = 0x22;

/**
 * Where the first record after a cut most likely starts in `bytes`: just after the first line break
 * outside quotes, taking the cut to fall inside a quoted field when the first quote met closes one
 * (a delimiter or a line break follows it) and outside when it opens one (one comes before it). A
 * doubled quote says nothing; no quote at all, outside. Returns -1 when the bytes do not tell (no
 * line break outside quotes in them). A wrong guess costs time only: the segment does not line up
 * with the one before it and is read again from the right place (segment-order.ts).
 */
export function likelyRecordStart(bytes: Uint8Array, delimiter: number): number {
  let inside = false;
  for (let i = 0; i < bytes.length; i++) {
    if (bytes[i] !== QUOTE) continue;
    if (bytes[i + 1] === QUOTE) {
      i++;
      continue;
    }
    const before = i > 0 ? bytes[i - 1] : undefined;
    const after = bytes[i + 1];
    const opens = before === delimiter || before === LF || before === CR;
    const closes = after === delimiter || after === LF || after === CR;
    if (opens !== closes) {
      inside = closes;
      break;
    }
  }
  for (let i = 0; i < bytes.length; i++) {
    const byte = bytes[i];
    if (byte === QUOTE) inside = !inside;
    else if (byte === LF && !inside) return i + 1;
  }
  return -1;
}

export interface SegmentReader {
  /** The file byte of the segment's first record; -1 until its bytes were pushed. */
  readonly start: number;
  /** The next bytes of the file; returns false once the segment has stopped (push no more). */
  push(bytes: Uint8Array): boolean;
  /** `atEnd`: the bytes pushed reach the end of the file. */
  finish(atEnd: boolean): SegmentResult;
}

export function createSegmentReader(options: SegmentOptions): SegmentReader {
  const rows = RowCollector.withNames(options.names, {
    delimiter: options.delimiter,
    ...(options.dictionaryCap === undefined ? {} : { dictionaryCap: options.dictionaryCap }),
    ...(options.batchRows === undefined ? {} : { batchRows: options.batchRows, onBatch: options.onBatch }),
    ...(options.columnHints === undefined ? {} : { columnHints: options.columnHints }),
    ...(options.packValues === true ? { packValues: true } : {}),
  });
  const parser = new RecordParser(rows, { delimiter: options.delimiter, lineBreak: '\n' });
  const delimiterByte = options.delimiter.charCodeAt(0);
  let pushed = 0;
  let start = -1;
  let reserved = false;

  const read = <T>(step: () => T): T => {
    try {
      return step();
    } catch (error) {
      if (error instanceof InvalidUtf8Error) throw invalidUtf8(options.encodingGuessed, 'utf-8');
      throw error;
    }
  };

  return {
    get start() {
      return start;
    },
    push(bytes) {
      const at = pushed;
      pushed += bytes.length;
      if (start === -1) {
        // Before the segment's first record: skip to just after a line break, outside quotes if
        // the bytes tell; else through the first line break.
        let skip = options.afterRecord === true ? -1 : likelyRecordStart(bytes, delimiterByte);
        if (skip === -1) skip = bytes.indexOf(LF) + 1;
        if (skip === 0) return true;
        start = options.firstByte + at + skip;
        parser.stopAt(options.stopAt - start);
        bytes = bytes.subarray(skip);
      }
      read(() => parser.push(bytes));
      if (!reserved && options.totalBytes !== undefined && rows.totalRows >= ESTIMATE_AFTER_ROWS) {
        // As the table reader does: room for the rows the segment's size promises, made once.
        reserved = true;
        const bytesPerRow = (options.firstByte + pushed - parser.pendingBytes - start) / rows.totalRows;
        rows.reserve(Math.ceil((options.totalBytes / bytesPerRow) * ROW_ESTIMATE_MARGIN));
      }
      return parser.stoppedAt === null;
    },
    finish(atEnd) {
      const fileEnd = options.firstByte + pushed;
      if (start === -1) start = fileEnd; // no line break at all: the segment holds no record
      if (parser.stoppedAt === null && !atEnd) throw new Error('a segment was finished before it reached its stop or the end of the file');
      const table = read(() => {
        parser.finish();
        return rows.finish();
      });
      const stopped = parser.stoppedAt;
      return {
        table,
        start,
        end: stopped === null ? fileEnd : start + stopped,
        rows: rows.totalRows,
        lineBreaks: parser.lineBreaksRead,
        emptyLinesSkipped: rows.emptyLinesSkipped,
      };
    },
  };
}

/**
 * Numbers a segment's rows from the file's start: its row r becomes row `rowOffset + r`, its line
 * l becomes `lineOffset + l`. The table's `lineOfRow` is changed in place (it is the segment's
 * own), so a segment is rebased once: call this when it is placed, never again.
 */
export function rebaseRows(table: Table, rowOffset: number, lineOffset: number): Table {
  if (lineOffset !== 0) {
    const lines = table.lineOfRow;
    for (let r = 0; r < lines.length; r++) lines[r] = lines[r]! + lineOffset;
  }
  if (rowOffset === 0 && lineOffset === 0) return table;
  return {
    ...table,
    rowIssues: table.rowIssues.map((issue) => ({ ...issue, row: issue.row + rowOffset, line: issue.line + lineOffset })),
  };
}
