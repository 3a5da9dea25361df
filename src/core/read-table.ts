/**
 * Reading a delimited text file into a Table: bytes → UTF-8 bytes (decode.ts) → records (parse.ts)
 * → columns (columns-builder.ts). The first non-empty record is the header.
 *
 * - `readTable`: a whole buffer at once.
 * - `createTableReader`: chunk by chunk, for files read in slices or streams; with `batchRows` it
 *   hands over consecutive Tables instead of keeping every row, so memory stays flat.
 * - `readTableFromSource`: a re-readable source of chunks, read again as Windows-1252 if needed.
 * - `tableFromRows`: rows already split into cells (a spreadsheet sheet read elsewhere).
 */
import type { HeaderIssue, Table } from './columns.ts';
import { TableBuilder } from './columns-builder.ts';
import { retryAsWindows1252, Utf8Chunks, type EncodingName } from './decode.ts';
import { LevelwiseError, isLevelwiseError } from './errors.ts';
import { InvalidUtf8Error } from './utf8-text.ts';
import { placeBadUtf8In } from './bad-utf8.ts';
import { plainFields, RecordParser, uniqueColumnNames, type Delimiter, type LineBreak, type PlainRecords, type RecordSink } from './parse.ts';

export type { Delimiter } from './parse.ts';
export type { EncodingName } from './decode.ts';

export interface ReadOptions {
  /** null or absent: chosen from the start of the file among comma, tab, semicolon and pipe. */
  readonly delimiter?: Delimiter | null;
  /** null or absent: chosen from the byte order mark or the bytes themselves. */
  readonly encoding?: EncodingName | null;
  /** Distinct values a column keeps as a dictionary before plain numbers move to number storage. */
  readonly dictionaryCap?: number;
  /** Hand over the rows as Tables of at most this many rows through `onBatch`, keeping none. */
  readonly batchRows?: number;
  /** Receives each batch; `firstRowIndex` is the absolute index of its first row. */
  readonly onBatch?: (batch: Table, firstRowIndex: number) => void;
  /**
   * The source's size in bytes, when known (a File, a file on disk). The table's storage is then
   * made once for the rows the size promises, instead of growing by doubling: growing copies
   * every column and leaves the old arrays as garbage, which doubled the memory held while a
   * big file was read.
   */
  readonly totalBytes?: number;
  /**
   * Stop at the first data record that starts at or after this byte of the source, so that the
   * rest can be read in segments elsewhere (read-segment.ts); `ReadResult.stoppedAt` says where
   * reading stopped. Honoured only where segments can be found by their line breaks (a UTF-8
   * source with LF line breaks and at least two columns; other sources are read to the end), and
   * only once the header is read: the first chunk parsed (at least 64 kB) is read whole, so the
   * reader may stop further on than asked. `segmenting` says when the stop is certain.
   */
  readonly stopAt?: number;
  /**
   * What the columns were like in rows read before (ReadResult.columnHints, from another segment
   * of the same file): the first batch, or the table, starts sized and stored like them.
   */
  readonly columnHints?: ColumnHints;
  /**
   * Keep identifier-like columns' values as bytes, made into strings only when read
   * (ColumnBuilder.build): for tables that cross to another thread, are joined with other
   * segments (concat-tables.ts) or profiled (profile.ts), none of which then makes a string per value.
   */
  readonly packValues?: boolean;
}

/** Per column, its distinct values in a batch and whether it ended in number storage. */
export interface ColumnHints {
  readonly distinct: readonly number[];
  readonly numbers: readonly boolean[];
}

export interface ReadResult {
  /** The whole table; in batch mode the header only (0 rows), the rows having gone to `onBatch`. */
  readonly table: Table;
  readonly encoding: EncodingName;
  readonly delimiter: Delimiter;
  readonly emptyLinesSkipped: number;
  /** Bytes read. */
  readonly bytes: number;
  /** Data rows read, in batch mode too. */
  readonly totalRows: number;
  /** The source byte where reading stopped for `stopAt` (the first record not read); null when read to the end. */
  readonly stoppedAt: number | null;
  /** Line breaks read, those inside quoted fields included: the next record starts on line `lineBreaks + 1`. */
  readonly lineBreaks: number;
  readonly lineBreak: LineBreak;
  /** Whether the encoding was guessed from the bytes (see decode.ts): bad bytes later on mean a restart. */
  readonly encodingGuessed: boolean;
  /** In batch mode, what the columns of the last full batch were like; null otherwise. */
  readonly columnHints: ColumnHints | null;
}

export interface TableReader {
  /**
   * Reads the next chunk. Throws a LevelwiseError: 'not-text' (binary file), 'encoding-restart'
   * (read the source again with `encoding: 'windows-1252'`), 'bad-encoding'.
   */
  push(bytes: Uint8Array): void;
  /** Reads what is left and returns the result; throws a LevelwiseError ('empty-file' and those of push). */
  finish(): ReadResult;
  /** Bytes pushed so far, for progress. */
  readonly bytesRead: number;
  /** Where reading stopped for `stopAt` (push no more then); null while it reads on. */
  readonly stoppedAt: number | null;
  /** See StreamingTableReader.segmenting. */
  readonly segmenting: SegmentingInfo | null;
  /**
   * Stops at the first record that starts at or after `at` instead of `stopAt`: for a thread that
   * hands the rest of its segment to an idle one (parallel-read.ts). Only once `segmenting` is
   * known, and only for a byte not pushed yet; false, changing nothing, otherwise.
   */
  stopEarlier(at: number): boolean;
}

/** What a reader of a later segment of the same file needs to know (read-segment.ts). */
export interface SegmentingInfo {
  readonly names: readonly string[];
  readonly delimiter: Delimiter;
  readonly encodingGuessed: boolean;
}

/** Slices handed to the reader by `readTable`, so no single string holds the whole file. */
const SLICE_BYTES = 1 << 20;
/** Rows read before the rows of the whole source are estimated from its size. */
export const ESTIMATE_AFTER_ROWS = 1000;
/** Room made for this much more than the estimate (rows vary in length). */
export const ROW_ESTIMATE_MARGIN = 1.05;

export function readTable(bytes: Uint8Array, options: ReadOptions = {}): ReadResult {
  try {
    return readSlices(bytes, options);
  } catch (error) {
    if (!isLevelwiseError(error, 'encoding-restart')) throw placeBadUtf8In(error, bytes);
    return readSlices(bytes, { ...options, encoding: 'windows-1252' });
  }
}

function readSlices(bytes: Uint8Array, options: ReadOptions): ReadResult {
  const reader = createTableReader({ totalBytes: bytes.length, ...options });
  for (let at = 0; at < bytes.length; at += SLICE_BYTES) reader.push(bytes.subarray(at, at + SLICE_BYTES));
  return reader.finish();
}

/**
 * Reads a source that can be opened more than once (a File's stream, a file path), starting over
 * as Windows-1252 if non-UTF-8 bytes show up late. In batch mode, a restart begins the batches
 * again at row 0.
 */
export function readTableFromSource(open: () => AsyncIterable<Uint8Array>, options: ReadOptions = {}): Promise<ReadResult> {
  return retryAsWindows1252(
    open,
    async (chunks, encoding) => {
      const reader = createTableReader({ ...options, encoding });
      for await (const chunk of chunks) reader.push(chunk);
      return reader.finish();
    },
    options.encoding ?? null,
  );
}

export function createTableReader(options: ReadOptions = {}): TableReader {
  return new StreamingTableReader(options);
}

class StreamingTableReader implements TableReader {
  private readonly source: Utf8Chunks;
  private readonly parser: RecordParser;
  private readonly rows: RowCollector;
  private readonly totalBytes: number | null;
  private reserved = false;
  private bytes = 0;
  private stopAt: number | null;
  private stopArmed = false;
  /** The parser was told where to stop (see `segmenting`). */
  private stopping = false;

  constructor(options: ReadOptions) {
    this.totalBytes = options.totalBytes ?? null;
    this.stopAt = options.stopAt ?? null;
    this.source = new Utf8Chunks(options.encoding ?? null);
    this.rows = new RowCollector(options);
    this.parser = new RecordParser(this.rows, options);
  }

  get bytesRead(): number {
    return this.bytes;
  }

  push(bytes: Uint8Array): void {
    this.bytes += bytes.length;
    this.read(() => {
      const utf8 = this.source.next(bytes);
      if (this.stopAt !== null && !this.stopArmed) this.armStop(this.stopAt);
      this.parser.push(utf8);
      // As soon as the header is known, so that `segmenting` tells the caller at once.
      if (this.stopAt !== null && !this.stopArmed) this.armStop(this.stopAt);
    });
    if (!this.reserved) this.reserveRows();
  }

  /** Where reading stopped for `stopAt` (a source byte), or null. */
  get stoppedAt(): number | null {
    const at = this.parser.stoppedAt;
    return at === null ? null : at + this.source.skippedBytes;
  }

  /**
   * Once the reader stops at `stopAt` for sure (the source is one that segments can split): what
   * the readers of the other segments need to know; null before, and for sources read to the end.
   */
  get segmenting(): SegmentingInfo | null {
    const names = this.rows.columnNames;
    if (!this.stopping || names === null) return null;
    return { names, delimiter: this.parser.delimiter ?? ',', encodingGuessed: this.source.encodingGuessed };
  }

  stopEarlier(at: number): boolean {
    if (!this.stopping || this.stopAt === null || at >= this.stopAt || at <= this.bytes) return false;
    this.stopAt = at;
    this.parser.stopAt(at - this.source.skippedBytes);
    return true;
  }

  /** Passes `stopAt` on to the parser once the source is known to be one that segments can split. */
  private armStop(stopAt: number): void {
    const names = this.rows.columnNames;
    if (names === null || this.parser.lineBreakInUse === null) return;
    this.stopArmed = true;
    if (this.source.encoding === 'utf-8' && this.parser.lineBreakInUse === '\n' && names.length >= 2) {
      this.parser.stopAt(stopAt - this.source.skippedBytes);
      this.stopping = true;
    }
  }

  /**
   * Once the first rows are read, makes room for the rows the whole source should hold: its size
   * over the bytes per row so far, with a margin. A wrong guess costs little: too low, storage
   * grows as before; too high, by the margin's share of unused room.
   */
  private reserveRows(): void {
    const rows = this.rows.totalRows;
    if (this.totalBytes === null || rows < ESTIMATE_AFTER_ROWS) return;
    this.reserved = true;
    const bytesPerRow = (this.bytes - this.parser.pendingBytes) / rows;
    // Also when stopping at `stopAt`: the other segments' rows are joined into this storage (concat-tables.ts, reuseFirst).
    this.rows.reserve(Math.ceil((this.totalBytes / bytesPerRow) * ROW_ESTIMATE_MARGIN));
  }

  finish(): ReadResult {
    if (this.bytes === 0) throw emptyFileError('The file is empty (0 bytes).');
    let table: Table | null = null;
    this.read(() => {
      this.parser.push(this.source.finish());
      this.parser.finish();
      // Building the columns decodes their values, checking the last of the bytes.
      table = this.rows.finish();
    });
    if (table === null) throw new Error('the table was not built');
    return {
      table,
      encoding: this.source.encoding ?? 'utf-8',
      delimiter: this.parser.delimiter ?? ',',
      emptyLinesSkipped: this.rows.emptyLinesSkipped,
      bytes: this.bytes,
      totalRows: this.rows.totalRows,
      stoppedAt: this.stoppedAt,
      lineBreaks: this.parser.lineBreaksRead,
      lineBreak: this.parser.lineBreakInUse ?? '\n',
      encodingGuessed: this.source.encodingGuessed,
      columnHints: this.rows.columnHints,
    };
  }

  /** Runs a step of reading; bytes that are not UTF-8 become the error the source's encoding calls for. */
  private read(step: () => void): void {
    try {
      step();
    } catch (error) {
      if (error instanceof InvalidUtf8Error) throw this.source.invalidUtf8Error();
      throw error;
    }
  }
}

/** A one-field record holding an empty cell; shared, as records are only read during a call. */
const EMPTY_CELL: readonly string[] = [''];

/**
 * Takes records after the header; keeps them all, or hands them on in batches. Empty lines are
 * skipped and counted, except inside a one-column table: there an empty line is how an empty cell
 * is written (spreadsheet programs save one-column sheets that way), so it becomes a row unless
 * only empty lines follow it up to the end of the file.
 */
export class RowCollector implements RecordSink {
  private readonly options: ReadOptions;
  private readonly batchRows: number;
  private names: readonly string[] | null = null;
  private headerIssues: readonly HeaderIssue[] = [];
  private builder: TableBuilder | null = null;
  private batchStart = 0;
  private skipped = 0;
  /** Lines of empty lines in a one-column table, waiting to see whether a record follows. */
  private blankLines: number[] = [];
  private hints: ColumnHints | null = null;

  constructor(options: ReadOptions) {
    this.options = options;
    this.batchRows = options.batchRows ?? Infinity;
    if (options.batchRows !== undefined && !(options.batchRows >= 1 && options.onBatch !== undefined)) {
      throw new Error('batchRows needs to be at least 1 and to come with onBatch');
    }
  }

  /** Columns named by a header read elsewhere: every record is a data row (a segment of a file). */
  static withNames(names: readonly string[], options: ReadOptions): RowCollector {
    const collector = new RowCollector(options);
    collector.names = names;
    collector.builder = collector.newBuilder();
    return collector;
  }

  /** The column names, once the header is read. */
  get columnNames(): readonly string[] | null {
    return this.names;
  }

  get totalRows(): number {
    return this.batchStart + (this.builder?.rowCount ?? 0);
  }

  get emptyLinesSkipped(): number {
    return this.skipped + this.blankLines.length;
  }

  record(fields: readonly string[], line: number, unclosedQuote: boolean): void {
    if (this.builder === null) {
      this.startTable(fields);
      return;
    }
    if (this.blankLines.length > 0) this.addBlankLines();
    this.addRow(fields, line, unclosedQuote);
  }

  /** The fast path for records without quoted fields: blocks of cells as positions in the text. */
  plainRecords(records: PlainRecords): void {
    let r = 0;
    if (this.builder === null) this.startTable(plainFields(records, r++));
    while (r < records.count) {
      if (this.blankLines.length > 0) this.addBlankLines();
      const builder = this.builder!; // after the blank lines, which may have started a new batch
      const to = Math.min(records.count, r + (this.batchRows - builder.rowCount));
      builder.addPlainRecords(records, r, to);
      r = to;
      if (builder.rowCount >= this.batchRows) this.handOver();
    }
  }

  /** Room for `rows` rows in all, when the rows are kept in one table (not in batch mode). */
  reserve(rows: number): void {
    if (this.batchRows === Infinity) this.builder?.reserve(rows);
  }

  emptyLine(line: number): void {
    if (this.names?.length === 1) this.blankLines.push(line);
    else this.skipped++;
  }

  /**
   * The table; in batch mode, after handing over the last rows (or an empty first batch for a
   * header-only file), the header alone.
   */
  finish(): Table {
    if (this.builder === null) throw emptyFileError('The file has no header row: it holds only empty lines.');
    if (this.batchRows === Infinity) return this.builder.build(this.options.packValues);
    if (this.builder.rowCount > 0 || this.batchStart === 0) this.handOver();
    return new TableBuilder(this.names ?? [], { firstRowIndex: this.batchStart, headerIssues: this.headerIssues }).build();
  }

  /** Empty lines of a one-column table followed by a record: empty cells after all. */
  private addBlankLines(): void {
    const lines = this.blankLines;
    this.blankLines = [];
    for (const blankLine of lines) this.addRow(EMPTY_CELL, blankLine, false);
  }

  private addRow(fields: readonly string[], line: number, unclosedQuote: boolean): void {
    const builder = this.builder!;
    builder.addRow(fields, line, unclosedQuote);
    if (builder.rowCount >= this.batchRows) this.handOver();
  }

  private startTable(header: readonly string[]): void {
    const { names, issues } = uniqueColumnNames(header);
    this.names = names;
    this.headerIssues = issues;
    this.builder = this.newBuilder();
  }

  /** In batch mode, what the columns of the last full batch were like. */
  get columnHints(): ColumnHints | null {
    return this.hints;
  }

  private handOver(): void {
    const builder = this.builder!;
    if (builder.rowCount >= this.batchRows || this.hints === null) this.hints = { distinct: builder.distinct, numbers: builder.numberColumns };
    const batch = builder.build(this.options.packValues);
    this.options.onBatch?.(batch, this.batchStart);
    this.batchStart += batch.rowCount;
    this.builder = this.newBuilder();
  }

  /** A batch is sized like the one before it (its dictionaries, its rows), or like the hints given. */
  private expectedBatch(previous: TableBuilder | null): { expected?: { rows: number; distinct: readonly number[]; numbers: readonly boolean[] } } {
    const rows = this.batchRows === Infinity ? 0 : this.batchRows; // a whole table reserves its rows later
    if (previous !== null && this.batchRows !== Infinity) return { expected: { rows, distinct: previous.distinct, numbers: previous.numberColumns } };
    const hints = this.options.columnHints;
    return hints === undefined || previous !== null ? {} : { expected: { rows, ...hints } };
  }

  /** Header issues go with the first table only. */
  private newBuilder(): TableBuilder {
    const previous = this.builder;
    return new TableBuilder(this.names ?? [], {
      dictionaryCap: this.options.dictionaryCap,
      firstRowIndex: this.batchStart,
      headerIssues: this.batchStart === 0 && previous === null ? this.headerIssues : [],
      ...this.expectedBatch(previous),
    });
  }
}

function emptyFileError(message: string): LevelwiseError {
  return new LevelwiseError('empty-file', message, { hint: 'Choose a file with a header row and data rows.' });
}

/**
 * Rows already split into cells, the first being the header. A row with no cells at all is an
 * empty line (see RowCollector); a row of empty cells is a record of missing values. Line numbers
 * are positions in `rows` counted from 1 (the sheet's row numbers when `rows` starts at the sheet's
 * first row). `encoding` and `delimiter` are reported as 'utf-8' and ','.
 */
export function tableFromRows(rows: readonly (readonly string[])[], options: Pick<ReadOptions, 'dictionaryCap'> = {}): ReadResult {
  const collector = new RowCollector(options);
  rows.forEach((row, index) => {
    if (row.length === 0) collector.emptyLine(index + 1);
    else collector.record(row, index + 1, false);
  });
  const table = collector.finish();
  return {
    table,
    encoding: 'utf-8',
    delimiter: ',',
    emptyLinesSkipped: collector.emptyLinesSkipped,
    bytes: 0,
    totalRows: table.rowCount,
    stoppedAt: null,
    lineBreaks: rows.length,
    lineBreak: '\n',
    encodingGuessed: false,
    columnHints: null,
  };
}
