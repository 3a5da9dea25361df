import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { NumberTally } from '../../src/core/number-tally.ts';
import { sortNumbers } from '../../src/core/sort-numbers.ts';
import { sortedRuns } from './helpers/sorted-runs.ts';

function tallyOf(values: readonly number[]): NumberTally {
  const tally = new NumberTally();
  values.forEach((v, row) => tally.add(v, 1, row));
  return tally;
}

/** Numbers as columns hold them: many repeats of few values, zeros of both signs, and any double. */
const cellNumbers = fc.array(
  fc.oneof(fc.integer({ min: -50, max: 50 }), fc.constantFrom(0, -0, 0.1, 1e300, -Infinity, Infinity, 5e-324), fc.double({ noNaN: true })),
  { maxLength: 5000 },
);

describe('NumberTally', () => {
  it('gives the runs a sort of every number gives, -0 and 0 in one run', () => {
    fc.assert(
      fc.property(cellNumbers, (values) => {
        const runs = tallyOf(values).runs(sortNumbers);
        const expected = sortedRuns(values);
        expect(Array.from(runs.values)).toEqual(expected.values);
        expect(Array.from(runs.counts)).toEqual(expected.counts);
        expect(runs.length).toBe(expected.values.length);
      }),
      { numRuns: 60 },
    );
  });

  it('keeps each distinct number with its count and first row, in the order first counted', () => {
    fc.assert(
      fc.property(cellNumbers, (values) => {
        const expected = new Map<number, { count: number; firstRow: number }>();
        values.forEach((v, row) => {
          const key = v === 0 ? 0 : v;
          const known = expected.get(key);
          if (known === undefined) expected.set(key, { count: 1, firstRow: row });
          else known.count++;
        });
        const seen: [number, { count: number; firstRow: number }][] = [];
        const tally = tallyOf(values);
        tally.forEach((value, count, firstRow) => seen.push([value === 0 ? 0 : value, { count, firstRow }]));
        expect(seen).toEqual([...expected]);
        expect(tally.distinct).toBe(expected.size);
      }),
      { numRuns: 60 },
    );
  });

  it('grows past its first table (1,024 slots) without losing a count, zeros of both signs in one run', () => {
    // 70,000 distinct numbers, each counted twice with weights 1 and 2: the table doubles eight
    // times, to where -0 and 0 hash to different slots.
    const tally = new NumberTally();
    for (let i = 1; i <= 70_000; i++) tally.add(i * 0.25, 1, i);
    for (let i = 1; i <= 70_000; i++) tally.add(i * 0.25, 2, 70_000 + i);
    tally.add(0, 1);
    tally.add(-0, 2);
    expect(tally.distinct).toBe(70_001);
    const runs = tally.runs(sortNumbers);
    expect(runs.length).toBe(70_001);
    expect(Object.is(runs.values[0], -0)).toBe(true);
    expect(runs.values[70_000]).toBe(17_500);
    expect(runs.counts.every((count) => count === 3)).toBe(true);
  });

  it('counts -0 and 0 as one number', () => {
    const tally = tallyOf([3, -0, 3, 0, 2.5, 3]);
    expect(tally.countOf(3)).toBe(3);
    expect(tally.countOf(0)).toBe(2);
    expect(tally.countOf(-0)).toBe(2);
    expect(tally.countOf(7)).toBe(0);
  });
});
