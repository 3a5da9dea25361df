/**
 * Builds column storage (columns.ts) one row at a time, without an object per row or per cell.
 *
 * Each column starts dictionary-encoded. When its distinct values outgrow the cap and all of them
 * so far are plain numbers (or empty), it moves to number storage: a Float64Array, plus the raw
 * text of any later cell that is not exactly `String(value)`. Either way `cellText` gives back the
 * parsed text unchanged.
 */
import type { Column, HeaderIssue, RowIssue, Table } from './columns.ts';

export const DEFAULT_DICTIONARY_CAP = 4096;

const INITIAL_CAPACITY = 1024;

export class ColumnBuilder {
  readonly name: string;
  private readonly cap: number;
  private length = 0;
  // Dictionary storage; `dictionary` is null once the column holds numbers.
  private dictionary: Map<string, number> | null = new Map();
  private codes = new Uint32Array(INITIAL_CAPACITY);
  private values: string[] = [];
  private counts = new Float64Array(64);
  private onlyPlainNumbers = true;
  // Number storage.
  private numbers: Float64Array | null = null;
  private exceptions: Map<number, string> | null = null;

  constructor(name: string, dictionaryCap: number = DEFAULT_DICTIONARY_CAP) {
    this.name = name;
    this.cap = dictionaryCap;
  }

  get rowCount(): number {
    return this.length;
  }

  push(text: string): void {
    if (this.dictionary === null) this.pushNumber(text);
    else this.pushCode(this.dictionary, text);
  }

  /** The column as built so far. The builder must not be used afterwards. */
  build(): Column {
    if (this.numbers !== null) {
      return { kind: 'number', name: this.name, length: this.length, values: this.numbers, exceptions: this.exceptions ?? new Map() };
    }
    const counts = Array.from(this.counts.subarray(0, this.values.length));
    return { kind: 'text', name: this.name, length: this.length, codes: this.codes, values: this.values, counts };
  }

  private pushCode(dictionary: Map<string, number>, text: string): void {
    let code = dictionary.get(text);
    if (code === undefined) code = this.addValue(dictionary, text);
    this.counts[code]! += 1;
    if (this.length === this.codes.length) this.codes = grow(this.codes);
    this.codes[this.length++] = code;
    if (this.values.length > this.cap && this.onlyPlainNumbers) this.switchToNumbers();
  }

  private addValue(dictionary: Map<string, number>, text: string): number {
    const code = this.values.length;
    const kept = detach(text);
    dictionary.set(kept, code);
    this.values.push(kept);
    if (code === this.counts.length) this.counts = grow(this.counts);
    if (this.onlyPlainNumbers && text !== '' && Number.isNaN(plainNumberValue(text))) this.onlyPlainNumbers = false;
    return code;
  }

  private switchToNumbers(): void {
    const valueOfCode = Float64Array.from(this.values, plainNumberValue);
    const numbers = new Float64Array(this.codes.length);
    for (let row = 0; row < this.length; row++) numbers[row] = valueOfCode[this.codes[row]!]!;
    this.numbers = numbers;
    this.exceptions = new Map();
    this.dictionary = null;
    this.codes = new Uint32Array(0);
    this.values = [];
    this.counts = new Float64Array(0);
  }

  private pushNumber(text: string): void {
    let numbers = this.numbers!;
    if (this.length === numbers.length) numbers = this.numbers = grow(numbers);
    const value = plainNumberValue(text);
    numbers[this.length] = value;
    // NaN reads back as '', so only non-empty text that is not a plain number needs keeping.
    if (Number.isNaN(value) && text !== '') this.exceptions!.set(this.length, detach(text));
    this.length++;
  }
}

/**
 * The number `text` spells in plain JavaScript form (exactly `String(value)`, finite), else NaN.
 * '1.5' → 1.5; '1.50', ' 7', '-0', '1e3', '0x10', 'NaN', '' → NaN.
 */
export function plainNumberValue(text: string): number {
  if (isShortPlainDecimal(text)) {
    const value = +text;
    // Canonical unless it is -0 or small enough for String() to switch to exponent form.
    if (value === 0) return text === '0' ? 0 : NaN;
    return Math.abs(value) >= 1e-6 ? value : NaN;
  }
  if (text === '') return NaN;
  const value = +text;
  return Number.isFinite(value) && String(value) === text ? value : NaN;
}

const ZERO = 0x30;
const NINE = 0x39;
const MINUS = 0x2d;
const DOT = 0x2e;

/**
 * `-?(0|[1-9][0-9]*)(\.[0-9]*[1-9])?` in at most 15 characters. Such a text has at most 15
 * significant digits, so it survives the trip to a double and back (IEEE 754 guarantees 15), and
 * `String()` prints it the same way unless it is -0 or below 1e-6. Avoids String() on most cells.
 */
function isShortPlainDecimal(text: string): boolean {
  const n = text.length;
  if (n === 0 || n > 15) return false;
  let i = text.charCodeAt(0) === MINUS ? 1 : 0;
  if (i === n) return false;
  if (text.charCodeAt(i) === ZERO) i++;
  else {
    const start = i;
    while (i < n && isDigit(text.charCodeAt(i))) i++;
    if (i === start) return false;
  }
  if (i === n) return true;
  if (text.charCodeAt(i) !== DOT || i === n - 1) return false;
  i++;
  while (i < n && isDigit(text.charCodeAt(i))) i++;
  return i === n && text.charCodeAt(n - 1) !== ZERO;
}

function isDigit(c: number): boolean {
  return c >= ZERO && c <= NINE;
}

/**
 * A string that does not hold on to the parsed chunk it was cut from. V8 keeps substrings of 13+
 * characters as views into their parent, so one kept cell could keep a whole megabyte chunk alive.
 */
function detach(text: string): string {
  return text.length < 13 ? text : (' ' + text).slice(1);
}

function grow<A extends Uint32Array | Float64Array>(array: A): A {
  const bigger = new (array.constructor as new (length: number) => A)(Math.max(16, array.length * 2));
  bigger.set(array);
  return bigger;
}

export interface TableBuilderOptions {
  readonly dictionaryCap?: number;
  /** Absolute index of this table's first row (for batches of a larger file). */
  readonly firstRowIndex?: number;
  readonly headerIssues?: readonly HeaderIssue[];
}

/**
 * Rows → Table. Every row becomes exactly one table row: missing cells are '' and reported, extra
 * cells are reported with their text; nothing is dropped or cut without a RowIssue.
 */
export class TableBuilder {
  private readonly names: readonly string[];
  private readonly columns: ColumnBuilder[];
  private readonly firstRowIndex: number;
  private readonly headerIssues: readonly HeaderIssue[];
  private readonly rowIssues: RowIssue[] = [];
  private lineOfRow = new Uint32Array(INITIAL_CAPACITY);
  private rows = 0;

  constructor(names: readonly string[], options: TableBuilderOptions = {}) {
    this.names = names;
    this.columns = names.map((name) => new ColumnBuilder(name, options.dictionaryCap));
    this.firstRowIndex = options.firstRowIndex ?? 0;
    this.headerIssues = options.headerIssues ?? [];
  }

  get rowCount(): number {
    return this.rows;
  }

  /** `line`: 1-based line the row starts on; `unclosedQuote`: its last field ran to the end of the file. */
  addRow(fields: readonly string[], line: number, unclosedQuote = false): void {
    const width = this.columns.length;
    const filled = Math.min(fields.length, width);
    for (let c = 0; c < filled; c++) this.columns[c]!.push(fields[c]!);
    for (let c = filled; c < width; c++) this.columns[c]!.push('');
    if (fields.length !== width) this.reportShape(fields, line);
    if (unclosedQuote) this.report({ line, kind: 'unclosed-quote', expected: width, found: fields.length });
    if (this.rows === this.lineOfRow.length) this.lineOfRow = grow(this.lineOfRow);
    this.lineOfRow[this.rows++] = line;
  }

  build(): Table {
    return {
      names: this.names,
      columns: this.columns.map((column) => column.build()),
      rowCount: this.rows,
      lineOfRow: this.lineOfRow.subarray(0, this.rows),
      rowIssues: this.rowIssues,
      headerIssues: this.headerIssues,
    };
  }

  private reportShape(fields: readonly string[], line: number): void {
    const width = this.columns.length;
    if (fields.length < width) {
      this.report({ line, kind: 'too-few-fields', expected: width, found: fields.length });
    } else {
      this.report({ line, kind: 'too-many-fields', expected: width, found: fields.length, extra: fields.slice(width).map(detach) });
    }
  }

  private report(issue: Omit<RowIssue, 'row'>): void {
    this.rowIssues.push({ ...issue, row: this.firstRowIndex + this.rows });
  }
}
