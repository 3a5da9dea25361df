/** Applying recipes: cases that the golden files cannot show, such as storage chosen by size. */
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { encodeTable, encodeToCsv } from '../../src/core/encode-csv.ts';
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

describe('a number-stored column encoded in batches', () => {
  it('reads each batch’s kept texts at their own rows ("4 000" in the second batch is 4000)', () => {
    const { table: fitted } = readTable(bytes('amount\n1 000\n2 500\n3\n'));
    const profiles = profileTable(fitted, { missingTokens: DEFAULT_MISSING_TOKENS });
    const r = decide(draftRecipe(profiles, { file: null, rows: fitted.rowCount }), { type: 'set-level', column: 'amount', level: 'continuous' }, profiles);
    expect(r.columns[0]).toMatchObject({ level: 'continuous', scaling: 'none', format: { decimal: '.', group: ' ' } });
    // "4 000" is not plain number text: number storage keeps it as an exception of row 3.
    const { table } = readTable(bytes('amount\n1\n2\n3\n4 000\n5\n'), { dictionaryCap: 2 });
    expect(table.columns[0]?.kind).toBe('number');
    let text = '';
    encodeTable(r, table, { batchRows: 2, sink: (part) => void (text += new TextDecoder().decode(part)) });
    expect(lines(new TextEncoder().encode(text))).toEqual(['amount', '1', '2', '3', '4000', '5']);
  });
});
