// @vitest-environment jsdom
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Decision } from '../../../src/core/decisions.ts';
import { forecastWidth } from '../../../src/core/width.ts';
import { WidthMeter } from '../../../src/ui/width/WidthMeter.tsx';
import type { WidthForecast } from '../../../src/ui/width/types.ts';
import { surveyForecast, surveyRecipe } from '../fixtures.ts';

afterEach(cleanup);

function renderMeter(forecast: WidthForecast = surveyForecast, threshold?: number) {
  const onDecide = vi.fn<(d: Decision) => void>();
  render(<WidthMeter forecast={forecast} threshold={threshold} onDecide={onDecide} />);
  return { onDecide, user: userEvent.setup() };
}

function tableRow(name: string): HTMLElement {
  const row = screen.getByRole('rowheader', { name }).closest('tr');
  if (!row) throw new Error(name);
  return row;
}

describe('WidthMeter', () => {
  it('the fixture agrees with the core forecast on every width', () => {
    const core = forecastWidth(surveyRecipe);
    expect(core.perColumn.map((c) => [c.name, c.after])).toEqual(surveyForecast.perColumn.map((c) => [c.name, c.after]));
    expect(core.total.after).toBe(67);
  });

  it('shows the total before and after and every source column', () => {
    renderMeter();
    // 8 source columns; 1 + 7 + 2 + 5 + 1 + 2 + 49 + 0 = 67 output columns.
    expect(screen.getByText('8 source columns')).toBeTruthy();
    expect(screen.getByText('67 output columns')).toBeTruthy();
    // (58 + 3,423 / 1,240) / 67 = 0.9069 of all output cells are 0 (see the fixture).
    expect(screen.getByText('About 90.7% of the output cells will be 0.')).toBeTruthy();
    const table = screen.getByRole('table', { name: 'Output columns per source column' });
    expect(within(table).getAllByRole('rowheader').map((h) => h.textContent)).toEqual([
      'household_id',
      'heating',
      'insulation',
      'smart_meter',
      'owns_ev',
      'annual_kwh',
      'region_code',
      'comments',
    ]);
    // heating: one-hot over 7 levels, 6 of 7 cells are 0 → 85.7%; owns_ev: 1,037 of 1,240 rows are "no" → 83.6%.
    expect(within(tableRow('heating')).getAllByRole('cell').map((c) => c.textContent)).toEqual(['nominal', '7', '', '85.7%']);
    expect(within(tableRow('owns_ev')).getAllByRole('cell').map((c) => c.textContent)).toEqual(['binary', '1', '', '83.6%']);
    expect(within(tableRow('comments')).getAllByRole('cell').map((c) => c.textContent)).toEqual(['left out', '0', '', '—']);
  });

  it('warns about the one column wider than the default threshold of 30', () => {
    renderMeter();
    const warnings = screen.getByRole('region', { name: 'Wide columns' });
    expect(warnings.textContent).toContain('region_code makes 49 output columns, more than 30.');
    expect(warnings.textContent).not.toContain('heating');
    expect(tableRow('region_code').dataset['wide']).toBe('true');
    expect(tableRow('heating').dataset['wide']).toBe('false');
  });

  it('uses the threshold it is given', () => {
    renderMeter(surveyForecast, 5);
    const warnings = screen.getByRole('region', { name: 'Wide columns' });
    // More than 5: heating (7) and region_code (49); smart_meter's 5 is not more than 5.
    expect([...warnings.querySelectorAll('[data-column]')].map((w) => w.getAttribute('data-column'))).toEqual(['heating', 'region_code']);
  });

  it('says so when no column is too wide', () => {
    renderMeter(surveyForecast, 49);
    expect(screen.queryByRole('region', { name: 'Wide columns' })).toBeNull();
    expect(screen.getByText('No column makes more than 49 output columns.')).toBeTruthy();
  });

  it('offers three remedies for a wide nominal column, each one decision', async () => {
    const { onDecide, user } = renderMeter();
    await user.click(screen.getByRole('button', { name: 'Keep the 20 most frequent levels of region_code' }));
    expect(onDecide).toHaveBeenLastCalledWith({
      type: 'set-rare',
      column: 'region_code',
      rare: { minCount: null, minShare: null, keepTop: 20 },
    });
    await user.click(screen.getByRole('button', { name: 'Use frequency coding for region_code' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-nominal-coding', column: 'region_code', coding: 'frequency' });
    await user.click(screen.getByRole('button', { name: 'Leave out region_code' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-level', column: 'region_code', level: 'excluded' });
    expect(onDecide).toHaveBeenCalledTimes(3);
  });

  it('offers only "leave out" for a wide column that is not nominal', () => {
    const forecast: WidthForecast = {
      perColumn: [{ name: 'survey_wave', level: 'ordinal', before: 1, after: 39, zeroShare: 0.5 }],
      total: { before: 1, after: 39, zeroShare: 0.5 },
    };
    renderMeter(forecast);
    const warning = screen.getByRole('region', { name: 'Wide columns' });
    expect(within(warning).getAllByRole('button').map((b) => b.getAttribute('aria-label'))).toEqual(['Leave out survey_wave']);
  });
});
