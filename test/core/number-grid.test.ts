import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { countOnGrid, type GridFacts } from '../../src/core/number-grid.ts';
import type { NumberRuns } from '../../src/core/number-runs.ts';
import { sortedRuns } from './helpers/sorted-runs.ts';

/** countOnGrid over `values` with the facts a caller's pass finds; `leftOut` marks cells not counted. */
function gridOf(values: readonly number[], leftOut: readonly number[] = []): NumberRuns | null {
  const cells = Float64Array.from(values);
  const out = new Uint8Array(cells.length);
  for (const row of leftOut) out[row] = 1;
  return countOnGrid(cells, out, factsOf(values.filter((v, row) => out[row] === 0 && !Number.isNaN(v))));
}

function factsOf(numbers: readonly number[]): GridFacts {
  return {
    count: numbers.length,
    min: Math.min(...numbers),
    max: Math.max(...numbers),
    hasFractions: numbers.some((v) => !Number.isInteger(v)),
    negativeZero: numbers.some((v) => Object.is(v, -0)),
  };
}

function plain(runs: NumberRuns | null): { values: number[]; counts: number[] } | null {
  return runs === null ? null : { values: [...runs.values.subarray(0, runs.length)], counts: [...runs.counts.subarray(0, runs.length)] };
}

describe('countOnGrid', () => {
  it('counts whole numbers by value, ascending (hand-counted)', () => {
    expect(plain(gridOf([5, 3, 5, 7, 3, 5]))).toEqual({ values: [3, 5, 7], counts: [2, 3, 1] });
  });

  it('counts amounts in cents as the numbers read, not as numbers rounded to the grid', () => {
    const runs = plain(gridOf([13.89, 0.1, 0.3, 9.31, 0.1, 14.08]));
    expect(runs).toEqual({ values: [0.1, 0.3, 9.31, 13.89, 14.08], counts: [2, 1, 1, 1, 1] });
    // The very doubles read, as Number('0.3') gives it: a key times a step would not always be (3 × 0.1 is not 0.3).
    expect(runs!.values).toEqual([Number('0.1'), Number('0.3'), Number('9.31'), Number('13.89'), Number('14.08')]);
    expect(3 * 0.1).not.toBe(0.3);
  });

  it('leaves out the cells marked and NaN', () => {
    expect(plain(gridOf([1, Number.NaN, 2, 9, 2], [3]))).toEqual({ values: [1, 2], counts: [1, 2] });
  });

  it('makes the run of zeros -0 when any cell is -0, as a sort does', () => {
    const runs = gridOf([0, -0, 1, 0]);
    expect(plain(runs)).toEqual({ values: [-0, 1], counts: [3, 1] });
    expect(Object.is(runs!.values[0], -0)).toBe(true);
    expect(Object.is(gridOf([0, 1])!.values[0], 0)).toBe(true);
  });

  it('gives no runs where no grid fits: a span too wide, too many decimals, a sum off every grid, keys past 2^53', () => {
    expect(gridOf([0, 1e9])).toBeNull(); // two numbers, a billion slots
    expect(gridOf([0.1234567, 1])).toBeNull(); // seven decimals
    expect(gridOf([0.1, 0.2, 0.1 + 0.2])).toBeNull(); // 0.30000000000000004 is on no decimal grid
    expect(gridOf([2 ** 60, 2 ** 60 + 256])).toBeNull();
    expect(gridOf([5e-324, 0])).toBeNull();
    expect(gridOf([])).toBeNull();
  });

  it('property: where it gives runs, they are the runs a sort of the numbers gives', () => {
    const decimals = fc.tuple(fc.integer({ min: -200_000, max: 200_000 }), fc.constantFrom(1, 10, 100, 1000)).map(([k, scale]) => k / scale);
    const cell = fc.oneof(decimals, fc.integer({ min: -50, max: 50 }), fc.constantFrom(0, -0, Number.NaN), fc.double({ noNaN: true, min: -1e6, max: 1e6 }));
    fc.assert(
      fc.property(fc.array(cell, { maxLength: 400 }), (values) => {
        const runs = gridOf(values);
        const numbers = values.filter((v) => !Number.isNaN(v));
        if (runs === null) return;
        const expected = sortedRuns(numbers);
        expect(plain(runs)).toEqual(expected);
        expect(runs.values.length > 0 ? Object.is(runs.values[0], expected.values[0]) : true).toBe(true);
      }),
      { numRuns: 400 },
    );
  });

  it('property: numbers of up to three decimals over a span of a few thousand steps always fit a grid', () => {
    // Between 0 and 4, with 0 to 3 decimals: at most 4,001 steps of a thousandth.
    const number = fc.tuple(fc.integer({ min: 0, max: 4000 }), fc.constantFrom(1, 10, 100, 1000)).map(([k, scale]) => Math.round(k / (1000 / scale)) / scale);
    const numbers = fc.array(number, { minLength: 1, maxLength: 300 });
    fc.assert(
      fc.property(numbers, (values) => {
        expect(gridOf(values)).not.toBeNull();
      }),
    );
  });
});
