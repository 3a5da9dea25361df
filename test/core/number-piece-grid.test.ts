/**
 * The grid in front of the CSV writer's number pieces (src/core/number-piece-grid.ts): it must
 * choose the step the file's numbers sit on, answer only for the very number a slot holds, and
 * send everything else to the hash. The writer's own bytes with and without it are compared by
 * test/core/csv-write.property.test.ts (numbers such as "2.5", "12.50", "-0", "1e3").
 */
import { describe, expect, it } from 'vitest';
import { NumberPieceGrid } from '../../src/core/number-piece-grid.ts';

/** Written numbers as the writer gets them: z-scores, (x − center) ÷ scale. */
function written(raw: readonly number[], center: number, scale: number): Float64Array {
  return Float64Array.from(raw, (x) => (x - center) / scale);
}

describe('the number-piece grid', () => {
  it('takes the file’s cents back from z-scores: one slot per cent, the same slot for the same number', () => {
    const center = 150.25;
    const scale = 42.5;
    const values = written([213.89, 211.81, 187.02, 219.91], center, scale);
    const grid = NumberPieceGrid.fit(values, new Uint8Array(4), 4, center, scale)!;
    expect(grid).not.toBeNull();
    const slots = Array.from(values, (v) => grid.slotOf(v));
    // Cents apart: 213.89 − 211.81 = 2.08, 208 steps of 0.01.
    expect(slots[0]! - slots[1]!).toBe(208);
    expect(slots[3]! - slots[2]!).toBe(3289);
    expect(grid.pieceIn(slots[0]!, values[0]!)).toBe(-1);
    grid.keep(slots[0]!, values[0]!, 17);
    expect(grid.pieceIn(slots[0]!, values[0]!)).toBe(17);
    // Another number in the same slot (not on the step) is not answered for.
    expect(grid.slotOf(values[0]! + 1e-12)).toBe(slots[0]);
    expect(grid.pieceIn(slots[0]!, values[0]! + 1e-12)).toBe(-1);
    grid.clear();
    expect(grid.pieceIn(slots[0]!, values[0]!)).toBe(-1);
  });

  it('keeps −0 apart from 0, and sends numbers off the grid and NaN to the hash', () => {
    const grid = NumberPieceGrid.fit(Float64Array.from([0, 1, 2, 3]), new Uint8Array(4), 4, 0, 1)!;
    const zero = grid.slotOf(0);
    expect(grid.slotOf(-0)).toBe(zero);
    grid.keep(zero, 0, 5);
    expect(grid.pieceIn(zero, 0)).toBe(5);
    expect(grid.pieceIn(zero, -0)).toBe(-1);
    // The range is the first batch's (0–3) with half of it again on each side: 4 steps → 2 more each way.
    expect(grid.slotOf(-2)).toBe(0);
    expect(grid.slotOf(-3)).toBe(-1);
    expect(grid.slotOf(6)).toBe(-1);
    expect(grid.slotOf(NaN)).toBe(-1);
    expect(grid.slotOf(Infinity)).toBe(-1);
  });

  it('is not made for numbers on no step up to 0.001, for a range too wide, or for a batch all missing', () => {
    expect(NumberPieceGrid.fit(Float64Array.from([0.12345, 1]), new Uint8Array(2), 2, 0, 1)).toBeNull();
    expect(NumberPieceGrid.fit(Float64Array.from([0, 5_000_000]), new Uint8Array(2), 2, 0, 1)).toBeNull();
    expect(NumberPieceGrid.fit(Float64Array.from([1, 2]), Uint8Array.from([1, 1]), 2, 0, 1)).toBeNull();
    // Missing cells (the fitted fill) are left out of the choice: the others are whole.
    expect(NumberPieceGrid.fit(Float64Array.from([1, 2.71828]), Uint8Array.from([0, 1]), 2, 0, 1)).not.toBeNull();
  });
});
