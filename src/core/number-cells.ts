/**
 * A number column's cells counted: the one pass over a million cells that its profile needs, in a
 * form that parts of the column counted apart add up to. A column read in parts (a file read on
 * several threads) is profiled from its parts' counts (`joinNumberCells`, number-profiles.ts),
 * without joining the parts' cells first.
 *
 * What a profile reads from the cells:
 * - the plain numbers (read as numbers, not counted by their text) as runs of equal values, with
 *   how many there are and how many are not whole;
 * - the cells counted by their text, each text with its first row: exceptions (cells that did not
 *   read as numbers), fixed-decimal cells ("134.00") and numbers a missing token spells ("-999");
 * - the empty cells.
 */
import type { NumberColumn } from './columns.ts';
import { countOnGrid, type GridFacts } from './number-grid.ts';
import { mergeRuns, NO_RUNS, runsFromSorted, type NumberRuns } from './number-runs.ts';
import { NumberTally } from './number-tally.ts';
import { sortNumbers } from './sort-numbers.ts';

/** The cells of one text, and the first row among them. */
export interface TextCells {
  count: number;
  firstRow: number;
}

export interface NumberCells {
  /** Cells counted by their text, rows counted from the part's first row. */
  readonly texts: ReadonlyMap<string, TextCells>;
  /** The other numbers ("plain"), ascending. */
  readonly plain: NumberRuns;
  readonly plainCount: number;
  /** Plain numbers that are not whole. */
  readonly plainFractions: number;
  readonly emptyCells: number;
}

/** Counted in a hash table up to this share of the cells distinct… */
const MAX_COUNTED_SHARE = 1 / 8;
/** …or this many, whichever is more. */
const MIN_COUNTED = 1024;

/**
 * The cells counted: NaN without text is an empty cell; exceptions, fixed-decimal cells ("134.00")
 * and numbers a missing token spells (`codedMissing`, "-999") are counted by their text; the
 * others, the plain numbers, are then counted by value: on a grid where one fits (number-grid.ts),
 * else in a hash table, or, past the most distinct numbers worth counting (MAX_COUNTED_SHARE),
 * sorted whole. Fixed-decimal cells are counted by number too, and get their text once per
 * distinct number: a tenth of a column of amounts can be "12.50"s.
 *
 * Each kind of cell has a loop of its own, and the loop over every cell (plainFacts) does nothing
 * else: V8 optimises a small loop sooner and compiles it faster than one that also hashed fixed
 * decimals (whose optimising compile took ~25 ms on a background thread, in a trace), and runs it
 * unoptimised, boxing every number it reads, for less time. The benchmark file's two number
 * columns, fresh processes, 10 interleaved runs each: first calls, medians, 29 + 65 → 28 + 59 ms;
 * second calls 23 + 55 → 14 + 46 ms.
 */
export function countNumberCells(column: NumberColumn, codedMissing: ReadonlySet<number>): NumberCells {
  const { length, values } = column;
  /** 1 for a cell counted by its text: the plain numbers are the others that are not NaN. */
  const byText = exceptionRows(column);
  const texts = new Map<string, TextCells>();
  for (const [row, text] of column.exceptions) if (row >= 0 && row < length) countText(texts, text, 1, row);
  if (column.fixedDigits !== null) countFixedDecimals(values, column.fixedDigits, length, byText, texts);
  if (codedMissing.size > 0) countCodedMissing(values, length, codedMissing, byText, texts);
  const facts = plainFacts(values, length, byText);
  // The storage may hold room past the column's length.
  const cells = values.subarray(0, length);
  const plain = countOnGrid(cells, byText, facts) ?? countByValue(cells, byText, facts.count);
  return { texts, plain, plainCount: facts.count, plainFractions: facts.fractions, emptyCells: facts.empty };
}

/** Cells written with fixed decimals ("134.00"), counted by their text; marked in `byText`. */
function countFixedDecimals(values: Float64Array, fixed: Uint8Array, length: number, byText: Uint8Array, texts: Map<string, TextCells>): void {
  /** By count of decimals. */
  const byDigits: NumberTally[] = [];
  for (let row = 0; row < length; row++) {
    const digits = fixed[row]!;
    const v = values[row]!;
    if (digits === 0 || byText[row] === 1 || v !== v) continue;
    (byDigits[digits] ??= new NumberTally()).add(v, 1, row);
    byText[row] = 1;
  }
  byDigits.forEach((numbers, digits) => numbers.forEach((v, count, firstRow) => countText(texts, v.toFixed(digits), count, firstRow)));
}

/** Plain cells whose number a missing token spells ("-999"), counted by their text; marked in `byText`. */
function countCodedMissing(values: Float64Array, length: number, codedMissing: ReadonlySet<number>, byText: Uint8Array, texts: Map<string, TextCells>): void {
  for (let row = 0; row < length; row++) {
    const v = values[row]!;
    if (byText[row] === 1 || !codedMissing.has(v)) continue;
    countText(texts, String(v), 1, row); // a plain cell's text
    byText[row] = 1;
  }
}

/** What the plain numbers are (the cells not NaN and not marked in `byText`), and how many cells are empty. */
interface PlainFacts extends GridFacts {
  /** Plain numbers that are not whole. */
  readonly fractions: number;
  readonly empty: number;
}

function plainFacts(values: Float64Array, length: number, byText: Uint8Array): PlainFacts {
  let count = 0;
  let fractions = 0;
  let empty = 0;
  let min = Infinity;
  let max = -Infinity;
  let negativeZero = false;
  for (let row = 0; row < length; row++) {
    if (byText[row] === 1) continue;
    const v = values[row]!;
    if (v !== v) {
      empty++;
      continue;
    }
    count++;
    if (!Number.isInteger(v)) fractions++;
    if (v < min) min = v;
    if (v > max) max = v;
    if (v === 0 && 1 / v < 0) negativeZero = true;
  }
  return { count, fractions, empty, min, max, hasFractions: fractions > 0, negativeZero };
}

/**
 * The plain numbers among `values` (not NaN, not marked in `byText`) as runs: counted in a hash
 * table, or sorted whole when more are distinct than counting pays for.
 */
function countByValue(values: Float64Array, byText: Uint8Array, plainCount: number): NumberRuns {
  if (plainCount === 0) return NO_RUNS;
  const most = Math.max(MIN_COUNTED, Math.ceil(plainCount * MAX_COUNTED_SHARE));
  const tally = new NumberTally();
  for (let row = 0; row < values.length; row++) {
    const v = values[row]!;
    if (byText[row] === 1 || v !== v) continue;
    tally.add(v, 1);
    if (tally.distinct > most) return runsFromSorted(sortNumbers(plainNumbers(values, byText, plainCount)));
  }
  return tally.runs(sortNumbers);
}

function plainNumbers(values: Float64Array, byText: Uint8Array, plainCount: number): Float64Array {
  const plain = new Float64Array(plainCount);
  let at = 0;
  for (let row = 0; row < values.length; row++) {
    const v = values[row]!;
    if (byText[row] === 0 && v === v) plain[at++] = v;
  }
  return plain;
}

/** 1 for each row of [start, start + rows) that holds one of the column's exceptions, indexed by row − start. */
export function exceptionRows(column: NumberColumn, start = 0, rows = column.length): Uint8Array {
  const isException = new Uint8Array(rows);
  for (const row of column.exceptions.keys()) if (row >= start && row < start + rows) isException[row - start] = 1;
  return isException;
}

function countText(texts: Map<string, TextCells>, text: string, count: number, row: number): void {
  const known = texts.get(text);
  if (known === undefined) texts.set(text, { count, firstRow: row });
  else {
    known.count += count;
    known.firstRow = Math.min(known.firstRow, row);
  }
}

/**
 * The cells of a column counted in parts, as if counted whole: `parts` in file order, part k's
 * rows starting at file row `firstRows[k]`.
 */
export function joinNumberCells(parts: readonly NumberCells[], firstRows: readonly number[]): NumberCells {
  const texts = new Map<string, TextCells>();
  let plain = NO_RUNS;
  let plainCount = 0;
  let plainFractions = 0;
  let emptyCells = 0;
  parts.forEach((part, k) => {
    const firstRow = firstRows[k]!;
    for (const [text, cells] of part.texts) countText(texts, text, cells.count, firstRow + cells.firstRow);
    plain = mergeRuns(plain, part.plain);
    plainCount += part.plainCount;
    plainFractions += part.plainFractions;
    emptyCells += part.emptyCells;
  });
  return { texts, plain, plainCount, plainFractions, emptyCells };
}
