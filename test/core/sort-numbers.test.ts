import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { sortNumbers } from '../../src/core/sort-numbers.ts';

/** The engine's own numeric sort is the reference (ECMAScript %TypedArray%.prototype.sort: -0 before +0). */
function reference(values: readonly number[]): number[] {
  return Array.from(Float64Array.from(values).sort());
}

describe('sortNumbers', () => {
  it('sorts like Float64Array.prototype.sort, -0 before +0, infinities at the ends', () => {
    const values = Array.from({ length: 5000 }, (_, i) => [0, -0, 1.5, -1.5, Infinity, -Infinity, 1e-310, -1e300, 42][i % 9]! * (i % 7 === 0 ? 1 : 1));
    const sorted = Array.from(sortNumbers(Float64Array.from(values)));
    expect(sorted).toEqual(reference(values));
    expect(Object.is(sorted[1666], -0)).toBe(true);
  });

  it('sorts any doubles like the engine does, above and below the size where it takes over', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true }), { minLength: 4000, maxLength: 6000 }), (values) => {
        expect(Array.from(sortNumbers(Float64Array.from(values)))).toEqual(reference(values));
      }),
      { numRuns: 30 },
    );
  });

  it('sorts a sub-array in place without touching the rest of its buffer', () => {
    const buffer = new Float64Array(10_002).fill(7);
    const view = buffer.subarray(1, 10_001);
    for (let i = 0; i < view.length; i++) view[i] = (i * 7919) % 10_000;
    sortNumbers(view);
    expect(view[0]).toBe(0);
    expect(view[9999]).toBe(9999);
    expect([buffer[0], buffer[10_001]]).toEqual([7, 7]);
  });
});
