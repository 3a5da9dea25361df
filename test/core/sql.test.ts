/**
 * The SQL a recipe compiles to, run on two real engines — DuckDB (@duckdb/node-api) and SQLite
 * (sql.js, WebAssembly) — must give the same numbers as the core's apply, cell by cell: for every
 * golden case, for the invented demo survey under two recipes, and for random cells built to hit
 * the edges (white space, quotes, number formats). The raw table is loaded as all-text columns
 * with parameterised INSERTs, so no engine type inference can change a value on the way in.
 *
 * PostgreSQL joins in when LEVELWISE_TEST_POSTGRES holds a psql connection string (e.g.
 * "host=/tmp/pg port=5432 user=me dbname=scratch"); the table is then loaded with COPY into TEXT
 * columns and the query runs through psql.
 */
import { DuckDBInstance, type DuckDBConnection } from '@duckdb/node-api';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import Papa from 'papaparse';
import initSqlJs, { type Database } from 'sql.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApplyReport } from '../../src/core/apply-report.ts';
import { encodeBatch, writeEncodedColumn } from '../../src/core/apply.ts';
import { cellText, type Table } from '../../src/core/columns.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { formatNumber, CANDIDATE_NUMBER_FORMATS } from '../../src/core/numbers.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable, tableFromRows } from '../../src/core/read-table.ts';
import { parseRecipe } from '../../src/core/recipe-io.ts';
import { DEFAULT_MISSING_TOKENS, type ContinuousColumn, type NumberFormat, type Recipe } from '../../src/core/recipe.ts';
import { JS_TRIM_CODE_POINTS, dialect, quoteIdentifier } from '../../src/core/sql-dialects.ts';
import {
  compileSql,
  numberPattern,
  POSTGRES_NAME_BYTES,
  recipeCanReject,
  REJECTED_COLUMN,
  SQL_DIALECTS,
  sqlNotes,
  type SqlDialectName,
} from '../../src/core/sql.ts';
import { generateHouseholdEnergyCsv } from '../../src/demo/household-energy.ts';
import { goldenCases } from '../golden/cases.ts';

type Cell = number | string | null;
interface QueryResult {
  readonly columns: readonly string[];
  readonly rows: readonly (readonly Cell[])[];
}

interface Engine {
  readonly name: 'duckdb' | 'sqlite' | 'postgres';
  load(table: string, names: readonly string[], rows: readonly (readonly string[])[]): Promise<void>;
  query(sql: string): Promise<QueryResult>;
}

const INSERT_ROWS = 100;

async function duckdbEngine(): Promise<Engine & { close(): void }> {
  const instance = await DuckDBInstance.create(':memory:', { threads: '1' });
  const connection: DuckDBConnection = await instance.connect();
  return {
    name: 'duckdb',
    async load(table, names, rows) {
      await connection.run(`DROP TABLE IF EXISTS ${quoteIdentifier(table)}`);
      await connection.run(`CREATE TABLE ${quoteIdentifier(table)} (${names.map((n) => `${quoteIdentifier(n)} VARCHAR`).join(', ')})`);
      for (let at = 0; at < rows.length; at += INSERT_ROWS) {
        const part = rows.slice(at, at + INSERT_ROWS);
        const placeholders = part.map(() => `(${names.map(() => '?').join(', ')})`).join(', ');
        await connection.run(`INSERT INTO ${quoteIdentifier(table)} VALUES ${placeholders}`, part.flat());
      }
    },
    async query(sql) {
      const reader = await connection.runAndReadAll(sql);
      const rows = reader.getRowsJS().map((row) => row.map((v) => (typeof v === 'bigint' ? Number(v) : (v as Cell))));
      return { columns: reader.columnNames(), rows };
    },
    close() {
      connection.closeSync();
      instance.closeSync();
    },
  };
}

async function sqliteEngine(): Promise<Engine & { close(): void }> {
  const SQL = await initSqlJs();
  const db: Database = new SQL.Database();
  return {
    name: 'sqlite',
    async load(table, names, rows) {
      db.run(`DROP TABLE IF EXISTS ${quoteIdentifier(table)}`);
      db.run(`CREATE TABLE ${quoteIdentifier(table)} (${names.map((n) => `${quoteIdentifier(n)} TEXT`).join(', ')})`);
      const insert = db.prepare(`INSERT INTO ${quoteIdentifier(table)} VALUES (${names.map(() => '?').join(', ')})`);
      for (const row of rows) insert.run([...row]);
      insert.free();
    },
    async query(sql) {
      const statement = db.prepare(sql);
      const rows: Cell[][] = [];
      while (statement.step()) rows.push(statement.get() as Cell[]);
      const columns = statement.getColumnNames();
      statement.free();
      return { columns, rows };
    },
    close() {
      db.close();
    },
  };
}

const POSTGRES = process.env['LEVELWISE_TEST_POSTGRES'] ?? '';
/** How psql prints NULL here: a text no cell of ours holds. */
const PSQL_NULL = '\u0001NULL';

function postgresEngine(connection: string): Engine & { close(): void } {
  const psql = (input: string): string => {
    const run = spawnSync('psql', [connection, '-X', '-q', '--csv', '-P', `null=${PSQL_NULL}`, '-v', 'ON_ERROR_STOP=1', '-f', '-'], {
      input,
      encoding: 'utf8',
      maxBuffer: 1 << 28,
    });
    if (run.status !== 0) throw new Error(`psql failed: ${run.stderr}`);
    return run.stdout;
  };
  return {
    name: 'postgres',
    async load(table, names, rows) {
      const csv = Papa.unparse(rows as string[][], { quotes: true, newline: '\n' });
      psql(
        `DROP TABLE IF EXISTS ${quoteIdentifier(table)};\n` +
          `CREATE TABLE ${quoteIdentifier(table)} (${names.map((n) => `${quoteIdentifier(n)} TEXT`).join(', ')});\n` +
          `COPY ${quoteIdentifier(table)} FROM STDIN WITH (FORMAT csv);\n${rows.length > 0 ? `${csv}\n` : ''}\\.\n`,
      );
    },
    async query(sql) {
      // Without parallel workers a plain scan returns rows in the order they were loaded.
      const parsed = Papa.parse<string[]>(psql(`SET max_parallel_workers_per_gather = 0;\n${sql};\n`), { skipEmptyLines: true });
      const [columns = [], ...rows] = parsed.data;
      return { columns, rows: rows.map((row) => row.map((cell) => (cell === PSQL_NULL ? null : cell))) };
    },
    close() {},
  };
}

/** A name as PostgreSQL keeps it: at most 63 bytes, cut between characters. */
function postgresName(name: string): string {
  const encoder = new TextEncoder();
  let kept = '';
  for (const ch of name) {
    if (encoder.encode(kept + ch).length > POSTGRES_NAME_BYTES) break;
    kept += ch;
  }
  return kept;
}

// -------------------------------------------------------------------------------------------------
// The core's answer: encodeBatch with a report, numbers written by writeEncodedColumn, identifiers as text.

interface Expected {
  readonly outputs: readonly string[];
  readonly rows: readonly (readonly (number | string)[])[];
  /** Row index → "column: reason" for rows a policy rejected. */
  readonly rejected: ReadonlyMap<number, string>;
}

function coreAnswer(recipe: Recipe, table: Table): Expected {
  const plan = compilePlan(recipe, table.names);
  const report = createApplyReport(plan);
  const batch = encodeBatch(plan, table, 0, table.rowCount, report);
  const width = plan.outputs.length;
  const values = new Float64Array(width);
  const rows: (number | string)[][] = [];
  for (let r = 0; r < table.rowCount; r++) {
    plan.columns.forEach((_, c) => writeEncodedColumn(plan, batch, c, r, values, 0));
    const row: (number | string)[] = Array.from(values);
    for (const columnPlan of plan.columns) {
      if (columnPlan.kind !== 'identifier') continue;
      const source = table.columns[columnPlan.source];
      row[columnPlan.offset] = source === undefined ? '' : cellText(source, r);
    }
    rows.push(row);
  }
  const finished = report.finish();
  expect(finished.rowsRejected, 'every rejected row is listed with its reason').toBe(finished.rejected.length);
  return { outputs: plan.outputs, rows, rejected: new Map(finished.rejected.map((x) => [x.row, `${x.column}: ${x.reason}`])) };
}

function rawRows(table: Table): string[][] {
  const rows: string[][] = [];
  for (let r = 0; r < table.rowCount; r++) rows.push(table.columns.map((column) => cellText(column, r)));
  return rows;
}

/** Same within 1e-9 relative (an absolute 1e-9 near zero); counts how many are bit-for-bit equal. */
function sameNumber(expected: number, actual: number): boolean {
  return expected === actual || Math.abs(expected - actual) <= 1e-9 * Math.max(1, Math.abs(expected), Math.abs(actual));
}

const TABLE = 'raw "survey" data';

/**
 * Engines need not return rows in the order they were loaded (PostgreSQL's COPY fills free space in
 * earlier pages), so the table gets a row-number column and the recipe passes it through in front.
 */
const ROW = '__test_row';

function withRowNumber(recipe: Recipe): Recipe {
  return { ...recipe, columns: [{ name: ROW, reason: 'row number for the comparison', outputs: [ROW], level: 'identifier' }, ...recipe.columns] };
}

async function loadWithRowNumbers(engine: Engine, table: Table): Promise<void> {
  await engine.load(TABLE, [ROW, ...table.names], rawRows(table).map((row, r) => [String(r), ...row]));
}

/** The compiled query's result in load order, without the row-number column. */
async function queryInLoadOrder(
  engine: Engine,
  recipe: Recipe,
  rejected: 'flag' | 'drop' = 'flag',
  dialectName: SqlDialectName = engine.name,
): Promise<QueryResult> {
  const result = await engine.query(compileSql(withRowNumber(recipe), { table: TABLE, dialect: dialectName, rejected }));
  expect(result.columns[0]).toBe(ROW);
  const rows = [...result.rows].sort((a, b) => Number(a[0]) - Number(b[0])).map((row) => row.slice(1));
  return { columns: result.columns.slice(1), rows };
}

async function compareOnEngine(
  engine: Engine,
  recipe: Recipe,
  table: Table,
  dialectName: SqlDialectName = engine.name,
): Promise<{ cells: number; exact: number }> {
  const expected = coreAnswer(recipe, table);
  await loadWithRowNumbers(engine, table);
  const result = await queryInLoadOrder(engine, recipe, 'flag', dialectName);
  const canReject = recipeCanReject(recipe);
  const names = engine.name === 'postgres' ? expected.outputs.map(postgresName) : expected.outputs;
  expect(result.columns).toEqual(canReject ? [...names, REJECTED_COLUMN] : names);
  expect(result.rows.length).toBe(table.rowCount);
  let cells = 0;
  let exact = 0;
  const differences: string[] = [];
  result.rows.forEach((row, r) => {
    const reason = (canReject ? row[expected.outputs.length] : null) ?? null;
    const wanted = expected.rejected.get(r) ?? null;
    if (reason !== wanted) differences.push(`row ${r}: rejected ${JSON.stringify(reason)}, core says ${JSON.stringify(wanted)}`);
    if (wanted !== null) return;
    expected.rows[r]!.forEach((want, c) => {
      const got = row[c];
      cells++;
      const value = typeof want === 'number' && typeof got === 'string' && got !== '' ? Number(got) : got;
      if (value === want) exact++;
      else if (typeof want === 'string' || typeof value !== 'number' || !sameNumber(want, value)) {
        differences.push(`row ${r}, ${expected.outputs[c]}: SQL ${JSON.stringify(got)}, core ${JSON.stringify(want)}`);
      }
    });
  });
  expect(differences.slice(0, 10)).toEqual([]);
  const dropped = await queryInLoadOrder(engine, recipe, 'drop', dialectName);
  expect(dropped.columns).toEqual(names);
  expect(dropped.rows.length).toBe(table.rowCount - expected.rejected.size);
  return { cells, exact };
}

// -------------------------------------------------------------------------------------------------

const engines: (Engine & { close(): void })[] = [];
beforeAll(async () => {
  engines.push(await duckdbEngine(), await sqliteEngine());
  if (POSTGRES !== '') engines.push(postgresEngine(POSTGRES));
});
afterAll(() => engines.forEach((e) => e.close()));

const ENGINE_NAMES: readonly Engine['name'][] = POSTGRES === '' ? ['duckdb', 'sqlite'] : ['duckdb', 'sqlite', 'postgres'];
const engineNamed = (name: Engine['name']) => engines.find((e) => e.name === name)!;

function parsed(text: string): Recipe {
  const result = parseRecipe(text);
  if (!result.ok) throw new Error(result.errors.join('\n'));
  return result.recipe;
}

describe('compiled SQL gives the core’s numbers on real engines', () => {
  const cases = goldenCases();
  it('finds the golden cases', () => expect(cases.length).toBeGreaterThanOrEqual(12));
  for (const engineName of ENGINE_NAMES) {
    for (const c of cases) {
      it(`${engineName}: golden case ${c.name}`, async () => {
        const recipe = parsed(c.recipeText);
        const { table } = readTable(c.input);
        const { cells, exact } = await compareOnEngine(engineNamed(engineName), recipe, table);
        expect(cells).toBeGreaterThan(0);
        // Same IEEE operations on the same doubles: every cell is bit-for-bit equal.
        expect(exact).toBe(cells);
      });
    }
  }
  // PostgreSQL speaks standard SQL too (SIMILAR TO, TRIM(BOTH … FROM …)): the ansi dialect runs there.
  for (const c of POSTGRES === '' ? [] : cases) {
    it(`postgres: golden case ${c.name} in the ansi dialect`, async () => {
      const { cells, exact } = await compareOnEngine(engineNamed('postgres'), parsed(c.recipeText), readTable(c.input).table, 'ansi');
      expect(exact).toBe(cells);
    });
  }
});

// The invented household-energy survey (src/demo): the page's demo recipe, a recipe using every
// coding and policy, and that recipe applied to a second invented sample with levels it never saw.
const demoFit = readTable(new TextEncoder().encode(generateHouseholdEnergyCsv({ rows: 2000 }))).table;
const demoNew = readTable(new TextEncoder().encode(generateHouseholdEnergyCsv({ rows: 1200, seed: 7, manyLevels: 60 }))).table;
const demoProfiles = profileTable(demoFit, { missingTokens: DEFAULT_MISSING_TOKENS });
const demoDraft = draftRecipe(demoProfiles, { file: 'household-energy-survey (invented).csv', rows: demoFit.rowCount });

const VARIETY: Decision[] = [
  { type: 'set-nominal-coding', column: 'region', coding: 'dummy' },
  { type: 'set-reference', column: 'region', reference: 'North' },
  { type: 'set-nominal-coding', column: 'heating', coding: 'effect' },
  { type: 'set-rare', column: 'heating', rare: { minCount: 20, minShare: null, keepTop: null } },
  { type: 'set-unseen', column: 'heating', unseen: 'other' },
  { type: 'set-nominal-coding', column: 'supplier', coding: 'frequency' },
  { type: 'set-rare', column: 'supplier', rare: { minCount: null, minShare: null, keepTop: 12 } },
  { type: 'set-ordinal-coding', column: 'satisfaction', coding: 'cumulative' },
  { type: 'set-scores', column: 'service_tier', scores: [-1, 0.1, 2.5] },
  { type: 'set-start', column: 'heat_pump_interest', start: 0 },
  { type: 'set-scaling', column: 'floor_area_m2', scaling: 'z-score' },
  { type: 'set-scaling', column: 'annual_kwh', scaling: 'min-max' },
  { type: 'set-continuous-missing', column: 'monthly_bill_eur', missing: { policy: 'median', indicator: true } },
  { type: 'set-scaling', column: 'monthly_bill_eur', scaling: 'z-score' },
  { type: 'set-invalid', column: 'outage_hours', invalid: 'error' },
  { type: 'set-unseen', column: 'dwelling_type', unseen: 'error' },
  { type: 'set-categorical-missing', column: 'tariff', missing: { policy: 'most-frequent', indicator: true } },
  { type: 'set-categorical-missing', column: 'insulation_rating', missing: { policy: 'error', indicator: false } },
  { type: 'set-level', column: 'comment', level: 'excluded' },
  { type: 'set-level', column: 'survey_date', level: 'identifier' },
];
const demoVariety = VARIETY.reduce((recipe, decision) => decide(recipe, decision, demoProfiles), demoDraft);
const demoVarietySafe = decide(demoVariety, { type: 'set-naming', naming: 'safe' }, demoProfiles);

describe('compiled SQL on the invented demo survey', () => {
  it('the variety recipe uses every coding and rejects some rows', () => {
    const codings = new Set(demoVariety.columns.map((c) => ('coding' in c ? c.coding : c.level)));
    expect([...codings].sort()).toEqual(
      ['binary', 'continuous', 'cumulative', 'dummy', 'effect', 'excluded', 'frequency', 'identifier', 'one-hot', 'rank', 'scores'].sort(),
    );
    expect(recipeCanReject(demoVariety)).toBe(true);
    expect(coreAnswer(demoVariety, demoFit).rejected.size).toBeGreaterThan(0);
  });
  const runs: [string, Recipe, Table][] = [
    ['draft recipe', demoDraft, demoFit],
    ['variety recipe', demoVariety, demoFit],
    ['variety recipe on a new sample', demoVariety, demoNew],
    ['variety recipe, safe names', demoVarietySafe, demoNew],
  ];
  for (const engineName of ENGINE_NAMES) {
    for (const [label, recipe, table] of runs) {
      it(`${engineName}: ${label}`, async () => {
        const { cells, exact } = await compareOnEngine(engineNamed(engineName), recipe, table);
        expect(cells).toBeGreaterThan(table.rowCount * 10);
        expect(exact).toBe(cells);
      });
    }
  }
});

// -------------------------------------------------------------------------------------------------
// Edges, by construction.

/** A one-column continuous recipe reading `format`; invalid cells count as missing and become 0. */
function numberRecipe(format: NumberFormat, invalid: 'missing' | 'error' = 'missing'): Recipe {
  const column: ContinuousColumn = {
    name: 'x',
    reason: 'set by hand',
    outputs: ['x', 'x (missing)'],
    level: 'continuous',
    scaling: 'none',
    format,
    invalid,
    missing: { policy: 'zero', indicator: true },
    fitted: { count: 1, mean: 0, sd: 0, min: 0, max: 0, median: 0 },
  };
  return {
    kind: 'levelwise.recipe',
    version: 1,
    source: { file: null, rows: 1, columns: ['n', 'x'] },
    reading: { delimiter: null, missingTokens: [...DEFAULT_MISSING_TOKENS] },
    naming: 'readable',
    columns: [column],
  };
}

/** A table of `cells` under `name`, beside a row number (a row of empty cells would count as an empty line). */
const oneColumn = (name: string, cells: readonly string[]): Table =>
  tableFromRows([['n', name], ...cells.map((c, i) => [String(i + 1), c])]).table;

const NBSP = '\u00a0';
const NNBSP = '\u202f';
const NUMBER_CHARS = ['0', '1', '5', '9', '+', '-', '.', ',', ' ', NBSP, NNBSP, 'e', 'E', '\t', 'x', '_', '€', '%', 'CHF', '(', ')'];
/** Formats with a currency or percent symbol (number-symbols.ts), on both sides, one a letter code. */
const SYMBOL_FORMATS: readonly NumberFormat[] = [
  { decimal: ',', group: '.', symbol: { text: '€', side: 'before' } },
  { decimal: '.', group: '', symbol: { text: '%', side: 'after' } },
  { decimal: '.', group: ',', symbol: { text: 'CHF', side: 'before' } },
  { decimal: ',', group: ' ', symbol: { text: '€', side: 'after' } },
  // A symbol outside the Basic Multilingual Plane: one character in SQL, two UTF-16 units in JavaScript.
  { decimal: '.', group: '', symbol: { text: '𝑥', side: 'after' } },
  { decimal: '.', group: '', symbol: { text: 'k𝑥', side: 'before' } },
  // Negatives in parentheses or with a trailing minus, with and without a symbol.
  { decimal: '.', group: ',', negative: 'parentheses' },
  { decimal: ',', group: '.', negative: 'trailing' },
  { decimal: ',', group: '.', symbol: { text: '€', side: 'before' }, negative: 'parentheses' },
  { decimal: '.', group: '', symbol: { text: '%', side: 'after' }, negative: 'trailing' },
];

describe('numbers are read as numbers.ts reads them', () => {
  const formats = [...CANDIDATE_NUMBER_FORMATS, ...SYMBOL_FORMATS];
  const formatName = (f: NumberFormat): string =>
    `decimal "${f.decimal}" group "${f.group}"${f.symbol ? ` symbol "${f.symbol.text}" ${f.symbol.side}` : ''}${f.negative ? ` negative ${f.negative}` : ''}`;
  const cellsFor = (format: NumberFormat): string[] => [
    '€ 1.234,50', '€1.234,50', `€${NBSP}12`, '-€5', '€-5', '€ -5', '+€ 5', '- €5', '--€5', '-€-5', '€€5', '€', '€ ', '5 €', `1 234,5${NNBSP}€`,
    '12%', '12 %', `-0.5${NNBSP}%`, '%12', '12%%', '%', 'CHF 1,250.75', '-CHF 3', 'chf 3', 'CHF', 'CHF-', 'CHF 3 %',
    '5𝑥', '5 𝑥', '𝑥', '𝑥5', 'k𝑥5', '-k𝑥 5', 'k𝑥', '5𝑥𝑥',
    '(5)', '( 5 )', '(1,234.5)', '(-5)', '((5))', '()', '(', ')', '5)', '(5', '(€ 1.234,5)', '(5 %)', '€ (5)',
    '5-', '5 -', '1.234,5-', '-5-', '--', '5--', '€5-', '5%-', '5 %-', '-',
    '1,234.5', '1.234,5', '1 234,5', `1${NBSP}234`, `1${NNBSP}234.25`, '12,5', '1,23', '1234,567', '12 34',
    '.5', ',5', '5.', '+5', '-5', '--5', '+-5', '1e3', '1E-3', '1e', 'e5', '1e+3', '1.5e3', '1,5e3', ' 7 ', '\t8\n',
    '1e309', '-1e309', '1e-400', '4.9e-324', '2.4703282292062328e-324', '179769313486231580793728971405303415079934132710037826936173778980444968292764750946649017977587207096330286416692887910946555547851940402630657488671505820681908902000708383676273854845817711531764475730270069855571366959622842914819860834936475292719074168444365510704342711559699508093042880177904174497791',
    '0x1F', 'Infinity', 'NaN', '', '  ', 'NA', '?', '12 kg', '$3', '1_000', '007', '-0', '0.1', '3.141592653589793',
    formatNumber(1234567.891, format), formatNumber(-0.000123, format), formatNumber(9.87e21, format),
  ];
  for (const engineName of ENGINE_NAMES) {
    for (const format of formats) {
      it(`${engineName}: hand-picked cells, format ${formatName(format)}`, async () => {
        const { cells } = await compareOnEngine(engineNamed(engineName), numberRecipe(format), oneColumn('x', cellsFor(format)));
        expect(cells).toBe(cellsFor(format).length * 2);
      });
    }
    it(`${engineName}: random cells in every format (property)`, async () => {
      const cell = fc.oneof(
        fc.array(fc.constantFrom(...NUMBER_CHARS), { maxLength: 10 }).map((chars) => chars.join('')),
        fc.tuple(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(...formats), fc.constantFrom('', ' ', '\t')).map(
          ([value, format, pad]) => pad + formatNumber(value, format) + pad,
        ),
      );
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...formats), fc.array(cell, { minLength: 1, maxLength: 60 }), async (format, cells) => {
          await compareOnEngine(engineNamed(engineName), numberRecipe(format), oneColumn('x', cells));
        }),
        { numRuns: 25, seed: 20240611 },
      );
    });
    it(`${engineName}: a cell that is not a number rejects its row with the core's reason`, async () => {
      const table = oneColumn('x', ['1', 'twelve', '', '3']);
      await compareOnEngine(engineNamed(engineName), numberRecipe({ decimal: '.', group: '' }, 'error'), table);
      const result = await queryInLoadOrder(engineNamed(engineName), numberRecipe({ decimal: '.', group: '' }, 'error'));
      expect(result.rows.map((r) => r[2])).toEqual([null, 'x: "twelve" is not a number', null, null]);
    });
  }
});

describe('missing spellings chosen by the person', () => {
  // "None" read as a value; -999 (a sensor's "no reading"), a spelling with a quote and a word added.
  const tokens = [...DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'), '-999', "n'a", 'unknown'];
  const cells = ['1', '-999', ' -999 ', '-999.0', "n'a", 'None', 'unknown', '', '2', 'NA'];
  for (const engineName of ENGINE_NAMES) {
    it(`${engineName}: a number column reads "-999" as missing but "-999.0" as a number, as the core does`, async () => {
      const recipe = { ...numberRecipe({ decimal: '.', group: '' }), reading: { delimiter: null, missingTokens: tokens } };
      const compared = await compareOnEngine(engineNamed(engineName), recipe, oneColumn('x', cells));
      expect(compared.cells).toBe(cells.length * 2);
      // By hand, the missing indicator (x (missing)): -999 and " -999 " missing, -999.0 a number; "n'a", "unknown", "" and "NA" missing; "None" not a number (missing too).
      expect(coreAnswer(recipe, oneColumn('x', cells)).rows.map((row) => row[1])).toEqual([0, 1, 1, 0, 1, 1, 1, 1, 0, 1]);
    });
    it(`${engineName}: a text column keeps "None" as a level`, async () => {
      const table = oneColumn('v', ['None', 'Minor', 'None', '-999', "n'a", 'Severe', 'None']);
      const profiles = profileTable(table, { missingTokens: tokens });
      const decisions: readonly Decision[] = [
        { type: 'set-level', column: 'v', level: 'nominal' },
        { type: 'set-level', column: 'n', level: 'excluded' },
      ];
      const recipe = decisions.reduce((r, d) => decide(r, d, profiles), draftRecipe(profiles, { file: null, rows: table.rowCount }, { missingTokens: tokens }));
      expect(recipe.columns[1]?.level === 'nominal' && recipe.columns[1].levels.map((l) => l.value)).toEqual(['None', 'Minor', 'Severe', '(missing)']);
      const compared = await compareOnEngine(engineNamed(engineName), recipe, table);
      expect(compared.cells).toBeGreaterThan(0);
    });
  }
});

/** Draft a nominal recipe for one column of `fitCells`, with the given cleaning and rare/unseen rules. */
function levelRecipe(fitCells: readonly string[], decisions: readonly Decision[]): Recipe {
  const table = oneColumn('v', fitCells);
  const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
  const draft = [
    { type: 'set-level', column: 'v', level: 'nominal' },
    { type: 'set-level', column: 'n', level: 'excluded' },
  ] as const satisfies readonly Decision[];
  return [...draft, ...decisions].reduce((recipe, d) => decide(recipe, d, profiles), draftRecipe(profiles, { file: null, rows: table.rowCount }));
}

const WHITE = JS_TRIM_CODE_POINTS.map((c) => String.fromCodePoint(c));
const LEVEL_CHARS = ['a', 'b', 'A', 'B', 'é', "'", '"', ';', '-', '=', ' ', ...WHITE.slice(0, 8), '\u3000', '\ufeff', 'N'];

describe('levels: trimming, case, merges, rare and unseen values', () => {
  for (const engineName of ENGINE_NAMES) {
    it(`${engineName}: a level that looks like SQL stays data`, async () => {
      const hostile = "x'); drop table t; --";
      const recipe = levelRecipe([hostile, hostile, 'plain', '"quoted"', "it's"], []);
      const table = oneColumn('v', ['plain', hostile, "it's", '"quoted"', 'other']);
      await compareOnEngine(engineNamed(engineName), recipe, table);
      const result = await queryInLoadOrder(engineNamed(engineName), recipe);
      const hostileColumn = result.columns.indexOf(`v=${hostile}`);
      expect(hostileColumn).toBeGreaterThanOrEqual(0);
      expect(result.rows.map((r) => Number(r[hostileColumn]))).toEqual([0, 1, 0, 0, 0]);
      // The table is still there.
      expect(Number((await engineNamed(engineName).query(`SELECT count(*) FROM ${quoteIdentifier(TABLE)}`)).rows[0]?.[0])).toBe(5);
    });
    it(`${engineName}: every white-space character JavaScript trims is trimmed`, async () => {
      const cells = WHITE.map((w) => `${w}gas${w}`);
      const recipe = levelRecipe(['gas', 'oil', 'gas'], [{ type: 'set-cleaning', column: 'v', trim: true }]);
      const result = await compareOnEngine(engineNamed(engineName), recipe, oneColumn('v', cells));
      expect(result.cells).toBe(cells.length * 2);
      const sql = await queryInLoadOrder(engineNamed(engineName), recipe);
      expect(sql.rows.map((row) => Number(row[sql.columns.indexOf('v=gas')]))).toEqual(cells.map(() => 1));
    });
    it(`${engineName}: random cells through trim, case-fold, merges, rare grouping and unseen policies (property)`, async () => {
      const text = fc.array(fc.constantFrom(...LEVEL_CHARS), { maxLength: 4 }).map((chars) => chars.join(''));
      const cleanings = fc.record({ trim: fc.boolean(), caseFold: fc.boolean() });
      await fc.assert(
        fc.asyncProperty(
          fc.array(text, { minLength: 3, maxLength: 25 }),
          fc.array(text, { minLength: 1, maxLength: 25 }),
          cleanings,
          fc.constantFrom('zeros', 'other', 'error') as fc.Arbitrary<'zeros' | 'other' | 'error'>,
          fc.constantFrom('level', 'most-frequent', 'zeros', 'error') as fc.Arbitrary<'level' | 'most-frequent' | 'zeros' | 'error'>,
          async (fit, apply, cleaning, unseen, missingPolicy) => {
            const merge = fit.filter((t) => t.trim() !== '').slice(0, 2);
            const decisions: Decision[] = [
              { type: 'set-cleaning', column: 'v', ...cleaning },
              { type: 'set-rare', column: 'v', rare: { minCount: null, minShare: null, keepTop: 3 } },
              { type: 'set-unseen', column: 'v', unseen },
              { type: 'set-categorical-missing', column: 'v', missing: { policy: missingPolicy, indicator: true } },
            ];
            if (merge.length === 2) decisions.push({ type: 'merge-levels', column: 'v', from: [merge[0]!], into: merge[1]! });
            const recipe = levelRecipe(fit, decisions);
            // SQLite's lower() folds ASCII only (see sql-dialects.ts); keep non-ASCII capitals out of its case-folding runs.
            const cells = engineName === 'sqlite' && cleaning.caseFold ? apply.map((t) => t.replace(/É/g, 'é')) : apply;
            await compareOnEngine(engineNamed(engineName), recipe, oneColumn('v', cells));
          },
        ),
        { numRuns: 30, seed: 611 },
      );
    });
  }
});

describe('the raw table as docs/cli.md tells people to load it', () => {
  it("duckdb: read_csv(..., all_varchar = true) on the demo file gives the core's numbers", async () => {
    const dir = mkdtempSync(join(tmpdir(), 'levelwise-sql-'));
    try {
      const path = join(dir, 'households.csv');
      writeFileSync(path, generateHouseholdEnergyCsv({ rows: 2000 }));
      const engine = engineNamed('duckdb');
      // DuckDB reads an empty cell as NULL; the compiled SQL counts NULL as missing, like an empty cell.
      await engine.query(
        `CREATE OR REPLACE TABLE ${quoteIdentifier(TABLE)} AS SELECT CAST(row_number() OVER () - 1 AS VARCHAR) AS ${quoteIdentifier(ROW)}, * ` +
          `FROM read_csv('${path.replace(/'/g, "''")}', all_varchar = true, header = true, delim = ',', quote = '"', escape = '"')`,
      );
      const result = await queryInLoadOrder(engine, demoVariety);
      const expected = coreAnswer(demoVariety, demoFit);
      expect(result.rows.length).toBe(demoFit.rowCount);
      const differences: string[] = [];
      result.rows.forEach((row, r) => {
        if (expected.rejected.has(r)) return expect(row[expected.outputs.length]).toBe(expected.rejected.get(r));
        expected.rows[r]!.forEach((want, c) => {
          const got = row[c] ?? '';
          if (got !== want) differences.push(`row ${r}, ${expected.outputs[c]}: SQL ${JSON.stringify(got)}, core ${JSON.stringify(want)}`);
        });
      });
      expect(differences.slice(0, 10)).toEqual([]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('constants and quoting', () => {
  it('every finite double reads back exactly as a literal (DuckDB and SQLite)', async () => {
    const values = fc.sample(fc.double({ noNaN: true, noDefaultInfinity: true }), { numRuns: 300, seed: 42 });
    values.push(0.1, 1 / 3, 5e-324, 1.7976931348623157e308, -2.2250738585072014e-308, 1e21, 1e-7, 123456789012345680000);
    for (const engineName of ENGINE_NAMES) {
      const sql = dialect(engineName);
      const select = `SELECT ${values.map((v, i) => `${sql.number(v)} AS ${quoteIdentifier(`v${i}`)}`).join(', ')}`;
      const [row] = (await engineNamed(engineName).query(select)).rows;
      expect(row?.map(Number)).toEqual(values.map((v) => (Object.is(v, -0) ? 0 : v)));
    }
  });
  it('writes text literals with doubled quotes and control characters through chr()', () => {
    expect(dialect('duckdb').text("it's")).toBe("'it''s'");
    expect(dialect('postgres').text('a\nb')).toBe("('a' || chr(10) || 'b')");
    expect(dialect('sqlite').text('\ta')).toBe("(char(9) || 'a')");
    expect(dialect('ansi').text('a\nb')).toBe("'a\nb'");
    expect(quoteIdentifier('say "hi"')).toBe('"say ""hi"""');
  });
  it('reads a qualified table name as its parts', () => {
    const sql = compileSql(demoDraft, { table: ['analytics', 'raw survey'], dialect: 'postgres' });
    expect(sql).toContain('FROM "analytics"."raw survey" AS "__levelwise_source"');
  });
  it('refuses a table named like its own steps, and a recipe without outputs', () => {
    expect(() => compileSql(demoDraft, { table: '__levelwise_step0', dialect: 'duckdb' })).toThrow(/clashes/);
    const none: Recipe = { ...demoDraft, columns: demoDraft.columns.map((c) => ({ name: c.name, reason: c.reason, outputs: [], level: 'excluded' as const })) };
    expect(() => compileSql(none, { table: 't', dialect: 'duckdb' })).toThrow(/no output columns/);
  });
  it('warns that PostgreSQL cuts output names longer than 63 bytes', () => {
    // The demo's comments, one-hot coded, make output names of whole sentences.
    const longNames = decide(demoDraft, { type: 'set-level', column: 'comment', level: 'nominal' }, demoProfiles);
    const notes = sqlNotes(longNames, { dialect: 'postgres' });
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/^PostgreSQL cuts names to 63 bytes, and \d+ output name\(s\) are longer/);
    expect(compileSql(longNames, { table: 't', dialect: 'postgres' })).toContain(`-- Note: ${notes[0]}`);
    expect(sqlNotes(longNames, { dialect: 'duckdb' })).toEqual([]);
  });
  it('keeps a file name with a line break inside its comment line', () => {
    const recipe: Recipe = { ...demoDraft, source: { ...demoDraft.source, file: 'x\nDROP TABLE t; --' } };
    const sql = compileSql(recipe, { table: 't', dialect: 'sqlite' });
    expect(sql.split('\n')[0]).toBe('-- Levelwise recipe as SQL (dialect: sqlite); fitted on "x DROP TABLE t; --", 2,000 rows.');
  });
  it('compiles for every dialect, with the number shape in each regular-expression flavour', () => {
    for (const name of SQL_DIALECTS) expect(compileSql(demoVariety, { table: 'households', dialect: name })).toMatch(/^-- Levelwise recipe as SQL/);
    expect(numberPattern({ decimal: ',', group: '.' }).re2).toBe('[+-]?(?:(?:[0-9]{1,3}(?:\\.[0-9]{3})+|[0-9]+)(?:,[0-9]+)?|,[0-9]+)(?:[eE][+-]?[0-9]+)?');
    expect(numberPattern({ decimal: '.', group: '' }).similar).toBe('[+-]?([0-9]+(.[0-9]+)?|.[0-9]+)([eE][+-]?[0-9]+)?');
  });
});

describe('documented limits of engines (not faults of the compiler)', () => {
  it("SQLite's lower() folds ASCII letters only; JavaScript folds all of Unicode", async () => {
    const [row] = (await engineNamed('sqlite').query("SELECT lower('ÉA')")).rows;
    expect(row?.[0]).toBe('Éa');
    expect('ÉA'.toLowerCase()).toBe('éa');
  });
  it('the ansi dialect trims only the plain space', () => {
    expect(dialect('ansi').trim('x')).toBe("TRIM(BOTH ' ' FROM x)");
  });
});

