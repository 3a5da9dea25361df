/**
 * The measured paths, as plain functions: the benchmark's child processes time them, and
 * test/bench checks that they do the same work as the core's own whole-table functions.
 */
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import Papa from 'papaparse';
import {
  compilePlan,
  createApplyReport,
  createCsvWriter,
  createTableReader,
  draftRecipe,
  encodeBatch,
  profileTable,
  type ApplyReport,
  type Recipe,
  type Table,
} from '../../src/core/index.ts';

/** The slice size the page's worker hands the reader (a File stream's chunks are of this order). */
export const CHUNK_BYTES = 1 << 20;
/** Rows per batch on the command line's streamed path. */
export const APPLY_BATCH_ROWS = 65_536;

/**
 * papaparse alone: records counted, nothing kept, no typing, no header objects. `dataRows` leaves
 * out the header and the empty record papaparse reports after a final line break.
 */
export function parseWithPapa(text: string): { records: number; dataRows: number } {
  let records = 0;
  Papa.parse<string[]>(text, {
    step: () => {
      records++;
    },
  });
  const trailingEmpty = text.endsWith('\n') || text.endsWith('\r') ? 1 : 0;
  return { records, dataRows: Math.max(0, records - 1 - trailingEmpty) };
}

export interface ProfileRun {
  readonly rows: number;
  readonly columns: number;
  /** Seconds in each phase: bytes → table, table → profiles, profiles → draft recipe. */
  readonly phases: { readonly read: number; readonly profile: number; readonly draft: number };
  readonly recipe: Recipe;
}

/** The page's worker path: 1 MB slices of bytes → table → profiles → draft recipe. */
export function profilePath(bytes: Uint8Array, file: string): ProfileRun {
  const t0 = performance.now();
  const reader = createTableReader({ totalBytes: bytes.length, packValues: true });
  for (let at = 0; at < bytes.length; at += CHUNK_BYTES) reader.push(bytes.subarray(at, at + CHUNK_BYTES));
  const { table, delimiter } = reader.finish();
  const t1 = performance.now();
  const profiles = profileTable(table);
  const t2 = performance.now();
  const recipe = draftRecipe(profiles, { file, rows: table.rowCount }, { delimiter });
  const t3 = performance.now();
  return {
    rows: table.rowCount,
    columns: table.columns.length,
    phases: { read: (t1 - t0) / 1000, profile: (t2 - t1) / 1000, draft: (t3 - t2) / 1000 },
    recipe,
  };
}

/** Calls `visit` with consecutive slices of the file, read into one reused buffer. */
export function forEachChunkOfFile(path: string, chunkBytes: number, visit: (chunk: Uint8Array) => void): number {
  const buffer = new Uint8Array(chunkBytes);
  const fd = openSync(path, 'r');
  let total = 0;
  try {
    for (let read = readSync(fd, buffer, 0, chunkBytes, null); read > 0; read = readSync(fd, buffer, 0, chunkBytes, null)) {
      total += read;
      visit(buffer.subarray(0, read));
    }
  } finally {
    closeSync(fd);
  }
  return total;
}

export interface ApplyRun {
  readonly rows: number;
  readonly bytesRead: number;
  readonly bytesWritten: number;
  readonly report: ApplyReport;
}

/**
 * The command line's streamed path, in process: file slices → batches of rows → encoded batch →
 * CSV bytes to `sink`, with the re-use report. No batch outlives its turn, so memory stays flat.
 */
export function applyFromFile(path: string, recipe: Recipe, sink: (bytes: Uint8Array) => void, batchRows = APPLY_BATCH_ROWS): ApplyRun {
  let session: ReturnType<typeof startWriting> | null = null;
  const reader = createTableReader({
    batchRows,
    onBatch: (batch) => {
      session ??= startWriting(recipe, batch, sink);
      session.writer.writeBatch(encodeBatch(session.plan, batch, 0, batch.rowCount, session.report));
    },
  });
  const bytesRead = forEachChunkOfFile(path, CHUNK_BYTES, (chunk) => reader.push(chunk));
  const { totalRows } = reader.finish();
  // finish() always hands over at least one batch, so the session exists by now.
  const done = session as ReturnType<typeof startWriting> | null;
  if (done === null) throw new Error(`${path}: the reader handed over no batch`);
  done.writer.finish();
  return { rows: totalRows, bytesRead, bytesWritten: done.writer.bytesWritten, report: done.report.finish() };
}

function startWriting(recipe: Recipe, first: Table, sink: (bytes: Uint8Array) => void) {
  const plan = compilePlan(recipe, first.names);
  const writer = createCsvWriter(plan, sink);
  writer.writeHeader();
  return { plan, writer, report: createApplyReport(plan) };
}

/** Reads the whole file into a table the way the page's worker does, from slices on disk. */
export function readTableFromFile(path: string): Table {
  // Identifiers kept as bytes, as the page keeps them in the files it reads in segments (from 16 MB).
  const reader = createTableReader({ totalBytes: statSync(path).size, packValues: true });
  forEachChunkOfFile(path, CHUNK_BYTES, (chunk) => reader.push(chunk));
  return reader.finish().table;
}
