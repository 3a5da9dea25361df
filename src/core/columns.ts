/**
 * Column-wise storage of a parsed table. No row objects anywhere: a million rows by twenty
 * columns must fit in a browser tab, and columns cross the worker boundary as typed arrays.
 *
 * Every column starts dictionary-encoded (`TextColumn`): a code per row plus the distinct raw
 * strings with their counts. Per-level work (cleaning, number parsing, encoding) then runs once
 * per distinct value instead of once per cell. A column whose distinct values outgrow the
 * dictionary cap while nearly all of them are plain numbers is switched to `NumberColumn` storage
 * (see columns-builder.ts), so a measurement column never holds a million strings.
 */

import { utf8Text } from './utf8-text.ts';

/** Raw text of one cell exactly as parsed (not trimmed). */
export type Cell = string;

/** ASCII texts one after another: text c is the bytes [starts[c], starts[c + 1]). */
export interface PackedTexts {
  readonly bytes: Uint8Array;
  readonly starts: Int32Array;
  /**
   * Each text is greater, byte by byte, than the one before (an export sorted by its key): then
   * no two are equal, and columns of consecutive segments join without looking a value up.
   */
  readonly ascending: boolean;
}

/**
 * A text column's codes, as narrow as its values allow: one byte a cell while they number at most
 * 256, two up to 65,536, four beyond. Most columns of an export have a handful of levels, and a
 * million rows of four-byte codes is 4 MB a column, 68 MB for the benchmark file's seventeen:
 * memory the page holds for as long as the file is open, and that every read writes afresh.
 */
export type Codes = Uint8Array | Uint16Array | Uint32Array;

/** Codes for `length` rows, wide enough for `distinct` values. */
export function codesFor(length: number, distinct: number): Codes {
  if (distinct <= 1 << 8) return new Uint8Array(length);
  if (distinct <= 1 << 16) return new Uint16Array(length);
  return new Uint32Array(length);
}

/** How many values codes of this width can tell apart. */
export function valuesHeldBy(codes: Codes): number {
  return 2 ** (8 * codes.BYTES_PER_ELEMENT);
}

/** `codes` as codes wide enough for `distinct` values, of the same length: themselves when they are. */
export function widenedCodes(codes: Codes, distinct: number): Codes {
  if (distinct <= valuesHeldBy(codes)) return codes;
  const wider = codesFor(codes.length, distinct);
  wider.set(codes);
  return wider;
}

export interface TextColumn {
  readonly kind: 'text';
  readonly name: string;
  /** Number of rows in this column (equals the table's row count). */
  readonly length: number;
  /** codes[row] indexes `values`. Length >= `length` (capacity may exceed it). */
  readonly codes: Codes;
  /** Distinct raw cell strings in order of first appearance. */
  readonly values: readonly string[];
  /** counts[code] = number of rows holding values[code]. */
  readonly counts: readonly number[];
  /**
   * The values as their bytes, when the column was built to cross to another thread without a
   * string per value (`withPackedValues`): `values` are then made from them only when first read,
   * and a writer that only copies them (an identifier passed through) never makes them at all.
   */
  readonly packed?: PackedTexts;
}

/**
 * Storage for a column of plain numbers with many distinct values. Lossless: a cell written as its
 * number with a fixed count of decimals ("134.00", "0.50") keeps that count in `fixedDigits`; any
 * other cell whose raw text is not exactly `String(values[row])` keeps its text in `exceptions`
 * (missing spellings, stray text, "007", " 7"), so `cellText` always gives back what the file said.
 */
export interface NumberColumn {
  readonly kind: 'number';
  readonly name: string;
  readonly length: number;
  /** values[row] is the number written in plain JavaScript syntax, NaN otherwise. Length >= `length`. */
  readonly values: Float64Array;
  /** row index → raw text, for every cell whose text is neither String(values[row]) nor fixed (below). */
  readonly exceptions: ReadonlyMap<number, string>;
  /**
   * fixedDigits[row] > 0: the cell's text is values[row].toFixed(fixedDigits[row]) ("134.00"),
   * kept as a byte per row instead of a text per cell. null when no cell is written so.
   */
  readonly fixedDigits: Uint8Array | null;
}

export type Column = TextColumn | NumberColumn;

/** A structural problem met while reading rows; nothing is dropped without one of these. */
export interface RowIssue {
  /** 1-based physical line number in the file where the record starts. */
  readonly line: number;
  /** 0-based data row index (row 0 is the first row after the header). */
  readonly row: number;
  readonly kind: 'too-few-fields' | 'too-many-fields' | 'unclosed-quote';
  readonly expected: number;
  readonly found: number;
  /** For too-many-fields: the extra cells, kept so nothing is lost. */
  readonly extra?: readonly string[];
}

export interface HeaderIssue {
  /** 0-based column position. */
  readonly column: number;
  readonly kind: 'blank' | 'duplicate';
  readonly original: string;
  readonly renamedTo: string;
}

/** A table held column-wise. */
export interface Table {
  readonly names: readonly string[];
  readonly columns: readonly Column[];
  readonly rowCount: number;
  /** 1-based line number where each data row starts (rows spanning lines inside quotes count once). */
  readonly lineOfRow: Uint32Array;
  readonly rowIssues: readonly RowIssue[];
  readonly headerIssues: readonly HeaderIssue[];
}

/** The raw text of one cell exactly as the file wrote it, whatever the column's storage. */
export function cellText(column: Column, row: number): string {
  // A packed column's text is made for this cell alone: a preview's rows need not make a million.
  if (column.kind === 'text') return valueText(column, column.codes[row] ?? 0);
  const raw = column.exceptions.get(row);
  if (raw !== undefined) return raw;
  const v = column.values[row] ?? NaN;
  if (Number.isNaN(v)) return '';
  const digits = column.fixedDigits?.[row] ?? 0;
  return digits > 0 ? v.toFixed(digits) : String(v);
}

/**
 * A text column whose `values` are made from `packed` (ASCII) the first time they are read. Reading
 * `values` is then the only cost: a column read on another thread and passed through to the
 * output unchanged (an identifier) needs its million strings neither made there, nor copied
 * across, nor made here.
 */
export function withPackedValues(column: Omit<TextColumn, 'values' | 'packed'>, packed: PackedTexts): TextColumn {
  let values: string[] | null = null;
  const made = (): string[] => {
    const { bytes, starts } = packed;
    const count = starts.length - 1;
    const all = utf8Text(bytes, 0, starts[count] ?? 0);
    values = new Array<string>(count);
    for (let code = 0; code < count; code++) values[code] = all.slice(starts[code]!, starts[code + 1]!);
    return values;
  };
  const { kind, name, length, codes, counts } = column;
  return Object.defineProperty({ kind, name, length, codes, counts, packed }, 'values', { enumerable: true, get: () => values ?? made() }) as TextColumn;
}

/**
 * The text of dictionary code `code`, made alone when the column keeps its values packed: a few
 * values (examples, the first values past a cap) are read without making the million.
 */
export function valueText(column: TextColumn, code: number): string {
  const packed = column.packed;
  if (packed === undefined) return column.values[code] ?? '';
  return utf8Text(packed.bytes, packed.starts[code] ?? 0, packed.starts[code + 1] ?? 0);
}

/**
 * The buffers a table's typed arrays hold, each its own: what to transfer (not copy) when the table
 * is handed to another thread. The table must not be used on this side afterwards.
 */
export function tableBuffers(table: Table): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  if (table.lineOfRow.buffer instanceof ArrayBuffer) buffers.add(table.lineOfRow.buffer);
  for (const column of table.columns) addColumnBuffers(column, buffers);
  return [...buffers];
}

/** The buffers one column's typed arrays hold (see tableBuffers). */
export function columnBuffers(column: Column): Set<ArrayBuffer> {
  const buffers = new Set<ArrayBuffer>();
  addColumnBuffers(column, buffers);
  return buffers;
}

function addColumnBuffers(column: Column, buffers: Set<ArrayBuffer>): void {
  const add = (array: { readonly buffer: ArrayBufferLike } | null): void => {
    if (array !== null && array.buffer instanceof ArrayBuffer) buffers.add(array.buffer);
  };
  if (column.kind === 'text') {
    add(column.codes);
    // Typed only in a table made to cross (crossingTable).
    if (ArrayBuffer.isView(column.counts)) add(column.counts as unknown as Uint32Array);
    if (column.packed !== undefined) {
      add(column.packed.bytes);
      add(column.packed.starts);
    }
  } else {
    add(column.values);
    add(column.fixedDigits);
  }
}

/**
 * A table as it crosses to another thread. Structured cloning copies a plain array element by
 * element (half a million identifiers' counts: 40–75 ms, paid by both threads) and reads `values`
 * of a packed column, so making a string per value: the counts cross as a typed array, which
 * `tableBuffers` transfers, and a packed column without `values`. `arrivedTable` undoes both on
 * the other side. The table must not be used on this side once sent.
 */
export function crossingTable(table: Table): Table {
  const columns = table.columns.map((column): Column => {
    if (column.kind !== 'text') return column;
    const { kind, name, length, codes, packed } = column;
    const counts = new Uint32Array(column.counts.length);
    for (let code = 0; code < counts.length; code++) counts[code] = column.counts[code]!;
    // Not a whole TextColumn while it crosses (typed counts; no `values` when packed): arrivedTable makes it one again.
    const crossing = packed === undefined ? { kind, name, length, codes, counts, values: column.values } : { kind, name, length, codes, counts, packed };
    return crossing as unknown as Column;
  });
  return { ...table, columns };
}

/** A table from another thread (crossingTable): counts as an array again, packed columns given `values` made when first read. */
export function arrivedTable(table: Table): Table {
  const columns = table.columns.map((column): Column => {
    if (column.kind !== 'text') return column;
    const counts = ArrayBuffer.isView(column.counts) ? countsArray(column.counts as unknown as Uint32Array) : column.counts;
    const { kind, name, length, codes, packed } = column;
    return packed === undefined ? { kind, name, length, codes, values: column.values, counts } : withPackedValues({ kind, name, length, codes, counts }, packed);
  });
  return { ...table, columns };
}

function countsArray(typed: Uint32Array): number[] {
  const counts = new Array<number>(typed.length);
  for (let code = 0; code < typed.length; code++) counts[code] = typed[code]!;
  return counts;
}
