// @vitest-environment jsdom
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { decide } from '../../../src/core/decisions.ts';
import { chartFor } from '../../../src/ui/columns/chart-data.ts';
import { ColumnList } from '../../../src/ui/columns/ColumnList.tsx';
import { KWH_HISTOGRAM, surveyProfiles, surveyRecipe } from '../fixtures.ts';

// The real chartFor, counted: a row that is drawn again makes its chart again.
vi.mock('../../../src/ui/columns/chart-data.ts', async (importOriginal) => {
  const actual = await importOriginal<typeof import('../../../src/ui/columns/chart-data.ts')>();
  return { ...actual, chartFor: vi.fn(actual.chartFor) };
});

afterEach(cleanup);

function renderList(selected: string | null = null) {
  const onSelect = vi.fn<(name: string) => void>();
  const view = render(<ColumnList profiles={surveyProfiles} recipe={surveyRecipe} selected={selected} onSelect={onSelect} />);
  return { onSelect, view };
}

function row(name: string): HTMLElement {
  const option = screen.getAllByRole('option').find((o) => o.dataset['column'] === name);
  if (!option) throw new Error(`no row for ${name}`);
  return option;
}

describe('ColumnList', () => {
  it('lists every column in file order, named by column and level', () => {
    renderList();
    const listbox = screen.getByRole('listbox', { name: 'Columns' });
    const options = within(listbox).getAllByRole('option');
    expect(options.map((o) => o.dataset['column'])).toEqual([
      'household_id',
      'heating',
      'insulation',
      'smart_meter',
      'owns_ev',
      'annual_kwh',
      'region_code',
      'comments',
    ]);
    // Accessible name = column name + level as the recipe has it.
    expect(screen.getByRole('option', { name: 'household_id identifier (kept as is)' })).toBeTruthy();
    expect(screen.getByRole('option', { name: 'heating nominal' })).toBeTruthy();
    expect(screen.getByRole('option', { name: 'insulation ordinal' })).toBeTruthy();
    expect(screen.getByRole('option', { name: 'owns_ev binary' })).toBeTruthy();
    expect(screen.getByRole('option', { name: 'annual_kwh continuous' })).toBeTruthy();
    expect(screen.getByRole('option', { name: 'comments left out' })).toBeTruthy();
  });

  it('shows the reason, missing and distinct counts and the output width of each column', () => {
    renderList();
    const heating = row('heating');
    expect(within(heating).getByText('6 distinct values with no order among them')).toBeTruthy();
    // 12 empty cells + 5 "NA" = 17 missing; 6 heating types; 6 levels + "(missing)" = 7 outputs.
    expect(heating.textContent).toContain('17 missing');
    expect(heating.textContent).toContain('6 distinct');
    expect(heating.textContent).toContain('7 output columns');

    const ids = row('household_id');
    expect(ids.textContent).toContain('0 missing');
    expect(ids.textContent).toContain('1,240 distinct');
    expect(ids.textContent).toContain('1 output column');

    expect(row('comments').textContent).toContain('0 output columns');
    expect(row('region_code').textContent).toContain('49 output columns');
    expect(row('annual_kwh').textContent).toContain('42 missing');
  });

  it('draws a histogram for a continuous column and level bars for categorical ones', () => {
    renderList();
    const kwhBars = row('annual_kwh').querySelectorAll('svg[data-kind="histogram"] rect');
    expect([...kwhBars].map((r) => Number(r.getAttribute('data-value')))).toEqual([...KWH_HISTOGRAM.counts]);

    // Nominal: the most frequent levels first, at most 8 bars.
    const heatingBars = row('heating').querySelectorAll('svg[data-kind="levels"] rect');
    expect([...heatingBars].map((r) => Number(r.getAttribute('data-value')))).toEqual([512, 233, 181, 142, 97, 58, 17]);
    expect(row('region_code').querySelectorAll('svg rect')).toHaveLength(8);

    // Ordinal: bars keep the order poor → very good, not the frequency order.
    const insulationBars = row('insulation').querySelectorAll('svg rect');
    expect([...insulationBars].map((r) => Number(r.getAttribute('data-value')))).toEqual([164, 402, 455, 171]);

    // The tallest bar fills the chart (28 px high, 1 px base line, 1 px spare).
    const tallest = [...heatingBars][0];
    expect(Number(tallest?.getAttribute('height'))).toBe(26);

    expect(row('household_id').querySelector('svg')).toBeNull();
    expect(row('comments').querySelector('svg')).toBeNull();
  });

  it('marks the selected column and calls onSelect on click', async () => {
    const user = userEvent.setup();
    const { onSelect } = renderList('heating');
    expect(row('heating').getAttribute('aria-selected')).toBe('true');
    expect(row('insulation').getAttribute('aria-selected')).toBe('false');
    await user.click(row('insulation'));
    expect(onSelect).toHaveBeenCalledWith('insulation');
  });

  it('moves through the columns with the arrow keys, Home and End', async () => {
    const user = userEvent.setup();
    const { onSelect, view } = renderList('heating');
    // One tab stop: the selected column.
    expect(row('heating').tabIndex).toBe(0);
    expect(row('insulation').tabIndex).toBe(-1);

    await user.tab();
    expect(document.activeElement).toBe(row('heating'));
    await user.keyboard('{ArrowDown}');
    expect(onSelect).toHaveBeenLastCalledWith('insulation');
    expect(document.activeElement).toBe(row('insulation'));

    view.rerender(<ColumnList profiles={surveyProfiles} recipe={surveyRecipe} selected="insulation" onSelect={onSelect} />);
    await user.keyboard('{End}');
    expect(onSelect).toHaveBeenLastCalledWith('comments');
    await user.keyboard('{Home}');
    expect(onSelect).toHaveBeenLastCalledWith('household_id');
    await user.keyboard('{ArrowUp}');
    // Already at the top: focus stays, household_id is selected again.
    expect(document.activeElement).toBe(row('household_id'));
  });

  it('makes the first column the tab stop when nothing is selected', () => {
    renderList(null);
    expect(row('household_id').tabIndex).toBe(0);
    expect(screen.getAllByRole('option').filter((o) => o.tabIndex === 0)).toHaveLength(1);
  });

  it('draws again only the row of the column a decision changed, whatever callback the page passes', () => {
    const { view } = renderList('heating');
    vi.mocked(chartFor).mockClear();
    const decided = decide(surveyRecipe, { type: 'set-nominal-coding', column: 'heating', coding: 'dummy' }, surveyProfiles);
    // A new callback on every drawing, as a page that writes it inline passes.
    view.rerender(<ColumnList profiles={surveyProfiles} recipe={decided} selected="heating" onSelect={() => undefined} />);
    expect(vi.mocked(chartFor).mock.calls.map(([, column]) => column.name)).toEqual(['heating']);
    expect(row('heating').textContent).toContain('6 output columns'); // dummy coding: one level fewer than one-hot's 7
  });
});
