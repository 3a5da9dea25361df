import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeToCsv, OTHER_LEVEL, profileTable, readTable, type Recipe } from '../../src/core/index.ts';
import { generateHouseholdEnergyCsv } from '../../src/demo/household-energy.ts';
import { applyFromFile, parseWithPapa, profilePath, readTableFromFile } from '../../bench/lib/paths.ts';
import { benchRecipe, KEEP_TOP_LEVELS, MANY_LEVELS_COLUMN } from '../../bench/lib/recipe.ts';

const ROWS = 3000;
let dir = '';
let file = '';
let bytes: Uint8Array = new Uint8Array();

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'levelwise-bench-test-'));
  file = join(dir, 'household.csv');
  // The invented household-energy survey, with the benchmark's many-level supplier column.
  writeFileSync(file, generateHouseholdEnergyCsv({ rows: ROWS, manyLevels: 200 }));
  bytes = readFileSync(file);
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

function fittedRecipe(): Recipe {
  const { table } = readTable(bytes);
  return benchRecipe(profileTable(table), { file: 'household.csv', rows: table.rowCount });
}

describe('the benchmark recipe', () => {
  it('keeps the 20 most frequent suppliers and groups the rest', () => {
    const profiles = profileTable(readTable(bytes).table);
    const supplierProfile = profiles.find((p) => p.name === MANY_LEVELS_COLUMN);
    const supplier = fittedRecipe().columns.find((c) => c.name === MANY_LEVELS_COLUMN);
    if (supplier?.level !== 'nominal' || !supplierProfile?.levels) throw new Error('supplier should be a nominal column');
    const top = supplierProfile.levels.slice(0, KEEP_TOP_LEVELS);
    expect(supplier.rare.keepTop).toBe(KEEP_TOP_LEVELS);
    expect(supplier.levels.slice(0, KEEP_TOP_LEVELS)).toEqual(top);
    const grouped = supplierProfile.levels.slice(KEEP_TOP_LEVELS);
    expect(supplier.levels[KEEP_TOP_LEVELS]).toEqual({ value: OTHER_LEVEL, count: grouped.reduce((n, l) => n + l.count, 0) });
    expect(supplier.grouped).toHaveLength(grouped.length);
  });

  it('z-scores every continuous column and one-hot codes every nominal one', () => {
    const columns = fittedRecipe().columns;
    const continuous = columns.filter((c) => c.level === 'continuous');
    expect(continuous.length).toBeGreaterThan(0);
    for (const c of continuous) expect(c.scaling).toBe('z-score');
    for (const c of columns) if (c.level === 'nominal') expect(c.coding).toBe('one-hot');
  });
});

describe('the measured paths', () => {
  it('writes the same bytes streamed in batches as the core writes from the whole table', () => {
    const recipe = fittedRecipe();
    const expected = encodeToCsv(recipe, readTable(bytes).table);
    const parts: Uint8Array[] = [];
    // 3000 rows in batches of 1000: the batch boundaries are crossed twice.
    const run = applyFromFile(file, recipe, (part) => parts.push(part.slice()), 1000);
    const written = Buffer.concat(parts);
    expect(run.rows).toBe(ROWS);
    expect(run.bytesRead).toBe(bytes.length);
    expect(run.bytesWritten).toBe(expected.bytes.length);
    expect(written.equals(Buffer.from(expected.bytes))).toBe(true);
    expect(run.report.rowsWritten).toBe(expected.report.rowsWritten);
  });

  it('reads the table and the profile the page reads', () => {
    const run = profilePath(bytes, 'household.csv');
    expect(run.rows).toBe(ROWS);
    expect(run.columns).toBe(20);
    expect(readTableFromFile(file).rowCount).toBe(ROWS);
    expect(run.recipe.columns.map((c) => c.name)).toEqual(readTable(bytes).table.names);
  });

  it('counts the data rows papaparse reads in the csv-spectrum files', () => {
    // csv-spectrum (npm package): each csvs/<name>.csv comes with json/<name>.json holding its rows.
    const spectrum = dirname(createRequire(import.meta.url).resolve('csv-spectrum/package.json'));
    const names = readdirSync(join(spectrum, 'csvs')).map((name) => name.replace(/\.csv$/, ''));
    expect(names.length).toBeGreaterThanOrEqual(12);
    for (const name of names) {
      const text = readFileSync(join(spectrum, 'csvs', `${name}.csv`), 'utf8');
      const expected: unknown = JSON.parse(readFileSync(join(spectrum, 'json', `${name}.json`), 'utf8'));
      // location_coordinates.json holds its one row as an object rather than an array of one.
      const rows = Array.isArray(expected) ? expected.length : 1;
      expect(parseWithPapa(text).dataRows, name).toBe(rows);
    }
  });
});
