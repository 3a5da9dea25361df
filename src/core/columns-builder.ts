/**
 * Builds column storage (columns.ts) one row at a time, without an object per row or per cell.
 *
 * Each column starts dictionary-encoded. When its distinct values outgrow the cap and all of them
 * so far are empty or decimal number text ('12', '-0.5', '1.50', '007', '1e3'), it moves to number
 * storage: a Float64Array holding Number(text) (NaN for other text), plus the raw text of every
 * cell that `String(value)` would not give back ('1.50', '007', 'n/a', later stray text). Either
 * way `cellText` gives back the parsed text unchanged. Requiring only decimal syntax, not the
 * exact `String(value)` form, lets fixed-decimal exports ('12.50') leave the dictionary too.
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
  /** Every distinct value so far is empty or decimal number text. */
  private onlyNumbers = true;
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
    if (this.values.length > this.cap && this.onlyNumbers) this.switchToNumbers();
  }

  private addValue(dictionary: Map<string, number>, text: string): number {
    const code = this.values.length;
    const kept = detach(text);
    dictionary.set(kept, code);
    this.values.push(kept);
    if (code === this.counts.length) this.counts = grow(this.counts);
    if (this.onlyNumbers && text !== '' && Number.isNaN(numberValue(text))) this.onlyNumbers = false;
    return code;
  }

  private switchToNumbers(): void {
    const valueOfCode = Float64Array.from(this.values, numberValue);
    const keepText = this.values.map((text) => !printsBack(text));
    const numbers = new Float64Array(this.codes.length);
    const exceptions = new Map<number, string>();
    for (let row = 0; row < this.length; row++) {
      const code = this.codes[row]!;
      numbers[row] = valueOfCode[code]!;
      if (keepText[code]) exceptions.set(row, this.values[code]!);
    }
    this.numbers = numbers;
    this.exceptions = exceptions;
    this.dictionary = null;
    this.codes = new Uint32Array(0);
    this.values = [];
    this.counts = new Float64Array(0);
  }

  private pushNumber(text: string): void {
    let numbers = this.numbers!;
    if (this.length === numbers.length) numbers = this.numbers = grow(numbers);
    scanner.read(text);
    numbers[this.length] = scanner.value;
    if (!scanner.printsBack) this.exceptions!.set(this.length, detach(text));
    this.length++;
  }
}

/** Number(text) when `text` is decimal number text (see NumberScanner), else NaN. */
export function numberValue(text: string): number {
  scanner.read(text);
  return scanner.value;
}

/** Whether cellText gives back `text` from the number storage alone (no exception kept). */
export function printsBack(text: string): boolean {
  scanner.read(text);
  return scanner.printsBack;
}

const ZERO = 0x30;
const MINUS = 0x2d;
const PLUS = 0x2b;
const DOT = 0x2e;

/** Powers of ten exactly representable as doubles. */
const POWERS_OF_TEN = Array.from({ length: 16 }, (_, k) => 10 ** k);

/**
 * Reads decimal number text `-?(digits[.digits]|.digits)([eE][+-]?digits)?` ('12', '-0.5', '1.50',
 * '007', '1e3'); anything else is not a number. The results sit in fields, so reading a cell
 * allocates nothing, and `Number()`/`String()` are called only for rare long or exponent forms.
 */
class NumberScanner {
  /** The number, or NaN for text that is not decimal number text (and for ''). */
  value = NaN;
  /** Whether String(value) === text (or text is '' and value NaN): cellText needs no copy of the text. */
  printsBack = false;
  private mantissa = 0;

  read(text: string): void {
    const n = text.length;
    const negative = n > 0 && text.charCodeAt(0) === MINUS;
    const intStart = negative ? 1 : 0;
    this.mantissa = 0;
    const intEnd = this.readDigits(text, intStart);
    const hasDot = intEnd < n && text.charCodeAt(intEnd) === DOT;
    const end = hasDot ? this.readDigits(text, intEnd + 1) : intEnd;
    const intDigits = intEnd - intStart;
    const fracDigits = hasDot ? end - intEnd - 1 : 0;
    if (intDigits + fracDigits === 0) return this.notANumber(n === 0);
    if (end < n) return this.readExponentForm(text, end);
    // Up to 15 digits the mantissa is an exact integer and one division by an exact power of ten
    // rounds correctly, so this equals Number(text) (the classic fast path, Clinger 1990).
    if (intDigits + fracDigits > 15) this.value = +text;
    else this.value = (negative ? -this.mantissa : this.mantissa) / POWERS_OF_TEN[fracDigits]!;
    const plainInteger = intDigits === 1 || (intDigits > 1 && text.charCodeAt(intStart) !== ZERO);
    const plainFraction = !hasDot || (fracDigits > 0 && text.charCodeAt(n - 1) !== ZERO);
    // String() never writes leading zeros, trailing fraction zeros or a bare dot; within 15
    // significant digits it writes the digits back unchanged, except for -0 and below 1e-6.
    if (!plainInteger || !plainFraction) this.printsBack = false;
    else if (n > 15) this.printsBack = String(this.value) === text;
    else this.printsBack = this.value === 0 ? text === '0' : Math.abs(this.value) >= 1e-6;
  }

  /** Adds the digits from `from` on to `mantissa`; returns where they stop. */
  private readDigits(text: string, from: number): number {
    let mantissa = this.mantissa;
    let i = from;
    while (i < text.length) {
      const digit = text.charCodeAt(i) - ZERO;
      if (digit < 0 || digit > 9) break;
      mantissa = mantissa * 10 + digit;
      i++;
    }
    this.mantissa = mantissa;
    return i;
  }

  private readExponentForm(text: string, at: number): void {
    let i = at;
    if ((text.charCodeAt(i) | 0x20) !== 0x65) return this.notANumber(false); // e or E
    const sign = text.charCodeAt(++i);
    if (sign === MINUS || sign === PLUS) i++;
    if (i === text.length || this.readDigits(text, i) !== text.length) return this.notANumber(false);
    const value = +text;
    if (!Number.isFinite(value)) return this.notANumber(false);
    this.value = value;
    this.printsBack = String(value) === text;
  }

  private notANumber(empty: boolean): void {
    this.value = NaN;
    this.printsBack = empty;
  }
}

const scanner = new NumberScanner();

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
