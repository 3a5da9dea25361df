/**
 * Property tests over arbitrary input: random bytes, random CSV-like text full of quotes,
 * delimiters, line breaks and odd characters, and random tables written by the rules of RFC 4180.
 * Whatever comes in, the whole path — decode, parse, profile, draft, encode, recipe round trip —
 * either works or stops with our own LevelwiseError (a message for a person), never anything
 * else; rows are neither lost nor invented; our output read back holds exactly the numbers encoded.
 */
import { misshapenRows } from '../../src/core/row-shape.ts';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { encodeWindow } from '../../src/core/apply.ts';
import { cellText, type Table } from '../../src/core/columns.ts';
import { quoteCell } from '../../src/core/csv-cell.ts';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { isLevelwiseError } from '../../src/core/errors.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';
import { parseRecipe, stringifyRecipe } from '../../src/core/recipe-io.ts';
import { concat, utf16le, utf8, windows1252 } from './helpers.ts';

/** The page's whole path; returns the encoded CSV's rows written, or the LevelwiseError it stopped with. */
function wholePath(bytes: Uint8Array): { rows: number; written: number; misshapen: number } | 'refused' {
  try {
    const { table } = readTable(bytes);
    const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
    const recipe = draftRecipe(profiles, { file: 'random.csv', rows: table.rowCount });
    const again = parseRecipe(stringifyRecipe(recipe));
    if (!again.ok) throw new Error(`a drafted recipe did not read back: ${again.errors.join(' ')}`);
    const { report } = encodeToCsv(again.recipe, table);
    return { rows: table.rowCount, written: report.rowsWritten, misshapen: misshapenRows(table, 0, table.rowCount).length };
  } catch (error) {
    if (isLevelwiseError(error)) return 'refused';
    throw error;
  }
}

const TOKENS = ['"', '""', ',', ';', '\t', '|', '\n', '\r', '\r\n', ' ', 'a', 'Zoë', '東京', '1', '-2.5', '1,5', '1e309', 'NA', '=SUM(A1)', '\u0000', '\ufeff', '\ud800', '€'];
const csvLikeText = fc.array(fc.constantFrom(...TOKENS), { maxLength: 120 }).map((parts) => parts.join(''));

describe('arbitrary input never breaks the path', () => {
  it('property: random bytes (with and without a byte order mark) work or are refused with a LevelwiseError', () => {
    const prefix = fc.constantFrom(new Uint8Array(0), new Uint8Array([0xef, 0xbb, 0xbf]), new Uint8Array([0xff, 0xfe]), new Uint8Array([0xfe, 0xff]));
    fc.assert(fc.property(prefix, fc.uint8Array({ maxLength: 400 }), (head, body) => void wholePath(concat(head, body))), { numRuns: 1500 });
  });

  it('property: random CSV-like text, as UTF-8, UTF-16 or Windows-1252, works or is refused with a LevelwiseError', () => {
    const encoded = fc.tuple(csvLikeText, fc.constantFrom('utf-8', 'utf-16le', 'windows-1252')).map(([text, encoding]) => {
      if (encoding === 'utf-8') return utf8(text);
      if (encoding === 'utf-16le') return utf16le(text);
      return windows1252(text.replace(/[^\u0000-\u00ff€]/g, '?'));
    });
    fc.assert(fc.property(encoded, (bytes) => void wholePath(bytes)), { numRuns: 1500 });
  });

  it('property: every row read is written, except rows whose fields do not line up (no policy rejects rows by default)', () => {
    fc.assert(
      fc.property(csvLikeText, (text) => {
        const result = wholePath(utf8(`a,b,c\n${text}`));
        if (result !== 'refused') expect(result.written).toBe(result.rows - result.misshapen);
      }),
      { numRuns: 1000 },
    );
  });
});

// Cells with everything RFC 4180 lets a field hold once quoted: quotes, commas, CR, LF.
const cellChars = fc.constantFrom('a', 'b', 'Z', 'é', '1', '0', '.', '-', ' ', '"', ',', '\n', '\r', ';', '\t', '=', 'NA');
const cell = fc.array(cellChars, { maxLength: 6 }).map((parts) => parts.join(''));

/** A table written as RFC 4180 text: CRLF line ends, fields quoted where they must be (sometimes always). */
const writtenTable = fc
  .record({
    width: fc.integer({ min: 2, max: 5 }),
    rows: fc.integer({ min: 0, max: 25 }),
    quoteAll: fc.boolean(),
    lastLineBreak: fc.boolean(),
  })
  .chain(({ width, rows, quoteAll, lastLineBreak }) =>
    fc.record({
      rows: fc.array(fc.array(cell, { minLength: width, maxLength: width }), { minLength: rows, maxLength: rows }),
      header: fc.constant(Array.from({ length: width }, (_, i) => `col ${i + 1}`)),
      quoteAll: fc.constant(quoteAll),
      lastLineBreak: fc.constant(lastLineBreak),
    }),
  )
  .map(({ header, rows, quoteAll, lastLineBreak }) => {
    const field = (text: string) => (quoteAll ? `"${text.replace(/"/g, '""')}"` : quoteCell(text));
    const lines = [header, ...rows].map((cells) => cells.map(field).join(','));
    return { header, rows, text: lines.join('\r\n') + (lastLineBreak ? '\r\n' : '') };
  });

describe('rows are kept, cell for cell', () => {
  it('property: an RFC 4180 table reads back with the same rows and cells, and encodes every row', () => {
    fc.assert(
      fc.property(writtenTable, ({ header, rows, text }) => {
        const { table } = readTable(utf8(text), { delimiter: ',' });
        expect(table.names).toEqual(header);
        expect(table.rowIssues).toEqual([]);
        // A last row of empty cells written without quotes and without a final line break is one
        // empty field per column: still a row, since the table has at least two columns.
        expect(table.rowCount).toBe(rows.length);
        const read = Array.from({ length: table.rowCount }, (_, r) => table.columns.map((c) => cellText(c, r)));
        expect(read).toEqual(rows);
        const profiles = profileTable(table);
        const recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
        // With every column left out the output has no columns, only line ends: nothing to read back.
        if (recipe.columns.every((c) => c.outputs.length === 0)) return;
        const output = readTable(encodeToCsv(recipe, table).bytes, { delimiter: ',' });
        expect(output.table.rowCount).toBe(rows.length);
      }),
      { numRuns: 800 },
    );
  });
});

describe('our output read back holds the numbers encoded', () => {
  const number = fc.oneof(
    fc.double({ min: -1e12, max: 1e12, noNaN: true }).map((v) => String(Object.is(v, -0) ? 0 : v)),
    fc.integer({ min: -1000, max: 1000 }).map(String),
    fc.constantFrom('', 'NA', 'n/a', '12,5', '$3'),
  );
  const level = fc.constantFrom('red', 'green', 'blue', ' Red', 'RED', '', 'NA', '=x', '-');
  const rows = fc.array(fc.tuple(number, level, number), { minLength: 1, maxLength: 40 });
  const scaling = fc.constantFrom('none', 'z-score', 'min-max') as fc.Arbitrary<'none' | 'z-score' | 'min-max'>;
  const coding = fc.constantFrom('one-hot', 'dummy', 'effect', 'frequency') as fc.Arbitrary<'one-hot' | 'dummy' | 'effect' | 'frequency'>;

  it('property: each number in the CSV, read with Number(), is the number the encoder computed', () => {
    fc.assert(
      fc.property(rows, scaling, coding, (cells, scale, code) => {
        const text = `x,colour,y\n${cells.map((r) => r.map(quoteCell).join(',')).join('\n')}\n`;
        const { table } = readTable(utf8(text), { delimiter: ',' });
        const profiles = profileTable(table);
        let recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
        for (const name of ['x', 'y']) {
          if (profiles.find((p) => p.name === name)?.numeric === null) continue;
          recipe = decide(recipe, { type: 'set-level', column: name, level: 'continuous' }, profiles);
          recipe = decide(recipe, { type: 'set-scaling', column: name, scaling: scale }, profiles);
        }
        if (profiles[1]?.levels?.length) {
          recipe = decide(recipe, { type: 'set-level', column: 'colour', level: 'nominal' }, profiles);
          recipe = decide(recipe, { type: 'set-nominal-coding', column: 'colour', coding: code }, profiles);
        }
        expectOutputMatchesEncoding(recipe, table);
      }),
      { numRuns: 400 },
    );
  });
});

function expectOutputMatchesEncoding(recipe: Parameters<typeof compilePlan>[0], table: Table): void {
  const plan = compilePlan(recipe, table.names);
  const width = plan.outputs.length;
  if (width === 0) return; // no output columns: only line ends, nothing to read back
  const { values, batch } = encodeWindow(plan, table, 0, table.rowCount);
  const written = readTable(encodeToCsv(recipe, table).bytes, { delimiter: ',' }).table;
  expect(written.names).toEqual(plan.outputs.map((name) => name));
  let outRow = 0;
  for (let r = 0; r < batch.end - batch.start; r++) {
    if (batch.rejected[r]) continue;
    for (let c = 0; c < width; c++) {
      const expected = values[r * width + c]!;
      if (Number.isNaN(expected)) continue; // a text output (identifier): not a number
      const text = cellText(written.columns[c]!, outRow);
      expect(Number(text) === expected).toBe(true);
    }
    outRow++;
  }
  expect(written.rowCount).toBe(outRow);
}
