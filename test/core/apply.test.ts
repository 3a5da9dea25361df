/** Applying recipes: cases that the golden files cannot show, such as storage chosen by size. */
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../src/core/recipe.ts';

const bytes = (text: string) => new TextEncoder().encode(text);
const lines = (out: Uint8Array) => new TextDecoder().decode(out).split('\r\n').filter((l) => l !== '');

describe('continuous columns read in the recipe’s number format whatever the storage', () => {
  const recipe = (): Recipe => {
    const { table } = readTable(bytes('amount\n"1.234,5"\n"2,5"\n"3,75"\n'));
    const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
    const drafted = draftRecipe(profiles, { file: null, rows: table.rowCount });
    return decide(drafted, { type: 'set-level', column: 'amount', level: 'continuous' }, profiles);
  };

  it('a decimal-comma recipe reads "1.234" as 1234 in a dictionary-stored column', () => {
    const r = recipe();
    expect(r.columns[0]).toMatchObject({ level: 'continuous', format: { decimal: ',', group: '.' } });
    const { table } = readTable(bytes('amount\n1.234\n7\n'));
    expect(lines(encodeToCsv(r, table).bytes)).toEqual(['amount', '1234', '7']);
  });

  it('and the same when the new file is big enough for number storage', () => {
    const r = recipe();
    const { table } = readTable(bytes('amount\n1.234\n7\n8\n9\n'), { dictionaryCap: 2 });
    expect(table.columns[0]?.kind).toBe('number');
    expect(lines(encodeToCsv(r, table).bytes)).toEqual(['amount', '1234', '7', '8', '9']);
  });
});
