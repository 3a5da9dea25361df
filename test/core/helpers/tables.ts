/**
 * Tables for the profiling and inference tests, built with `tableFromRows` (first row the header):
 * published datasets shipped by the npm package vega-datasets (a JSON null becomes an empty cell,
 * as a spreadsheet export would write it), and one-column tables from cells.
 */
import { LevelwiseError } from '../../../src/core/errors.ts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Table } from '../../../src/core/columns.ts';
import { tableFromRows } from '../../../src/core/read-table.ts';

const DATA = join(import.meta.dirname, '../../../node_modules/vega-datasets/data');

export function vegaRows(name: 'penguins' | 'cars'): string[][] {
  const records = JSON.parse(readFileSync(join(DATA, `${name}.json`), 'utf8')) as Record<string, unknown>[];
  const header = Object.keys(records[0] ?? {});
  const cell = (v: unknown): string => (v === null || v === undefined ? '' : String(v));
  return [header, ...records.map((r) => header.map((h) => cell(r[h])))];
}

export function vegaTable(name: 'penguins' | 'cars'): Table {
  return tableFromRows(vegaRows(name)).table;
}

/**
 * A table whose first column holds `cells`; a small dictionary cap moves plain numbers to number
 * storage. A second column numbers the rows, because the reader skips rows whose cells are all
 * empty and an empty cell of ours must stay a row.
 */
export function columnTable(name: string, cells: readonly string[], dictionaryCap?: number): Table {
  const rows = [[name, 'row'], ...cells.map((c, i) => [c, String(i)])];
  return tableFromRows(rows, dictionaryCap === undefined ? {} : { dictionaryCap }).table;
}

/** Runs `run` and returns the LevelwiseError it throws; fails the test when it throws nothing or something else. */
export function thrownLevelwiseError(run: () => unknown): LevelwiseError {
  try {
    run();
  } catch (error) {
    if (error instanceof LevelwiseError) return error;
    throw error;
  }
  throw new Error('expected a LevelwiseError');
}
