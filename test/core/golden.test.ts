/**
 * Worked examples with hand-computed expected output (each case's README.md explains the numbers
 * and names its source), compared byte for byte.
 */
import { describe, expect, it } from 'vitest';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import { parseRecipe } from '../../src/core/recipe-io.ts';
import { goldenCases } from '../golden/cases.ts';

const text = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

describe('golden cases', () => {
  const cases = goldenCases();
  it('there are worked examples for every encoding', () => expect(cases.length).toBeGreaterThanOrEqual(12));
  for (const c of cases) {
    it(`${c.name}: output equals expected.csv exactly`, () => {
      const parsed = parseRecipe(c.recipeText);
      if (!parsed.ok) throw new Error(parsed.errors.join('\n'));
      const { table } = readTable(c.input);
      const { bytes } = encodeToCsv(parsed.recipe, table);
      expect(text(bytes)).toBe(text(c.expected));
    });
    it(`${c.name}: the same input and recipe give identical bytes every time`, () => {
      const parsed = parseRecipe(c.recipeText);
      if (!parsed.ok) throw new Error(parsed.errors.join('\n'));
      const once = encodeToCsv(parsed.recipe, readTable(c.input).table).bytes;
      const twice = encodeToCsv(parsed.recipe, readTable(c.input).table).bytes;
      expect(twice).toEqual(once);
    });
  }

  it('policy-errors: rejected rows are reported with line, column and reason', () => {
    const c = cases.find((x) => x.name === 'policy-errors')!;
    const parsed = parseRecipe(c.recipeText);
    if (!parsed.ok) throw new Error(parsed.errors.join('\n'));
    const { report } = encodeToCsv(parsed.recipe, readTable(c.input).table);
    expect(report.rows).toBe(4);
    expect(report.rowsWritten).toBe(2);
    expect(report.rowsRejected).toBe(2);
    expect(report.rejected.map((r) => [r.line, r.column])).toEqual([
      [4, 'colour'],
      [5, 'size'],
    ]);
    expect(report.rejected[0]?.reason).toContain('unseen level "green"');
    expect(report.fits).toBe(false);
    const colour = report.columns.find((col) => col.name === 'colour');
    expect(colour?.unseen).toEqual([{ value: 'green', count: 1, lines: [4] }]);
    const size = report.columns.find((col) => col.name === 'size');
    expect(size?.invalid).toEqual([{ value: 'x', count: 1, lines: [5] }]);
  });
});
