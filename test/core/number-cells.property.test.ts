/**
 * A number column counted in parts (core number-cells.ts), as a column read on several threads is
 * profiled (number-profiles.ts profileNumberParts): wherever the parts are cut, the counts add up to
 * the whole column's, and the profile is the whole column's, examples of invalid cells included.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { NumberColumn } from '../../src/core/columns.ts';
import { missingNumbers } from '../../src/core/missing.ts';
import { countNumberCells, joinNumberCells, type NumberCells } from '../../src/core/number-cells.ts';
import { profileNumberParts } from '../../src/core/number-profiles.ts';
import { DEFAULT_PROFILE_OPTIONS, profileColumn, type ProfileOptions } from '../../src/core/profile.ts';

/** One cell as a reader stores it in a number column. */
type Cell =
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'fixed'; readonly value: number; readonly digits: number }
  | { readonly kind: 'text'; readonly text: string }
  | { readonly kind: 'empty' };

const cell: fc.Arbitrary<Cell> = fc.oneof(
  { weight: 6, arbitrary: fc.oneof(fc.integer({ min: -40, max: 40 }), fc.integer({ min: -400, max: 400 }).map((n) => n / 100), fc.constantFrom(0, -0, -999)).map((value) => ({ kind: 'number' as const, value })) },
  // Wide-ranging numbers push a part past the grid and the hash table, to the sorted array.
  { weight: 1, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e9, max: 1e9 }).map((value) => ({ kind: 'number' as const, value })) },
  { weight: 2, arbitrary: fc.record({ value: fc.integer({ min: 0, max: 30 }).map((n) => n / 2), digits: fc.constantFrom(2, 3) }).map((f) => ({ kind: 'fixed' as const, ...f })) },
  { weight: 2, arbitrary: fc.constantFrom('NA', 'n/a', '12 504', '1,5', 'no reading', '  ', '-999.0').map((text) => ({ kind: 'text' as const, text })) },
  { weight: 1, arbitrary: fc.constant({ kind: 'empty' as const }) },
);

function columnOf(cells: readonly Cell[]): NumberColumn {
  const values = new Float64Array(cells.length);
  const fixedDigits = new Uint8Array(cells.length);
  const exceptions = new Map<number, string>();
  cells.forEach((c, row) => {
    values[row] = c.kind === 'number' || c.kind === 'fixed' ? c.value : NaN;
    if (c.kind === 'fixed') fixedDigits[row] = c.digits;
    if (c.kind === 'text') exceptions.set(row, c.text);
  });
  return { kind: 'number', name: 'reading', length: cells.length, values, exceptions, fixedDigits: fixedDigits.some((d) => d > 0) ? fixedDigits : null };
}

/** Rows `from` to `to` of `column` as a part of its own, its rows numbered from 0, with room for more (a reader's storage). */
function partOf(column: NumberColumn, from: number, to: number): NumberColumn {
  const room = (to - from) * 2 + 3;
  const values = new Float64Array(room).fill(7);
  values.set(column.values.subarray(from, to));
  const fixedDigits = column.fixedDigits === null ? null : new Uint8Array(room).fill(2);
  fixedDigits?.set(column.fixedDigits!.subarray(from, to));
  const exceptions = new Map<number, string>();
  for (const [row, text] of column.exceptions) if (row >= from && row < to) exceptions.set(row - from, text);
  return { ...column, length: to - from, values, exceptions, fixedDigits };
}

/** Cut points: where each part starts, the first at 0. */
function cutsOf(length: number, picks: readonly number[]): number[] {
  return [0, ...new Set(picks.map((p) => Math.floor(p * length)).filter((p) => p > 0 && p < length))].sort((a, b) => a - b);
}

const cells = fc.array(cell, { minLength: 1, maxLength: 3000, size: 'max' });
/** Where to cut, as shares of the column's length. */
const cutPicks = fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { maxLength: 4 });

/** The column of `cellList`, where its parts start (`cuts`) and end (`ends`). */
function cutUp(cellList: readonly Cell[], picks: readonly number[]): { whole: NumberColumn; cuts: number[]; ends: number[] } {
  const whole = columnOf(cellList);
  const cuts = cutsOf(whole.length, picks);
  return { whole, cuts, ends: [...cuts.slice(1), whole.length] };
}

/** Counted cells as plain data: texts in key order, runs as arrays. */
function plainCells(cells: NumberCells): unknown {
  return {
    texts: [...cells.texts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)),
    values: Array.from(cells.plain.values.subarray(0, cells.plain.length)),
    counts: Array.from(cells.plain.counts.subarray(0, cells.plain.length)),
    plainCount: cells.plainCount,
    plainFractions: cells.plainFractions,
    emptyCells: cells.emptyCells,
  };
}

const options = fc.constantFrom<ProfileOptions>(
  DEFAULT_PROFILE_OPTIONS,
  // A missing spelling that is a number: its cells are counted by text, and are missing.
  { missingTokens: [...DEFAULT_PROFILE_OPTIONS.missingTokens, '-999'] },
  // Decimal commas: plain numbers with a fraction become invalid cells, with examples.
  { ...DEFAULT_PROFILE_OPTIONS, format: { decimal: ',', group: '' } },
);

describe('a number column counted in parts', () => {
  it('adds up to the whole column counted, wherever it is cut', () => {
    fc.assert(
      fc.property(cells, cutPicks, options, (cellList, picks, chosen) => {
        const { whole, cuts, ends } = cutUp(cellList, picks);
        const codedMissing = missingNumbers(chosen.missingTokens);
        const parts = cuts.map((from, k) => countNumberCells(partOf(whole, from, ends[k]!), codedMissing));
        expect(plainCells(joinNumberCells(parts, cuts))).toEqual(plainCells(countNumberCells(whole, codedMissing)));
      }),
      { numRuns: 80 },
    );
  });

  it('is profiled as the whole column is, examples of invalid cells (with their rows) included', () => {
    fc.assert(
      fc.property(cells, cutPicks, options, (cellList, picks, chosen) => {
        const { whole, cuts, ends } = cutUp(cellList, picks);
        const parts = cuts.map((from, k) => partOf(whole, from, ends[k]!));
        const rowCounts = cuts.map((from, k) => ends[k]! - from);
        expect(profileNumberParts({ parts, rowCounts, index: 3, options: chosen })).toEqual(profileColumn(whole, 3, chosen));
      }),
      { numRuns: 80 },
    );
  });

  it('keeps each text with its first row in the file, and -0 as the run of zeros when any part holds it (counted by hand)', () => {
    const codedMissing = missingNumbers(['-999']);
    const whole = columnOf([
      { kind: 'number', value: 0 },
      { kind: 'text', text: 'n/a' },
      { kind: 'number', value: 2.5 },
      { kind: 'number', value: -999 },
      { kind: 'fixed', value: 3, digits: 2 },
      { kind: 'number', value: -0 },
      { kind: 'text', text: 'n/a' },
      { kind: 'empty' },
      { kind: 'fixed', value: 3, digits: 2 },
    ]);
    const cuts = [0, 4];
    const joined = joinNumberCells([countNumberCells(partOf(whole, 0, 4), codedMissing), countNumberCells(partOf(whole, 4, 9), codedMissing)], cuts);
    expect(plainCells(joined)).toEqual({
      // "3.00" first in row 4 (the second part's row 0); "n/a" in rows 1 and 6; -999 in row 3.
      texts: [
        ['-999', { count: 1, firstRow: 3 }],
        ['3.00', { count: 2, firstRow: 4 }],
        ['n/a', { count: 2, firstRow: 1 }],
      ],
      values: [-0, 2.5],
      counts: [2, 1],
      plainCount: 3,
      plainFractions: 1,
      emptyCells: 1,
    });
    expect(Object.is(joined.plain.values[0], -0)).toBe(true);
  });

  it('names invalid cells by their row in the whole column, whichever part holds them (counted by hand)', () => {
    const whole = columnOf([
      { kind: 'number', value: 1 },
      { kind: 'number', value: 2.5 },
      { kind: 'text', text: 'NA' },
      { kind: 'number', value: 4 },
      { kind: 'text', text: 'no reading' },
      { kind: 'number', value: 6 },
      { kind: 'text', text: 'about 7' },
    ]);
    const parts = [partOf(whole, 0, 3), partOf(whole, 3, 7)];
    const numeric = profileNumberParts({ parts, rowCounts: [3, 4], index: 0, options: DEFAULT_PROFILE_OPTIONS }).numeric!;
    expect(numeric.invalidCount).toBe(2);
    expect(numeric.invalidExamples).toEqual([
      { row: 4, text: 'no reading' },
      { row: 6, text: 'about 7' },
    ]);
    // In a decimal-comma format, 2.5 (row 1, the first part) does not read either.
    const comma = profileNumberParts({ parts: [partOf(whole, 0, 3), partOf(whole, 3, 7)], rowCounts: [3, 4], index: 0, options: { ...DEFAULT_PROFILE_OPTIONS, format: { decimal: ',', group: '' } } }).numeric!;
    expect(comma.invalidExamples.map((e) => e.row)).toEqual([1, 4, 6]);
  });
});
