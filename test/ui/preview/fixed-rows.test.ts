/**
 * The preview finds its rows on screen by arithmetic (src/ui/preview/useFixedRows.ts). Expected
 * rows are worked out by hand from 28-pixel rows.
 */
import { describe, expect, it } from 'vitest';
import { rowsInView } from '../../../src/ui/preview/useFixedRows.ts';

describe('rows in view', () => {
  it('takes the rows the viewport meets, with the overscan on each side', () => {
    // Scrolled 280 px: row 10 is at the top (280 / 28); 140 px tall reaches 420 px, the end of row 14,
    // so rows up to ceil(420 / 28) = 15 are counted; overscan 2 gives rows 8 to 17.
    const rows = rowsInView({ top: 280, height: 140 }, 1_000_000, 28, 2);
    expect(rows.map((r) => r.index)).toEqual([8, 9, 10, 11, 12, 13, 14, 15, 16, 17]);
    expect(rows[0]?.start).toBe(224);
  });

  it('stops at the first and the last row', () => {
    expect(rowsInView({ top: 0, height: 84 }, 12, 28, 8).map((r) => r.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    // The last of 1,000,000 rows starts at 999,999 × 28 = 27,999,972 px.
    const end = rowsInView({ top: 27_999_972 - 56, height: 84 }, 1_000_000, 28, 1);
    expect(end.at(-1)).toEqual({ index: 999_999, start: 27_999_972 });
  });

  it('has no rows for an empty table', () => {
    expect(rowsInView({ top: 0, height: 500 }, 0, 28, 8)).toEqual([]);
  });
});
