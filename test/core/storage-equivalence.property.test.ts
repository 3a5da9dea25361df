/**
 * The reader keeps a column as a dictionary or, past a cap, as numbers plus the texts the numbers
 * do not give back (columns-builder.ts). Which one it chose must never show: profiling and
 * encoding a table give the same answers either way. Checked on random columns of number
 * spellings, missing spellings (some of them numbers, "-999"), and stray text.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Table } from '../../src/core/columns.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable, type ColumnProfile } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';

const SPELLINGS = ['1', '2', '-3', '1.5', '1.50', '007', '0', '-0', '2.25', '1e3', '12345678901234567', '', ' 4', 'NA', 'n/a', '-999', 'x', '12 504'];
const TOKEN_POOL = ['NA', 'n/a', '-999', '0', '1.5', 'x'];

/** A table of one column `v` (and a row number), as CSV bytes. */
function csv(cells: readonly string[]): Uint8Array {
  return new TextEncoder().encode(`n,v\n${cells.map((c, i) => `${i},${c}`).join('\n')}\n`);
}

/**
 * What a profile says, without what only one storage can say (its level list and text shape), as
 * the recipe will hold it: JSON, where -0 is 0 (cells "0.000" and "-0.000" give a minimum of either).
 */
function comparable(profile: ColumnProfile): unknown {
  const { levels: _levels, text: _text, ...rest } = profile;
  const bySpelling = (a: { value: string }, b: { value: string }) => (a.value < b.value ? -1 : a.value > b.value ? 1 : 0);
  return JSON.parse(JSON.stringify({ ...rest, missingSpellings: [...rest.missingSpellings].sort(bySpelling) }));
}

describe('number storage and dictionary storage give the same profile and the same encoded bytes', () => {
  it('for random cells and missing tokens', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.constantFrom(...SPELLINGS), fc.integer({ min: -50, max: 5000 }).map(String), fc.double({ min: -100, max: 100, noNaN: true }).map((d) => d.toFixed(3))), { minLength: 20, maxLength: 200 }),
        fc.subarray(TOKEN_POOL),
        (cells, tokens) => {
          const missingTokens = ['', ...tokens];
          const bytes = csv(cells);
          const numberStored: Table = readTable(bytes, { dictionaryCap: 8 }).table;
          const dictionary: Table = readTable(bytes, { dictionaryCap: 1e9 }).table;
          const [fromNumbers, fromDictionary] = [numberStored, dictionary].map((t) => profileTable(t, { missingTokens })[1]!) as [ColumnProfile, ColumnProfile];
          if (numberStored.columns[1]!.kind === 'number') {
            expect(comparable(fromNumbers)).toEqual(comparable(fromDictionary));
          }
          const recipe = draftRecipe(profileTable(dictionary, { missingTokens }), { file: 'v.csv', rows: dictionary.rowCount }, { missingTokens });
          const a = encodeToCsv(recipe, numberStored);
          const b = encodeToCsv(recipe, dictionary);
          expect(new TextDecoder().decode(a.bytes)).toBe(new TextDecoder().decode(b.bytes));
          expect(a.report).toEqual(b.report);
        },
      ),
      { numRuns: 300 },
    );
  });
});
