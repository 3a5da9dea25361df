/**
 * Builds column storage (columns.ts) row by row, or a block of rows column by column, without an
 * object per row or per cell.
 *
 * Each column starts dictionary-encoded. When its distinct values outgrow the cap and nearly all
 * of them, and of its cells, (all but one in NON_NUMBER_SHARE) are empty or decimal number text
 * ('12', '-0.5', '1.50', '007', '1e3'), it moves to number storage: a Float64Array holding
 * Number(text) (NaN for other text), plus the raw text of every cell that `String(value)` would
 * not give back ('1.50', '007', 'n/a', '12 504', later stray text). Either way `cellText` gives back the parsed text
 * unchanged. Requiring only decimal syntax, not the exact `String(value)` form, lets
 * fixed-decimal exports ('12.50') leave the dictionary too; tolerating a few other texts lets a
 * measurement with missing-value spellings ('NA', 'n/a') or the odd grouped number leave it.
 */
import { codesFor, valuesHeldBy, widenedCodes, withPackedValues, type Codes, type Column, type HeaderIssue, type RowIssue, type Table } from './columns.ts';
import { hashBytes, plainFields, type PlainRecords } from './parse.ts';
import { utf8Bytes, utf8Text } from './utf8-text.ts';

export const DEFAULT_DICTIONARY_CAP = 4096;

/** What a column builder can be told to expect (see the ColumnBuilder constructor). */
export interface ExpectedColumn {
  readonly rows: number;
  readonly distinct: number;
  readonly numbers?: boolean;
}
/**
 * A column past the cap moves to number storage when at most 1 in this many of its distinct values,
 * and 1 in this many of its cells, hold something other than a number or nothing.
 */
export const NON_NUMBER_SHARE = 8;

const INITIAL_CAPACITY = 1024;
/** Hash table slots to start with; a power of two, doubled whenever the table is half full. */
const INITIAL_SLOTS = 64;
/** Distinct values the per-value arrays are made for at first. */
const INITIAL_VALUES = 32;

/**
 * The dictionary is our own, rather than a Map keyed by strings: a cell arrives as UTF-8 bytes in
 * the file's buffer with a hash the scanner computed while reading them (parse.ts), and is
 * compared in place with the bytes of the stored values. The table is open addressing with
 * linear probing.
 *
 * Two shortcuts for identifier columns, where every cell is a new value:
 * - While the cells come in strictly ascending byte order (exports sorted by their key), each is
 *   new by that fact alone, and the hash table is not even built; it is built from the stored
 *   values the first time a cell is not greater than the one before.
 * - Values become strings only when the column is built: ASCII values are cut from one string of
 *   all their bytes, which is far cheaper than a string made from bytes a million times over.
 */
export class ColumnBuilder {
  readonly name: string;
  private readonly cap: number;
  private length = 0;
  // Dictionary storage, emptied once the column holds numbers.
  /** As narrow as the values so far allow (columns.ts Codes), widened as they come (widenedCodes). */
  private codes: Codes;
  /** The values' strings; undefined until `build` for those read as bytes (see valueTexts). */
  private values: (string | undefined)[] = [];
  private counts: Uint32Array<ArrayBuffer>;
  /** Every cell so far was new and greater (byte by byte) than the one before: no hash table yet. */
  private ascending = true;
  /** Every stored value's bytes are ASCII. */
  private asciiBytes = true;
  /**
   * The UTF-8 bytes of every value, one after another: value c is
   * valueBytes[valueStart[c], valueStart[c + 1]).
   */
  private valueBytes = new Uint8Array(256);
  /** valueBytes as a DataView, for comparing four bytes at a time; replaced with valueBytes. */
  private valueWords = wordsOf(this.valueBytes);
  private valueStart: Int32Array<ArrayBuffer>;
  /**
   * Hash table: slot i is table[2i] = the value's hash and table[2i + 1] = its code + 1 (0: free).
   * The hash sits beside the code so that a probe reads one cache line.
   */
  private table: Int32Array;
  /** Distinct values so far that are neither empty nor decimal number text (counted until the cap). */
  private nonNumbers = 0;
  /** Whether the dictionary outgrew the cap: the storage was chosen for good. */
  private pastCap = false;
  /** The dictionary outgrew the cap holding numbers: switch after storing the current cell. */
  private switchDue = false;
  // Number storage.
  private numbers: Float64Array | null = null;
  private exceptions: Map<number, string> | null = null;
  /** Decimals of cells written with a fixed count of them (see NumberColumn.fixedDigits); made on first need. */
  private fixedDigits: Uint8Array | null = null;

  /**
   * `expected` sizes the storage up front when the caller can tell (the previous batch of the same
   * file): the rows, and the distinct values; `numbers` starts the column in number storage (the
   * previous batch ended there), rather than learning again, batch after batch, that it holds
   * numbers.
   */
  constructor(name: string, dictionaryCap: number = DEFAULT_DICTIONARY_CAP, expected: ExpectedColumn | null = null) {
    this.name = name;
    this.cap = dictionaryCap;
    const distinct = Math.max(INITIAL_VALUES, expected?.distinct ?? 0);
    let slots = INITIAL_SLOTS;
    while (slots < 2 * distinct) slots *= 2;
    this.table = new Int32Array(2 * slots);
    this.counts = new Uint32Array(distinct + 1);
    this.valueStart = new Int32Array(distinct + 1);
    this.codes = codesFor(Math.max(INITIAL_CAPACITY, expected?.rows ?? 0), expected?.distinct ?? 0);
    if (expected?.numbers === true) {
      this.pastCap = true;
      this.numbers = new Float64Array(this.codes.length);
      this.exceptions = new Map();
      this.codes = new Uint8Array(0);
    }
  }

  /** Whether the column holds numbers (number storage) at this point. */
  get holdsNumbers(): boolean {
    return this.numbers !== null;
  }

  /** Distinct values in the dictionary so far (0 once the column holds numbers). */
  get distinct(): number {
    return this.values.length;
  }

  get rowCount(): number {
    return this.length;
  }

  push(text: string): void {
    const bytes = utf8Bytes(text);
    this.pushBytes(bytes, 0, bytes.length, hashBytes(bytes, 0, bytes.length), text);
  }

  /**
   * Adds field `field` of records [from, to) of a block: one column at a time, so that one
   * dictionary is in the processor's cache while its cells are looked up.
   */
  pushField(records: PlainRecords, field: number, from: number, to: number): void {
    const { bytes, bounds, hashes, width } = records;
    const stride = width + 1;
    let r = from;
    while (r < to) {
      if (this.numbers !== null) r = this.pushNumberCells(records, field, r, to);
      else if (!this.ascending) r = this.pushKnownValues(records, field, r, to);
      else if (this.pastCap) r = this.pushAscendingValues(records, field, r, to);
      if (r === to) break;
      // A new value, a cell of an ascending run before the cap, or the cell that ends a run: the general path, one cell.
      const at = r * stride + field;
      this.pushBytes(bytes, bounds[at]!, bounds[at + 1]! - 1, hashes[at]!, null);
      r++;
    }
  }

  /**
   * The common case of a dictionary column, with the builder's arrays held in locals: cells of
   * values already in the dictionary, from record `from` on, up to the first new value (the
   * general path adds it). Returns the record it stopped at.
   */
  private pushKnownValues(records: PlainRecords, field: number, from: number, to: number): number {
    const { bytes, words: cellWords, bounds, hashes, width } = records;
    const stride = width + 1;
    if (this.codes.length < this.length + (to - from)) this.codes = resized(this.codes, roomFor(this.codes.length, this.length + (to - from)));
    const { table, valueStart, valueBytes, valueWords, counts, codes } = this;
    const mask = (table.length >> 1) - 1;
    let length = this.length;
    let r = from;
    rows: for (; r < to; r++) {
      const at = r * stride + field;
      const start = bounds[at]!;
      const size = bounds[at + 1]! - 1 - start;
      const hash = hashes[at]!;
      for (let i = hash & mask; ; i = (i + 1) & mask) {
        const slot = table[2 * i + 1]!;
        if (slot === 0) break rows;
        if (table[2 * i] !== hash) continue;
        const code = slot - 1;
        const stored = valueStart[code]!;
        if (valueStart[code + 1]! - stored === size && (size < 4 ? sameBytes(valueBytes, stored, bytes, start, size) : sameWords(valueWords, stored, cellWords, start, size))) {
          counts[code]! += 1;
          codes[length++] = code;
          break;
        }
      }
    }
    this.length = length;
    return r;
  }

  /**
   * The common case of an identifier column, with the builder's arrays held in locals: cells each
   * new and greater than the one before, past the cap (no cell counted as a number any more). From
   * record `from` on, up to the first cell that is not greater: the run ends there, and the hash
   * table is made (continuesAscending). Returns the record it stopped at.
   */
  private pushAscendingValues(records: PlainRecords, field: number, from: number, to: number): number {
    const { bytes, words, bounds, width } = records;
    const stride = width + 1;
    const rows = to - from;
    const values = this.values;
    let count = values.length;
    if (this.codes.length < this.length + rows) this.codes = resized(this.codes, roomFor(this.codes.length, this.length + rows));
    this.codes = widenedCodes(this.codes, count + rows);
    if (this.counts.length <= count + rows) {
      const room = roomFor(this.counts.length, count + rows + 1);
      this.counts = resized(this.counts, room);
      this.valueStart = resized(this.valueStart, room);
    }
    const { codes, counts, valueStart } = this;
    let valueBytes = this.valueBytes;
    let length = this.length;
    let stored = valueStart[count]!;
    let previous = count > 0 ? valueStart[count - 1]! : stored;
    let high = 0;
    let r = from;
    for (; r < to; r++) {
      const at = r * stride + field;
      const start = bounds[at]!;
      const size = bounds[at + 1]! - 1 - start;
      if (count > 0 && compareWords(words, start, start + size, this.valueWords, previous, stored) <= 0) break;
      if (stored + size > valueBytes.length) {
        valueBytes = resized(valueBytes, Math.max(2 * valueBytes.length, stored + size));
        this.setValueBytes(valueBytes);
      }
      for (let k = 0; k < size; k++) high |= valueBytes[stored + k] = bytes[start + k]!;
      values.push(undefined);
      previous = stored;
      stored += size;
      valueStart[count + 1] = stored;
      counts[count]! += 1;
      codes[length++] = count++;
    }
    if (high >= 0x80) this.asciiBytes = false;
    this.length = length;
    if (r < to) {
      this.ascending = false;
      this.hashStoredValues();
    }
    return r;
  }

  /** pushNumber for records [from, to) of a block, the room made once; returns `to`. */
  private pushNumberCells(records: PlainRecords, field: number, from: number, to: number): number {
    const { bytes, bounds, width } = records;
    const stride = width + 1;
    this.numberRoom(this.length + (to - from));
    for (let r = from, at = from * stride + field; r < to; r++, at += stride) this.storeNumber(bytes, bounds[at]!, bounds[at + 1]! - 1, null);
    return to;
  }

  /** Makes room for `rows` rows in all, so that storage need not grow by doubling (and copying) up to there. */
  reserve(rows: number): void {
    if (this.numbers !== null) {
      if (rows > this.numbers.length) this.numbers = resized(this.numbers, rows);
      if (this.fixedDigits !== null && rows > this.fixedDigits.length) this.fixedDigits = resized(this.fixedDigits, rows);
      return;
    }
    if (rows > this.codes.length) this.codes = resized(this.codes, rows);
    // Every cell so far a new value (an identifier): its values will be about as many as its rows.
    const count = this.values.length;
    if (count > 0 && count === this.length && rows + 1 > this.counts.length) {
      this.counts = resized(this.counts, rows + 1);
      this.valueStart = resized(this.valueStart, rows + 1);
      const bytesPerValue = this.valueStart[count]! / count;
      this.setValueBytes(resized(this.valueBytes, Math.max(this.valueBytes.length, Math.ceil(bytesPerValue * rows * 1.05))));
    }
  }

  /**
   * The column as built so far. The builder must not be used afterwards. With `packValues`, a
   * column of mostly distinct ASCII values (an identifier) keeps them as their bytes, made into
   * strings only when read (columns.ts `withPackedValues`).
   */
  build(packValues = false): Column {
    if (this.numbers !== null) {
      return { kind: 'number', name: this.name, length: this.length, values: this.numbers, exceptions: this.exceptions ?? new Map(), fixedDigits: this.fixedDigits };
    }
    // A plain loop: Array.from goes through the typed array's iterator, ~100 ms for a million values.
    const counts = new Array<number>(this.values.length);
    for (let code = 0; code < counts.length; code++) counts[code] = this.counts[code]!;
    if (packValues && this.asciiBytes && 2 * this.values.length > this.length) {
      const starts = this.valueStart.subarray(0, counts.length + 1);
      const packed = { bytes: this.valueBytes.subarray(0, starts[counts.length]!), starts, ascending: this.ascending };
      this.table = new Int32Array(0);
      return withPackedValues({ kind: 'text', name: this.name, length: this.length, codes: this.codes, counts }, packed);
    }
    const values = this.valueTexts();
    // Needed no more; a reader kept alive must not keep them (tens of MB for a million values).
    this.table = new Int32Array(0);
    this.setValueBytes(new Uint8Array(0));
    this.valueStart = new Int32Array(0);
    this.counts = new Uint32Array(0);
    return { kind: 'text', name: this.name, length: this.length, codes: this.codes, values, counts };
  }

  /**
   * Every value as a string. Values read as bytes get theirs now: ASCII ones cut from one string
   * of all the stored bytes, others decoded one by one (throwing InvalidUtf8Error for bytes that
   * are not UTF-8: this is where a file's bytes are checked).
   */
  private valueTexts(): string[] {
    const values = this.values;
    const stored = this.valueStart;
    const all = this.asciiBytes ? utf8Text(this.valueBytes, 0, stored[values.length]!) : null;
    for (let code = 0; code < values.length; code++) {
      if (values[code] !== undefined) continue;
      values[code] = all !== null ? all.slice(stored[code]!, stored[code + 1]!) : utf8Text(this.valueBytes, stored[code]!, stored[code + 1]!);
    }
    return values as string[];
  }

  private setValueBytes(bytes: Uint8Array<ArrayBuffer>): void {
    this.valueBytes = bytes;
    this.valueWords = wordsOf(bytes);
  }

  /** Adds the cell bytes[start, end) with its hash; `text` is its text when the caller has it. */
  private pushBytes(bytes: Uint8Array, start: number, end: number, hash: number, text: string | null): void {
    if (this.numbers !== null) {
      this.pushNumber(bytes, start, end, text);
      return;
    }
    const code = this.ascending && this.continuesAscending(bytes, start, end)
      ? this.addValue(bytes, start, end, text)
      : this.codeOf(bytes, start, end, hash, text);
    this.counts[code]! += 1;
    if (this.length === this.codes.length) this.codes = grow(this.codes);
    this.codes[this.length++] = code;
    if (this.switchDue) this.switchToNumbers();
  }

  /** Whether the cell is greater than the last value stored; if not, the ascending run ends here. */
  private continuesAscending(bytes: Uint8Array, start: number, end: number): boolean {
    const count = this.values.length;
    if (count > 0 && compareBytes(bytes, start, end, this.valueBytes, this.valueStart[count - 1]!, this.valueStart[count]!) <= 0) {
      this.ascending = false;
      this.hashStoredValues();
      return false;
    }
    return true;
  }

  private codeOf(bytes: Uint8Array, start: number, end: number, hash: number, text: string | null): number {
    const table = this.table;
    const mask = (table.length >> 1) - 1;
    const length = end - start;
    for (let i = hash & mask; ; i = (i + 1) & mask) {
      const slot = table[2 * i + 1]!;
      if (slot === 0) {
        const code = this.addValue(bytes, start, end, text);
        table[2 * i] = hash;
        table[2 * i + 1] = code + 1;
        if (4 * this.values.length > table.length) this.growTable();
        return code;
      }
      if (table[2 * i] === hash) {
        const code = slot - 1;
        const stored = this.valueStart[code]!;
        if (this.valueStart[code + 1]! - stored === length && sameBytes(this.valueBytes, stored, bytes, start, length)) return code;
      }
    }
  }

  private addValue(bytes: Uint8Array, start: number, end: number, text: string | null): number {
    const code = this.values.length;
    if (code === valuesHeldBy(this.codes)) this.codes = widenedCodes(this.codes, code + 1);
    const length = end - start;
    this.values.push(text ?? undefined);
    if (code + 1 >= this.counts.length) {
      this.counts = grow(this.counts);
      this.valueStart = grow(this.valueStart);
    }
    const stored = this.valueStart[code]!;
    if (stored + length > this.valueBytes.length) {
      const bigger = new Uint8Array(Math.max(2 * this.valueBytes.length, stored + length));
      bigger.set(this.valueBytes.subarray(0, stored));
      this.setValueBytes(bigger);
    }
    const valueBytes = this.valueBytes;
    let high = 0;
    for (let k = 0; k < length; k++) high |= valueBytes[stored + k] = bytes[start + k]!;
    if (high >= 0x80) this.asciiBytes = false;
    this.valueStart[code + 1] = stored + length;
    if (!this.pastCap) this.countNumber(bytes, start, end);
    return code;
  }

  /** Counts a new value that is not a number, and at the cap decides the column's storage. */
  private countNumber(bytes: Uint8Array, start: number, end: number): void {
    if (end > start) {
      scanner.read(bytes, start, end);
      if (Number.isNaN(scanner.value)) this.nonNumbers++;
    }
    if (this.values.length <= this.cap) return;
    this.pastCap = true;
    this.switchDue = this.nonNumbers * NON_NUMBER_SHARE <= this.values.length && this.nonNumberCells() * NON_NUMBER_SHARE <= this.length;
  }

  /**
   * Cells so far holding a value that is neither empty nor a number. Number storage keeps each such
   * cell's text in its exceptions, one entry per cell: a frequent missing spelling ('NA' in a third
   * of the rows) would cost far more there than a dictionary code.
   */
  private nonNumberCells(): number {
    let cells = 0;
    const stored = this.valueStart;
    for (let code = 0; code < this.values.length; code++) {
      if (stored[code + 1] === stored[code]) continue;
      scanner.read(this.valueBytes, stored[code]!, stored[code + 1]!);
      if (Number.isNaN(scanner.value)) cells += this.counts[code]!;
    }
    return cells;
  }

  /** After an ascending run: the hash table, made from the stored values' bytes. */
  private hashStoredValues(): void {
    const count = this.values.length;
    let entries = this.table.length;
    while (entries < 4 * count) entries *= 2;
    const table = new Int32Array(entries);
    const stored = this.valueStart;
    for (let code = 0; code < count; code++) insert(table, hashBytes(this.valueBytes, stored[code]!, stored[code + 1]!), code + 1);
    this.table = table;
  }

  /** The hash table, twice as large: its entries move over with the hashes they hold. */
  private growTable(): void {
    const old = this.table;
    const table = new Int32Array(old.length * 2);
    for (let j = 1; j < old.length; j += 2) if (old[j] !== 0) insert(table, old[j - 1]!, old[j]!);
    this.table = table;
  }

  private switchToNumbers(): void {
    const texts = this.valueTexts();
    const valueOfCode = new Float64Array(texts.length);
    // Per code: 0 prints back, a count of decimals for a fixed form, -1 keeps its text.
    const formOfCode = new Int8Array(texts.length);
    texts.forEach((text, code) => {
      const bytes = utf8Bytes(text);
      scanner.read(bytes, 0, bytes.length);
      valueOfCode[code] = scanner.value;
      formOfCode[code] = scanner.printsBack ? 0 : scanner.fixed > 0 ? scanner.fixed : -1;
    });
    const numbers = new Float64Array(this.codes.length);
    const exceptions = new Map<number, string>();
    for (let row = 0; row < this.length; row++) {
      const code = this.codes[row]!;
      numbers[row] = valueOfCode[code]!;
      const form = formOfCode[code]!;
      if (form < 0) exceptions.set(row, texts[code]!);
      else if (form > 0) (this.fixedDigits ??= new Uint8Array(numbers.length))[row] = form;
    }
    this.numbers = numbers;
    this.exceptions = exceptions;
    this.switchDue = false;
    this.table = new Int32Array(0);
    this.setValueBytes(new Uint8Array(0));
    this.valueStart = new Int32Array(0);
    this.codes = new Uint8Array(0);
    this.values = [];
    this.counts = new Uint32Array(0);
  }

  private pushNumber(bytes: Uint8Array, start: number, end: number, text: string | null): void {
    if (this.length === this.numbers!.length) this.numberRoom(this.length + 1);
    this.storeNumber(bytes, start, end, text);
  }

  /** Number storage for `rows` rows at least, grown by doubling (fixed decimals alongside). */
  private numberRoom(rows: number): void {
    if (this.numbers!.length >= rows) return;
    const room = roomFor(this.numbers!.length, rows);
    this.numbers = resized(this.numbers!, room);
    if (this.fixedDigits !== null) this.fixedDigits = resized(this.fixedDigits, room);
  }

  /** The cell bytes[start, end) as the next row of number storage, which has room for it. */
  private storeNumber(bytes: Uint8Array, start: number, end: number, text: string | null): void {
    const row = this.length++;
    scanner.read(bytes, start, end);
    this.numbers![row] = scanner.value;
    if (scanner.printsBack) return;
    if (scanner.fixed > 0) (this.fixedDigits ??= new Uint8Array(this.numbers!.length))[row] = scanner.fixed;
    else this.exceptions!.set(row, text ?? utf8Text(bytes, start, end));
  }
}

/** Puts (hash, code + 1) into the first free slot from the hash's own (linear probing). */
function insert(table: Int32Array, hash: number, codePlusOne: number): void {
  const mask = (table.length >> 1) - 1;
  let i = hash & mask;
  while (table[2 * i + 1] !== 0) i = (i + 1) & mask;
  table[2 * i] = hash;
  table[2 * i + 1] = codePlusOne;
}

/** Byte-wise comparison of a[aStart, aEnd) with b[bStart, bEnd): negative, 0 or positive. */
export function compareBytes(a: Uint8Array, aStart: number, aEnd: number, b: Uint8Array, bStart: number, bEnd: number): number {
  const length = Math.min(aEnd - aStart, bEnd - bStart);
  for (let k = 0; k < length; k++) {
    const difference = a[aStart + k]! - b[bStart + k]!;
    if (difference !== 0) return difference;
  }
  return aEnd - aStart - (bEnd - bStart);
}

/** compareBytes over DataViews, four bytes at a time: read big-endian, a word orders as its bytes do. */
function compareWords(a: DataView, aStart: number, aEnd: number, b: DataView, bStart: number, bEnd: number): number {
  const length = Math.min(aEnd - aStart, bEnd - bStart);
  let k = 0;
  for (; k + 4 <= length; k += 4) {
    const x = a.getUint32(aStart + k);
    const y = b.getUint32(bStart + k);
    if (x !== y) return x < y ? -1 : 1;
  }
  for (; k < length; k++) {
    const difference = a.getUint8(aStart + k) - b.getUint8(bStart + k);
    if (difference !== 0) return difference;
  }
  return aEnd - aStart - (bEnd - bStart);
}

/** The bytes as a DataView over exactly them (a view of part of a buffer stays within it). */
function wordsOf(bytes: Uint8Array): DataView {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** sameBytes for length ≥ 4, four bytes at a time; the last four bytes may overlap the ones before. */
function sameWords(stored: DataView, at: number, bytes: DataView, start: number, length: number): boolean {
  const last = length - 4;
  for (let k = 0; k < last; k += 4) if (stored.getInt32(at + k, true) !== bytes.getInt32(start + k, true)) return false;
  return stored.getInt32(at + last, true) === bytes.getInt32(start + last, true);
}

function sameBytes(stored: Uint8Array, at: number, bytes: Uint8Array, start: number, length: number): boolean {
  for (let k = 0; k < length; k++) if (stored[at + k] !== bytes[start + k]) return false;
  return true;
}

/** Number(text) when `text` is decimal number text (see NumberScanner), else NaN. */
export function numberValue(text: string): number {
  const bytes = utf8Bytes(text);
  scanner.read(bytes, 0, bytes.length);
  return scanner.value;
}

/** Whether cellText gives back `text` from the number storage alone (no exception kept). */
export function printsBack(text: string): boolean {
  const bytes = utf8Bytes(text);
  scanner.read(bytes, 0, bytes.length);
  return scanner.printsBack;
}

/** What number storage makes of a cell's text (see NumberScanner's fields). */
export interface NumberText {
  /** The number, or NaN for text that is not decimal number text (and for ''). */
  readonly value: number;
  /** Whether String(value) gives the text back (or the text is ''). */
  readonly printsBack: boolean;
  /** When not: the count of decimals if the text is value.toFixed(fixed), else 0 (the text is then kept as is). */
  readonly fixed: number;
}

/**
 * `text` read with number storage's own grammar, for code that moves cells between storages
 * (concat-tables.ts). The result is shared and valid until the next read: copy its fields.
 */
export function readNumberText(text: string): NumberText {
  const bytes = utf8Bytes(text);
  scanner.read(bytes, 0, bytes.length);
  return scanner;
}

const ZERO = 0x30;
const MINUS = 0x2d;
const PLUS = 0x2b;
const DOT = 0x2e;

/** Powers of ten exactly representable as doubles. */
const POWERS_OF_TEN = Array.from({ length: 16 }, (_, k) => 10 ** k);

/**
 * Reads decimal number text `-?(digits[.digits]|.digits)([eE][+-]?digits)?` ('12', '-0.5', '1.50',
 * '007', '1e3'); anything else is not a number. Reads the UTF-8 bytes[start, end) in place and
 * keeps the results in fields, so reading a cell allocates nothing, and `Number()`/`String()` are
 * called only for rare long or exponent forms.
 */
class NumberScanner {
  /** The number, or NaN for text that is not decimal number text (and for ''). */
  value = NaN;
  /** Whether String(value) === text (or text is '' and value NaN): cellText needs no copy of the text. */
  printsBack = false;
  /**
   * When the text is not what String() writes but is value.toFixed(fixed) ("134.00", "0.50"): its
   * count of decimals, else 0. Within 15 digits toFixed rounds the double back to the same digits;
   * -0 ("-0.00") is excluded, as toFixed drops its sign.
   */
  fixed = 0;
  private mantissa = 0;

  read(bytes: Uint8Array, start: number, end: number): void {
    const n = end - start;
    const negative = n > 0 && bytes[start] === MINUS;
    const intStart = negative ? start + 1 : start;
    this.mantissa = 0;
    const intEnd = this.readDigits(bytes, intStart, end);
    const hasDot = intEnd < end && bytes[intEnd] === DOT;
    const digitsEnd = hasDot ? this.readDigits(bytes, intEnd + 1, end) : intEnd;
    const intDigits = intEnd - intStart;
    const fracDigits = hasDot ? digitsEnd - intEnd - 1 : 0;
    if (intDigits + fracDigits === 0) return this.notANumber(n === 0);
    if (digitsEnd < end) return this.readExponentForm(bytes, start, digitsEnd, end);
    // Up to 15 digits the mantissa is an exact integer and one division by an exact power of ten
    // rounds correctly, so this equals Number(text) (the classic fast path, Clinger 1990).
    if (intDigits + fracDigits > 15) this.value = +utf8Text(bytes, start, end);
    else this.value = (negative ? -this.mantissa : this.mantissa) / POWERS_OF_TEN[fracDigits]!;
    const plainInteger = intDigits === 1 || (intDigits > 1 && bytes[intStart] !== ZERO);
    const plainFraction = !hasDot || (fracDigits > 0 && bytes[end - 1] !== ZERO);
    // String() never writes leading zeros, trailing fraction zeros or a bare dot; within 15
    // significant digits it writes the digits back unchanged, except for -0 and below 1e-6.
    if (!plainInteger || !plainFraction) this.printsBack = false;
    else if (n > 15) this.printsBack = String(this.value) === utf8Text(bytes, start, end);
    else this.printsBack = this.value === 0 ? n === 1 : Math.abs(this.value) >= 1e-6;
    this.fixed =
      !this.printsBack && plainInteger && fracDigits > 0 && intDigits + fracDigits <= 15 && !(negative && this.value === 0) ? fracDigits : 0;
  }

  /** Adds the digits from `from` on to `mantissa`; returns where they stop. */
  private readDigits(bytes: Uint8Array, from: number, end: number): number {
    let mantissa = this.mantissa;
    let i = from;
    while (i < end) {
      const digit = bytes[i]! - ZERO;
      if (digit < 0 || digit > 9) break;
      mantissa = mantissa * 10 + digit;
      i++;
    }
    this.mantissa = mantissa;
    return i;
  }

  private readExponentForm(bytes: Uint8Array, start: number, at: number, end: number): void {
    let i = at;
    if ((bytes[i]! | 0x20) !== 0x65) return this.notANumber(false); // e or E
    const sign = bytes[++i];
    if (sign === MINUS || sign === PLUS) i++;
    if (i === end || this.readDigits(bytes, i, end) !== end) return this.notANumber(false);
    const written = utf8Text(bytes, start, end);
    const value = +written;
    if (!Number.isFinite(value)) return this.notANumber(false);
    this.value = value;
    this.printsBack = String(value) === written;
    this.fixed = 0;
  }

  private notANumber(empty: boolean): void {
    this.value = NaN;
    this.printsBack = empty;
    this.fixed = 0;
  }
}

const scanner = new NumberScanner();

/**
 * A copy of `text` that does not hold on to a larger string: V8 keeps substrings of 13+
 * characters as views into their parent, so one kept cell could keep a whole chunk alive.
 */
function detach(text: string): string {
  return text.length < 13 ? text : (' ' + text).slice(1);
}

/** A copy of `array` with room for `length` entries. */
function resized<A extends Uint8Array | Uint16Array | Uint32Array | Float64Array | Int32Array>(array: A, length: number): A {
  const bigger = new (array.constructor as new (length: number) => A)(length);
  bigger.set(array);
  return bigger;
}

/** `length` doubled (from INITIAL_CAPACITY at least) until it holds `needed`. */
function roomFor(length: number, needed: number): number {
  let room = Math.max(INITIAL_CAPACITY, length);
  while (room < needed) room *= 2;
  return room;
}

/** A typed array twice as long (at least 16), holding `array`'s values first. */
export function grow<A extends Uint8Array | Uint16Array | Uint32Array | Float64Array | Int32Array>(array: A): A {
  const bigger = new (array.constructor as new (length: number) => A)(Math.max(16, array.length * 2));
  bigger.set(array);
  return bigger;
}

export interface TableBuilderOptions {
  readonly dictionaryCap?: number;
  /**
   * A batch like the previous one: its rows, and per column the distinct values and whether it
   * ended in number storage, to size and choose storage up front.
   */
  readonly expected?: { readonly rows: number; readonly distinct: readonly number[]; readonly numbers?: readonly boolean[] };
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
      (name, c) =>
        new ColumnBuilder(
          name,
          options.dictionaryCap,
          expected === undefined ? null : { rows: expected.rows, distinct: expected.distinct[c] ?? 0, numbers: expected.numbers?.[c] ?? false },
        ),
    );
    if (expected !== undefined) this.lineOfRow = new Uint32Array(Math.max(INITIAL_CAPACITY, expected.rows));
    this.firstRowIndex = options.firstRowIndex ?? 0;
    this.headerIssues = options.headerIssues ?? [];
  }

  get rowCount(): number {
    return this.rows;
  }

  /** Makes room for `rows` rows in all, in every column (see ColumnBuilder.reserve). */
  reserve(rows: number): void {
    for (const column of this.columns) column.reserve(rows);
    if (rows > this.lineOfRow.length) this.lineOfRow = resized(this.lineOfRow, rows);
  }

  /** Distinct values per column so far. */
  get distinct(): number[] {
    return this.columns.map((column) => column.distinct);
  }

  /** Per column, whether it holds numbers (number storage) so far. */
  get numberColumns(): boolean[] {
    return this.columns.map((column) => column.holdsNumbers);
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

  /** With `packValues`, identifier-like columns keep their values as bytes (ColumnBuilder.build). */
  build(packValues = false): Table {
    return {
      names: this.names,
      columns: this.columns.map((column) => column.build(packValues)),
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
