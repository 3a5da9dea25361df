/**
 * Builds column storage (columns.ts) row by row, or a block of rows column by column, without an
 * object per row or per cell.
 *
 * Each column starts dictionary-encoded. When its distinct values outgrow the cap and all of them
 * so far are empty or decimal number text ('12', '-0.5', '1.50', '007', '1e3'), it moves to number
 * storage: a Float64Array holding Number(text) (NaN for other text), plus the raw text of every
 * cell that `String(value)` would not give back ('1.50', '007', 'n/a', later stray text). Either
 * way `cellText` gives back the parsed text unchanged. Requiring only decimal syntax, not the
 * exact `String(value)` form, lets fixed-decimal exports ('12.50') leave the dictionary too.
 */
import type { Column, HeaderIssue, RowIssue, Table } from './columns.ts';
import { plainFields, type PlainRecords } from './parse.ts';

export const DEFAULT_DICTIONARY_CAP = 4096;

const INITIAL_CAPACITY = 1024;
/** A dictionary of up to this many values is searched by length alone; a bigger one by hash. */
const SMALL_DICTIONARY = 32;
/** Values of this length or longer share the last length list. */
const LENGTH_LISTS = 64;
/** Hash table slots to start with; a power of two, doubled whenever the table is half full. */
const INITIAL_SLOTS = 128;

/**
 * The dictionary is our own, rather than a Map: a cell arrives as a position in the parsed text
 * (parse.ts) and is compared in place with the stored values, so only a value met for the first
 * time becomes a string. Most columns have a few levels: their cells are compared with the values
 * of the same length, without hashing. A column that outgrows SMALL_DICTIONARY values moves to an
 * open-addressing hash table.
 */
export class ColumnBuilder {
  readonly name: string;
  private readonly cap: number;
  private length = 0;
  // Dictionary storage, emptied once the column holds numbers.
  private codes: Uint32Array<ArrayBuffer>;
  private values: string[] = [];
  private counts: Float64Array<ArrayBuffer>;
  /**
   * Small dictionary: byLength[min(length, LENGTH_LISTS − 1)] is code + 1 of the first value of that
   * length (0: none) and nextOfLength[code] the next one's. null once the dictionary is hashed.
   */
  private byLength: Int32Array | null = new Int32Array(LENGTH_LISTS);
  private readonly nextOfLength = new Int32Array(SMALL_DICTIONARY + 1);
  /**
   * Hash table, with linear probing: slot i is table[2i] = the value's fieldHash and table[2i + 1]
   * = its code + 1 (0: free). The hash sits beside the code so that a probe reads one cache line.
   */
  private table = new Int32Array(0);
  /** Slots the hash table starts with (from the expected distinct values). */
  private readonly initialSlots: number;
  /** Every distinct value so far is empty or decimal number text. */
  private onlyNumbers = true;
  /** The dictionary outgrew the cap with only numbers in it: switch after storing the current cell. */
  private switchDue = false;
  // Number storage.
  private numbers: Float64Array | null = null;
  private exceptions: Map<number, string> | null = null;

  /**
   * `expected` sizes the storage up front when the caller can tell (the previous batch of the same
   * file): the rows, and the distinct values.
   */
  constructor(name: string, dictionaryCap: number = DEFAULT_DICTIONARY_CAP, expected: { rows: number; distinct: number } | null = null) {
    this.name = name;
    this.cap = dictionaryCap;
    let slots = INITIAL_SLOTS;
    while (expected !== null && slots < 2 * expected.distinct) slots *= 2;
    this.initialSlots = slots;
    this.counts = new Float64Array(Math.max(SMALL_DICTIONARY + 1, expected?.distinct ?? 0));
    this.codes = new Uint32Array(Math.max(INITIAL_CAPACITY, expected?.rows ?? 0));
    if (expected !== null && expected.distinct > SMALL_DICTIONARY) {
      this.byLength = null;
      this.table = new Int32Array(2 * slots);
    }
  }

  /** Distinct values in the dictionary so far (0 once the column holds numbers). */
  get distinct(): number {
    return this.values.length;
  }

  get rowCount(): number {
    return this.length;
  }

  push(text: string): void {
    this.pushRange(text, 0, text.length);
  }

  /** Adds the cell text[start, end). */
  pushRange(text: string, start: number, end: number): void {
    if (this.numbers !== null) {
      this.pushNumber(text, start, end);
      return;
    }
    const code = this.byLength !== null ? this.smallCodeOf(text, start, end) : this.hashedCodeOf(text, start, end);
    this.counts[code]! += 1;
    if (this.length === this.codes.length) this.codes = grow(this.codes);
    this.codes[this.length++] = code;
    if (this.switchDue) this.switchToNumbers();
  }

  /**
   * Adds field `field` of records [from, to) of a block: one column at a time, so that one
   * dictionary is in the processor's cache while its cells are looked up.
   */
  pushField(records: PlainRecords, field: number, from: number, to: number): void {
    const { text, bounds, width } = records;
    const stride = width + 1;
    for (let r = from; r < to; r++) {
      const at = r * stride + field;
      this.pushRange(text, bounds[at]!, bounds[at + 1]! - 1);
    }
  }

  /** The column as built so far. The builder must not be used afterwards. */
  build(): Column {
    if (this.numbers !== null) {
      return { kind: 'number', name: this.name, length: this.length, values: this.numbers, exceptions: this.exceptions ?? new Map() };
    }
    const counts = Array.from(this.counts.subarray(0, this.values.length));
    // The hash table is needed no more; a reader kept alive must not keep it (16 MB for a million values).
    this.table = new Int32Array(0);
    this.counts = new Float64Array(0);
    return { kind: 'text', name: this.name, length: this.length, codes: this.codes, values: this.values, counts };
  }

  private smallCodeOf(text: string, start: number, end: number): number {
    const length = end - start;
    const list = length < LENGTH_LISTS ? length : LENGTH_LISTS - 1;
    const byLength = this.byLength!;
    for (let next = byLength[list]!; next !== 0; next = this.nextOfLength[next - 1]!) {
      const value = this.values[next - 1]!;
      if (value.length === length && text.startsWith(value, start)) return next - 1;
    }
    const code = this.addValue(text, start, end);
    if (this.values.length > SMALL_DICTIONARY) {
      this.hashAll();
    } else {
      this.nextOfLength[code] = byLength[list]!;
      byLength[list] = code + 1;
    }
    return code;
  }

  private hashedCodeOf(text: string, start: number, end: number): number {
    const hash = fieldHash(text, start, end);
    const table = this.table;
    const mask = (table.length >> 1) - 1;
    for (let i = hash & mask; ; i = (i + 1) & mask) {
      const slot = table[2 * i + 1]!;
      if (slot === 0) {
        const code = this.addValue(text, start, end);
        table[2 * i] = hash;
        table[2 * i + 1] = code + 1;
        if (4 * this.values.length > table.length) this.rehash(table.length * 2);
        return code;
      }
      if (table[2 * i] === hash) {
        const value = this.values[slot - 1]!;
        if (value.length === end - start && text.startsWith(value, start)) return slot - 1;
      }
    }
  }

  private addValue(text: string, start: number, end: number): number {
    const code = this.values.length;
    const value = detach(text, start, end);
    this.values.push(value);
    if (code === this.counts.length) this.counts = grow(this.counts);
    if (this.onlyNumbers && value !== '' && Number.isNaN(numberValue(value))) this.onlyNumbers = false;
    if (this.onlyNumbers && this.values.length > this.cap) this.switchDue = true;
    return code;
  }

  /** The small dictionary outgrew its lists: every value goes into the hash table. */
  private hashAll(): void {
    this.byLength = null;
    let slots = this.initialSlots;
    while (slots < 4 * this.values.length) slots *= 2;
    this.rehash(2 * slots);
  }

  /** Builds the hash table anew with `entries` Int32 entries: twice a power of two (hash, code). */
  private rehash(entries: number): void {
    const table = new Int32Array(entries);
    const mask = (entries >> 1) - 1;
    this.values.forEach((value, code) => {
      const hash = fieldHash(value, 0, value.length);
      let i = hash & mask;
      while (table[2 * i + 1] !== 0) i = (i + 1) & mask;
      table[2 * i] = hash;
      table[2 * i + 1] = code + 1;
    });
    this.table = table;
  }

  private switchToNumbers(): void {
    const valueOfCode = Float64Array.from(this.values, (text) => numberValue(text));
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
    this.switchDue = false;
    this.byLength = null;
    this.table = new Int32Array(0);
    this.codes = new Uint32Array(0);
    this.values = [];
    this.counts = new Float64Array(0);
  }

  private pushNumber(text: string, start: number, end: number): void {
    let numbers = this.numbers!;
    if (this.length === numbers.length) numbers = this.numbers = grow(numbers);
    scanner.read(text, start, end);
    numbers[this.length] = scanner.value;
    if (!scanner.printsBack) this.exceptions!.set(this.length, detach(text, start, end));
    this.length++;
  }
}

/** Number(text) when `text` is decimal number text (see NumberScanner), else NaN. */
export function numberValue(text: string): number {
  scanner.read(text, 0, text.length);
  return scanner.value;
}

/** Whether cellText gives back `text` from the number storage alone (no exception kept). */
export function printsBack(text: string): boolean {
  scanner.read(text, 0, text.length);
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
 * '007', '1e3'); anything else is not a number. Reads text[start, end) in place and keeps the
 * results in fields, so reading a cell allocates nothing, and `Number()`/`String()` are called
 * only for rare long or exponent forms.
 */
class NumberScanner {
  /** The number, or NaN for text that is not decimal number text (and for ''). */
  value = NaN;
  /** Whether String(value) === text (or text is '' and value NaN): cellText needs no copy of the text. */
  printsBack = false;
  private mantissa = 0;

  read(text: string, start: number, end: number): void {
    const n = end - start;
    const negative = n > 0 && text.charCodeAt(start) === MINUS;
    const intStart = negative ? start + 1 : start;
    this.mantissa = 0;
    const intEnd = this.readDigits(text, intStart, end);
    const hasDot = intEnd < end && text.charCodeAt(intEnd) === DOT;
    const digitsEnd = hasDot ? this.readDigits(text, intEnd + 1, end) : intEnd;
    const intDigits = intEnd - intStart;
    const fracDigits = hasDot ? digitsEnd - intEnd - 1 : 0;
    if (intDigits + fracDigits === 0) return this.notANumber(n === 0);
    if (digitsEnd < end) return this.readExponentForm(text, start, digitsEnd, end);
    // Up to 15 digits the mantissa is an exact integer and one division by an exact power of ten
    // rounds correctly, so this equals Number(text) (the classic fast path, Clinger 1990).
    if (intDigits + fracDigits > 15) this.value = +text.slice(start, end);
    else this.value = (negative ? -this.mantissa : this.mantissa) / POWERS_OF_TEN[fracDigits]!;
    const plainInteger = intDigits === 1 || (intDigits > 1 && text.charCodeAt(intStart) !== ZERO);
    const plainFraction = !hasDot || (fracDigits > 0 && text.charCodeAt(end - 1) !== ZERO);
    // String() never writes leading zeros, trailing fraction zeros or a bare dot; within 15
    // significant digits it writes the digits back unchanged, except for -0 and below 1e-6.
    if (!plainInteger || !plainFraction) this.printsBack = false;
    else if (n > 15) this.printsBack = String(this.value) === text.slice(start, end);
    else this.printsBack = this.value === 0 ? n === 1 : Math.abs(this.value) >= 1e-6;
  }

  /** Adds the digits from `from` on to `mantissa`; returns where they stop. */
  private readDigits(text: string, from: number, end: number): number {
    let mantissa = this.mantissa;
    let i = from;
    while (i < end) {
      const digit = text.charCodeAt(i) - ZERO;
      if (digit < 0 || digit > 9) break;
      mantissa = mantissa * 10 + digit;
      i++;
    }
    this.mantissa = mantissa;
    return i;
  }

  private readExponentForm(text: string, start: number, at: number, end: number): void {
    let i = at;
    if ((text.charCodeAt(i) | 0x20) !== 0x65) return this.notANumber(false); // e or E
    const sign = text.charCodeAt(++i);
    if (sign === MINUS || sign === PLUS) i++;
    if (i === end || this.readDigits(text, i, end) !== end) return this.notANumber(false);
    const written = text.slice(start, end);
    const value = +written;
    if (!Number.isFinite(value)) return this.notANumber(false);
    this.value = value;
    this.printsBack = String(value) === written;
  }

  private notANumber(empty: boolean): void {
    this.value = NaN;
    this.printsBack = empty;
  }
}

const scanner = new NumberScanner();

/**
 * FNV-1a over the UTF-16 code units of text[start, end), cut to 30 bits: a full 32-bit value would
 * not stay a small integer in V8, and every hash passed around would be boxed.
 */
export function fieldHash(text: string, start: number, end: number): number {
  let hash = 0x811c9dc5 | 0;
  for (let i = start; i < end; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 0x01000193);
  return hash & 0x3fffffff;
}

/**
 * text[start, end) as a string that does not hold on to `text`. V8 keeps substrings of 13+
 * characters as views into their parent, so one kept cell could keep a whole megabyte chunk alive.
 */
function detach(text: string, start: number, end: number): string {
  const cell = text.slice(start, end);
  return cell.length < 13 ? cell : (' ' + cell).slice(1);
}

function grow<A extends Uint32Array | Float64Array | Int32Array>(array: A): A {
  const bigger = new (array.constructor as new (length: number) => A)(Math.max(16, array.length * 2));
  bigger.set(array);
  return bigger;
}

export interface TableBuilderOptions {
  readonly dictionaryCap?: number;
  /** Rows and distinct values per column expected (a batch like the previous one), to size storage up front. */
  readonly expected?: { readonly rows: number; readonly distinct: readonly number[] };
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
    const expected = options.expected;
    this.columns = names.map(
      (name, c) => new ColumnBuilder(name, options.dictionaryCap, expected === undefined ? null : { rows: expected.rows, distinct: expected.distinct[c] ?? 0 }),
    );
    if (expected !== undefined) this.lineOfRow = new Uint32Array(Math.max(INITIAL_CAPACITY, expected.rows));
    this.firstRowIndex = options.firstRowIndex ?? 0;
    this.headerIssues = options.headerIssues ?? [];
  }

  get rowCount(): number {
    return this.rows;
  }

  /** Distinct values per column so far. */
  get distinct(): number[] {
    return this.columns.map((column) => column.distinct);
  }

  /** `line`: 1-based line the row starts on; `unclosedQuote`: its last field ran to the end of the file. */
  addRow(fields: readonly string[], line: number, unclosedQuote = false): void {
    const width = this.columns.length;
    const filled = Math.min(fields.length, width);
    for (let c = 0; c < filled; c++) this.columns[c]!.push(fields[c]!);
    this.padRow(filled);
    if (fields.length !== width) this.reportShape(fields, line);
    if (unclosedQuote) this.report({ line, kind: 'unclosed-quote', expected: width, found: fields.length });
    this.addLine(line);
  }

  /**
   * Records [from, to) of a block of plain records (parse.ts), column by column; strings are made
   * only for values met for the first time.
   */
  addPlainRecords(records: PlainRecords, from: number, to: number): void {
    const columns = this.columns;
    const filled = Math.min(records.width, columns.length);
    for (let c = 0; c < filled; c++) columns[c]!.pushField(records, c, from, to);
    for (let c = filled; c < columns.length; c++) for (let r = from; r < to; r++) columns[c]!.push('');
    for (let r = from; r < to; r++) {
      const line = records.lines[r]!;
      if (records.width !== columns.length) this.reportShape(plainFields(records, r), line);
      this.addLine(line);
    }
  }

  /** Missing cells of a short row are empty. */
  private padRow(filled: number): void {
    for (let c = filled; c < this.columns.length; c++) this.columns[c]!.push('');
  }

  private addLine(line: number): void {
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
      this.report({ line, kind: 'too-many-fields', expected: width, found: fields.length, extra: fields.slice(width).map((cell) => detach(cell, 0, cell.length)) });
    }
  }

  private report(issue: Omit<RowIssue, 'row'>): void {
    this.rowIssues.push({ ...issue, row: this.firstRowIndex + this.rows });
  }
}
