import { describe, expect, it } from 'vitest';
import { codebookEntries, codebookHtml, codebookMarkdown, missingSentence } from '../../src/core/codebook.ts';
import { decide } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { tableFromRows } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';

describe('the codebook of a continuous column', () => {
  // An invented price list: euro prices with decimal commas, and plain quantities.
  const prices = ['€ 1.234,50', '€ 19,99', '€ 7', '€ 250', '€ 99,90', '€ 12,00', '€ 7,25', '€ 1.000', '€ 30', '€ 45,10', '€ 2', '€ 3,30'];
  const table = tableFromRows([['price', 'quantity'], ...prices.map((p, i) => [p, String(i * 3 + 1)])]).table;
  const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
  const recipe = decide(draftRecipe(profiles, { file: null, rows: table.rowCount }), { type: 'set-level', column: 'quantity', level: 'continuous' }, profiles);

  it('says how the source writes its numbers when they carry a sign or separators, and nothing when plain', () => {
    const [price, quantity] = codebookEntries(recipe);
    // The mean of the twelve prices: 2,711.04 / 12 = 225.92.
    expect(price?.meaning).toMatch(/^price as a number, read from text written like €1\.234,5 \(the number as written, without “€”\); missing filled with 225\.92\d* \(mean\) before scaling$/);
    expect(quantity?.meaning).toMatch(/^quantity as a number; missing filled with/);
  });
});

describe('the codebook says which cells were read as missing', () => {
  const table = tableFromRows([['damage'], ['None'], ['Minor'], ['-999'], ['Severe']]).table;
  const tokens = [...DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'), '-999'];
  const recipe = draftRecipe(profileTable(table, { missingTokens: tokens }), { file: 'log <1>.csv', rows: 4 }, { missingTokens: tokens });

  it('names every spelling of the recipe, in its order, in both formats', () => {
    const sentence = 'A cell counts as missing when it is empty or, spaces around it aside, spelled “NA”, “N/A”, “n/a”, “#N/A”, “NaN”, “null”, “NULL”, “.”, “?”, “-” or “-999”.';
    expect(missingSentence(recipe)).toBe(sentence);
    expect(codebookMarkdown(recipe).split('\n')[2]).toBe(`Made by Levelwise from a recipe fitted on 4 rows. ${sentence}`);
    expect(codebookHtml(recipe)).toContain(`<p>Made by Levelwise from a recipe fitted on 4 rows. ${sentence}</p>`);
    expect(missingSentence({ ...recipe, reading: { ...recipe.reading, missingTokens: [] } })).toBe('A cell counts as missing when it is empty.');
    expect(missingSentence({ ...recipe, reading: { ...recipe.reading, missingTokens: ['<none>'] } })).toBe('A cell counts as missing when it is empty or, spaces around it aside, spelled “<none>”.');
    expect(codebookHtml({ ...recipe, reading: { ...recipe.reading, missingTokens: ['<none>'] } })).toContain('spelled “&lt;none&gt;”.');
  });
});
