// @vitest-environment jsdom
/**
 * The Missing values tab: which spellings are read as missing, with the cells each fills in the
 * file, and the changes it asks for. Counts are worked out by hand from the invented sheet below.
 */
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { DEFAULT_MISSING_TOKENS } from '../../../src/core/missing.ts';
import { profileTable } from '../../../src/core/profile.ts';
import { tableFromRows } from '../../../src/core/read-table.ts';
import { MissingSpellings } from '../../../src/ui/files/MissingSpellings.tsx';

afterEach(cleanup);

// An invented damage sheet: "None" (no damage) in 4 of 6 rows, one "n/a" and one empty reading.
const ROWS = [
  ['strike', 'damage', 'reading'],
  ['S1', 'None', '21.5'],
  ['S2', 'None', 'n/a'],
  ['S3', 'Minor', '19'],
  ['S4', 'None', ''],
  ['S5', 'None', '20'],
  ['S6', 'Severe', '22'],
];

function shown(tokens: readonly string[] = DEFAULT_MISSING_TOKENS, busy = false) {
  const profiles = profileTable(tableFromRows(ROWS).table, { missingTokens: tokens });
  const onChange = vi.fn();
  render(<MissingSpellings profiles={profiles} tokens={tokens} busy={busy} onChange={onChange} />);
  return onChange;
}

describe('the missing spellings of the open file', () => {
  it('names at most three columns a spelling is in, then how many more', () => {
    const wide = [['a', 'b', 'c', 'd', 'e'], ['NA', 'NA', 'NA', 'NA', 'x'], ['1', '2', '3', '4', 'NA']];
    const profiles = profileTable(tableFromRows(wide).table, { missingTokens: DEFAULT_MISSING_TOKENS });
    render(<MissingSpellings profiles={profiles} tokens={DEFAULT_MISSING_TOKENS} busy={false} onChange={() => undefined} />);
    const met = screen.getByRole('list', { name: 'Missing spellings in this file' });
    expect(within(met).getAllByRole('listitem')[1]?.textContent).toBe('NA5 cells in a, b, c and 2 more columnsRead as a value');
  });

  it('names five columns a spelling may be a value in, then counts the rest', () => {
    const header = Array.from({ length: 7 }, (_, i) => `c${i + 1}`);
    const rows = [header, header.map(() => 'NA'), header.map(() => 'NA'), header.map((_, i) => String(i))];
    const profiles = profileTable(tableFromRows(rows).table, { missingTokens: DEFAULT_MISSING_TOKENS });
    render(<MissingSpellings profiles={profiles} tokens={DEFAULT_MISSING_TOKENS} busy={false} onChange={() => undefined} />);
    const lines = [...screen.getByRole('note').querySelectorAll('p')].map((p) => p.textContent);
    expect(lines).toHaveLength(6);
    expect(lines[0]).toBe('“NA” fills 2 cells of c1, more than all of its values together (1): it may be a value there.');
    expect(lines[5]).toBe('… and 2 more such columns.');
  });

  it('lists the spellings met with their cells, the others apart, and names the one that outnumbers a column', () => {
    shown();
    const met = screen.getByRole('list', { name: 'Missing spellings in this file' });
    // empty 1 (S4's reading), "None" 4, "n/a" 1.
    expect(within(met).getAllByRole('listitem').map((li) => li.textContent)).toEqual([
      'empty cell1 cell in readingalways missing',
      'None4 cells in damageRead as a value',
      'n/a1 cell in readingRead as a value',
    ]);
    const unmet = screen.getByRole('list', { name: 'Missing spellings not met in this file' });
    expect(within(unmet).getAllByRole('listitem').map((li) => li.textContent?.replace('×', ''))).toEqual(DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None' && t !== 'n/a'));
    // damage: 4 "None" against 2 values (Minor, Severe).
    expect(screen.getByRole('note').textContent).toBe('“None” fills 4 cells of damage, more than all of its values together (2): it may be a value there.');
    expect(screen.queryByRole('button', { name: 'Back to the usual spellings' })).toBeNull();
  });

  it('asks for the list without a spelling, or with one more; refuses an empty or a repeated one', async () => {
    const onChange = shown();
    await userEvent.click(screen.getByRole('button', { name: 'Read “None” as a value' }));
    expect(onChange).toHaveBeenLastCalledWith(DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'));
    await userEvent.click(screen.getByRole('button', { name: 'Read “NULL” as a value' }));
    expect(onChange).toHaveBeenLastCalledWith(DEFAULT_MISSING_TOKENS.filter((t) => t !== 'NULL'));
    const field = screen.getByLabelText('Also read as missing');
    await userEvent.type(field, '  -999 {Enter}');
    expect(onChange).toHaveBeenLastCalledWith([...DEFAULT_MISSING_TOKENS, '-999']);
    expect(field).toHaveProperty('value', '');
    onChange.mockClear();
    await userEvent.type(field, 'NA{Enter}');
    expect(screen.getByRole('alert').textContent).toBe('“NA” is read as missing already.');
    await userEvent.clear(field);
    await userEvent.click(screen.getByRole('button', { name: 'Read as missing' }));
    expect(screen.getByRole('alert').textContent).toMatch(/^Type the spelling the file uses/);
    expect(onChange).not.toHaveBeenCalled();
  });

  it('with other spellings than the usual, offers them back; while a task runs, nothing can be changed', async () => {
    const tokens = [...DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'), 'unknown'];
    const onChange = shown(tokens, true);
    expect(screen.queryByRole('note')).toBeNull();
    for (const button of screen.getAllByRole('button')) expect(button).toHaveProperty('disabled', true);
    cleanup();
    const again = shown(tokens);
    await userEvent.click(screen.getByRole('button', { name: 'Back to the usual spellings' }));
    expect(again).toHaveBeenLastCalledWith(DEFAULT_MISSING_TOKENS);
    expect(onChange).not.toHaveBeenCalled();
  });
});
