/**
 * The real command line, spawned as a user runs it (`node bin/levelwise.js …`), on small files.
 *
 * One suite over two implementations: the page's path (core's encodeToCsv on the whole table) and
 * the command line's path (the file streamed in batches). Batches are made tiny through
 * LEVELWISE_BATCH_ROWS so that batch boundaries fall inside every file; the bytes must not change.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, lstatSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { neutraliseFormula } from '../../src/core/csv-cell.ts';
import { cellText } from '../../src/core/columns.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { parseRecipe, stringifyRecipe } from '../../src/core/recipe-io.ts';
import { DEFAULT_MISSING_TOKENS, type ContinuousColumn, type Recipe } from '../../src/core/recipe.ts';
import { compileSql } from '../../src/core/sql.ts';
import { generateHouseholdEnergyCsv } from '../../src/demo/household-energy.ts';
import { buildXlsx } from '../e2e/helpers/xlsx.ts';
import { goldenCases } from '../golden/cases.ts';

const ROOT = join(import.meta.dirname, '../..');
const BIN = join(ROOT, 'bin/levelwise.js');
const work = mkdtempSync(join(tmpdir(), 'levelwise-cli-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

interface Run {
  readonly status: number | null;
  readonly stdout: Buffer;
  readonly stderr: string;
}

function levelwise(args: readonly string[], options: { input?: Uint8Array | string; batchRows?: number; cwd?: string; fromSources?: boolean } = {}): Run {
  const env: NodeJS.ProcessEnv = { ...process.env, LEVELWISE_DEBUG: '' };
  if (options.batchRows !== undefined) env['LEVELWISE_BATCH_ROWS'] = String(options.batchRows);
  // From the TypeScript sources (no bundle), a file is read on one thread; from the bundle, on a second one.
  if (options.fromSources === true) env['LEVELWISE_NO_BUNDLE'] = '1';
  const run = spawnSync(process.execPath, [BIN, ...args], { input: options.input ?? '', env, cwd: options.cwd ?? work, maxBuffer: 1 << 28 });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr.toString('utf8') };
}

function file(name: string, content: Uint8Array | string): string {
  const path = join(work, name);
  writeFileSync(path, content);
  return path;
}

function parsed(text: string): Recipe {
  const result = parseRecipe(text);
  if (!result.ok) throw new Error(result.errors.join('\n'));
  return result.recipe;
}

const text = (bytes: Uint8Array) => new TextDecoder().decode(bytes);
/** Messages on standard error: one line each, never a stack trace. */
const stderrLines = (run: Run) => run.stderr.split('\n').filter((l) => l !== '');

function expectOneLineError(run: Run, pattern: RegExp): void {
  expect(run.status).toBe(2);
  expect(run.stdout.length).toBe(0);
  expect(stderrLines(run)).toHaveLength(1);
  expect(run.stderr).toMatch(pattern);
  expect(run.stderr).not.toMatch(/\n\s+at /);
}

describe('help', () => {
  it('levelwise --help names every verb and the exit codes', () => {
    const run = levelwise(['--help']);
    expect(run.status).toBe(0);
    const help = run.stdout.toString();
    for (const verb of ['profile FILE', 'draft FILE', 'apply RECIPE FILE', 'check RECIPE FILE', 'sql RECIPE --table NAME']) expect(help).toContain(verb);
    expect(help).toContain('Exit codes: 0 done; 1 the data does not fit the recipe; 2 wrong command or unreadable input.');
  });
  it('levelwise --version names the package version and the recipe format', () => {
    const version = (JSON.parse(readFileSync(join(import.meta.dirname, '../../package.json'), 'utf8')) as { version: string }).version;
    for (const flag of ['--version', '-V']) {
      const run = levelwise([flag]);
      expect(run.status).toBe(0);
      expect(run.stdout.toString()).toBe(`levelwise ${version} (recipe format 1)\n`);
    }
  });
  it('without a verb the help goes to standard error with exit 2', () => {
    const run = levelwise([]);
    expect(run.status).toBe(2);
    expect(run.stdout.length).toBe(0);
    expect(run.stderr).toContain('Usage: levelwise VERB [options]');
  });
  const options: Record<string, string[]> = {
    profile: ['--format text|json', '--output OUT', '--delimiter', '--encoding', '--sheet'],
    draft: ['--set COLUMN=LEVEL[:CODING]', '--numbers COLUMN=EXAMPLE', '--reference COLUMN=LEVEL', '--positive COLUMN=LEVEL', '--order COLUMN=A,B,C', '--keep-top COLUMN=N', '--naming readable|safe'],
    apply: ['--output OUT', '--rejects FILE'],
    check: ['--format text|json'],
    sql: ['--table NAME', '--dialect D', 'duckdb (default), postgres, sqlite or ansi', '--rejected flag', '--rejected drop'],
  };
  for (const [verb, names] of Object.entries(options)) {
    it(`levelwise ${verb} --help lists its options`, () => {
      const run = levelwise([verb, '--help']);
      expect(run.status).toBe(0);
      const help = run.stdout.toString();
      expect(help.startsWith(`Usage: levelwise ${verb}`)).toBe(true);
      for (const name of names) expect(help).toContain(name);
    });
  }
});

describe('apply: the command line writes the bytes the page writes', () => {
  const cases = goldenCases();
  it('finds the golden cases', () => expect(cases.length).toBeGreaterThanOrEqual(12));
  for (const c of cases) {
    for (const batchRows of [1, 3]) {
      it(`golden case ${c.name}, batches of ${batchRows} rows`, () => {
        const recipe = file(`${c.name}.recipe.json`, c.recipeText);
        const input = file(`${c.name}.csv`, c.input);
        const run = levelwise(['apply', recipe, input], { batchRows });
        const page = encodeToCsv(parsed(c.recipeText), readTable(c.input).table);
        expect(text(run.stdout)).toBe(text(page.bytes));
        expect(text(run.stdout)).toBe(text(c.expected));
        expect(run.status).toBe(page.report.rowsRejected > 0 ? 1 : 0);
      });
    }
  }

  it('reads the file from standard input and the recipe from a file, or the recipe from standard input', () => {
    const c = cases.find((x) => x.name === 'nominal-one-hot')!;
    const recipe = file('stdin.recipe.json', c.recipeText);
    const input = file('stdin.csv', c.input);
    const fromStdin = levelwise(['apply', recipe, '-'], { input: c.input, batchRows: 2 });
    expect(fromStdin.status).toBe(0);
    expect(text(fromStdin.stdout)).toBe(text(c.expected));
    const recipeFromStdin = levelwise(['apply', '-', input, '-o', '-'], { input: c.recipeText });
    expect(text(recipeFromStdin.stdout)).toBe(text(c.expected));
    expectOneLineError(levelwise(['apply', '-', '-'], { input: c.input }), /both come from standard input/);
  });

  it('writes -o OUT only when complete, with no partial file left beside it', () => {
    const c = cases.find((x) => x.name === 'ordinal-rank')!;
    const out = join(work, 'ordinal-rank.out.csv');
    const run = levelwise(['apply', file('rank.recipe.json', c.recipeText), file('rank.csv', c.input), '-o', out], { batchRows: 1 });
    expect(run.status).toBe(0);
    expect(run.stdout.length).toBe(0);
    expect(text(readFileSync(out))).toBe(text(c.expected));
    expect(readdirSync(work).filter((n) => n.includes('.partial'))).toEqual([]);
  });

  it('writes through a symbolic link (or a device such as /dev/null) instead of replacing it', () => {
    const c = cases.find((x) => x.name === 'ordinal-rank')!;
    const target = join(work, 'link-target.csv');
    const link = join(work, 'link.csv');
    writeFileSync(target, 'old');
    symlinkSync(target, link);
    const run = levelwise(['apply', file('link.recipe.json', c.recipeText), file('link-input.csv', c.input), '-o', link]);
    expect(run.status).toBe(0);
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(text(readFileSync(target))).toBe(text(c.expected));
  });
});

// The invented household-energy survey (src/demo): draft through the command line, then apply to a
// second invented sample, streamed in batches of 7 rows.
const demoCsv = generateHouseholdEnergyCsv({ rows: 2000 });
const demoNewCsv = generateHouseholdEnergyCsv({ rows: 1200, seed: 7, manyLevels: 60 });

describe('draft and apply on the invented demo survey', () => {
  const demoFile = file('household-energy-survey (invented).csv', demoCsv);
  const newFile = file('household-energy-new (invented).csv', demoNewCsv);
  const demoTable = readTable(new TextEncoder().encode(demoCsv)).table;
  const profiles = profileTable(demoTable, { missingTokens: DEFAULT_MISSING_TOKENS });

  const recipePath = join(work, 'demo.recipe.json');
  let draftRun: Run;
  beforeAll(() => {
    draftRun = levelwise([
      'draft', demoFile, '-o', recipePath,
      '--set', 'region=nominal:dummy', '--reference', 'region=North',
      '--set', 'heating=nominal:effect', '--keep-top', 'heating=4',
      '--set', 'floor_area_m2=continuous:z-score',
      '--order', 'service_tier=premium,standard,basic',
      '--positive', 'has_solar=no',
      '--set', 'comment=excluded', '--naming', 'safe',
    ]);
  });

  it('draft writes the recipe core drafts, with the choices as core decisions', () => {
    const run = draftRun;
    expect(run.stderr).not.toMatch(/error|unexpected/i);
    expect(run.status).toBe(0);
    const decisions: Decision[] = [
      { type: 'set-level', column: 'region', level: 'nominal' },
      { type: 'set-nominal-coding', column: 'region', coding: 'dummy' },
      { type: 'set-level', column: 'heating', level: 'nominal' },
      { type: 'set-nominal-coding', column: 'heating', coding: 'effect' },
      { type: 'set-level', column: 'floor_area_m2', level: 'continuous' },
      { type: 'set-scaling', column: 'floor_area_m2', scaling: 'z-score' },
      { type: 'set-level', column: 'comment', level: 'excluded' },
      { type: 'set-rare', column: 'heating', rare: { minCount: null, minShare: null, keepTop: 4 } },
      { type: 'set-order', column: 'service_tier', order: ['premium', 'standard', 'basic'] },
      { type: 'set-reference', column: 'region', reference: 'North' },
      { type: 'set-positive', column: 'has_solar', positive: 'no' },
      { type: 'set-naming', naming: 'safe' },
    ];
    const drafted = draftRecipe(profiles, { file: 'household-energy-survey (invented).csv', rows: demoTable.rowCount });
    const expected = decisions.reduce((r, d) => decide(r, d, profiles), drafted);
    expect(readFileSync(recipePath, 'utf8')).toBe(stringifyRecipe(expected));
    const region = expected.columns.find((c) => c.name === 'region');
    expect(region?.outputs).not.toContain('region__north');
    // "occupant_age_band" names an age: the usual caution is shown (common practice).
    expect(run.stderr).toContain('caution: "occupant_age_band" may describe a sensitive attribute of people');
  });

  it('apply on a new sample, in batches of 7 rows, equals the whole-table encoding', () => {
    const recipe = parsed(readFileSync(recipePath, 'utf8'));
    const run = levelwise(['apply', recipePath, newFile], { batchRows: 7 });
    const page = encodeToCsv(recipe, readTable(new TextEncoder().encode(demoNewCsv)).table);
    expect(run.status).toBe(0);
    expect(Buffer.compare(run.stdout, Buffer.from(page.bytes))).toBe(0);
    // New suppliers were never seen: said on standard error, handled by the unseen policy.
    expect(run.stderr).toMatch(/^levelwise apply: supplier: [\d,]+ cells with levels the recipe never saw/m);
  });

  it('reading the file on a second thread gives the same bytes and messages as reading it on one', () => {
    const threaded = levelwise(['apply', recipePath, newFile], { batchRows: 7 });
    const single = levelwise(['apply', recipePath, newFile], { batchRows: 7, fromSources: true });
    expect(threaded.status).toBe(0);
    expect(single.status).toBe(0);
    expect(Buffer.compare(threaded.stdout, single.stdout)).toBe(0);
    expect(threaded.stderr).toBe(single.stderr);
  });

  it('rows a policy rejects go to the rejects file with line and reason, and exit 1', () => {
    const strict = [
      { type: 'set-invalid', column: 'annual_kwh', invalid: 'error' },
      { type: 'set-categorical-missing', column: 'insulation_rating', missing: { policy: 'error', indicator: false } },
      { type: 'set-unseen', column: 'supplier', unseen: 'error' },
    ] as const satisfies readonly Decision[];
    const recipe = strict.reduce((r, d) => decide(r, d, profiles), draftRecipe(profiles, { file: 'demo.csv', rows: demoTable.rowCount }));
    const recipePath = file('strict.recipe.json', stringifyRecipe(recipe));
    const rejectsPath = join(work, 'strict.rejects.csv');
    const run = levelwise(['apply', recipePath, newFile, '--rejects', rejectsPath, '-o', join(work, 'strict.out.csv')], { batchRows: 7 });
    const newTable = readTable(new TextEncoder().encode(demoNewCsv)).table;
    const page = encodeToCsv(recipe, newTable);
    expect(page.report.rowsRejected).toBeGreaterThan(10);
    expect(run.status).toBe(1);
    expect(text(readFileSync(join(work, 'strict.out.csv')))).toBe(text(page.bytes));
    const rows = Papa.parse<string[]>(readFileSync(rejectsPath, 'utf8'), { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['levelwise_line', 'levelwise_column', 'levelwise_reason', ...newTable.names]);
    // The report lists rejections column by column; the rejects file in the order of the rows.
    const byRow = [...page.report.rejected].sort((a, b) => a.row - b.row);
    expect(rows.slice(1).map((r) => r.slice(0, 3))).toEqual(byRow.map((r) => [String(r.line), r.column, r.reason]));
    // Each rejected row is there as the file had it (text that starts like a formula is neutralised, OWASP "CSV Injection").
    byRow.forEach((r, i) => {
      expect(rows[i + 1]?.slice(3)).toEqual(newTable.columns.map((column) => neutraliseFormula(cellText(column, r.row))));
    });
    expect(run.stderr).toContain(`levelwise apply: ${page.report.rowsRejected} rows rejected and left out of the output; all are in ${rejectsPath}, with every cell.`);
  });

  it('without --rejects the first rejected rows are listed on standard error, every value with its line', () => {
    const c = goldenCases().find((x) => x.name === 'policy-errors')!;
    const run = levelwise(['apply', file('pe.recipe.json', c.recipeText), file('pe.csv', c.input)]);
    expect(run.status).toBe(1);
    expect(stderrLines(run)).toEqual([
      'levelwise apply: colour: 1 cell with levels the recipe never saw, rows rejected: "green" ×1 (line 4).',
      'levelwise apply: size: 1 cell not a number, rows rejected: "x" ×1 (line 5).',
      'levelwise apply: 2 rows rejected and left out of the output.',
      'levelwise apply:   line 4, colour: unseen level "green" (unseen policy: error)',
      'levelwise apply:   line 5, size: "x" is not a number',
    ]);
  });
});

describe('amounts written with currency and percent signs', () => {
  // An invented price list: euro prices with decimal commas, and "%" after the discount.
  const prices = file('prices (invented).csv', 'item;price;discount\r\nP1;€ 1.234,50;10 %\r\nP2;-€ 4,50;0 %\r\nP3;€ 19,99;12,5 %\r\nP4;€ 7;5 %\r\nP5;€ 30,10;\r\nP6;€ 2,00;20 %\r\nP7;€ 250;15 %\r\nP8;€ 99,90;7,5 %\r\nP9;€ 12;25 %\r\nP10;€ 5,25;30 %\r\nP11;€ 8;35 %\r\nP12;€ 61,75;40 %\r\nP13;€ 3,30;45 %\r\n');
  const recipePath = join(work, 'prices.recipe.json');

  it('profile says how the numbers are written', () => {
    const run = levelwise(['profile', prices]);
    expect(run.status).toBe(0);
    expect(text(run.stdout)).toContain('   numbers (written like €1.234,5): min -4.5, max 1234.5,');
    expect(text(run.stdout)).toContain('   numbers (written like 1234,5%): min 0, max 45,');
  });

  it('profile names a stray text by its first five lines', () => {
    // An invented meter log: 40 readings, "unknown" on 8 lines (2 and every fifth line after it).
    const rows = Array.from({ length: 40 }, (_, i) => `M${i},${i % 5 === 0 ? 'unknown' : String(1200 + i * 7)}`);
    const run = levelwise(['profile', file('meters (invented).csv', `meter,kwh\n${rows.join('\n')}\n`)]);
    expect(run.status).toBe(0);
    expect(text(run.stdout)).toContain('; 8 not numbers: "unknown" (lines 2, 7, 12, 17, 22, …)');
  });

  it('draft reads them as numbers in their format, and apply writes the numbers', () => {
    const draft = levelwise(['draft', prices, '-o', recipePath]);
    expect(draft.status).toBe(0);
    const recipe = parsed(readFileSync(recipePath, 'utf8'));
    expect(recipe.columns.map((c) => [c.name, c.level, c.level === 'continuous' ? c.format : null])).toEqual([
      ['item', 'identifier', null],
      ['price', 'continuous', { decimal: ',', group: '.', symbol: { text: '€', side: 'before' } }],
      ['discount', 'continuous', { decimal: ',', group: '', symbol: { text: '%', side: 'after' } }],
    ]);
    const out = levelwise(['apply', recipePath, prices]);
    expect(out.status).toBe(0);
    // The discounts 10 … 45 (12 of them) sum to 245: the empty one is filled with the mean, 245 / 12.
    expect(text(out.stdout).split('\r\n').slice(0, 6)).toEqual([
      'item,price,discount,discount (missing)',
      'P1,1234.5,10,0',
      'P2,-4.5,0,0',
      'P3,19.99,12.5,0',
      'P4,7,5,0',
      `P5,30.1,${245 / 12},1`,
    ]);
  });
});

describe('draft --numbers: the number format shown by example', () => {
  // An invented lab sheet: estimated weights written "≈12" (a sign the draft does not know), and one bare number.
  const sheet = file('weights (invented).csv', 'sample,weight\nS1,≈12\nS2,≈3.5\nS3,7\nS4,≈10\nS5,≈2.5\nS6,≈1\nS7,≈4\nS8,≈8\nS9,≈6\nS10,≈9\nS11,≈11\nS12,≈5\n');

  it('names a sign the draft does not know, so the column reads as numbers', () => {
    const run = levelwise(['draft', sheet, '--set', 'weight=continuous', '--numbers', 'weight=≈1234.5']);
    expect(run.status).toBe(0);
    const weight = parsed(text(run.stdout)).columns[1] as ContinuousColumn;
    expect(weight.format).toEqual({ decimal: '.', group: '', symbol: { text: '≈', side: 'before' } });
    // 12 + 3.5 + 7 + 10 + 2.5 + 1 + 4 + 8 + 6 + 9 + 11 + 5 = 79 over 12 samples.
    expect(weight.fitted).toMatchObject({ count: 12, min: 1, max: 12 });
    expect(weight.fitted.mean).toBeCloseTo(79 / 12, 12);
  });

  it('says so when the format given reads fewer numbers than the one detected', () => {
    const prices = file('euro prices (invented).csv', `item;price\n${Array.from({ length: 12 }, (_, i) => `P${i};€ ${i + 1},50`).join('\n')}\n`);
    const run = levelwise(['draft', prices, '--numbers', 'price=1234,5']);
    expect(run.status).toBe(0);
    expect(run.stderr).toContain('levelwise draft: --numbers price=1234,5: only 0 values read as numbers in this format, against 12 in the format detected.');
  });

  it('refuses an example that is not 1234.5, and a column that is not continuous, saying what to write', () => {
    expectOneLineError(levelwise(['draft', sheet, '--numbers', 'weight=12,5']), /--numbers weight=12,5: "12,5" is not the number 1234\.5 written in some format\./);
    expectOneLineError(levelwise(['draft', sheet, '--numbers', 'sample=1234.5']), /--numbers sample=1234\.5: "sample" is identifier, and --numbers applies to continuous columns\./);
  });
});

describe('check', () => {
  const cases = goldenCases();
  it('exit 0 and one line when the file fits', () => {
    const c = cases.find((x) => x.name === 'nominal-dummy')!;
    const recipe = file('fit.recipe.json', c.recipeText);
    const run = levelwise(['check', recipe, file('fit.csv', c.input)]);
    expect(run.status).toBe(0);
    expect(run.stdout.toString()).toMatch(/^"[^"]+fit\.csv" fits the recipe "[^"]+fit\.recipe\.json": \d+ rows?, \d+ encoded columns?\.\n/);
  });
  it('exit 1 with unseen levels and their counts and lines', () => {
    const c = cases.find((x) => x.name === 'rare-and-unseen')!;
    const run = levelwise(['check', file('ru.recipe.json', c.recipeText), file('ru.csv', c.input)]);
    expect(run.status).toBe(1);
    const out = run.stdout.toString();
    expect(out).toMatch(/does not fit the recipe/);
    expect(out).toMatch(/Levels the recipe never saw:\n {2}\S+ \(encoded as "\(other\)"\): "geothermal" ×1 \(line \d+\)/);
  });
  it('exit 1 with missing columns, values that are not numbers and rejected rows', () => {
    const c = cases.find((x) => x.name === 'policy-errors')!;
    const withoutSize = 'colour\nred\nblue\n';
    const missing = levelwise(['check', file('pe2.recipe.json', c.recipeText), file('pe-no-size.csv', withoutSize)]);
    expect(missing.status).toBe(1);
    expect(missing.stdout.toString()).toContain('Missing columns (their cells count as missing): size');
    // In batches of one row, the report still numbers rows from the start of the file.
    const bad = levelwise(['check', file('pe3.recipe.json', c.recipeText), file('pe3.csv', c.input), '--format', 'json'], { batchRows: 1 });
    expect(bad.status).toBe(1);
    const report = JSON.parse(bad.stdout.toString());
    const page = encodeToCsv(parsed(c.recipeText), readTable(c.input).table).report;
    // The core's report, and what the reading found: here nothing (every row has its fields).
    const findings = { headerIssues: [], tooFewFields: 0, tooManyFields: 0, unclosedQuote: null, rowIssues: [] };
    expect(report).toEqual(JSON.parse(JSON.stringify({ ...page, findings })));
  });
});

describe('missing spellings: --missing and --not-missing', () => {
  // "None" says there was no damage; -999 is a sensor's code for no reading (common practice in lab and field sheets).
  const csv = 'id,damage,reading\n1,None,21.5\n2,None,-999\n3,None,19.0\n4,Minor,-999\n5,None,20.0\n6,Severe,-999\n';
  const note = 'damage: "None" is read as missing in 4 cells, more than all of its values together (2 cells). If "None" is a value here, run again with --not-missing None.';

  it('draft and profile note a spelling read as missing in more cells than the column has values', () => {
    const input = file('spellings.csv', csv);
    const draft = levelwise(['draft', input]);
    expect(draft.status).toBe(0);
    expect(draft.stderr).toBe(`levelwise draft: ${note}\n`);
    expect(parsed(draft.stdout.toString()).reading.missingTokens).toEqual(DEFAULT_MISSING_TOKENS);
    const profile = levelwise(['profile', input, '--missing', '-999']);
    expect(profile.stderr).toBe(`levelwise profile: ${note}\n`);
    expect(profile.stdout.toString()).toContain('3. reading — ');
    expect(profile.stdout.toString()).toContain('   3 missing ("-999" 3), 3 distinct');
  });

  it('the recipe keeps the spellings chosen, and apply reads the file with them', () => {
    const input = file('spellings2.csv', csv);
    const draft = levelwise(['draft', input, '--not-missing', 'None', '--missing=-999', '--set', 'reading=continuous:none', '--set', 'damage=nominal']);
    expect(draft.stderr).toBe('');
    const recipe = parsed(draft.stdout.toString());
    expect(recipe.reading.missingTokens).toEqual([...DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'), '-999']);
    const applied = levelwise(['apply', file('spellings2.recipe.json', draft.stdout), input]);
    expect(applied.status).toBe(0);
    // By hand: "None" is a level of its own; -999 is missing, filled with the mean of 21.5, 19 and 20 (60.5 / 3).
    expect(text(applied.stdout)).toBe(
      [
        'id,damage=None,damage=Minor,damage=Severe,reading,reading (missing)',
        '1,1,0,0,21.5,0',
        '2,1,0,0,20.166666666666668,1',
        '3,1,0,0,19,0',
        '4,0,1,0,20.166666666666668,1',
        '5,1,0,0,20,0',
        '6,0,0,1,20.166666666666668,1',
        '',
      ].join('\r\n'),
    );
  });

  it('names five such columns, then counts the rest', () => {
    // Eight invented columns, each "NA" in 3 of 4 rows.
    const header = Array.from({ length: 8 }, (_, i) => `c${i + 1}`);
    const rows = [header.map(() => 'NA'), header.map(() => 'NA'), header.map(() => 'NA'), header.map((_, i) => String(i))];
    const run = levelwise(['profile', file('mostly-na.csv', [header, ...rows].map((r) => r.join(',')).join('\n') + '\n')]);
    const lines = stderrLines(run);
    expect(lines).toHaveLength(6);
    expect(lines[0]).toBe('levelwise profile: c1: "NA" is read as missing in 3 cells, more than all of its values together (1 cell). If "NA" is a value here, run again with --not-missing NA.');
    expect(lines[5]).toBe('levelwise profile: … and in 3 more columns (c6, c7, c8) a missing spelling fills more cells than the values do.');
  });

  it('refuses the empty cell, a spelling not on the list, and one given to both options', () => {
    const input = file('spellings3.csv', csv);
    expectOneLineError(levelwise(['draft', input, '--not-missing', 'Unknown']), /--not-missing Unknown: "Unknown" is not read as missing to begin with\. The spellings read as missing are "NA", .*"-" and the empty cell\./);
    expectOneLineError(levelwise(['profile', input, '--not-missing', ' ']), /--not-missing "": an empty cell is always read as missing/);
    expectOneLineError(levelwise(['draft', input, '--missing', '']), /--missing "": an empty cell is read as missing already/);
    expectOneLineError(levelwise(['draft', input, '--missing', 'x', '--not-missing', 'x']), /"x" was given to both --missing and --not-missing/);
  });

  it('the help of draft and profile lists every spelling read as missing', () => {
    for (const verb of ['draft', 'profile']) {
      const help = levelwise([verb, '--help']).stdout.toString();
      const line = help.split('\n').find((l) => l.includes('NA  N/A'))!;
      expect(line.trim().split(/\s+/).filter((w) => w !== 'or')).toEqual(DEFAULT_MISSING_TOKENS);
      expect(help).toContain('--not-missing SPELLING');
    }
  });
});

describe('sql', () => {
  it('writes compileSql’s query with a closing semicolon', () => {
    const c = goldenCases().find((x) => x.name === 'continuous-scaling')!;
    const recipePath = file('sql.recipe.json', c.recipeText);
    const run = levelwise(['sql', recipePath, '--table', 'analytics.raw_rows', '--dialect', 'postgres']);
    expect(run.status).toBe(0);
    expect(run.stdout.toString()).toBe(`${compileSql(parsed(c.recipeText), { table: ['analytics', 'raw_rows'], dialect: 'postgres' })};\n`);
    const drop = levelwise(['sql', recipePath, '--table=t', '--rejected', 'drop']);
    expect(drop.stdout.toString()).toBe(`${compileSql(parsed(c.recipeText), { table: 't', dialect: 'duckdb', rejected: 'drop' })};\n`);
  });
  it('refuses an unknown dialect and a missing --table', () => {
    const recipePath = file('sql2.recipe.json', goldenCases()[0]!.recipeText);
    expectOneLineError(levelwise(['sql', recipePath, '--table', 't', '--dialect', 'oracle']), /--dialect "oracle" is not one of duckdb, postgres, sqlite, ansi/);
    expectOneLineError(levelwise(['sql', recipePath]), /--table is missing/);
  });
});

describe('errors: one line, exit 2', () => {
  const c = goldenCases()[0]!;
  it('a missing input file', () => {
    const recipe = file('e.recipe.json', c.recipeText);
    expectOneLineError(levelwise(['apply', recipe, 'no-such-file.csv']), /^levelwise apply: cannot read "no-such-file\.csv": there is no such file\. Check the path/);
  });
  it('a recipe that is not JSON, and one that is not a recipe', () => {
    const input = file('e.csv', c.input);
    expectOneLineError(levelwise(['apply', file('broken.json', '{"kind": '), input]), /^levelwise apply: the recipe "[^"]+broken\.json" cannot be used: The recipe is not valid JSON/);
    expectOneLineError(levelwise(['check', file('other.json', '{"kind": "something else"}'), input]), /This is not a Levelwise recipe/);
    const wrong = JSON.parse(c.recipeText);
    wrong.columns[0].level = 'nominalish';
    expectOneLineError(levelwise(['apply', file('wrong.json', JSON.stringify(wrong)), input]), /cannot be used: columns\[0\]/);
  });
  it('an empty file, a folder, an unknown verb, an unknown option, a missing argument', () => {
    const recipe = file('e2.recipe.json', c.recipeText);
    expectOneLineError(levelwise(['apply', recipe, file('empty.csv', '')]), /cannot read "[^"]+empty\.csv": the file is empty/);
    expectOneLineError(levelwise(['profile', work]), /is a folder, not a file/);
    expectOneLineError(levelwise(['encode', recipe]), /^levelwise: "encode" is not a verb/);
    expectOneLineError(levelwise(['apply', '--fast', recipe, 'x.csv']), /unknown option --fast/);
    expectOneLineError(levelwise(['apply', recipe]), /FILE is missing/);
  });
  it('a draft choice that does not fit the file', () => {
    const input = file('choice.csv', 'colour,size\nred,1\nblue,2\nred,3\n');
    expectOneLineError(levelwise(['draft', input, '--reference', 'colour=green']), /--reference colour=green: "colour" (has no level "green"|is \w+, and --reference applies to nominal columns)/);
    expectOneLineError(levelwise(['draft', input, '--set', 'weight=continuous']), /the file has no column "weight"/);
    expectOneLineError(levelwise(['draft', input, '--set', 'colour=nominal:rank']), /"rank" is not a coding of a nominal column/);
    // The page offers continuous only for a column with numbers in it; so does the command line.
    expectOneLineError(levelwise(['draft', input, '--set', 'colour=continuous']), /--set colour=continuous: no value of "colour" reads as a number, so it cannot be continuous\./);
    expect(levelwise(['draft', input, '--set', 'size=continuous']).status).toBe(0);
  });
  it('a reader that closes standard output early ends the run quietly', () => {
    const run = spawnSync('sh', ['-c', `"${process.execPath}" "${BIN}" apply "${file('epipe.recipe.json', c.recipeText)}" "${file('epipe.csv', demoLikeRows(c))}" | head -c 10`], {
      env: { ...process.env, LEVELWISE_BATCH_ROWS: '1' },
    });
    expect(run.stdout.toString().length).toBe(10);
    expect(run.stderr.toString()).toBe('');
  });
});

/** The golden input repeated many times, enough to fill a pipe. */
function demoLikeRows(c: ReturnType<typeof goldenCases>[number]): string {
  const [header, ...rows] = text(c.input).split(/\r?\n/).filter((l) => l !== '');
  return [header, ...Array.from({ length: 20000 }, (_, i) => rows[i % rows.length])].join('\n') + '\n';
}

describe('gzip-compressed input (RFC 1952)', () => {
  // The invented demo survey, compressed as a whole and as two members one after the other (as
  // `cat a.gz b.gz` makes them; a gzip reader reads every member, RFC 1952 §2.2).
  const plainPath = file('survey-gz.csv', demoNewCsv);
  const split = demoNewCsv.indexOf('\n', demoNewCsv.length >> 1) + 1;
  const whole = gzipSync(demoNewCsv);
  const members = Buffer.concat([gzipSync(demoNewCsv.slice(0, split)), gzipSync(demoNewCsv.slice(split))]);
  let recipePath = '';
  let plain: Run;
  beforeAll(() => {
    recipePath = join(work, 'survey-gz.recipe.json');
    expect(levelwise(['draft', plainPath, '-o', recipePath]).status).toBe(0);
    plain = levelwise(['apply', recipePath, plainPath]);
  });

  it('apply reads a .gz file, one of several members, or standard input, to the bytes of the plain file', () => {
    expect(plain.status).toBe(0);
    expect(plain.stdout.length).toBeGreaterThan(100_000);
    for (const run of [
      levelwise(['apply', recipePath, file('survey-gz.csv.gz', whole)], { batchRows: 97 }),
      levelwise(['apply', recipePath, file('survey-members.csv.gz', members)]),
      levelwise(['apply', recipePath, '-'], { input: whole, batchRows: 97 }),
    ]) {
      expect(run.status).toBe(0);
      expect(Buffer.compare(run.stdout, plain.stdout)).toBe(0);
      expect(run.stderr).toBe(plain.stderr);
    }
  });

  it('draft and profile read it as the plain file (the recipe names the file given)', () => {
    const drafted = levelwise(['draft', file('survey-draft.csv.gz', whole)]);
    expect(drafted.status).toBe(0);
    const expected = readFileSync(recipePath, 'utf8').replace('"survey-gz.csv"', '"survey-draft.csv.gz"');
    expect(text(drafted.stdout)).toBe(expected);
    const profiled = levelwise(['profile', file('survey-profile.csv.gz', members)]);
    expect(profiled.status).toBe(0);
    expect(text(profiled.stdout).split('\n')[0]).toBe(`${join(work, 'survey-profile.csv.gz')}: 1,200 rows, 20 columns (utf-8, comma-separated)`);
  });

  it('apply -o OUT.gz and --rejects FILE.gz write gzip-compressed, only when complete', () => {
    const out = join(work, 'survey.encoded.csv.gz');
    const rejects = join(work, 'survey.rejects.csv.gz');
    const plainRejects = join(work, 'survey.rejects.csv');
    // Rows whose annual_kwh is not a number ("unknown") are rejected, so that the rejects file has rows.
    const profiles = profileTable(readTable(new TextEncoder().encode(demoNewCsv)).table, { missingTokens: DEFAULT_MISSING_TOKENS });
    const rejecting = decide(parsed(readFileSync(recipePath, 'utf8')), { type: 'set-invalid', column: 'annual_kwh', invalid: 'error' }, profiles);
    const rejectingPath = file('survey-gz.rejecting.recipe.json', stringifyRecipe(rejecting));
    const packed = levelwise(['apply', rejectingPath, file('survey-out.csv.gz', whole), '-o', out, '--rejects', rejects], { batchRows: 97 });
    const unpacked = levelwise(['apply', rejectingPath, plainPath, '-o', join(work, 'survey.encoded.csv'), '--rejects', plainRejects], { batchRows: 97 });
    expect(unpacked.status).toBe(1);
    expect(packed.status).toBe(1);
    expect(gunzipSync(readFileSync(out)).equals(readFileSync(join(work, 'survey.encoded.csv')))).toBe(true);
    expect(gunzipSync(readFileSync(rejects)).equals(readFileSync(plainRejects))).toBe(true);
    expect(readFileSync(plainRejects).length).toBeGreaterThan(100);
    expect(readdirSync(work).filter((name) => name.includes('.partial'))).toEqual([]);
  });

  it('a damaged or cut short file: one line, exit 2, no output file', () => {
    const out = join(work, 'cut.out.csv');
    const cut = levelwise(['apply', recipePath, file('cut.csv.gz', whole.subarray(0, whole.length >> 1)), '-o', out]);
    expectOneLineError(cut, /"\S*cut\.csv\.gz" is gzip-compressed, but its compressed data is damaged or cut short \(unexpected end of file\)\. Copy or download it again/);
    expect(existsSync(out)).toBe(false);
    const damaged = Buffer.from(whole);
    damaged.fill(0x55, 40, 80);
    expectOneLineError(levelwise(['apply', recipePath, '-'], { input: damaged }), /"standard input" is gzip-compressed, but its compressed data is damaged/);
  });
});

describe('encodings', () => {
  // Plain ASCII well past the first chunk the reader chooses the encoding from, then one
  // Windows-1252 byte: 0xE9 is "é" in Windows-1252 (WHATWG Encoding Standard, index
  // windows-1252) and invalid in UTF-8.
  const head = new TextEncoder().encode(`name,town\n${Array.from({ length: 20000 }, (_, i) => `p${i},Lyon`).join('\n')}\n`);
  const bytes = new Uint8Array([...head, ...new TextEncoder().encode('q1,Orl'), 0xe9, ...new TextEncoder().encode('ans\n')]);
  const table = () => readTable(bytes).table;
  const recipe = () => {
    const profiles = profileTable(table(), { missingTokens: DEFAULT_MISSING_TOKENS });
    return decide(draftRecipe(profiles, { file: 'towns.csv', rows: table().rowCount }), { type: 'set-level', column: 'town', level: 'nominal' }, profiles);
  };
  it('a file that turns out not to be UTF-8 is read again as Windows-1252, output started over', () => {
    const recipePath = file('towns.recipe.json', stringifyRecipe(recipe()));
    const out = join(work, 'towns.out.csv');
    const run = levelwise(['apply', recipePath, file('towns.csv', bytes), '-o', out], { batchRows: 50 });
    expect(run.status).toBe(0);
    const page = encodeToCsv(recipe(), table());
    expect(text(readFileSync(out))).toBe(text(page.bytes));
    expect(text(page.bytes)).toContain('town=Orléans');
    // Written compressed, the output is started over the same way.
    const packed = join(work, 'towns.out.csv.gz');
    expect(levelwise(['apply', recipePath, join(work, 'towns.csv'), '-o', packed], { batchRows: 50 }).status).toBe(0);
    expect(text(gunzipSync(readFileSync(packed)))).toBe(text(page.bytes));
  });
  it('from standard input it cannot be read again: one line says to name the encoding, and no output file appears', () => {
    const recipePath = file('towns2.recipe.json', stringifyRecipe(recipe()));
    const out = join(work, 'towns2.out.csv');
    const run = levelwise(['apply', recipePath, '-', '-o', out], { input: bytes, batchRows: 50 });
    expectOneLineError(run, /started as UTF-8 text but holds other bytes further down, and cannot be read again from the start\. Run again with --encoding windows-1252/);
    expect(existsSync(out)).toBe(false);
    const again = levelwise(['apply', recipePath, '-', '--encoding', 'windows-1252'], { input: bytes, batchRows: 50 });
    expect(again.status).toBe(0);
    expect(text(again.stdout)).toBe(text(encodeToCsv(recipe(), table()).bytes));
  });
  it('read as UTF-8 on request, a file names the line of the bad byte; standard input says why it cannot', () => {
    // The byte is on line 20,002 (the header, 20,000 rows, then "q1,Orl\xE9ans"), at offset
    // 10 + 10·8 + 90·9 + 900·10 + 9,000·11 + 10,000·12 = 228,900 bytes of lines, plus "q1,Orl".
    const fromFile = levelwise(['profile', file('towns3.csv', bytes), '--encoding', 'utf-8']);
    expectOneLineError(fromFile, /not valid UTF-8: byte \\xE9 \(offset 228,906\) is not part of any UTF-8 character, in "q1,Orl\\xE9ans" \(line 20,002\)\. If an older office program saved it, run again with --encoding windows-1252/);
    const fromInput = levelwise(['profile', '-', '--encoding', 'utf-8'], { input: bytes });
    expectOneLineError(fromInput, /"standard input" is not valid UTF-8: it holds bytes that are not UTF-8, and cannot be read a second time to find where\. Save it to a file/);
  });
});

describe('spreadsheets', () => {
  it('an .xlsx workbook is read like the page reads it, sheet by name', () => {
    const rows = [['colour', 'size'], ['red', 1], ['blue', 2.5], ['red', null]];
    const workbook = file('book.xlsx', buildXlsx([{ name: 'Notes', rows: [['ignore me']] }, { name: 'Data', rows }]));
    const draft = levelwise(['draft', workbook, '--sheet', 'Data', '--set', 'colour=nominal:one-hot']);
    expect(draft.status).toBe(0);
    const recipe = parsed(draft.stdout.toString());
    expect(recipe.source).toEqual({ file: 'book.xlsx', rows: 3, columns: ['colour', 'size'] });
    const run = levelwise(['apply', file('book.recipe.json', draft.stdout), workbook, '--sheet', 'Data'], { batchRows: 2 });
    expect(run.status).toBe(0);
    const csv = file('book.csv', 'colour,size\nred,1\nblue,2.5\nred,\n');
    expect(text(run.stdout)).toBe(text(levelwise(['apply', join(work, 'book.recipe.json'), csv]).stdout));
    expectOneLineError(levelwise(['profile', workbook, '--sheet', 'Summary']), /has no sheet named "Summary"\. Choose one with --sheet: Notes, Data\./);
  });
});

// -------------------------------------------------------------------------------------------------
// Outside checks: published datasets shipped by the npm package vega-datasets, converted to CSV.

function jsonToCsv(name: string, records: readonly Record<string, unknown>[]): string {
  const columns = Object.keys(records[0] ?? {});
  const rows = records.map((r) => columns.map((c) => (r[c] === null || r[c] === undefined ? '' : String(r[c]))));
  return file(name, Papa.unparse({ fields: columns, data: rows }));
}

function columnSums(csv: string): Map<string, number> {
  const [header = [], ...rows] = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
  const sums = new Map<string, number>();
  header.forEach((name, j) => sums.set(name, rows.reduce((s, row) => s + Number(row[j]), 0)));
  sums.set('(rows)', rows.length);
  return sums;
}

const VEGA = join(ROOT, 'node_modules/vega-datasets/data');

describe('published datasets through draft and apply', () => {
  it('Palmer penguins: 344 rows; Adelie 152, Chinstrap 68, Gentoo 124', () => {
    // Gorman, Williams & Fraser (2014), PLoS ONE 9(3): e90081; counts as in the palmerpenguins
    // documentation (Horst, Hill & Gorman 2020). Data: vega-datasets data/penguins.json.
    const csv = jsonToCsv('penguins.csv', JSON.parse(readFileSync(join(VEGA, 'penguins.json'), 'utf8')));
    const recipePath = join(work, 'penguins.recipe.json');
    expect(levelwise(['draft', csv, '-o', recipePath, '--set', 'Species=nominal:one-hot']).status).toBe(0);
    const run = levelwise(['apply', recipePath, csv], { batchRows: 7 });
    expect(run.status).toBe(0);
    const sums = columnSums(run.stdout.toString());
    expect(sums.get('(rows)')).toBe(344);
    expect([sums.get('Species=Adelie'), sums.get('Species=Chinstrap'), sums.get('Species=Gentoo')]).toEqual([152, 68, 124]);
  });
  it('Cars: 406 rows; Origin USA 254, Europe 73, Japan 79', () => {
    // StatLib "auto-mpg" data (Quinlan 1993) as shipped in vega-datasets data/cars.json. It keeps
    // the 8 cars without a mileage that the UCI copy drops (398 + 8 = 406; the UCI description, from memory).
    const csv = jsonToCsv('cars.csv', JSON.parse(readFileSync(join(VEGA, 'cars.json'), 'utf8')));
    const recipePath = join(work, 'cars.recipe.json');
    expect(levelwise(['draft', csv, '-o', recipePath, '--set', 'Origin=nominal:one-hot', '--set', 'Name=identifier']).status).toBe(0);
    const run = levelwise(['apply', recipePath, csv], { batchRows: 7 });
    expect(run.status).toBe(0);
    const sums = columnSums(run.stdout.toString());
    expect(sums.get('(rows)')).toBe(406);
    expect([sums.get('Origin=USA'), sums.get('Origin=Europe'), sums.get('Origin=Japan')]).toEqual([254, 73, 79]);
    expect(sums.get('Miles_per_Gallon (missing)')).toBe(8);
  });
});
