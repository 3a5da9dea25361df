/**
 * Writing encoded rows as CSV bytes (RFC 4180: comma-separated, CRLF line ends, §2.1–2.7).
 * Output is often several times larger than the input and can exceed the longest string a
 * JavaScript engine allows, so it is written into large reusable byte buffers and handed to a
 * sink in parts.
 *
 * Per level, not per cell: each level's codes are turned into bytes once per plan ("0,1,0", with
 * the missing indicator), and a number column read from a dictionary is formatted once per
 * distinct number, remembered across batches (formatting a double is the costliest step of
 * writing). Text cells are checked for quoting and formula neutralising while they are copied.
 */
import { cellText, type Column } from './columns.ts';
import { numberCell, textCell } from './csv-cell.ts';
import type { EncodedBatch, EncodedColumn } from './apply.ts';
import { ALL_ZEROS, type CategoricalPlan, type ColumnPlan, type Plan } from './plan.ts';

export const LINE_END = '\r\n';
const DEFAULT_BUFFER_BYTES = 1 << 22;
const COMMA = 44;
const CR = 13;
const LF = 10;
const QUOTE = 34;
/** Patterns up to this long are copied byte by byte; longer ones with `set` (measured faster). */
const SHORT_COPY = 8;
/** Formatted numbers remembered per column across batches, at most. */
const NUMBER_CACHE_LIMIT = 1 << 17;

export interface CsvWriter {
  writeHeader(): void;
  writeBatch(batch: EncodedBatch): void;
  /** Flushes what is buffered to the sink. */
  finish(): void;
  readonly bytesWritten: number;
}

/** Bytes of each level's codes, by `2 × level + missing` (missing: the indicator, when the column has one). */
interface LevelPatterns {
  readonly byLevel: readonly Uint8Array[];
  /** The all-zero row (ALL_ZEROS), by missing. */
  readonly zeros: readonly Uint8Array[];
}

/** What the row loop needs of one column for one batch. */
type BatchColumn =
  | { readonly kind: 'levels'; readonly level: Int32Array; readonly missing: Uint8Array; readonly indicator: boolean; readonly patterns: LevelPatterns }
  | {
      readonly kind: 'coded-numbers';
      readonly codes: Uint32Array;
      readonly values: Float64Array;
      readonly missing: Uint8Array;
      readonly indicator: boolean;
      /** The cell's text (number and indicator) per code, made on first use. */
      readonly byCode: (string | undefined)[];
      /** The same across batches, by number, for cells that are not missing. */
      readonly byNumber: Map<number, string>;
    }
  | { readonly kind: 'numbers'; readonly values: Float64Array; readonly missing: Uint8Array; readonly indicator: boolean }
  | { readonly kind: 'text'; readonly source: Column | null };

/**
 * `sink` receives filled parts; it must copy or consume them before returning, because the buffer
 * is reused (the CLI writes them, the page copies them into Blob parts).
 */
export function createCsvWriter(plan: Plan, sink: (bytes: Uint8Array) => void, bufferBytes = DEFAULT_BUFFER_BYTES): CsvWriter {
  return new BufferedCsvWriter(plan, sink, bufferBytes);
}

class BufferedCsvWriter implements CsvWriter {
  private readonly plan: Plan;
  private readonly sink: (bytes: Uint8Array) => void;
  private readonly encoder = new TextEncoder();
  private readonly buffer: Uint8Array;
  /** Bytes of `buffer` in use; also where text cells end (see `text`). */
  private used = 0;
  private total = 0;
  private readonly patterns: readonly (LevelPatterns | null)[];
  private readonly numberCaches: readonly Map<number, string>[];

  constructor(plan: Plan, sink: (bytes: Uint8Array) => void, bufferBytes: number) {
    this.plan = plan;
    this.sink = sink;
    this.buffer = new Uint8Array(Math.max(bufferBytes, 64));
    this.patterns = plan.columns.map((c) => (c.kind === 'categorical' ? levelPatterns(c, this.encoder) : null));
    this.numberCaches = plan.columns.map(() => new Map<number, string>());
  }

  get bytesWritten(): number {
    return this.total + this.used;
  }

  writeHeader(): void {
    this.plan.outputs.forEach((name, i) => {
      if (i > 0) this.text(',');
      this.text(textCell(name));
    });
    this.text(LINE_END);
  }

  writeBatch(batch: EncodedBatch): void {
    const rows = batch.end - batch.start;
    const columns: BatchColumn[] = [];
    this.plan.columns.forEach((columnPlan, c) => {
      const column = this.batchColumn(columnPlan, batch.columns[c], c);
      if (column !== null) columns.push(column);
    });
    const out = this.buffer;
    // Room kept free for the separators and line end around a cell.
    const limit = out.length - 8;
    let pos = this.used;
    for (let r = 0; r < rows; r++) {
      if (batch.rejected[r]) continue;
      for (let c = 0; c < columns.length; c++) {
        if (c > 0) out[pos++] = COMMA;
        const column = columns[c]!;
        if (column.kind === 'levels') {
          const level = column.level[r] ?? ALL_ZEROS;
          const missing = column.indicator ? (column.missing[r] ?? 0) : 0;
          const part = level === ALL_ZEROS ? column.patterns.zeros[missing]! : column.patterns.byLevel[2 * level + missing]!;
          const n = part.length;
          if (pos + n > limit) {
            this.used = pos;
            this.flush();
            pos = 0;
            if (n > limit) {
              this.sink(part);
              this.total += n;
              continue;
            }
          }
          if (n <= SHORT_COPY) for (let k = 0; k < n; k++) out[pos + k] = part[k]!;
          else out.set(part, pos);
          pos += n;
        } else {
          this.used = pos;
          this.cell(column, r, batch.start + r);
          pos = this.used;
        }
      }
      if (pos > limit) {
        this.used = pos;
        this.flush();
        pos = 0;
      }
      out[pos++] = CR;
      out[pos++] = LF;
    }
    this.used = pos;
  }

  finish(): void {
    this.flush();
  }

  private flush(): void {
    if (this.used === 0) return;
    this.sink(this.buffer.subarray(0, this.used));
    this.total += this.used;
    this.used = 0;
  }

  /** A cell that is not a level pattern, written as text at `used`. */
  private cell(column: BatchColumn, r: number, row: number): void {
    switch (column.kind) {
      case 'coded-numbers': {
        const code = column.codes[r] ?? 0;
        this.text(column.byCode[code] ?? (column.byCode[code] = codedNumber(column, r)));
        return;
      }
      case 'numbers':
        this.text(numberCell(column.values[r] ?? NaN));
        if (column.indicator) this.text(column.missing[r] ? ',1' : ',0');
        return;
      case 'text': {
        const source = column.source;
        if (source !== null) this.safeText(source.kind === 'text' ? (source.values[source.codes[row] ?? 0] ?? '') : cellText(source, row));
        return;
      }
      case 'levels':
        return; // written by the row loop
    }
  }

  /**
   * A text cell as textCell makes it. Most cells need neither quotes nor an apostrophe: they are
   * copied as they are checked, and only the others go through textCell.
   */
  private safeText(value: string): void {
    const first = value.charCodeAt(0);
    const formulaStart = first === 0x3d || first === 0x2b || first === 0x2d || first === 0x40 || first === 9 || first === CR || first === LF;
    if (formulaStart || !this.plainText(value)) this.text(textCell(value));
  }

  /** Copies `value` when it holds no quote, comma, CR or LF and is ASCII; false (nothing written) otherwise. */
  private plainText(value: string): boolean {
    const n = value.length;
    if (this.used + n > this.buffer.length - 8) this.flush();
    if (n > this.buffer.length - 8) return false;
    const out = this.buffer;
    const at = this.used;
    for (let k = 0; k < n; k++) {
      const c = value.charCodeAt(k);
      if (c >= 0x80 || c === QUOTE || c === COMMA || c === CR || c === LF) return false;
      out[at + k] = c;
    }
    this.used = at + n;
    return true;
  }

  /** Any text as UTF-8: ASCII byte by byte, the rest through the encoder. */
  private text(value: string): void {
    const n = value.length;
    if (this.used + 3 * n > this.buffer.length - 8) this.flush();
    if (3 * n > this.buffer.length - 8) {
      const bytes = this.encoder.encode(value);
      this.sink(bytes);
      this.total += bytes.length;
      return;
    }
    const out = this.buffer;
    const at = this.used;
    let k = 0;
    for (; k < n; k++) {
      const c = value.charCodeAt(k);
      if (c >= 0x80) break;
      out[at + k] = c;
    }
    this.used = at + k;
    if (k < n) this.used += this.encoder.encodeInto(value.slice(k), out.subarray(this.used)).written;
  }

  private batchColumn(plan: ColumnPlan, encoded: EncodedColumn | undefined, index: number): BatchColumn | null {
    if (plan.width === 0 || encoded === undefined) return null;
    const indicator = (plan.kind === 'categorical' || plan.kind === 'continuous') && plan.indicator;
    switch (encoded.kind) {
      case 'levels': {
        const patterns = this.patterns[index] ?? null;
        return patterns === null ? null : { kind: 'levels', level: encoded.level, missing: encoded.missing, indicator, patterns };
      }
      case 'numbers': {
        const { values, missing, codes } = encoded;
        if (codes === undefined) return { kind: 'numbers', values, missing, indicator };
        const byCode = new Array<string | undefined>(maxOf(codes) + 1).fill(undefined);
        return { kind: 'coded-numbers', codes, values, missing, indicator, byCode, byNumber: this.numberCaches[index]! };
      }
      case 'text':
        return { kind: 'text', source: encoded.source };
      case 'none':
        return null;
    }
  }
}

/** The text of a coded number cell; numbers not missing are remembered across batches. */
function codedNumber(column: Extract<BatchColumn, { kind: 'coded-numbers' }>, r: number): string {
  const value = column.values[r] ?? NaN;
  const missing = column.missing[r] === 1;
  if (missing) return column.indicator ? `${numberCell(value)},1` : numberCell(value);
  let cell = column.byNumber.get(value);
  if (cell === undefined) {
    cell = column.indicator ? `${numberCell(value)},0` : numberCell(value);
    if (column.byNumber.size < NUMBER_CACHE_LIMIT) column.byNumber.set(value, cell);
  }
  return cell;
}

function maxOf(codes: Uint32Array): number {
  let max = -1;
  for (let i = 0; i < codes.length; i++) if (codes[i]! > max) max = codes[i]!;
  return max;
}

/** The bytes of each level's codes ("0,1,0") and of the all-zero row, each with the indicator's 0 and 1. */
function levelPatterns(plan: CategoricalPlan, encoder: TextEncoder): LevelPatterns {
  const { width, matrix, levels } = plan.codes;
  const pattern = (level: number, missing: number): Uint8Array => {
    const cells: string[] = [];
    for (let j = 0; j < width; j++) cells.push(level === ALL_ZEROS ? '0' : numberCell(matrix[level * width + j] ?? 0));
    if (plan.indicator) cells.push(String(missing));
    return encoder.encode(cells.join(','));
  };
  const byLevel: Uint8Array[] = [];
  levels.forEach((_, i) => byLevel.push(pattern(i, 0), pattern(i, 1)));
  return { byLevel, zeros: [pattern(ALL_ZEROS, 0), pattern(ALL_ZEROS, 1)] };
}
