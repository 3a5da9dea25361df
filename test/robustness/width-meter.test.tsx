// @vitest-environment jsdom
/**
 * The width meter on a file of a thousand columns: it draws the widest 200 and counts the rest,
 * and lists at most 50 wide-column warnings, so every output column is accounted for without
 * filling the page. Counts are worked out in the comments.
 */
import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { WidthForecast } from '../../src/ui/width/types.ts';
import { ROWS_LISTED, WARNINGS_LISTED, WidthMeter } from '../../src/ui/width/WidthMeter.tsx';

afterEach(cleanup);

// 1,000 columns: every 10th (100 of them) makes 40 outputs, the others 1 each.
// Outputs: 100 × 40 + 900 × 1 = 4,900.
const perColumn = Array.from({ length: 1000 }, (_, i) => ({
  name: `c${i}`,
  level: (i % 10 === 0 ? 'nominal' : 'continuous') as 'nominal' | 'continuous',
  before: 1,
  after: i % 10 === 0 ? 40 : 1,
  zeroShare: i % 10 === 0 ? 39 / 40 : 0,
}));
const forecast: WidthForecast = { perColumn, total: { before: 1000, after: 4900, zeroShare: (100 * 39) / 4900 } };

describe('the width meter on a very wide file', () => {
  it('draws the 200 widest columns, wide ones first in file order, and counts the other 800', () => {
    const { container } = render(<WidthMeter forecast={forecast} onDecide={() => undefined} />);
    const rows = container.querySelectorAll('tbody tr');
    expect(rows).toHaveLength(ROWS_LISTED);
    expect(rows[0]?.getAttribute('data-column')).toBe('c0');
    expect(rows[99]?.getAttribute('data-column')).toBe('c990');
    expect(rows[100]?.getAttribute('data-column')).toBe('c1');
    // Listed: 100 × 40 + 100 × 1 = 4,100; the other 800 columns make 4,900 − 4,100 = 800.
    expect(screen.getByTestId('width-more').textContent).toBe('… and 800 more source columns, making 800 output columns in all.');
    expect(screen.getByText('Output columns per source column: the 200 widest')).toBeTruthy();
  });

  it('lists 50 wide-column warnings and counts the other 50', () => {
    const { container } = render(<WidthMeter forecast={forecast} onDecide={() => undefined} />);
    expect(container.querySelectorAll('.lw-width__warning')).toHaveLength(WARNINGS_LISTED);
    expect(screen.getByText('… and 50 more wide columns; deal with these first.')).toBeTruthy();
  });
});
