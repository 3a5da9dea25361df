// @vitest-environment jsdom
import { cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { decide, type Decision } from '../../../src/core/decisions.ts';
import { draftRecipe, profileAsDecided } from '../../../src/core/fit.ts';
import { profileTable } from '../../../src/core/profile.ts';
import { tableFromRows } from '../../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type ContinuousColumn } from '../../../src/core/recipe.ts';
import { ContinuousOptions } from '../../../src/ui/columns/ContinuousOptions.tsx';

afterEach(cleanup);

// An invented lab sheet: weights written with decimal commas, the first two of which look like thousands.
const CELLS = ['1,234', '5,678', '12', '7', '3', '9', '4', '8', '6', '10', '11', 'x'];
const table = tableFromRows([['weight'], ...CELLS.map((c) => [c])]).table;
const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
const drafted = decide(draftRecipe(profiles, { file: null, rows: table.rowCount }), { type: 'set-level', column: 'weight', level: 'continuous' }, profiles);

/** The options inside a parent that applies each decision with the real core, as the page does. */
function Workbench({ onDecide }: { onDecide: (d: Decision) => void }) {
  const [recipe, setRecipe] = useState(drafted);
  const column = recipe.columns[0] as ContinuousColumn;
  return (
    <ContinuousOptions
      profile={profileAsDecided(profiles[0]!, column)}
      column={column}
      onDecide={(d) => {
        onDecide(d);
        setRecipe((r) => decide(r, d, profiles));
      }}
    />
  );
}

const statOf = (term: string) => screen.getByText(term).nextSibling?.textContent;

describe('the number format of a continuous column', () => {
  it('starts from the detected format, and a decimal comma chosen re-reads the numbers', async () => {
    const onDecide = vi.fn<(d: Decision) => void>();
    render(<Workbench onDecide={onDecide} />);
    const user = userEvent.setup();
    expect(statOf('written like')).toBe('1,234.5');
    expect(statOf('maximum')).toBe('5,678');
    expect((screen.getByLabelText('Decimal separator') as HTMLSelectElement).value).toBe('.');
    await user.selectOptions(screen.getByLabelText('Decimal separator'), ',');
    await user.selectOptions(screen.getByLabelText('Digit groups'), '');
    expect(screen.getByText(/^Read like -1234,5\./)).toBeTruthy();
    await user.click(screen.getByRole('button', { name: 'Read in this format' }));
    expect(onDecide).toHaveBeenCalledWith({ type: 'set-number-format', column: 'weight', format: { decimal: ',', group: '' } });
    expect(statOf('written like')).toBe('1234,5');
    // 1.234, 5.678, 12, 7, 3, 9, 4, 8, 6, 10, 11: the largest is now 12.
    expect(statOf('maximum')).toBe('12');
    expect(screen.getByText('1 cell does not read as numbers here, e.g. “x”.')).toBeTruthy();
  });

  it('a sign or unit is given as written, on its side; one that is not a symbol is refused in words', async () => {
    const onDecide = vi.fn<(d: Decision) => void>();
    render(<Workbench onDecide={onDecide} />);
    const user = userEvent.setup();
    await user.type(screen.getByLabelText('Sign or unit'), 'kg');
    await user.click(screen.getByRole('button', { name: 'Read in this format' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-number-format', column: 'weight', format: { decimal: '.', group: ',', symbol: { text: 'kg', side: 'after' } } });
    await user.clear(screen.getByLabelText('Sign or unit'));
    await user.type(screen.getByLabelText('Sign or unit'), '1kg');
    await user.click(screen.getByRole('button', { name: 'Read in this format' }));
    expect(screen.getByRole('alert').textContent).toMatch(/^“1kg” cannot stand beside the numbers: a symbol holds no digit/);
    expect(onDecide).toHaveBeenCalledTimes(1);
  });

  it('negatives in parentheses can be chosen', async () => {
    const onDecide = vi.fn<(d: Decision) => void>();
    render(<Workbench onDecide={onDecide} />);
    const user = userEvent.setup();
    await user.selectOptions(screen.getByLabelText('Negative numbers'), 'parentheses');
    expect(screen.getByText(/^Read like \(1,234\.5\)\./)).toBeTruthy();
    await user.click(screen.getByRole('button', { name: 'Read in this format' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-number-format', column: 'weight', format: { decimal: '.', group: ',', negative: 'parentheses' } });
  });

  it('a column of plain decimal numbers has no other format to offer', () => {
    const plain = tableFromRows([['w'], ...Array.from({ length: 5000 }, (_, i) => [String(i / 4)])]).table;
    const plainProfiles = profileTable(plain, { missingTokens: DEFAULT_MISSING_TOKENS });
    const column = draftRecipe(plainProfiles, { file: null, rows: plain.rowCount }).columns[0] as ContinuousColumn;
    render(<ContinuousOptions profile={plainProfiles[0]!} column={column} onDecide={() => undefined} />);
    expect(screen.queryByLabelText('Decimal separator')).toBeNull();
    expect(screen.getByText(/Every filled cell is a plain decimal number/)).toBeTruthy();
  });
});
