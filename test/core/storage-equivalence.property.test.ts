/**
 * The reader keeps a column as a dictionary or, past a cap, as numbers plus the texts the numbers
 * do not give back (columns-builder.ts). Which one it chose must never show: profiling and
 * encoding a table give the same answers either way. Checked on random columns of number
 * spellings, missing spellings (some of them numbers, "-999"), and stray text.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Table } from '../../src/core/columns.ts';
import { encodeBatch } from '../../src/core/apply.ts';
import { createCsvWriter } from '../../src/core/csv-write.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { decide } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable, type ColumnProfile } from '../../src/core/profile.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { createTableReader, readTable } from '../../src/core/read-table.ts';

const SPELLINGS = ['1', '2', '-3', '1.5', '1.50', '007', '0', '-0', '0.00', '-0.00', '2.25', '2.250', '1e3', '12345678901234567', '', ' 4', 'NA', 'n/a', '-999', 'x', '12 504'];
const TOKEN_POOL = ['NA', 'n/a', '-999', '0', '1.5', '1.50', '0.00', 'x'];

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

describe('the streamed path (batches, each choosing its own storage) gives the bytes of the whole table', () => {
  it('for random cells, batch sizes and dictionary caps', () => {
    fc.assert(
      fc.property(
        // Mostly numbers, so that batches often move to number storage; now and then another spelling.
        fc.array(fc.oneof({ arbitrary: fc.integer({ min: -50, max: 5000 }).map(String), weight: 8 }, { arbitrary: fc.constantFrom(...SPELLINGS), weight: 1 }), { minLength: 1, maxLength: 150 }),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 2, max: 16 }),
        (cells, batchRows, dictionaryCap) => {
          const bytes = csv(cells);
          const whole = readTable(bytes).table;
          const missingTokens = ['', 'NA', '-999'];
          const profiles = profileTable(whole, { missingTokens });
          // Read as a measurement, whatever the draft proposed (mostly distinct whole numbers look like codes).
          const drafted = draftRecipe(profiles, { file: 'v.csv', rows: whole.rowCount }, { missingTokens });
          const recipe = profiles[1]!.numeric === null ? drafted : decide(drafted, { type: 'set-level', column: 'v', level: 'continuous' }, profiles);
          const expected = new TextDecoder().decode(encodeToCsv(recipe, whole).bytes);
          // As the command line streams: batches handed over by the reader, encoded and written in turn.
          const parts: Uint8Array[] = [];
          let writer: ReturnType<typeof createCsvWriter> | null = null;
          let plan: ReturnType<typeof compilePlan> | null = null;
          const reader = createTableReader({
            batchRows,
            dictionaryCap,
            onBatch: (batch) => {
              plan ??= compilePlan(recipe, batch.names);
              if (writer === null) {
                writer = createCsvWriter(plan, (part) => parts.push(part.slice()), 64);
                writer.writeHeader();
              }
              writer.writeBatch(encodeBatch(plan, batch));
            },
          });
          for (let at = 0; at < bytes.length; at += 97) reader.push(bytes.subarray(at, at + 97));
          reader.finish();
          (writer as ReturnType<typeof createCsvWriter> | null)?.finish();
          expect(new TextDecoder().decode(Buffer.concat(parts))).toBe(expected);
        },
      ),
      { numRuns: 200 },
    );
  });
});
