/**
 * Joining the tables of consecutive segments of one file (read-segment.ts) into the table that
 * reading the whole file in one go gives: same cells, same storage per column, same dictionaries.
 *
 * Each segment chose every column's storage from its own cells (columns-builder.ts), so a column
 * may come as a dictionary in one segment and as numbers in the next. The whole file's choice is
 * made by the builder once, at the cell that brings the (cap + 1)-th distinct value, from the cells
 * before it; that moment is replayed here over the parts (StorageReplay), then every part is put in
 * the chosen storage. Both storages are lossless, so a part can be moved to the other one.
 *
 * Costs, for a million rows: one typed-array pass per part and column; per distinct value, not per
 * cell, for anything that needs a string or a lookup. Identifier columns, whose values are all new,
 * skip the lookup when a segment's values all sort after those already joined, as they do in
 * exports sorted by their key.
 */
import { codesFor, columnBuffers, valueText, valuesHeldBy, withPackedValues, type Codes, type Column, type NumberColumn, type PackedTexts, type RowIssue, type Table, type TextColumn } from './columns.ts';
import { compareBytes, DEFAULT_DICTIONARY_CAP, NON_NUMBER_SHARE, readNumberText } from './columns-builder.ts';
import { releaseBuffer } from './release-buffers.ts';

export interface ConcatOptions {
  /**
   * The dictionary cap the whole file would be read with (see ReadOptions.dictionaryCap). The
   * storage chosen for a column depends on it alone, not on the storages the parts came in.
   */
  readonly dictionaryCap?: number;
  /**
   * Give up the first part: where its typed arrays have room for every row (a reader that
   * reserved storage for the whole file), they become the joined table's, filled in place. Its
   * rows are then neither copied nor held twice: joining needs memory for the other parts only.
   * The first part must not be used afterwards.
   */
  readonly reuseFirst?: boolean;
  /**
   * Join each column's cells (a dictionary's codes; numbers, their texts and decimals) the first
   * time they are read, not now. A dictionary column's values and counts, and every column's
   * storage, are joined at once. For a table read to be profiled: the profile of a dictionary
   * column is made from its values and counts alone (its codes are read only to find the rows of
   * cells that are not numbers), and a command line that only drafts a recipe never reads them.
   * The parts must then not be changed while the table is in use, nor given up but by releaseParts.
   */
  readonly cellsWhenRead?: boolean;
  /**
   * Give up every part's storage (release-buffers.ts) as soon as its column is joined, but for what
   * the joined table keeps: with reuseFirst, joining then holds at most one column twice, not the
   * other parts until the end (or, where the first part's arrays lack room, the first part too).
   * With cellsWhenRead, a column's parts are given up when its cells are joined, on first reading.
   * The parts must not be used afterwards.
   */
  readonly releaseParts?: boolean;
}

/**
 * How a column is joined: in the first part's storage (reuseFirst), now or when read
 * (cellsWhenRead); `whenJoined` is called once cells joined later are.
 */
interface JoinMode {
  readonly reuse: boolean;
  readonly later: boolean;
  readonly whenJoined?: () => void;
}

/**
 * `parts`: tables of consecutive segments of one file, in file order, with the same column names,
 * their rows and lines already numbered from the file's start (rebaseRows). Header issues are taken
 * from the first. One part is returned as it is. The parts are not changed.
 */
export function concatTables(parts: readonly Table[], options: ConcatOptions = {}): Table {
  const first = parts[0];
  if (first === undefined) throw new Error('concatTables needs at least one table');
  if (parts.length === 1) return first;
  checkSameNames(parts);
  const cap = options.dictionaryCap ?? DEFAULT_DICTIONARY_CAP;
  const rowCounts = parts.map((part) => part.rowCount);
  const reuse = options.reuseFirst === true;
  const mode: JoinMode = { reuse, later: options.cellsWhenRead === true };
  const release = options.releaseParts === true;
  const columns = first.names.map((_, c) => {
    const columnParts = parts.map((part) => part.columns[c]!);
    // Set before any cells are joined later: whenJoined runs on a first reading, after this returns.
    let joined: Column | null = null;
    const giveUpParts = (): void => releaseAllBut(columnParts.map(columnBuffers), columnBuffers(joined!));
    joined = joinColumn(columnParts, rowCounts, cap, release && mode.later ? { ...mode, whenJoined: giveUpParts } : mode);
    // With cellsWhenRead every column's cells are joined later, and its parts go then.
    if (release && !mode.later) giveUpParts();
    return joined;
  });
  const lineOfRow = joinUint32(parts.map((part) => part.lineOfRow), rowCounts, reuse);
  if (release) releaseAllBut(parts.map((part) => buffersOf(part.lineOfRow)), buffersOf(lineOfRow));
  const rowIssues: RowIssue[] = [];
  for (const part of parts) for (const issue of part.rowIssues) rowIssues.push(issue);
  return { names: first.names, columns, rowCount: sum(rowCounts), lineOfRow, rowIssues, headerIssues: first.headerIssues };
}

/** Releases the parts' buffers, but for those in `kept` (the joined column's, some of which may be the first part's). */
function releaseAllBut(partBuffers: readonly Set<ArrayBuffer>[], kept: ReadonlySet<ArrayBuffer>): void {
  for (const buffers of partBuffers) for (const buffer of buffers) if (!kept.has(buffer)) releaseBuffer(buffer);
}

function buffersOf(array: Uint32Array): Set<ArrayBuffer> {
  return new Set(array.buffer instanceof ArrayBuffer ? [array.buffer] : []);
}

function checkSameNames(parts: readonly Table[]): void {
  const names = parts[0]!.names;
  for (const part of parts) {
    if (part.names.length !== names.length || part.names.some((name, c) => name !== names[c])) {
      throw new Error(`concatTables: the parts have different columns (${names.join(', ')} / ${part.names.join(', ')})`);
    }
  }
}

function joinColumn(parts: readonly Column[], rowCounts: readonly number[], cap: number, mode: JoinMode): Column {
  if (storageOfWhole(parts, rowCounts, cap) === 'number') {
    const join = (): NumberColumn => joinAsNumbers(parts, rowCounts, mode.reuse);
    return mode.later ? numberCellsWhenRead(parts[0]!.name, sum(rowCounts), join, mode.whenJoined) : join();
  }
  return joinPackedAscending(parts, rowCounts, mode) ?? joinAsText(parts, rowCounts, mode);
}

/** A number column whose cells are joined by `join` the first time any of them is read; then `whenJoined`. */
function numberCellsWhenRead(name: string, length: number, join: () => NumberColumn, whenJoined?: () => void): NumberColumn {
  const cells = joinedOnce(join, whenJoined);
  const column = { kind: 'number', name, length };
  for (const key of ['values', 'exceptions', 'fixedDigits'] as const) {
    Object.defineProperty(column, key, { enumerable: true, configurable: true, get: () => cells()[key] });
  }
  return column as NumberColumn;
}

/** `column` with its codes made by `join` the first time they are read; then `whenJoined`. */
function codesWhenRead(column: TextColumn, join: () => Codes, whenJoined?: () => void): TextColumn {
  return Object.defineProperty(column, 'codes', { enumerable: true, configurable: true, get: joinedOnce(join, whenJoined) });
}

/** What `join` makes, made at the first call and kept; `whenJoined` runs once it is made. */
function joinedOnce<T extends object>(join: () => T, whenJoined?: () => void): () => T {
  let joined: T | null = null;
  return () => {
    if (joined === null) {
      joined = join();
      whenJoined?.();
    }
    return joined;
  };
}

/**
 * `array` itself, seen over all of its buffer from where it starts, when that holds `rows` entries
 * (a reader's storage is made larger than its rows; `lineOfRow` is a view of its first rows).
 */
function withRoomFor<A extends Uint32Array | Uint16Array | Int32Array | Float64Array | Uint8Array>(array: A, rows: number): A | null {
  if (!(array.buffer instanceof ArrayBuffer)) return null;
  const room = Math.floor((array.buffer.byteLength - array.byteOffset) / array.BYTES_PER_ELEMENT);
  if (room < rows) return null;
  return new (array.constructor as new (buffer: ArrayBuffer, byteOffset: number, length: number) => A)(array.buffer, array.byteOffset, room);
}

// ---------------------------------------------------------------------------------------------
// The storage the whole file would have chosen.

type Storage = 'text' | 'number';

function storageOfWhole(parts: readonly Column[], rowCounts: readonly number[], cap: number): Storage {
  const replay = new StorageReplay(cap);
  for (let k = 0; k < parts.length; k++) {
    const part = parts[k]!;
    const chosen = part.kind === 'text' ? replay.textPart(part, rowCounts[k]!) : replay.numberPart(part, rowCounts[k]!);
    if (chosen !== null) return chosen;
  }
  return 'text'; // never past the cap: the dictionary stays
}

/**
 * The column builder's state up to the cap (distinct values, those that are not numbers, cells
 * holding those), carried from part to part until the cell that brings the (cap + 1)-th distinct
 * value, where the builder's rule is applied (ColumnBuilder.countNumber). Only values up to the
 * cap, and rows up to that cell, are visited.
 */
class StorageReplay {
  private readonly cap: number;
  /** Distinct values so far → whether it is neither empty nor a number. */
  private readonly seen = new Map<string, boolean>();
  private rows = 0;
  private nonNumberValues = 0;
  private nonNumberCells = 0;

  constructor(cap: number) {
    this.cap = cap;
  }

  /** The storage, when chosen within this part; null to go on with the next. */
  textPart(part: TextColumn, rows: number): Storage | null {
    const { counts, codes } = part;
    // Per code of the part: 1 when not a number, 0 otherwise. Codes come in order of first
    // appearance, so the rows before code c's first one hold codes below c only.
    const nonNumber = new Uint8Array(counts.length);
    for (let code = 0; code < counts.length; code++) {
      if (!((counts[code] ?? 0) > 0)) continue;
      // One value at a time: a packed part (an identifier) makes no more strings than the cap's.
      const value = valueText(part, code);
      const known = this.seen.get(value);
      if (known !== undefined) {
        nonNumber[code] = known ? 1 : 0;
        continue;
      }
      const isNonNumber = notANumber(value);
      nonNumber[code] = isNonNumber ? 1 : 0;
      if (this.seen.size >= this.cap) {
        const row = firstRowOf(codes, code, rows);
        return this.choose(isNonNumber, this.nonNumberCells + cellsFlagged(codes, nonNumber, row), this.rows + row);
      }
      this.add(value, isNonNumber);
    }
    for (let code = 0; code < counts.length; code++) if (nonNumber[code] === 1) this.nonNumberCells += counts[code] ?? 0;
    this.rows += rows;
    return null;
  }

  numberPart(part: NumberColumn, rows: number): Storage | null {
    const texts = new NumberCellTexts(part);
    for (let row = 0; row < rows; row++) {
      const text = texts.at(row);
      const isNonNumber = text !== '' && Number.isNaN(part.values[row]!);
      if (!this.seen.has(text)) {
        if (this.seen.size >= this.cap) return this.choose(isNonNumber, this.nonNumberCells, this.rows + row);
        this.add(text, isNonNumber);
      }
      if (isNonNumber) this.nonNumberCells++;
    }
    this.rows += rows;
    return null;
  }

  private add(value: string, isNonNumber: boolean): void {
    this.seen.set(value, isNonNumber);
    if (isNonNumber) this.nonNumberValues++;
  }

  /**
   * The builder's rule at the value past the cap (`isNonNumber`: whether it is not a number),
   * met on a cell with `rowsBefore` rows, `cellsBefore` of them not numbers, before it.
   */
  private choose(isNonNumber: boolean, cellsBefore: number, rowsBefore: number): Storage {
    const distinct = this.seen.size + 1;
    const nonNumberValues = this.nonNumberValues + (isNonNumber ? 1 : 0);
    return nonNumberValues * NON_NUMBER_SHARE <= distinct && cellsBefore * NON_NUMBER_SHARE <= rowsBefore ? 'number' : 'text';
  }
}

/** Neither empty nor a number in number storage's grammar: a cell number storage keeps as text. */
function notANumber(text: string): boolean {
  return text !== '' && Number.isNaN(readNumberText(text).value);
}

function firstRowOf(codes: Codes, code: number, rows: number): number {
  for (let row = 0; row < rows; row++) if (codes[row] === code) return row;
  throw new Error(`concatTables: code ${code} counted but not found in the codes`);
}

/** Rows before `end` whose code is flagged. */
function cellsFlagged(codes: Codes, flagged: Uint8Array, end: number): number {
  let cells = 0;
  for (let row = 0; row < end; row++) cells += flagged[codes[row]!]!;
  return cells;
}

/**
 * The text of a number-stored cell (what cellText gives), made once per distinct number and count
 * of decimals rather than once per cell. -0 shares 0's entry: String and toFixed write them alike.
 */
class NumberCellTexts {
  private readonly column: NumberColumn;
  private readonly plain = new Map<number, string>();
  /** By count of decimals. */
  private readonly fixed: Map<number, string>[] = [];

  constructor(column: NumberColumn) {
    this.column = column;
  }

  at(row: number): string {
    const { exceptions, values, fixedDigits } = this.column;
    const raw = exceptions.size === 0 ? undefined : exceptions.get(row);
    if (raw !== undefined) return raw;
    const value = values[row]!;
    if (Number.isNaN(value)) return '';
    const digits = fixedDigits === null ? 0 : fixedDigits[row]!;
    const texts = digits === 0 ? this.plain : (this.fixed[digits] ??= new Map());
    let text = texts.get(value);
    if (text === undefined) {
      text = digits === 0 ? String(value) : value.toFixed(digits);
      texts.set(value, text);
    }
    return text;
  }
}

// ---------------------------------------------------------------------------------------------
// Number storage.

function joinAsNumbers(parts: readonly Column[], rowCounts: readonly number[], reuse: boolean): NumberColumn {
  const forms = parts.map((part) => (part.kind === 'text' ? numberFormsOf(part) : null));
  const rows = sum(rowCounts);
  const first = parts[0]!;
  // The first part's arrays, filled in place (reuseFirst), or new ones.
  const inPlace = reuse && first.kind === 'number' ? withRoomFor(first.values, rows) : null;
  const values = inPlace ?? new Float64Array(rows);
  const exceptions = inPlace !== null && first.kind === 'number' && first.exceptions instanceof Map ? first.exceptions : new Map<number, string>();
  const needsFixed = parts.some((part, k) => (part.kind === 'number' ? part.fixedDigits !== null : forms[k]!.anyFixed));
  const firstFixed = inPlace !== null && first.kind === 'number' && first.fixedDigits !== null ? withRoomFor(first.fixedDigits, rows) : null;
  const fixedDigits = needsFixed ? (firstFixed ?? new Uint8Array(rows)) : null;
  let offset = 0;
  parts.forEach((part, k) => {
    const length = rowCounts[k]!;
    if (k === 0 && inPlace !== null && part.kind === 'number') {
      // Its values and exceptions are where they belong already; its fixed digits too, unless
      // they had to move to a new array.
      if (part.fixedDigits !== null && fixedDigits !== firstFixed) fixedDigits!.set(part.fixedDigits.subarray(0, length), 0);
    } else if (part.kind === 'number') {
      values.set(part.values.subarray(0, length), offset);
      if (part.fixedDigits !== null) fixedDigits!.set(part.fixedDigits.subarray(0, length), offset);
      part.exceptions.forEach((text, row) => exceptions.set(row + offset, text));
    } else {
      writeTextAsNumbers(part, forms[k]!, length, offset, values, exceptions, fixedDigits);
    }
    offset += length;
  });
  return { kind: 'number', name: parts[0]!.name, length: rows, values, exceptions, fixedDigits };
}

/** Per code of a dictionary: its number, and how number storage writes it back (as switchToNumbers does). */
interface NumberForms {
  readonly valueOfCode: Float64Array;
  /** 0: String(value) prints it back; > 0: a count of decimals; -1: the text is kept as an exception. */
  readonly formOfCode: Int8Array;
  readonly anyFixed: boolean;
}

function numberFormsOf(part: TextColumn): NumberForms {
  const count = part.values.length;
  const valueOfCode = new Float64Array(count);
  const formOfCode = new Int8Array(count);
  let anyFixed = false;
  for (let code = 0; code < count; code++) {
    const read = readNumberText(part.values[code]!);
    valueOfCode[code] = read.value;
    formOfCode[code] = read.printsBack ? 0 : read.fixed > 0 ? read.fixed : -1;
    if (formOfCode[code]! > 0 && (part.counts[code] ?? 0) > 0) anyFixed = true;
  }
  return { valueOfCode, formOfCode, anyFixed };
}

function writeTextAsNumbers(
  part: TextColumn,
  forms: NumberForms,
  rows: number,
  offset: number,
  values: Float64Array,
  exceptions: Map<number, string>,
  fixedDigits: Uint8Array | null,
): void {
  const { codes } = part;
  const { valueOfCode, formOfCode } = forms;
  for (let row = 0; row < rows; row++) {
    const code = codes[row]!;
    values[offset + row] = valueOfCode[code]!;
    const form = formOfCode[code]!;
    if (form < 0) exceptions.set(offset + row, part.values[code]!);
    else if (form > 0) fixedDigits![offset + row] = form;
  }
}

// ---------------------------------------------------------------------------------------------
// Dictionary storage.

/** A part's dictionary codes in the joined dictionary: `base + code`, or `remap[code]`. */
type CodeMap = { readonly base: number } | { readonly remap: Uint32Array };

function joinAsText(columns: readonly Column[], rowCounts: readonly number[], mode: JoinMode): TextColumn {
  const parts = columns.map((column, k) => (column.kind === 'text' ? column : numbersAsText(column, rowCounts[k]!)));
  const dictionary = joinDictionaries(parts);
  const rows = sum(rowCounts);
  const column = { kind: 'text' as const, name: columns[0]!.name, length: rows, codes: NO_CODES, values: dictionary.values, counts: dictionary.counts };
  // The first part's codes stay what they are (its values come first in the joined dictionary):
  // with reuseFirst they are filled on in place.
  const firstMap = dictionary.maps[0]!;
  const reuse = mode.reuse && columns[0]!.kind === 'text' && 'base' in firstMap && firstMap.base === 0;
  const join = (): Codes => joinCodes(parts, dictionary.maps, rowCounts, reuse, dictionary.values.length);
  return mode.later ? codesWhenRead(column, join, mode.whenJoined) : { ...column, codes: join() };
}

/** Stands for codes joined only when read. */
const NO_CODES = new Uint32Array(0);

/**
 * The parts' codes in the joined dictionary (`maps`, `distinct` values), in one array; `reuse`:
 * filled on in the first part's, when they are wide enough for the joined dictionary.
 */
function joinCodes(parts: readonly TextColumn[], maps: readonly CodeMap[], rowCounts: readonly number[], reuse: boolean, distinct: number): Codes {
  const rows = sum(rowCounts);
  const inPlace = reuse ? inPlaceCodes(parts[0]!.codes, rows, distinct) : null;
  const codes = inPlace ?? codesFor(rows, distinct);
  let offset = 0;
  parts.forEach((part, k) => {
    const map = maps[k]!;
    const length = rowCounts[k]!;
    const partCodes = part.codes;
    if (k === 0 && inPlace !== null) {
      // Already in place.
    } else if (!('base' in map)) {
      const remap = map.remap;
      for (let row = 0; row < length; row++) codes[offset + row] = remap[partCodes[row]!]!;
    } else if (map.base === 0) {
      codes.set(partCodes.subarray(0, length), offset);
    } else {
      const base = map.base;
      for (let row = 0; row < length; row++) codes[offset + row] = partCodes[row]! + base;
    }
    offset += length;
  });
  return codes;
}

/**
 * Parts that all kept their values as bytes in ascending order (an identifier of an export sorted
 * by its key, read with ReadOptions.packValues), each part's first value after the last value of
 * the parts before: every value is new, so the joined dictionary is the parts' one after another,
 * and stays bytes. No string is made. null when the parts are not all so.
 */
function joinPackedAscending(columns: readonly Column[], rowCounts: readonly number[], mode: JoinMode): TextColumn | null {
  const packs: PackedTexts[] = [];
  for (const column of columns) {
    if (column.kind !== 'text' || column.packed === undefined || !column.packed.ascending) return null;
    packs.push(column.packed);
  }
  if (!eachAfterTheOnesBefore(packs)) return null;
  const parts = columns as readonly TextColumn[];
  const rows = sum(rowCounts);
  const distinct = sum(parts.map((part) => part.counts.length));
  const counts = new Array<number>(distinct);
  const totalBytes = sum(packs.map((pack) => valueBytesOf(pack)));
  // With reuseFirst, filled on in the first part's storage, which a reader made for the whole file
  // (~14 MB for a million identifiers that need not be written afresh).
  const inPlace = mode.reuse ? packInPlace(packs[0]!, totalBytes, distinct) : null;
  const bytes = inPlace?.bytes ?? new Uint8Array(totalBytes);
  const starts = inPlace?.starts ?? new Int32Array(distinct + 1);
  let base = 0;
  let byteBase = 0;
  parts.forEach((part, k) => {
    const pack = packs[k]!;
    const values = part.counts.length;
    appendValues(part.counts, pack.starts, base, byteBase, counts, starts);
    if (!(k === 0 && inPlace !== null)) bytes.set(pack.bytes.subarray(pack.starts[0]!, pack.starts[values]!), byteBase);
    base += values;
    byteBase += valueBytesOf(pack);
  });
  starts[distinct] = byteBase;
  const join = (): Codes => joinAscendingCodes(parts, rowCounts, mode.reuse, distinct);
  const column = withPackedValues({ kind: 'text', name: parts[0]!.name, length: rows, codes: mode.later ? NO_CODES : join(), counts }, { bytes, starts, ascending: true });
  return mode.later ? codesWhenRead(column, join, mode.whenJoined) : column;
}

/** The parts' codes, each part's after the codes of the parts before it. */
function joinAscendingCodes(parts: readonly TextColumn[], rowCounts: readonly number[], reuse: boolean, distinct: number): Codes {
  const inPlace = reuse ? inPlaceCodes(parts[0]!.codes, sum(rowCounts), distinct) : null;
  const codes = inPlace ?? codesFor(sum(rowCounts), distinct);
  let offset = 0;
  let base = 0;
  parts.forEach((part, k) => {
    const length = rowCounts[k]!;
    if (!(k === 0 && inPlace !== null)) shiftCodes(part.codes, length, base, codes, offset);
    offset += length;
    base += part.counts.length;
  });
  return codes;
}

/** The first part's codes, to be filled on with the others', when they have room for `rows` and are wide enough for `distinct` values. */
function inPlaceCodes(codes: Codes, rows: number, distinct: number): Codes | null {
  return distinct <= valuesHeldBy(codes) ? withRoomFor(codes, rows) : null;
}

/** codes[offset + row] = from[row] + base for the part's rows. */
function shiftCodes(from: Codes, rows: number, base: number, codes: Codes, offset: number): void {
  for (let row = 0; row < rows; row++) codes[offset + row] = from[row]! + base;
}

/** A part's counts and value starts, from code `base` and byte `byteBase` of the joined ones. */
function appendValues(partCounts: readonly number[], partStarts: Int32Array, base: number, byteBase: number, counts: number[], starts: Int32Array): void {
  const first = partStarts[0]!;
  for (let code = 0; code < partCounts.length; code++) {
    counts[base + code] = partCounts[code] ?? 0;
    starts[base + code] = byteBase + partStarts[code]! - first;
  }
}

/** The first part's bytes and starts seen over `totalBytes` and `distinct` values, when its storage has room for them. */
function packInPlace(pack: PackedTexts, totalBytes: number, distinct: number): { bytes: Uint8Array; starts: Int32Array } | null {
  if (pack.starts[0] !== 0) return null;
  const bytes = withRoomFor(pack.bytes, totalBytes);
  const starts = withRoomFor(pack.starts, distinct + 1);
  return bytes === null || starts === null ? null : { bytes: bytes.subarray(0, totalBytes), starts: starts.subarray(0, distinct + 1) };
}

function valueBytesOf(pack: PackedTexts): number {
  return pack.starts[pack.starts.length - 1]! - pack.starts[0]!;
}

/** Whether each pack's first text sorts after the last text of the packs before it (each ascending in itself). */
function eachAfterTheOnesBefore(packs: readonly PackedTexts[]): boolean {
  let last: { readonly pack: PackedTexts; readonly code: number } | null = null;
  for (const pack of packs) {
    const count = pack.starts.length - 1;
    if (count === 0) continue;
    if (last !== null) {
      const { pack: before, code } = last;
      const order = compareBytes(pack.bytes, pack.starts[0]!, pack.starts[1]!, before.bytes, before.starts[code]!, before.starts[code + 1]!);
      if (order <= 0) return false;
    }
    last = { pack, code: count - 1 };
  }
  return true;
}

/**
 * The joined dictionary (values in order of first appearance, counts summed) and where each part's
 * codes go in it. A part whose values all sort after every value joined so far (an export sorted
 * by its key) adds them all, in its own order, without a lookup; from the first part that does
 * not on, values are looked up in an index of those joined so far.
 */
function joinDictionaries(parts: readonly TextColumn[]): { values: string[]; counts: number[]; maps: CodeMap[] } {
  // Made for every value being new, cut to the values there are at the end.
  const most = sum(parts.map((part) => part.values.length));
  const values = new Array<string>(most);
  const counts = new Array<number>(most).fill(0);
  const maps: CodeMap[] = [];
  const order = new AscendingParts(parts);
  let distinct = 0;
  let index: ValueIndex | null = null;
  for (let k = 0; k < parts.length; k++) {
    const part = parts[k]!;
    const partValues = part.values;
    if (index === null) {
      if (order.comesAfter(k)) {
        for (let code = 0; code < partValues.length; code++) {
          values[distinct + code] = partValues[code]!;
          counts[distinct + code] = part.counts[code] ?? 0;
        }
        maps.push({ base: distinct });
        distinct += partValues.length;
        continue;
      }
      // Room for the values so far and those of the parts to come but the last, which no one looks up.
      index = new ValueIndex(values, distinct + sum(parts.slice(k, -1).map((later) => later.values.length)));
      for (let code = 0; code < distinct; code++) index.add(code);
    }
    const isLast = k === parts.length - 1;
    const remap = new Uint32Array(partValues.length);
    for (let code = 0; code < partValues.length; code++) {
      const value = partValues[code]!;
      let joined = index.codeOf(value);
      if (joined === -1) {
        joined = distinct++;
        values[joined] = value;
        if (!isLast) index.add(joined);
      }
      remap[code] = joined;
      counts[joined]! += part.counts[code] ?? 0;
    }
    maps.push({ remap });
  }
  values.length = distinct;
  counts.length = distinct;
  return { values, counts, maps };
}

/**
 * Joined values → their codes: a hash table of (hash, code + 1) pairs in one Int32Array, open
 * addressing with linear probing, the values themselves compared in the joined dictionary. Two to
 * three times faster than a Map<string, number> here: the values are fresh strings (cut from one
 * string by the column builder) whose first hashing by the engine is what a Map pays for.
 */
class ValueIndex {
  private readonly values: readonly string[];
  private readonly table: Int32Array;
  private readonly mask: number;

  /** `values`: the joined dictionary, by code; `most`: the most codes that will be added. */
  constructor(values: readonly string[], most: number) {
    this.values = values;
    let slots = 16;
    while (slots < 2 * most) slots *= 2;
    this.table = new Int32Array(2 * slots);
    this.mask = slots - 1;
  }

  /** Adds values[code], known not to be in the index yet. */
  add(code: number): void {
    const hash = hashText(this.values[code]!);
    const table = this.table;
    let slot = hash & this.mask;
    while (table[2 * slot + 1] !== 0) slot = (slot + 1) & this.mask;
    table[2 * slot] = hash;
    table[2 * slot + 1] = code + 1;
  }

  /** The code of `value`, or -1. */
  codeOf(value: string): number {
    const hash = hashText(value);
    const table = this.table;
    for (let slot = hash & this.mask; ; slot = (slot + 1) & this.mask) {
      const entry = table[2 * slot + 1]!;
      if (entry === 0) return -1;
      if (table[2 * slot] === hash && this.values[entry - 1] === value) return entry - 1;
    }
  }
}

/** FNV-1a over the text's UTF-16 code units. */
function hashText(text: string): number {
  let hash = 0x811c9dc5 | 0;
  for (let i = 0; i < text.length; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 0x01000193);
  return hash;
}

/**
 * Whether each part's values all sort after those of the parts before it, asked part after part.
 * Gives up early on unsorted values: the parts before are scanned only for a value not below the
 * part's first value, which unsorted identifiers show within a few comparisons.
 */
class AscendingParts {
  private readonly parts: readonly TextColumn[];
  /** The greatest value of parts [0, scanned); undefined when they hold none. */
  private greatest: string | undefined;
  private scanned = 0;

  constructor(parts: readonly TextColumn[]) {
    this.parts = parts;
  }

  /** Asked for k = 0, 1, … in turn, until it first says false. */
  comesAfter(k: number): boolean {
    const values = this.parts[k]!.values;
    // Nothing before it; its own values are scanned only when a later part needs their greatest.
    if (k === 0 || values.length === 0) return true;
    const first = values[0]!;
    for (; this.scanned < k; this.scanned++) {
      for (const value of this.parts[this.scanned]!.values) {
        if (!(value < first)) return false;
        if (this.greatest === undefined || value > this.greatest) this.greatest = value;
      }
    }
    const bound = this.greatest;
    let greatest = first;
    for (const value of values) {
      if (bound !== undefined && !(value > bound)) return false;
      if (value > greatest) greatest = value;
    }
    this.greatest = greatest;
    this.scanned = k + 1;
    return true;
  }
}

/**
 * A number-stored part as a dictionary (the whole file kept its column as one). A cell's text is
 * found by how it is stored: its exception's text, empty, or its number written plainly or with a
 * count of decimals; a number storage writes each text one way only, so these keys tell texts
 * apart, and a text is made once per distinct value.
 */
function numbersAsText(column: NumberColumn, rows: number): TextColumn {
  const { exceptions, fixedDigits } = column;
  const numbers = column.values;
  const byText = new Map<string, number>();
  /** By count of decimals (0: written plainly), number → code. */
  const byNumber: Map<number, number>[] = [];
  const values: string[] = [];
  const counts: number[] = [];
  const codes = new Uint32Array(rows);
  const codeOfText = (text: string): number => {
    let code = byText.get(text);
    if (code === undefined) byText.set(text, (code = newValue(text)));
    return code;
  };
  const newValue = (text: string): number => {
    values.push(text);
    counts.push(0);
    return values.length - 1;
  };
  for (let row = 0; row < rows; row++) {
    const raw = exceptions.size === 0 ? undefined : exceptions.get(row);
    const value = numbers[row]!;
    let code: number;
    if (raw !== undefined) code = codeOfText(raw);
    else if (Number.isNaN(value)) code = codeOfText('');
    else {
      const digits = fixedDigits === null ? 0 : fixedDigits[row]!;
      const byValue = (byNumber[digits] ??= new Map());
      const known = byValue.get(value);
      if (known !== undefined) code = known;
      else byValue.set(value, (code = newValue(digits === 0 ? String(value) : value.toFixed(digits))));
    }
    counts[code]!++;
    codes[row] = code;
  }
  return { kind: 'text', name: column.name, length: rows, codes, values, counts };
}

// ---------------------------------------------------------------------------------------------

function joinUint32(arrays: readonly Uint32Array[], lengths: readonly number[], reuse: boolean): Uint32Array {
  const rows = sum(lengths);
  const inPlace = reuse ? withRoomFor(arrays[0]!, rows) : null;
  const joined = inPlace ?? new Uint32Array(rows);
  let offset = 0;
  arrays.forEach((array, k) => {
    if (k > 0 || inPlace === null) joined.set(array.subarray(0, lengths[k]!), offset);
    offset += lengths[k]!;
  });
  return inPlace === null ? joined : joined.subarray(0, rows);
}

function sum(numbers: readonly number[]): number {
  let total = 0;
  for (const n of numbers) total += n;
  return total;
}
