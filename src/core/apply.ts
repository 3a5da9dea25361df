/**
 * Applying a recipe to rows, in named phases:
 *
 *   compilePlan (plan.ts)     recipe + header → per-column plans, code tables, cached resolvers
 *   resolve                   each distinct cell text → level / number / missing / unseen / reject
 *   encode                    per row: a level index or a scaled number, plus missing flags
 *   reject (row-shape.ts)     rows whose fields do not line up with the header
 *   report (apply-report.ts)  counts of what each policy did, unseen levels, rejected rows
 *   write (csv-write.ts)      encoded rows → RFC 4180 bytes; or encodeWindow → numbers for a preview
 *
 * The page (whole table, or a visible window of it) and the command line (streamed batches) call
 * the same functions, so they produce the same bytes.
 */
import { cellText, type Codes, type Column, type Table, type TextColumn } from './columns.ts';
import type { ApplyReportBuilder } from './apply-report.ts';
import { exceptionRows } from './number-cells.ts';
import { misshapenRows } from './row-shape.ts';
import { ALL_ZEROS, type CategoricalPlan, type ContinuousPlan, type LevelResolution, type Plan } from './plan.ts';

/** One encoded column of a batch; arrays are indexed by row − start. */
export type EncodedColumn =
  | { readonly kind: 'levels'; readonly level: Int32Array; readonly missing: Uint8Array }
  | {
      readonly kind: 'numbers';
      readonly values: Float64Array;
      readonly missing: Uint8Array;
      /**
       * For a dictionary-stored source: the code of each row (indexed by row − start). Rows of one
       * code hold the same value and missing flag, so a writer may format each code once.
       */
      readonly codes?: Codes;
    }
  | { readonly kind: 'text'; readonly source: Column | null }
  | { readonly kind: 'none' };

export interface EncodedBatch {
  /** First and one-past-last row of the table that were encoded. */
  readonly start: number;
  readonly end: number;
  /** Parallel to plan.columns. */
  readonly columns: readonly EncodedColumn[];
  /** rejected[row − start] is 1 when a policy rejected the row; such rows are not written. */
  readonly rejected: Uint8Array;
  readonly rejectedCount: number;
}

/** Where a batch's arrays come from: made anew, or kept from the batch before (batch-arrays.ts). */
interface ArraySource {
  int32(slot: string, length: number): Int32Array;
  float64(slot: string, length: number): Float64Array;
  uint8(slot: string, length: number): Uint8Array;
}

const NEW_ARRAYS: ArraySource = {
  int32: (_, length) => new Int32Array(length),
  float64: (_, length) => new Float64Array(length),
  uint8: (_, length) => new Uint8Array(length),
};

/**
 * Encodes rows [start, end) of `table` (default: all); records what happened in `report` when given.
 * With `arrays`, the batch is made in the arrays of the last batch encoded with them, which it
 * then replaces: for a caller done with each batch before it encodes the next.
 */
export function encodeBatch(plan: Plan, table: Table, start = 0, end = table.rowCount, report?: ApplyReportBuilder, arrays: ArraySource = NEW_ARRAYS): EncodedBatch {
  const rows = Math.max(0, end - start);
  const rejected = arrays.uint8('rejected', rows);
  const position = sourcePositions(plan, table);
  const columns = plan.columns.map((columnPlan, i): EncodedColumn => {
    const source = position[i] === -1 ? null : (table.columns[position[i] ?? -1] ?? null);
    switch (columnPlan.kind) {
      case 'categorical':
        return encodeLevels(columnPlan, source, start, rows, rejected, table, report, arrays.int32(`level ${i}`, rows), arrays.uint8(`missing ${i}`, rows));
      case 'continuous':
        return encodeNumbers(columnPlan, source, start, rows, rejected, table, report, arrays.float64(`value ${i}`, rows), arrays.uint8(`missing ${i}`, rows));
      case 'identifier':
        return { kind: 'text', source };
      case 'excluded':
        return { kind: 'none' };
    }
  });
  for (const misshapen of misshapenRows(table, start, start + rows)) {
    rejected[misshapen.row - start] = 1;
    report?.misshapen(misshapen);
  }
  let rejectedCount = 0;
  for (let r = 0; r < rows; r++) rejectedCount += rejected[r] ?? 0;
  report?.rowsDone(rows, rejectedCount);
  return { start, end: start + rows, columns, rejected, rejectedCount };
}

/** The table's column index for each plan column, matched by name (batches may come from any file). */
function sourcePositions(plan: Plan, table: Table): number[] {
  if (table.names === plan.header) return plan.columns.map((c) => c.source);
  const byName = new Map<string, number>();
  table.names.forEach((name, i) => byName.has(name) || byName.set(name, i));
  return plan.columns.map((c) => byName.get(c.recipe.name) ?? -1);
}

/** Calls `visit(offset, text)` for rows of a column that is absent or number-stored (text columns are resolved per code). */
function forEachCell(source: Column | null, start: number, rows: number, visit: (offset: number, text: string) => void): void {
  for (let r = 0; r < rows; r++) visit(r, source === null ? '' : cellText(source, start + r));
}

function encodeLevels(
  plan: CategoricalPlan, source: Column | null, start: number, rows: number, rejected: Uint8Array, table: Table, report: ApplyReportBuilder | undefined,
  level: Int32Array, missing: Uint8Array,
): EncodedColumn {
  const note = (r: number, text: string, outcome: LevelResolution): void => {
    level[r] = outcome.level;
    missing[r] = outcome.missing ? 1 : 0;
    if (outcome.reject !== null) rejected[r] = 1;
    if (report && (outcome.missing || outcome.unseen || outcome.reject !== null)) report.cell(plan, start + r, table.lineOfRow[start + r] ?? 0, text, outcome);
  };
  if (source?.kind === 'text') {
    // Resolve each distinct value once; the row loop is then a lookup by code.
    const levelOfCode = resolveCodes(new Int32Array(source.values.length), source, start, rows, (text) => ordinaryLevel(plan.resolve(text)));
    // Unusual codes (a missing spelling in a tenth of the rows) keep their outcome too: no lookup by text per cell.
    const unusual: (LevelResolution | undefined)[] = [];
    for (let r = 0; r < rows; r++) {
      const code = source.codes[start + r]!;
      const known = levelOfCode[code]!;
      if (known !== UNUSUAL) level[r] = known;
      else {
        const text = source.values[code] ?? '';
        note(r, text, (unusual[code] ??= plan.resolve(text)));
      }
    }
  } else {
    forEachCell(source, start, rows, (r, text) => note(r, text, plan.resolve(text)));
  }
  return { kind: 'levels', level, missing };
}

/** A code whose cells are not plain: missing, unseen, not a number, or rejected. Such cells go the slow way, one by one, for the report. */
const UNUSUAL = -2;

/** The level of an ordinary outcome, or UNUSUAL. */
function ordinaryLevel(outcome: LevelResolution): number {
  return !outcome.missing && !outcome.unseen && outcome.reject === null ? outcome.level : UNUSUAL;
}

/**
 * Fills `byCode` with what each code of a dictionary-stored column becomes, worked out once per
 * code: every code when the rows use most of the dictionary; when they are a small part of a big
 * one (a window of a whole table), only the codes they use.
 */
function resolveCodes<T extends Int32Array | Float64Array>(byCode: T, source: TextColumn, start: number, rows: number, resolve: (text: string) => number): T {
  const { values, codes } = source;
  if (values.length <= 2 * rows) {
    for (let code = 0; code < values.length; code++) byCode[code] = resolve(values[code]!);
    return byCode;
  }
  const done = new Uint8Array(values.length);
  for (let r = 0; r < rows; r++) {
    const code = codes[start + r]!;
    if (done[code] === 1) continue;
    done[code] = 1;
    byCode[code] = resolve(values[code]!);
  }
  return byCode;
}

function encodeNumbers(
  plan: ContinuousPlan, source: Column | null, start: number, rows: number, rejected: Uint8Array, table: Table, report: ApplyReportBuilder | undefined,
  values: Float64Array, missing: Uint8Array,
): EncodedColumn {
  const { center, scale } = plan.transform;
  // A plain number is read directly (no cache to consult); only unusual texts are resolved in full.
  const { isMissing, readNumber } = plan;
  const scaled = (text: string): number => {
    const value = isMissing(text) ? NaN : readNumber(text);
    return Number.isNaN(value) ? NaN : (value - center) / scale;
  };
  // Number storage holds texts read with a decimal point; a column written with a decimal comma
  // ("1.234" meaning 1234) must be read from its text in the column's own format instead.
  if (source?.kind === 'number' && plan.column.format.decimal === '.') {
    // Plain numbers need no text at all; only the exceptions are read as text, and the numbers
    // whose text is a missing token ("-999").
    // Going through the exceptions once pays unless they far outnumber the rows (a window of a
    // whole table): then each row is looked up instead.
    const flagged = source.exceptions.size > 4 * rows ? null : exceptionRows(source, start, rows);
    const codedMissing = plan.missingNumbers;
    for (let r = 0; r < rows; r++) {
      let text = flagged === null || flagged[r] === 1 ? source.exceptions.get(start + r) : undefined;
      const v = text === undefined ? (source.values[start + r] ?? NaN) : NaN;
      if (codedMissing.size > 0 && codedMissing.has(v)) text = cellText(source, start + r);
      const value = text === undefined ? (v - center) / scale : scaled(text);
      if (!Number.isNaN(value)) values[r] = value;
      else numberCell(plan, text ?? '', r, start, values, missing, rejected, table, report);
    }
  } else if (source?.kind === 'text') {
    const valueOfCode = resolveCodes(new Float64Array(source.values.length), source, start, rows, scaled);
    for (let r = 0; r < rows; r++) {
      const code = source.codes[start + r]!;
      const value = valueOfCode[code]!;
      if (!Number.isNaN(value)) values[r] = value;
      else numberCell(plan, source.values[code] ?? '', r, start, values, missing, rejected, table, report);
    }
    return { kind: 'numbers', values, missing, codes: source.codes.subarray(start, start + rows) };
  } else {
    for (let r = 0; r < rows; r++) numberCell(plan, source === null ? '' : cellText(source, start + r), r, start, values, missing, rejected, table, report);
  }
  return { kind: 'numbers', values, missing };
}

function numberCell(
  plan: ContinuousPlan, text: string, r: number, start: number, values: Float64Array, missing: Uint8Array, rejected: Uint8Array, table: Table, report?: ApplyReportBuilder,
): void {
  const outcome = plan.resolve(text);
  values[r] = (outcome.value - plan.transform.center) / plan.transform.scale;
  missing[r] = outcome.missing ? 1 : 0;
  if (outcome.reject !== null) rejected[r] = 1;
  if (report && (outcome.missing || outcome.invalid || outcome.reject !== null)) report.cell(plan, start + r, table.lineOfRow[start + r] ?? 0, text, outcome);
}

/** The numbers of one encoded row's columns for `columnIndex`, written into `out` at the plan's offset. */
export function writeEncodedColumn(plan: Plan, batch: EncodedBatch, columnIndex: number, row: number, out: Float64Array, rowOffset: number): void {
  const columnPlan = plan.columns[columnIndex];
  const encoded = batch.columns[columnIndex];
  if (!columnPlan || !encoded) return;
  const base = rowOffset + columnPlan.offset;
  if (encoded.kind === 'levels' && columnPlan.kind === 'categorical') {
    const { width, matrix } = columnPlan.codes;
    const level = encoded.level[row] ?? ALL_ZEROS;
    for (let j = 0; j < width; j++) out[base + j] = level === ALL_ZEROS ? 0 : (matrix[level * width + j] ?? 0);
    if (columnPlan.indicator) out[base + width] = encoded.missing[row] ?? 0;
  } else if (encoded.kind === 'numbers' && columnPlan.kind === 'continuous') {
    out[base] = encoded.values[row] ?? NaN;
    if (columnPlan.indicator) out[base + 1] = encoded.missing[row] ?? 0;
  } else if (encoded.kind === 'text') {
    // Identifiers are text; a numeric preview shows them as NaN and the caller shows the text.
    out[base] = NaN;
  }
}

/** Numbers of rows [start, end) as a row-major matrix (rows × plan.outputs.length), for previews. */
export function encodeWindow(plan: Plan, table: Table, start: number, end: number): { values: Float64Array; batch: EncodedBatch } {
  const batch = encodeBatch(plan, table, start, Math.min(end, table.rowCount));
  const width = plan.outputs.length;
  const rows = batch.end - batch.start;
  const values = new Float64Array(rows * width);
  for (let r = 0; r < rows; r++) for (let c = 0; c < plan.columns.length; c++) writeEncodedColumn(plan, batch, c, r, values, r * width);
  return { values, batch };
}
