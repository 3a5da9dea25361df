// @vitest-environment jsdom
import { cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { TakeAway } from '../../../src/ui/files/TakeAway.tsx';

afterEach(cleanup);

describe('TakeAway', () => {
  it('offers the encoded CSV when the recipe makes output columns', async () => {
    const onCsv = vi.fn();
    render(<TakeAway onCsv={onCsv} onRecipe={() => {}} onCodebook={() => {}} busy={false} />);
    await userEvent.click(screen.getByRole('button', { name: 'Encoded CSV' }));
    expect(onCsv).toHaveBeenCalledTimes(1);
    expect(onCsv).toHaveBeenLastCalledWith(false);
  });

  it('offers it gzip-compressed, as a .csv.gz file, once chosen', async () => {
    const onCsv = vi.fn();
    render(<TakeAway onCsv={onCsv} onRecipe={() => {}} onCodebook={() => {}} busy={false} />);
    await userEvent.selectOptions(screen.getByLabelText('Encoded CSV file type'), '.csv.gz');
    await userEvent.click(screen.getByRole('button', { name: 'Encoded CSV' }));
    expect(onCsv).toHaveBeenLastCalledWith(true);
  });

  it('does not offer a file of empty lines when every column is excluded, and says why', async () => {
    const onCsv = vi.fn();
    render(<TakeAway onCsv={onCsv} onRecipe={() => {}} onCodebook={() => {}} busy={false} noOutputs />);
    const button = screen.getByRole('button', { name: 'Encoded CSV' });
    expect(button).toHaveProperty('disabled', true);
    const note = document.getElementById(button.getAttribute('aria-describedby') ?? '');
    expect(note?.textContent).toContain('Every column is excluded');
    await userEvent.click(button);
    expect(onCsv).not.toHaveBeenCalled();
    // The recipe can still be taken away: it records the choice to exclude everything.
    expect(screen.getByRole('button', { name: 'Recipe' })).toHaveProperty('disabled', false);
  });
});
