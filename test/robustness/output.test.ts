/**
 * What Levelwise writes: text that a spreadsheet would run as a formula is neutralised (OWASP
 * "CSV Injection": a cell must not begin with =, +, -, @, tab or CR; LF too, common practice),
 * numbers never are, and every number reads back as exactly the double that was written
 * (ECMAScript Number::toString gives the shortest text that round-trips, ECMA-262 §6.1.6.1.20).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cellText } from '../../src/core/columns.ts';
import { numberCell, neutraliseFormula } from '../../src/core/csv-cell.ts';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable, tableFromRows } from '../../src/core/read-table.ts';
import type { Recipe } from '../../src/core/recipe.ts';

function asIdentifiers(rows: string[][]): { recipe: Recipe; csv: string } {
  const { table } = tableFromRows(rows);
  const profiles = profileTable(table);
  const recipe = table.names.reduce(
    (r, name) => decide(r, { type: 'set-level', column: name, level: 'identifier' }, profiles),
    draftRecipe(profiles, { file: null, rows: table.rowCount }),
  );
  return { recipe, csv: new TextDecoder().decode(encodeToCsv(recipe, table).bytes) };
}

describe('formula injection (OWASP "CSV Injection")', () => {
  const cases: [string, string][] = [
    ['=1+2', "'=1+2"],
    ['=HYPERLINK("http://example.invalid","click")', `"'=HYPERLINK(""http://example.invalid"",""click"")"`],
    ["=cmd|' /C calc'!A0", "'=cmd|' /C calc'!A0"],
    ['+A1', "'+A1"],
    ['-A1+B1', "'-A1+B1"],
    ['@SUM(A1:A9)', "'@SUM(A1:A9)"],
    ['\t=1', "'\t=1"],
    ['\r=1', `"'\r=1"`],
    ['\n=1', `"'\n=1"`],
    // Numbers are numbers, not formulas: never touched (an apostrophe would turn them into text).
    ['-3', '-3'],
    ['+5', '+5'],
    ['-1.5e3', '-1.5e3'],
    // Only the first character counts (OWASP lists leading characters); quoting still applies.
    [' =1', ' =1'],
    ['a=b', 'a=b'],
    ['plain, with comma', '"plain, with comma"'],
  ];

  it.each(cases)('the cell %j is written as %j', (cell, written) => {
    const { csv } = asIdentifiers([['ref', 'n'], [cell, '1']]);
    expect(csv).toBe(`ref,n\r\n${written},1\r\n`);
  });

  it('headers made from formula-looking names are neutralised too', () => {
    const { csv } = asIdentifiers([['=x', '@y', 'z'], ['1', '2', '3']]);
    expect(csv.split('\r\n')[0]).toBe("'=x,'@y,z");
  });

  it('encoded numbers are never neutralised: negative z-scores stay numbers', () => {
    const { table } = tableFromRows([['amount'], ...[-5, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11].map((n) => [String(n)])]);
    const profiles = profileTable(table);
    const recipe = decide(draftRecipe(profiles, { file: null, rows: table.rowCount }), { type: 'set-scaling', column: 'amount', scaling: 'z-score' }, profiles);
    const csv = new TextDecoder().decode(encodeToCsv(recipe, table).bytes);
    expect(csv).not.toContain("'");
    expect(csv.split('\r\n')[1]?.startsWith('-')).toBe(true);
  });

  it('property: no text cell we write starts with a formula character unless it is a plain number', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 20 }), (text) => {
        const safe = neutraliseFormula(text);
        const risky = /^[=+\-@\t\r\n]/.test(safe);
        if (risky) expect(safe).toMatch(/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/);
        expect(safe === text || safe === `'${text}`).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('numbers read back exactly', () => {
  it('property: any finite double written as a CSV number reads back with Number() as the same double', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (value) => {
        const text = numberCell(value);
        // -0 is written as 0 on purpose (spreadsheets show "-0" oddly); 0 === -0.
        expect(Number(text) === value).toBe(true);
        if (!Object.is(value, -0)) expect(Object.is(Number(text), value)).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it('property: doubles read from a file and written through the whole path as they are come back identical', () => {
    const doubles = fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }).map((v) => (Object.is(v, -0) ? 0 : v)), { minLength: 1, maxLength: 40 });
    fc.assert(
      fc.property(doubles, (values) => {
        const input = `row,x\n${values.map((v, i) => `${i},${String(v)}`).join('\n')}\n`;
        const { table } = readTable(new TextEncoder().encode(input));
        const profiles = profileTable(table);
        let recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
        recipe = decide(recipe, { type: 'set-level', column: 'x', level: 'continuous' }, profiles);
        recipe = decide(recipe, { type: 'set-level', column: 'row', level: 'excluded' }, profiles);
        const output = readTable(encodeToCsv(recipe, table).bytes).table;
        expect(output.names).toEqual(['x']);
        const back = Array.from({ length: output.rowCount }, (_, row) => Number(cellText(output.columns[0]!, row)));
        expect(back).toEqual(values);
      }),
      { numRuns: 300 },
    );
  });
});
