/**
 * The whole path for a table already in memory: plan, encode in batches, write CSV, report.
 * The page's download and the tests use it; the command line streams the same functions batch by batch.
 */
import { createApplyReport, type ApplyReport } from './apply-report.ts';
import { encodeBatch } from './apply.ts';
import type { Table } from './columns.ts';
import { createCsvWriter } from './csv-write.ts';
import { compilePlan } from './plan.ts';
import type { Recipe } from './recipe.ts';

export const ENCODE_BATCH_ROWS = 65_536;

export interface EncodeOptions {
  /** Receives the CSV in parts; each part must be consumed or copied before returning. */
  readonly sink: (bytes: Uint8Array) => void;
  readonly batchRows?: number;
  /** Called after each batch with rows done so far; return false to stop early (cancel). */
  readonly onProgress?: (rowsDone: number, rowsTotal: number) => boolean | void;
}

export function encodeTable(recipe: Recipe, table: Table, options: EncodeOptions): ApplyReport {
  const plan = compilePlan(recipe, table.names);
  const report = createApplyReport(plan);
  const writer = createCsvWriter(plan, options.sink);
  const batchRows = options.batchRows ?? ENCODE_BATCH_ROWS;
  writer.writeHeader();
  for (let start = 0; start < table.rowCount; start += batchRows) {
    const end = Math.min(table.rowCount, start + batchRows);
    writer.writeBatch(encodeBatch(plan, table, start, end, report));
    if (options.onProgress?.(end, table.rowCount) === false) break;
  }
  writer.finish();
  return report.finish();
}

/** Convenience for small tables and tests: the CSV as one byte array. */
export function encodeToCsv(recipe: Recipe, table: Table): { bytes: Uint8Array; report: ApplyReport } {
  const parts: Uint8Array[] = [];
  const report = encodeTable(recipe, table, { sink: (part) => parts.push(part.slice()) });
  const bytes = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let offset = 0;
  for (const part of parts) {
    bytes.set(part, offset);
    offset += part.length;
  }
  return { bytes, report };
}
