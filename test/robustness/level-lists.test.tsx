// @vitest-environment jsdom
/**
 * A column of many levels in the page: the level table draws the 200 most frequent and counts the
 * rest, the output names list the first 100 and count the rest, the small chart shows 8 bars and
 * says how many more. The recipe keeps every level. Counts are worked out in the comments.
 */
import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { tableFromRows } from '../../src/core/read-table.ts';
import { profileTable } from '../../src/core/profile.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import type { NominalColumn } from '../../src/core/recipe.ts';
import { chartFor } from '../../src/ui/columns/chart-data.ts';
import { LEVELS_LISTED, LevelCleaning } from '../../src/ui/columns/LevelCleaning.tsx';
import { NAMES_LISTED, OutputNames } from '../../src/ui/columns/OutputNames.tsx';

afterEach(cleanup);

// 300 invented shop codes; code k appears 301 − k times (k = 1 … 300), so levels sort by k.
// Rows: 300 + 299 + … + 1 = 45,150.
const rows: string[][] = [['shop']];
for (let k = 1; k <= 300; k++) for (let n = 0; n < 301 - k; n++) rows.push([`shop-${k}`]);
const { table } = tableFromRows(rows);
const profiles = profileTable(table);
const recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
const shop = recipe.columns[0] as NominalColumn;

describe('a column of 300 levels', () => {
  it('keeps all 300 levels in the recipe (one-hot: 300 outputs)', () => {
    expect(shop.level).toBe('nominal');
    expect(shop.levels).toHaveLength(300);
    expect(shop.outputs).toHaveLength(300);
  });

  it('the level table draws the 200 most frequent and counts the other 100 with their rows', () => {
    const { container } = render(<LevelCleaning column={shop} onDecide={() => undefined} />);
    expect(container.querySelectorAll('tbody tr')).toHaveLength(LEVELS_LISTED);
    expect(container.querySelector('tbody tr')?.getAttribute('data-level')).toBe('shop-1');
    // Levels 201 … 300 hold 100 + 99 + … + 1 = 5,050 rows.
    expect(screen.getByTestId('levels-more').textContent).toBe(
      '… and 100 more levels (5,050 rows), less frequent than those above. Group rare levels to fold them into one.',
    );
  });

  it('the output names list the first 100 and count the other 200', () => {
    render(<OutputNames column={shop} />);
    expect(screen.getByRole('list', { name: 'Output columns of shop' }).querySelectorAll('li')).toHaveLength(NAMES_LISTED);
    expect(screen.getByText('… and 200 more.')).toBeTruthy();
  });

  it('the small chart shows the 8 most frequent and says how many more', () => {
    const chart = chartFor(profiles[0]!, shop);
    expect(chart?.values).toEqual([300, 299, 298, 297, 296, 295, 294, 293]);
    expect(chart?.summary.endsWith('; 292 more')).toBe(true);
  });
});
