/**
 * The preview finds its rows on screen by arithmetic (src/ui/preview/useFixedRows.ts). Expected
 * rows are worked out by hand from 28-pixel rows.
 */
import { describe, expect, it } from 'vitest';
import { MAX_SCROLL_SIZE, rowsInView, scrollSize } from '../../../src/ui/preview/useFixedRows.ts';

describe('rows in view', () => {
  it('takes the rows the viewport meets, with the overscan on each side', () => {
    // Scrolled 280 px: row 10 is at the top (280 / 28); 140 px tall reaches 420 px, the end of row 14,
    // so rows up to ceil(420 / 28) = 15 are counted; overscan 2 gives rows 8 to 17.
    const rows = rowsInView({ top: 280, height: 140 }, 100_000, 28, 2);
    expect(rows.map((r) => r.index)).toEqual([8, 9, 10, 11, 12, 13, 14, 15, 16, 17]);
    expect(rows[0]?.start).toBe(224);
  });

  it('stops at the first and the last row', () => {
    expect(rowsInView({ top: 0, height: 84 }, 12, 28, 8).map((r) => r.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    // The last of 500,000 rows starts at 499,999 × 28 = 13,999,972 px (under the scroll cap).
    const end = rowsInView({ top: 13_999_972 - 56, height: 84 }, 500_000, 28, 1);
    expect(end.at(-1)).toEqual({ index: 499_999, start: 13_999_972 });
  });

  it('has no rows for an empty table', () => {
    expect(rowsInView({ top: 0, height: 500 }, 0, 28, 8)).toEqual([]);
  });

  it('scales the scroll range of a table taller than a browser lays out, reaching the last row', () => {
    // 4,000,000 rows of 28 px are 112,000,000 px: the content is MAX_SCROLL_SIZE tall instead.
    const count = 4_000_000;
    const height = 560;
    expect(scrollSize(count, 28)).toBe(MAX_SCROLL_SIZE);
    const atTop = rowsInView({ top: 0, height }, count, 28, 0);
    expect(atTop[0]).toEqual({ index: 0, start: 0 });
    // Scrolled to the end: the last row's bottom is the viewport's bottom.
    const endTop = MAX_SCROLL_SIZE - height;
    const atEnd = rowsInView({ top: endTop, height }, count, 28, 0);
    const last = atEnd.at(-1)!;
    expect(last.index).toBe(count - 1);
    expect(last.start + 28).toBeCloseTo(endTop + height, 6);
    // Halfway down the range: halfway down the rows (scale (112,000,000 − 560) / (15,000,000 − 560)).
    const middle = rowsInView({ top: endTop / 2, height }, count, 28, 0);
    expect(middle[0]!.index).toBe(Math.floor((count * 28 - height) / 2 / 28));
    // Rows stay 28 px apart and cover the viewport.
    expect(middle[1]!.start - middle[0]!.start).toBe(28);
    expect(middle[0]!.start).toBeLessThanOrEqual(endTop / 2);
    expect(middle.at(-1)!.start + 28).toBeGreaterThanOrEqual(endTop / 2 + height);
  });

  it('does not scale a table that fits under the cap (500,000 rows are 14,000,000 px)', () => {
    expect(scrollSize(500_000, 28)).toBe(14_000_000);
    expect(rowsInView({ top: 280, height: 140 }, 500_000, 28, 0)[0]).toEqual({ index: 10, start: 280 });
  });
});
