/**
 * The CSV writer against the plainest possible writer, on random tables, recipes, batch sizes and
 * buffer sizes (fast-check): every written row is its cells made one by one with textCell and
 * numberCell, joined by commas and ended by CRLF (RFC 4180 §2.1, §2.4), rejected rows left out.
 * The writer's shortcuts — bytes made once per level (or per combination of adjacent columns'
 * levels), per distinct number and per text of a batch, copied eight bytes at a time (sixteen in
 * WebAssembly), across buffer flushes — must never change a byte.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeBatch, type EncodedBatch } from '../../src/core/apply.ts';
import { cellText, withPackedValues, type Column, type Table } from '../../src/core/columns.ts';
import { numberCell, textCell } from '../../src/core/csv-cell.ts';
import { createCsvWriter } from '../../src/core/csv-write.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan, type Plan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { tableFromRows } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type MeasurementLevel, type Recipe } from '../../src/core/recipe.ts';
import { wasmRowCopier } from '../../src/core/wasm-row-copier.ts';
import { useWebAssembly } from '../../src/core/webassembly.ts';

/**
 * Cells that test every rule of a text cell: formula starts (OWASP "CSV Injection"), quotes, commas
 * and line breaks (RFC 4180 §2.6–2.7), text that is not ASCII (a surrogate pair, and a lone
 * surrogate that UTF-8 writes as U+FFFD), numbers, missing-value tokens, a long text, and the bytes
 * nearest to a NaN's that UTF-8 holds (F0 9F 98 80 7F C3 BF: the row loop copies eight bytes as a double).
 */
const CELLS = [
  'a', 'b', 'c', 'NA', '?', '', ' ', '7', '-3', '2.5', '1e3', '0.1', '-0', '1,5', '12.50',
  '=SUM(A1)', '+1 x', '@home', '-x', '\tTab', 'say "hi"', 'x,y', 'line\nbreak', 'cr\rhere',
  'Zoë', '日本', '😀', '\uD800', ' pad ', 'x'.repeat(150), '😀\x7F\xFF',
];
const cell = fc.oneof({ weight: 6, arbitrary: fc.constantFrom(...CELLS) }, { weight: 1, arbitrary: fc.string({ maxLength: 6 }) });
const level = fc.constantFrom<MeasurementLevel>('continuous', 'nominal', 'ordinal', 'binary', 'identifier', 'excluded');

const rowsOf = (rows: number, columns: number) =>
  fc.array(fc.array(cell, { minLength: columns, maxLength: columns }), { minLength: rows, maxLength: rows });

const scenario = fc.tuple(fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 4 })).chain(([fitRows, applyRows, columns]) =>
  fc.record({
    fitRows: rowsOf(fitRows, columns),
    applyRows: rowsOf(applyRows, columns),
    levels: fc.array(level, { minLength: columns, maxLength: columns }),
    indicator: fc.boolean(),
    strict: fc.boolean(),
    batchRows: fc.integer({ min: 1, max: 45 }),
    bufferBytes: fc.integer({ min: 64, max: 400 }),
    dictionaryCap: fc.constantFrom(2, 4096),
    // Runs of adjacent categorical columns share pieces up to this many combinations: 1 writes
    // each column alone, 4096 (the default) joins every run these small tables make.
    jointLimit: fc.constantFrom(1, 3, 12, 4096),
  }),
);

function table(rows: readonly (readonly string[])[], dictionaryCap: number): Table {
  const header = (rows[0] ?? []).map((_, i) => `c${i}`);
  // The reader leaves out rows whose cells are all empty; a row number keeps every row a row.
  return tableFromRows([[...header, 'row'], ...rows.map((row, i) => [...row, String(i)])], { dictionaryCap }).table;
}

function recipeFor(fit: Table, levels: readonly MeasurementLevel[], indicator: boolean, strict: boolean): Recipe {
  const profiles = profileTable(fit, { missingTokens: DEFAULT_MISSING_TOKENS });
  let recipe = draftRecipe(profiles, { file: null, rows: fit.rowCount });
  const decisions = levels.flatMap((l, i): Decision[] => {
    const column = `c${i}`;
    return [
      { type: 'set-level', column, level: l },
      { type: 'set-continuous-missing', column, missing: { policy: strict ? 'error' : 'mean', indicator } },
      { type: 'set-categorical-missing', column, missing: { policy: strict ? 'error' : 'zeros', indicator } },
      { type: 'set-unseen', column, unseen: strict ? 'error' : 'zeros' },
      { type: 'set-invalid', column, invalid: strict ? 'error' : 'missing' },
    ];
  });
  for (const d of decisions) recipe = decide(recipe, d, profiles);
  return recipe;
}

/** The table with every text column of ASCII values holding them as bytes (columns.ts withPackedValues). */
function packed(source: Table): Table {
  const columns = source.columns.map((column): Column => {
    if (column.kind !== 'text' || column.values.some((v) => /[^\x00-\x7f]/.test(v))) return column;
    const starts = new Int32Array(column.values.length + 1);
    column.values.forEach((v, i) => (starts[i + 1] = starts[i]! + v.length));
    const ascending = column.values.every((v, i) => i === 0 || v > column.values[i - 1]!);
    return withPackedValues(column, { bytes: new TextEncoder().encode(column.values.join('')), starts, ascending });
  });
  return { ...source, columns };
}

/** The plainest writer: each cell made on its own, as the rules say. */
function referenceRows(plan: Plan, source: Table, batch: EncodedBatch): string {
  let text = '';
  for (let r = 0; r < batch.end - batch.start; r++) {
    if (batch.rejected[r] === 1) continue;
    const cells: string[] = [];
    plan.columns.forEach((column, c) => {
      const encoded = batch.columns[c]!;
      if (column.kind === 'categorical' && encoded.kind === 'levels') {
        const level = encoded.level[r]!;
        const { width, matrix } = column.codes;
        for (let j = 0; j < width; j++) cells.push(level === -1 ? '0' : numberCell(matrix[level * width + j]!));
        if (column.indicator) cells.push(String(encoded.missing[r]));
      } else if (column.kind === 'continuous' && encoded.kind === 'numbers') {
        cells.push(numberCell(encoded.values[r]!));
        if (column.indicator) cells.push(String(encoded.missing[r]));
      } else if (column.kind === 'identifier') {
        const from = source.columns[source.names.indexOf(column.recipe.name)];
        cells.push(from === undefined ? '' : textCell(cellText(from, batch.start + r)));
      }
    });
    text += `${cells.join(',')}\r\n`;
  }
  return text;
}

function written(plan: Plan, source: Table, batchRows: number, bufferBytes: number, jointLimit?: number): { bytes: Uint8Array; expected: string; reported: number } {
  const parts: Uint8Array[] = [];
  const writer = createCsvWriter(plan, (part) => parts.push(part.slice()), bufferBytes, jointLimit);
  writer.writeHeader();
  let expected = `${plan.outputs.map(textCell).join(',')}\r\n`;
  for (let start = 0; start < source.rowCount; start += batchRows) {
    const batch = encodeBatch(plan, source, start, Math.min(source.rowCount, start + batchRows));
    writer.writeBatch(batch);
    expected += referenceRows(plan, source, batch);
  }
  writer.finish();
  const bytes = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  parts.reduce((at, p) => (bytes.set(p, at), at + p.length), 0);
  return { bytes, expected, reported: writer.bytesWritten };
}

// The row loop runs in WebAssembly where it can (core wasm-row-copier.ts) and in JavaScript
// elsewhere: both must write every byte the same.
describe.each([
  ['its row loop in WebAssembly', true],
  ['its row loop in JavaScript', false],
])('the CSV writer, %s, writes what the plainest writer writes', (_, webAssembly) => {
  beforeAll(() => useWebAssembly(webAssembly));
  afterAll(() => useWebAssembly(true));

  it('has the row loop asked for', () => expect(wasmRowCopier(64) !== null).toBe(webAssembly));

  it('byte for byte, whatever the levels, policies, batch and buffer sizes and runs of categorical columns (the fitting file and a new one)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const fit = table(s.fitRows, 4096);
        const recipe = recipeFor(fit, s.levels, s.indicator, s.strict);
        for (const source of [table(s.fitRows, s.dictionaryCap), table(s.applyRows, s.dictionaryCap)]) {
          const plan = compilePlan(recipe, source.names);
          const { bytes, expected, reported } = written(plan, source, s.batchRows, s.bufferBytes, s.jointLimit);
          const want = new TextEncoder().encode(expected);
          expect(new TextDecoder().decode(bytes)).toBe(new TextDecoder().decode(want));
          expect(bytes).toEqual(want);
          expect(reported).toBe(want.length);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('with text columns that kept their values as bytes (read on another thread): the same bytes', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        // ASCII cells (only those are kept as bytes), the first column an identifier.
        const ascii = (rows: readonly (readonly string[])[]) => rows.map((row) => row.map((cell) => cell.replace(/[^\x00-\x7f]/g, '?')));
        const fit = table(ascii(s.fitRows), 4096);
        const recipe = recipeFor(fit, ['identifier', ...s.levels.slice(1)], s.indicator, s.strict);
        const source = packed(table(ascii(s.applyRows), s.dictionaryCap));
        const plan = compilePlan(recipe, source.names);
        // Whole tables as batches, as the command line writes each segment read on another thread.
        const { bytes, expected } = written(plan, source, source.rowCount, s.bufferBytes, s.jointLimit);
        expect(bytes).toEqual(new TextEncoder().encode(expected));
      }),
      { numRuns: 150 },
    );
  });

  it('when the file lacks a recipe column (its cells count as missing; an identifier writes empty cells)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const fit = table(s.fitRows, 4096);
        const recipe = recipeFor(fit, s.levels, s.indicator, false);
        const rows = s.applyRows.map((row) => row.slice(1));
        const source = tableFromRows([[...(s.fitRows[0] ?? []).slice(1).map((_, i) => `c${i + 1}`), 'row'], ...rows.map((row, i) => [...row, String(i)])]).table;
        const plan = compilePlan(recipe, source.names);
        const { bytes, expected } = written(plan, source, s.batchRows, s.bufferBytes);
        expect(bytes).toEqual(new TextEncoder().encode(expected));
      }),
      { numRuns: 50 },
    );
  });
});
