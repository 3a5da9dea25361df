/** The CSV writer on hand-checked cases, and on the sizes where its shortcuts change course. */
import { describe, expect, it } from 'vitest';
import { encodeBatch } from '../../src/core/apply.ts';
import { createCsvWriter } from '../../src/core/csv-write.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable, tableFromRows } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../src/core/recipe.ts';
import type { Table } from '../../src/core/columns.ts';

const bytes = (text: string) => new TextEncoder().encode(text);

function recipeOf(table: Table, decisions: readonly Decision[]): Recipe {
  const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
  return decisions.reduce((r, d) => decide(r, d, profiles), draftRecipe(profiles, { file: null, rows: table.rowCount }));
}

/** Everything the writer hands the sink, joined. */
function writeAll(recipe: Recipe, table: Table, batchRows: number, bufferBytes?: number): { text: string; parts: number[] } {
  const plan = compilePlan(recipe, table.names);
  const chunks: Uint8Array[] = [];
  const writer = createCsvWriter(plan, (part) => chunks.push(part.slice()), bufferBytes);
  writer.writeHeader();
  for (let start = 0; start < table.rowCount; start += batchRows) writer.writeBatch(encodeBatch(plan, table, start, Math.min(table.rowCount, start + batchRows)));
  writer.finish();
  const all = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  chunks.reduce((at, c) => (all.set(c, at), at + c.length), 0);
  expect(writer.bytesWritten).toBe(all.length);
  return { text: new TextDecoder().decode(all), parts: chunks.map((c) => c.length) };
}

describe('a hand-checked file', () => {
  // id: formula starts neutralised (OWASP "CSV Injection"), a plain negative number left alone;
  // quotes doubled and cells with quotes or commas quoted (RFC 4180 §2.6–2.7).
  // size: min-max over the fitted 1..3, so (x − 1) / 2; NA takes the median 2 → 0.5, indicator 1.
  // colour: one-hot over red, blue; the empty cell is missing → all zeros, indicator 1.
  const input = 'id,size,colour\r\n=1+2,1,red\r\n"Zoë ""Z""",2,blue\r\n"a,b",3,\r\n-7,NA,red\r\n';
  const expected =
    'id,size,size (missing),colour=red,colour=blue,colour (missing)\r\n' +
    "'=1+2,0,0,1,0,0\r\n" +
    '"Zoë ""Z""",0.5,0,0,1,0\r\n' +
    '"a,b",1,0,0,0,1\r\n' +
    '-7,0.5,1,1,0,0\r\n';
  const { table } = readTable(bytes(input));
  const recipe = recipeOf(table, [
    { type: 'set-level', column: 'id', level: 'identifier' },
    { type: 'set-level', column: 'size', level: 'continuous' },
    { type: 'set-scaling', column: 'size', scaling: 'min-max' },
    { type: 'set-continuous-missing', column: 'size', missing: { policy: 'median', indicator: true } },
    { type: 'set-level', column: 'colour', level: 'nominal' },
    { type: 'set-nominal-coding', column: 'colour', coding: 'one-hot' },
    { type: 'set-categorical-missing', column: 'colour', missing: { policy: 'zeros', indicator: true } },
  ]);

  it('is written as worked out by hand', () => {
    expect(new TextDecoder().decode(encodeToCsv(recipe, table).bytes)).toBe(expected);
  });

  it('and the same one row per batch, through the smallest buffer (64 bytes)', () => {
    const { text, parts } = writeAll(recipe, table, 1, 64);
    expect(text).toBe(expected);
    expect(Math.max(...parts)).toBeLessThanOrEqual(64);
  });
});

describe('sizes where the writer changes course', () => {
  it('a text cell longer than the buffer goes to the sink whole, between the rest of its row', () => {
    const long = 'x'.repeat(10_000);
    const { table } = readTable(bytes(`id,n\r\nshort,1\r\n${long},2\r\n`));
    const recipe = recipeOf(table, [{ type: 'set-level', column: 'id', level: 'identifier' }, { type: 'set-level', column: 'n', level: 'continuous' }]);
    const { text, parts } = writeAll(recipe, table, 2, 64);
    expect(text).toBe(`id,n\r\nshort,1\r\n${long},2\r\n`);
    expect(parts).toContain(10_000);
  });

  it('numbers that share a slot of the grid in front of the number pieces, and −0 beside 0, are each written as themselves', () => {
    // The first batch (1, 2, 3) puts the grid on whole steps; 2.4 and 2.0000001 then land in 2's
    // slot and 1e-9 and −0 in 0's, and must not take the piece kept there (number-piece-grid.ts).
    const fit = tableFromRows([['a'], ['1'], ['2'], ['3']]).table;
    const recipe = recipeOf(fit, [
      { type: 'set-level', column: 'a', level: 'continuous' },
      { type: 'set-scaling', column: 'a', scaling: 'none' },
    ]);
    const cells = ['1', '2', '3', '2', '2.4', '2.0000001', '0', '1e-9', '-0', '0', '2.4', '-1', '7'];
    // A cap of 2 values keeps the column in number storage, where the grid is used.
    const table = tableFromRows([['a'], ...cells.map((cell) => [cell])], { dictionaryCap: 2 }).table;
    expect(table.columns[0]?.kind).toBe('number');
    // −0 is written as 0, as JavaScript's shortest form of the number has it (common practice for CSV).
    const written = ['1', '2', '3', '2', '2.4', '2.0000001', '0', '1e-9', '0', '0', '2.4', '-1', '7'];
    for (const batchRows of [3, 13]) expect(writeAll(recipe, table, batchRows).text).toBe(['a', ...written].map((line) => `${line}\r\n`).join(''));
  });

  it('number columns with more distinct values than the writer remembers (2^18 in all) are written exactly', () => {
    // As-is scaling: each output cell is the shortest text of the same double, so here the input text itself.
    const fit = tableFromRows([['a', 'b'], ['0.5', '1'], ['1.25', '2'], ['2', '3']]).table;
    const recipe = recipeOf(fit, [
      { type: 'set-level', column: 'a', level: 'continuous' },
      { type: 'set-scaling', column: 'a', scaling: 'none' },
      { type: 'set-level', column: 'b', level: 'continuous' },
      { type: 'set-scaling', column: 'b', scaling: 'none' },
    ]);
    // Batches of 50,000 rows: after three, 300,000 distinct numbers are remembered, so the fourth starts
    // afresh; its numbers are those of the first batch again, which must not come back from before.
    const rows = Array.from({ length: 180_000 }, (_, i) => [String((i % 150_000) / 7), String((i % 150_000) / 11 + 0.5)]);
    for (const extra of [[], [['NA', 'NA']]]) {
      // With a missing token the columns may stay dictionary-stored; without, they move to number storage.
      const table = tableFromRows([['a', 'b'], ...rows, ...extra]).table;
      const { text } = writeAll(recipe, table, 50_000);
      const fitted = recipe.columns.map((c) => (c.level === 'continuous' ? String(c.fitted.mean) : ''));
      const lines = [['a', 'b'], ...rows, ...extra.map(() => fitted)];
      expect(text).toBe(lines.map((line) => `${line.join(',')}\r\n`).join(''));
    }
  });
});
