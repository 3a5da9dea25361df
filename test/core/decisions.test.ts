/**
 * Decisions that need the data read again: choosing the number format of a continuous column.
 * The profile keeps a text column's distinct values, so `decide` re-reads them in the chosen
 * format without the table, and every later refit keeps reading in it.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { draftRecipe, profileAsDecided } from '../../src/core/fit.ts';
import { CANDIDATE_NUMBER_FORMATS } from '../../src/core/numbers.ts';
import { numericSummaryIn, profileColumn, profileTable } from '../../src/core/profile.ts';
import { DEFAULT_MISSING_TOKENS, type ContinuousColumn, type NumberFormat, type Recipe } from '../../src/core/recipe.ts';
import { columnTable, thrownLevelwiseError } from './helpers/tables.ts';

const DECIMAL_COMMA: NumberFormat = { decimal: ',', group: '' };

/** The drafted recipe and profiles of a one-column table (beside its row number), `amount` set continuous. */
function drafted(cells: readonly string[]): { recipe: Recipe; profiles: ReturnType<typeof profileTable> } {
  const table = columnTable('amount', cells);
  const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
  const recipe = decide(draftRecipe(profiles, { file: null, rows: table.rowCount }), { type: 'set-level', column: 'amount', level: 'continuous' }, profiles);
  return { recipe, profiles };
}

const amountOf = (recipe: Recipe): ContinuousColumn => recipe.columns.find((c) => c.name === 'amount') as ContinuousColumn;

describe('set-number-format', () => {
  // Written with decimal commas, but "1,234" and "5,678" alone look like thousands to the draft.
  const cells = ['1,234', '5,678', '12', '7', 'n/a', '12', 'x'];
  const { recipe, profiles } = drafted(cells);

  it('the draft reads "1,234" as one thousand two hundred thirty-four (ties go to the point: numbers.ts)', () => {
    const amount = amountOf(recipe);
    expect(amount.format).toEqual({ decimal: '.', group: ',' });
    expect(amount.fitted).toMatchObject({ count: 5, min: 7, max: 5678 });
  });

  it('with a decimal comma chosen, the same cells are refitted: 1.234, 5.678, 12, 7, 12', () => {
    const amount = amountOf(decide(recipe, { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA }, profiles));
    expect(amount.format).toEqual(DECIMAL_COMMA);
    // (1.234 + 5.678 + 12 + 7 + 12) / 5 = 37.912 / 5; the median is the third of 1.234, 5.678, 7, 12, 12.
    expect(amount.fitted.count).toBe(5);
    expect(amount.fitted.mean).toBeCloseTo(37.912 / 5, 12);
    expect(amount.fitted).toMatchObject({ min: 1.234, max: 12, median: 7 });
  });

  it('the reason says the format was chosen by hand and how many values read in it', () => {
    expect(amountOf(recipe).reason).toBe('set by hand');
    const chosen = amountOf(decide(recipe, { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA }, profiles));
    // 1,234 5,678 12 7 12 read; "x" does not; "n/a" is missing: 5 of 6 (83.3 %).
    expect(chosen.reason).toBe('set by hand: numbers written like "1234,5"; 5 of 6 values read so (83.3%)');
    const euros = amountOf(decide(recipe, { type: 'set-number-format', column: 'amount', format: { decimal: ',', group: '.', symbol: { text: '€', side: 'before' } } }, profiles));
    expect(euros.reason).toBe('set by hand: numbers written like "€1.234,5"; 5 of 6 values read so (83.3%)');
    const kilos = amountOf(decide(recipe, { type: 'set-number-format', column: 'amount', format: { decimal: '.', group: '', symbol: { text: 'kg', side: 'after' } } }, profiles));
    // The unit may be left out, so 12, 7 and 12 read; "1,234" does not without digit groups.
    expect(kilos.reason).toBe('set by hand: numbers written like "1234.5 kg"; 3 of 6 values read so (50%)');
    // "1.5" is no number with "." grouping thousands: nothing reads.
    const halves = drafted(['1.5', '2.5', '3.25', '4.5']);
    const unread = amountOf(decide(halves.recipe, { type: 'set-number-format', column: 'amount', format: { decimal: ',', group: '.' } }, halves.profiles));
    expect(unread.reason).toBe('set by hand: numbers written like "1.234,5"; none of the 4 values read so');
    // Choosing the format the column already has changes nothing, the reason included.
    expect(amountOf(decide(recipe, { type: 'set-number-format', column: 'amount', format: { decimal: '.', group: ',' } }, profiles))).toEqual(amountOf(recipe));
  });

  it('later decisions keep reading in the chosen format, and undoing is replaying fewer decisions', () => {
    const decisions: Decision[] = [
      { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA },
      { type: 'set-scaling', column: 'amount', scaling: 'z-score' },
      { type: 'set-invalid', column: 'amount', invalid: 'error' },
    ];
    const after = amountOf(decisions.reduce((r, d) => decide(r, d, profiles), recipe));
    expect(after.format).toEqual(DECIMAL_COMMA);
    expect(after.fitted.max).toBe(12);
    const undone = amountOf(decisions.slice(1).reduce((r, d) => decide(r, d, profiles), recipe));
    expect(undone.format).toEqual({ decimal: '.', group: ',' });
    expect(undone.fitted.max).toBe(5678);
  });

  it('the page is shown the numbers in the chosen format; cells that do not read are named without a row', () => {
    const chosen = decide(recipe, { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA }, profiles);
    const shown = profileAsDecided(profiles[0]!, amountOf(chosen));
    expect(shown.numeric).toMatchObject({ count: 5, invalidCount: 1, invalidExamples: [{ text: 'x' }] });
    expect(shown.numeric?.invalidExamples[0]?.row).toBeUndefined();
    expect(profileAsDecided(profiles[0]!, amountOf(recipe))).toBe(profiles[0]);
  });

  it('a symbol can be added by hand: "≈12" (about twelve) is read once the sign is named', () => {
    const weights = drafted(['≈12', '≈3.5', '7', '≈10', '2.5', '≈1', '≈4', '≈8', '≈6', '≈9', '≈11', '≈5']);
    expect(amountOf(weights.recipe).fitted.count).toBe(2);
    const about = { decimal: '.', group: '', symbol: { text: '≈', side: 'before' } } as const;
    const amount = amountOf(decide(weights.recipe, { type: 'set-number-format', column: 'amount', format: about }, weights.profiles));
    // 12 + 3.5 + 7 + 10 + 2.5 + 1 + 4 + 8 + 6 + 9 + 11 + 5 = 79 over 12.
    expect(amount.fitted).toMatchObject({ count: 12, min: 1, max: 12 });
    expect(amount.fitted.mean).toBeCloseTo(79 / 12, 12);
  });

  it('refuses a symbol that is not one, saying what to give instead', () => {
    const error = thrownLevelwiseError(() =>
      decide(recipe, { type: 'set-number-format', column: 'amount', format: { decimal: '.', group: '', symbol: { text: '5 €', side: 'after' } } }, profiles),
    );
    expect(error.code).toBe('bad-number-format');
    expect(error.message).toMatch(/^“5 €” cannot be the symbol of “amount”'s numbers: /);
    expect(error.hint).toMatch(/as it is written beside the numbers/);
  });

  it('refuses another format for a column stored as plain numbers (no levels kept to read again), but not its own', () => {
    const plain = drafted(Array.from({ length: 5000 }, (_, i) => String(i * 0.5)));
    expect(plain.profiles[0]!.levels).toBeNull();
    const error = thrownLevelwiseError(() => decide(plain.recipe, { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA }, plain.profiles));
    expect(error.code).toBe('number-format-fixed');
    expect(amountOf(decide(plain.recipe, { type: 'set-number-format', column: 'amount', format: { decimal: '.', group: '' } }, plain.profiles)).fitted.count).toBe(5000);
  });

  it('leaves columns of other levels as they are', () => {
    const { recipe: r, profiles: p } = drafted(['a', 'b', 'a', 'c']);
    const asNominal = decide(r, { type: 'set-level', column: 'amount', level: 'nominal' }, p);
    expect(decide(asNominal, { type: 'set-number-format', column: 'amount', format: DECIMAL_COMMA }, p)).toEqual(asNominal);
  });
});

describe('numericSummaryIn', () => {
  it('property: reading a profile’s levels again in a format gives what profiling in that format gives, rows apart', () => {
    const cell = fc.oneof(
      fc.constantFrom('', 'NA', 'x', '1,5', '1.5', '1,234', '1.234,5', '12 %', '€ 3', '-€ 2,50', '1 234', '007', '1e3', 'US$4', '(5)', '(€ 2,50)', '1.234,5-', '7 kg'),
      fc.integer({ min: -50, max: 50 }).map(String),
    );
    const symbols = [undefined, { text: '%', side: 'after' }, { text: '€', side: 'before' }, { text: 'US$', side: 'before' }] as const;
    const negatives = [undefined, 'parentheses', 'trailing'] as const;
    const format = fc
      .tuple(fc.constantFrom(...CANDIDATE_NUMBER_FORMATS), fc.constantFrom(...symbols), fc.constantFrom(...negatives))
      .map(([f, symbol, negative]): NumberFormat => ({ ...f, ...(symbol ? { symbol } : {}), ...(negative ? { negative } : {}) }));
    fc.assert(
      fc.property(fc.array(cell, { minLength: 1, maxLength: 40 }), format, (cells, chosen) => {
        const column = columnTable('c', cells).columns[0]!;
        const options = { missingTokens: ['NA'] };
        const detected = profileColumn(column, 0, options);
        const direct = profileColumn(column, 0, { ...options, format: chosen }).numeric;
        const again = numericSummaryIn(detected, chosen);
        if (direct === null) {
          expect(again).toBeNull();
          return;
        }
        // Profiling names every cell that does not read (up to 100); reading levels again names each text once.
        const withoutRows = (n: typeof direct) => ({ ...n, invalidExamples: [...new Set(n.invalidExamples.map((e) => e.text))].sort() });
        expect(withoutRows(again!)).toEqual(withoutRows(direct));
      }),
      { numRuns: 400 },
    );
  });
});

describe('decide', () => {
  it('keeps every column it did not change as the same object, so that a page redraws only the changed one', () => {
    const table = columnTable('amount', ['1', '2', '3', '2', '1']);
    const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
    const recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
    const decided = decide(recipe, { type: 'set-level', column: 'amount', level: 'nominal' }, profiles);
    decided.columns.forEach((column, i) => {
      if (column.name === 'amount') expect(column).not.toBe(recipe.columns[i]);
      else expect(column).toBe(recipe.columns[i]);
    });
    expect(decided.columns.filter((c) => c !== recipe.columns[decided.columns.indexOf(c)]).map((c) => c.name)).toEqual(['amount']);
  });
});
