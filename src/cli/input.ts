/**
 * Where tables and recipes come from: a file path, or "-" for standard input. Text files are read
 * in chunks into core's table reader — whole (profile, draft) or batch by batch (apply, check), so
 * memory does not grow with the file. XLSX workbooks are read whole by read-excel-file, then go
 * through core's tableFromRows like the page's spreadsheets. A gzip-compressed file or input
 * (big exports often travel so) is decompressed as it is read, on this thread.
 */
import { createReadStream } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import { basename } from 'node:path';
import { pipeline, Readable } from 'node:stream';
import { createGunzip } from 'node:zlib';
import type { Table } from '../core/columns.ts';
import { decodeBytes, startsLikeGzip, type EncodingName } from '../core/decode.ts';
import { isNotUtf8Error, placeBadUtf8 } from '../core/bad-utf8.ts';
import { isLevelwiseError } from '../core/errors.ts';
import { createTableReader, tableFromRows, type Delimiter, type ReadResult } from '../core/read-table.ts';
import { profileTable, type ColumnProfile, type ProfileOptions } from '../core/profile.ts';
import { parseRecipe } from '../core/recipe-io.ts';
import type { Recipe } from '../core/recipe.ts';
import { spreadsheetCellText } from '../core/spreadsheet-cell.ts';
import { CliFailure, readingFailure } from './failure.ts';
import { canReadInThread, readBatchesInThread, readTableInThreads } from './read-thread.ts';
import { createFindingsLog, type ReadingFindings } from './reading-findings.ts';
import { recipeFailure } from './recipe-problems.ts';

export interface InputSource {
  /** The path as given, or "standard input". */
  readonly label: string;
  /** The file's name for a recipe's `source.file`; null for standard input. */
  readonly fileName: string | null;
  /** Whether the bytes can be read a second time (files can, standard input cannot). */
  readonly reopenable: boolean;
  /** Size in bytes when known, for progress. */
  readonly size: number | null;
  /** The file's path; null for standard input. */
  readonly path: string | null;
  chunks(): AsyncIterable<Uint8Array>;
}

const STDIN_LABEL = 'standard input';

/** How messages name an input given as `path` ("-": standard input). */
export function inputLabel(path: string): string {
  return path === '-' ? STDIN_LABEL : path;
}

/** A file path or "-"; fails at once (exit 2) when the file cannot be read. */
export async function inputSource(path: string): Promise<InputSource> {
  if (path === '-') {
    let used = false;
    return {
      label: STDIN_LABEL,
      fileName: null,
      reopenable: false,
      size: null,
      path: null,
      chunks() {
        if (used) throw new Error('standard input can be read only once');
        used = true;
        return process.stdin;
      },
    };
  }
  let size: number;
  try {
    const info = await stat(path);
    if (info.isDirectory()) throw new CliFailure(`"${path}" is a folder, not a file.`, 'Give the path of a CSV, TSV or XLSX file.');
    size = info.size;
  } catch (error) {
    throw readFailure(path, error);
  }
  const file: InputSource = {
    label: path,
    fileName: basename(path),
    reopenable: true,
    size,
    path,
    chunks: () => readChunks(path),
  };
  return (await fileStartsLikeGzip(path)) ? gunzipped(file) : file;
}

async function fileStartsLikeGzip(path: string): Promise<boolean> {
  try {
    const handle = await open(path, 'r');
    try {
      const { buffer, bytesRead } = await handle.read(Buffer.alloc(2), 0, 2, 0);
      return startsLikeGzip(buffer.subarray(0, bytesRead));
    } finally {
      await handle.close();
    }
  } catch (error) {
    throw readFailure(path, error);
  }
}

/**
 * `source` decompressed as it is read: every gzip member, one after the other (as `cat a.gz b.gz`
 * makes them). Its size is then unknown and it is read on this thread, from the start (no path for
 * the reading threads). `started`: the source's chunks, already begun, for the first read.
 */
function gunzipped(source: InputSource, started?: AsyncIterable<Uint8Array>): InputSource {
  let first = started;
  return {
    ...source,
    size: null,
    path: null,
    chunks() {
      const chunks = first ?? source.chunks();
      first = undefined;
      return gunzipChunks(chunks, source.label);
    },
  };
}

async function* gunzipChunks(chunks: AsyncIterable<Uint8Array>, label: string): AsyncGenerator<Uint8Array> {
  const gunzip = createGunzip();
  // pipeline ends both streams on an error in either (and when this generator is left early).
  pipeline(Readable.from(chunks), gunzip, () => undefined);
  try {
    for await (const chunk of gunzip) yield chunk as Buffer;
  } catch (error) {
    const code = (error as NodeJS.ErrnoException | null)?.code;
    if (typeof code !== 'string' || !code.startsWith('Z_')) throw error;
    throw new CliFailure(
      `"${label}" is gzip-compressed, but its compressed data is damaged or cut short (${(error as Error).message}).`,
      'Copy or download it again; "gzip -t FILE" tests a compressed file.',
    );
  } finally {
    gunzip.destroy();
  }
}

async function* readChunks(path: string): AsyncGenerator<Uint8Array> {
  try {
    for await (const chunk of createReadStream(path, { highWaterMark: 1 << 16 })) yield chunk as Buffer;
  } catch (error) {
    throw readFailure(path, error);
  }
}

function readFailure(path: string, error: unknown): unknown {
  if (error instanceof CliFailure) return error;
  const code = (error as NodeJS.ErrnoException | null)?.code;
  if (code === 'ENOENT') return new CliFailure(`cannot read "${path}": there is no such file.`, `Check the path (relative paths start at ${process.cwd()}).`);
  if (code === 'EACCES' || code === 'EPERM') return new CliFailure(`cannot read "${path}": permission denied.`, 'Check the file’s permissions.');
  if (code === 'EISDIR') return new CliFailure(`"${path}" is a folder, not a file.`, 'Give the path of a CSV, TSV or XLSX file.');
  return error;
}

/** The whole of a small input (a recipe) as text. */
async function readAllText(source: InputSource): Promise<string> {
  const parts: Uint8Array[] = [];
  for await (const chunk of source.chunks()) parts.push(chunk);
  return Buffer.concat(parts).toString('utf8');
}

/** A recipe file, validated; every problem is listed (see recipe-problems.ts). */
export async function readRecipe(path: string): Promise<Recipe> {
  const source = await inputSource(path);
  const parsed = parseRecipe(await readAllText(source));
  if (parsed.ok) return parsed.recipe;
  throw recipeFailure(source.label, parsed.errors, parsed.unlisted);
}

// ---------------------------------------------------------------------------------------------------

export interface ReadSettings {
  readonly delimiter: Delimiter | null;
  /** null: chosen from the bytes (and read again as Windows-1252 when UTF-8 turns out wrong). */
  readonly encoding: EncodingName | null;
  /** For workbooks: the sheet to read (default the first). */
  readonly sheet: string | null;
}

/** What was read, besides the rows. */
export interface ReadSummary {
  readonly names: readonly string[];
  readonly rows: number;
  readonly encoding: EncodingName | 'xlsx';
  readonly delimiter: Delimiter | null;
  readonly sheet: string | null;
  /** Renamed columns, rows with the wrong number of fields, a quote never closed. */
  readonly findings: ReadingFindings;
}

/** The start of every ZIP container, XLSX included ("PK\3\4"). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];

/** The whole table in memory (profile, draft). */
export async function readWholeTable(
  source: InputSource,
  settings: ReadSettings,
  profiling: ProfileOptions,
): Promise<{ table: Table; summary: ReadSummary; profiles: ColumnProfile[] }> {
  let table: Table | null = null;
  let profiles: ColumnProfile[] | null = null;
  const summary = await readBatches(source, settings, null, {
    onBatch(batch) {
      table = batch;
    },
    async afterChunk() {},
    async restart() {
      return true;
    },
    profiling: {
      options: profiling,
      take(made) {
        profiles = made;
      },
    },
  });
  if (table === null) throw new Error('the reader handed over no table');
  // Read on threads, the table was profiled there (its number columns on the reading threads).
  return { table, summary, profiles: profiles ?? profileTable(table, profiling) };
}

export interface BatchHandlers {
  /** Rows [start, end) of `table` are ready, in order; row 0 of `table` is row `firstRow` of the file. */
  onBatch(table: Table, start: number, end: number, firstRow: number): void;
  /** After each chunk of input: wait for the output to drain, show progress. */
  afterChunk(bytesRead: number, rowsRead: number): Promise<void>;
  /**
   * Non-UTF-8 bytes turned up after the start: may everything be read again as Windows-1252 from
   * row 0? Return false when what was written cannot be taken back (standard output).
   */
  restart(): Promise<boolean>;
  /** A whole table read on threads is profiled with `options` before the threads go, and its profiles handed to `take`. */
  readonly profiling?: { readonly options: ProfileOptions; take(profiles: ColumnProfile[]): void };
}

/**
 * Reads `source` and hands its rows over in batches of `batchRows` (null: one batch with every row).
 * Workbooks are read whole, then handed over in the same batches.
 */
export async function readBatches(
  source: InputSource,
  settings: ReadSettings,
  batchRows: number | null,
  handlers: BatchHandlers,
): Promise<ReadSummary> {
  try {
    return await readBatchesOnce(source, settings, batchRows, handlers);
  } catch (error) {
    throw isLevelwiseError(error) ? readingFailure(source.label, error) : error;
  }
}

async function readBatchesOnce(
  source: InputSource,
  settings: ReadSettings,
  batchRows: number | null,
  handlers: BatchHandlers,
): Promise<ReadSummary> {
  const chunks = withFirstChunk(source.chunks());
  const first = await chunks.first();
  // Standard input (a file is found out sooner, by inputSource).
  if (first !== null && startsLikeGzip(first)) return readBatchesOnce(gunzipped(source, chunks), settings, batchRows, handlers);
  if (first !== null && ZIP_MAGIC.every((b, i) => first[i] === b)) return readWorkbook(source, chunks, settings, batchRows, handlers);
  // A file is read on other threads, which read it from its path (read-thread.ts).
  const threadPath = source.path !== null && canReadInThread() ? source.path : null;
  if (threadPath !== null) await chunks.close();
  const read = (encoding: EncodingName | null): Promise<ReadSummary> => {
    if (threadPath === null) {
      return readText(encoding === settings.encoding ? chunks : withFirstChunk(source.chunks()), settings.delimiter, encoding, batchRows, handlers, source.size);
    }
    return batchRows === null
      ? readWholeInThreads(threadPath, settings.delimiter, encoding, handlers)
      : readTextInThread(threadPath, settings.delimiter, encoding, batchRows, handlers);
  };
  try {
    return await read(settings.encoding);
  } catch (error) {
    if (!isLevelwiseError(error, 'encoding-restart')) {
      if (source.reopenable) throw await placeBadUtf8(error, () => source.chunks());
      if (isNotUtf8Error(error)) {
        // Finding the place takes a second pass, which standard input cannot give.
        throw new CliFailure(
          `"${source.label}" is not valid UTF-8: it holds bytes that are not UTF-8, and cannot be read a second time to find where.`,
          'Save it to a file and run again on that to see the line; or run again with --encoding windows-1252 if an older office program saved it.',
        );
      }
      throw error;
    }
    if (!source.reopenable || !(await handlers.restart())) {
      throw new CliFailure(
        `"${source.label}" started as UTF-8 text but holds other bytes further down, and cannot be read again from the start.`,
        'Run again with --encoding windows-1252, or save the file as UTF-8.',
      );
    }
    return read('windows-1252');
  }
}

/** Hands each batch to the handlers, noting what reading found in it, and counts the rows handed. */
function batchTaker(handlers: BatchHandlers) {
  const log = createFindingsLog();
  let rows = 0;
  return {
    log,
    get rows(): number {
      return rows;
    },
    take(batch: Table, firstRow: number): void {
      log.add(batch.rowIssues, batch.headerIssues);
      handlers.onBatch(batch, 0, batch.rowCount, firstRow);
      rows += batch.rowCount;
    },
  };
}

/** As readText, with the reading on a second thread (read-thread.ts). */
async function readTextInThread(
  path: string,
  delimiter: Delimiter | null,
  encoding: EncodingName | null,
  batchRows: number,
  handlers: BatchHandlers,
): Promise<ReadSummary> {
  const taker = batchTaker(handlers);
  const result = await readBatchesInThread(path, { delimiter, encoding, batchRows }, async (batch, firstRow, bytesRead) => {
    taker.take(batch, firstRow);
    await handlers.afterChunk(bytesRead, taker.rows);
  });
  return { names: result.names, rows: result.totalRows, encoding: result.encoding, delimiter: result.delimiter, sheet: null, findings: taker.log.findings() };
}

/** As readText with every row in one table, read on several threads (read-thread.ts). */
async function readWholeInThreads(path: string, delimiter: Delimiter | null, encoding: EncodingName | null, handlers: BatchHandlers): Promise<ReadSummary> {
  const taker = batchTaker(handlers);
  const result = await readTableInThreads(path, { delimiter, encoding }, (bytes) => void handlers.afterChunk(bytes, 0), handlers.profiling?.options ?? null);
  taker.take(result.table, 0);
  if (result.profiles !== null) handlers.profiling?.take(result.profiles);
  return { names: result.table.names, rows: result.totalRows, encoding: result.encoding, delimiter: result.delimiter, sheet: null, findings: taker.log.findings() };
}

/** `size`: the source's bytes when known, so that a whole table's storage is made once (ReadOptions.totalBytes). */
async function readText(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: Delimiter | null,
  encoding: EncodingName | null,
  batchRows: number | null,
  handlers: BatchHandlers,
  size: number | null,
): Promise<ReadSummary> {
  const taker = batchTaker(handlers);
  const reader = createTableReader({
    delimiter,
    encoding,
    ...(size === null ? {} : { totalBytes: size }),
    ...(batchRows === null ? {} : { batchRows, onBatch: (batch: Table, firstRow: number) => taker.take(batch, firstRow) }),
  });
  for await (const chunk of chunks) {
    reader.push(chunk);
    await handlers.afterChunk(reader.bytesRead, taker.rows);
  }
  const result: ReadResult = reader.finish();
  if (batchRows === null) taker.take(result.table, 0);
  return {
    names: result.table.names,
    rows: result.totalRows,
    encoding: result.encoding,
    delimiter: result.delimiter,
    sheet: null,
    findings: taker.log.findings(),
  };
}

async function readWorkbook(
  source: InputSource,
  chunks: AsyncIterable<Uint8Array>,
  settings: ReadSettings,
  batchRows: number | null,
  handlers: BatchHandlers,
): Promise<ReadSummary> {
  const parts: Uint8Array[] = [];
  for await (const chunk of chunks) parts.push(chunk);
  const bytes = Buffer.concat(parts);
  // Loaded only for a workbook: most runs read text, and loading it costs every run ~80 ms.
  const { default: readXlsxFile } = await import('read-excel-file/node');
  let sheets: Awaited<ReturnType<typeof readXlsxFile>>;
  try {
    sheets = await readXlsxFile(bytes, { trim: false });
  } catch (error) {
    throw notAWorkbook(source.label, bytes, error);
  }
  const names = sheets.map((s) => s.sheet);
  const chosen = settings.sheet === null ? sheets[0] : sheets.find((s) => s.sheet === settings.sheet);
  if (chosen === undefined) {
    throw new CliFailure(
      settings.sheet === null ? `"${source.label}" holds no sheets.` : `"${source.label}" has no sheet named "${settings.sheet}".`,
      names.length > 0 ? `Choose one with --sheet: ${names.join(', ')}.` : 'Choose a workbook with at least one sheet.',
    );
  }
  const { table } = tableFromRows(chosen.data.map((row) => row.map(spreadsheetCellText)));
  const log = createFindingsLog();
  log.add(table.rowIssues, table.headerIssues);
  const step = batchRows ?? Math.max(1, table.rowCount);
  for (let start = 0; start < table.rowCount || start === 0; start += step) {
    handlers.onBatch(table, start, Math.min(table.rowCount, start + step), 0);
    await handlers.afterChunk(0, Math.min(table.rowCount, start + step));
    if (table.rowCount === 0) break;
  }
  return { names: table.names, rows: table.rowCount, encoding: 'xlsx', delimiter: null, sheet: chosen.sheet, findings: log.findings() };
}

/**
 * A ZIP container that is no workbook the reader can open: said as core says it of any file that
 * is not text ("it looks like a ZIP archive"), with why it is not a workbook either.
 */
function notAWorkbook(label: string, bytes: Uint8Array, error: unknown): CliFailure {
  const why = error instanceof Error ? error.message.replace(/\.$/, '') : String(error);
  let what = 'This is not a text table: it looks like a ZIP archive.';
  try {
    decodeBytes(bytes.subarray(0, 64));
  } catch (notText) {
    if (isLevelwiseError(notText, 'not-text')) what = notText.message;
  }
  const message = what.charAt(0).toLowerCase() + what.slice(1).replace(/\.$/, '');
  return new CliFailure(
    `cannot read "${label}": ${message}, and not a workbook that can be opened (${why}).`,
    'If it is an archive, unpack it and give the CSV inside; if it is a workbook, open it in its spreadsheet program and save it again as .xlsx.',
  );
}

/** An async iterable that can show its first chunk before being iterated (to spot a workbook). */
function withFirstChunk(source: AsyncIterable<Uint8Array>): AsyncIterable<Uint8Array> & { first(): Promise<Uint8Array | null>; close(): Promise<void> } {
  const iterator = source[Symbol.asyncIterator]();
  let head: IteratorResult<Uint8Array> | null = null;
  return {
    /** Stops reading (closes the file) when the rest will not be iterated. */
    async close() {
      await iterator.return?.();
    },
    async first() {
      head ??= await iterator.next();
      return head.done ? null : head.value;
    },
    async *[Symbol.asyncIterator]() {
      head ??= await iterator.next();
      if (head.done) return;
      yield head.value;
      for (;;) {
        const next = await iterator.next();
        if (next.done) return;
        yield next.value;
      }
    },
  };
}
