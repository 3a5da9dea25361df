/**
 * The command line, as a black box, meeting bad input: it is run as a person runs it
 * (`node bin/levelwise.js …`) and only its exit code, standard error and files are looked at.
 * Every refusal is one line on standard error that says what is wrong, where, and what to do, with
 * exit code 2 (1 when the data does not fit the recipe); never a stack trace. A recipe with several
 * problems gets one line per problem. What reading a file found (rows with the wrong number of
 * fields, a quote never closed, a header with no rows) is said by every verb, with its lines.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const CLI = join(ROOT, 'bin/levelwise.js');

interface Run {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

function levelwise(args: readonly string[], cwd: string, env: Record<string, string> = {}): Promise<Run> {
  return new Promise((resolve) => {
    execFile(process.execPath, [CLI, ...args], { cwd, env: { ...process.env, LEVELWISE_DEBUG: '', ...env }, maxBuffer: 64 * 2 ** 20 }, (error, stdout, stderr) => {
      const code = error === null ? 0 : typeof error.code === 'number' ? error.code : -1;
      resolve({ code, stdout, stderr });
    });
  });
}

/** Standard error's lines. */
const lines = (text: string) => text.split('\n').filter((l) => l !== '');

/** One line, no stack trace. */
function expectOneLine(stderr: string): string {
  const lines = stderr.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  expect(stderr).not.toMatch(/\n\s+at /);
  return lines[0]!;
}

let dir = '';
const file = (name: string) => join(dir, name);
// An invented ticket list; its recipe is drafted by the command line itself.
const TICKETS = 'ticket,colour,amount\nT-01,red,10\nT-02,blue,20.5\nT-03,red,12\nT-04,green,40\nT-05,red,50\nT-06,blue,12\nT-07,red,9\nT-08,blue,31\nT-09,red,7\nT-10,red,16\nT-11,blue,3\nT-12,red,18\n';
// The drafted recipe fills a missing amount with the mean of the twelve amounts above, worked by
// hand: 10 + 20.5 + 12 + 40 + 50 + 12 + 9 + 31 + 7 + 16 + 3 + 18 = 228.5, over 12 rows.
const MEAN_AMOUNT = String(228.5 / 12);
const ENCODED_HEADER = 'ticket,colour=red,colour=blue,colour=green,amount\r\n';
// Line 2 lacks its amount; line 3 has two fields more than the header (RFC 4180 §2, rule 4: "Each
// line should contain the same number of fields throughout the file").
const RAGGED = 'ticket,colour,amount\nT-20,red\nT-21,blue,20.5,extra,more\nT-22,red,12\n';
// The quote opened on line 3 is never closed: the rest of the file is that one cell.
const UNCLOSED = 'ticket,colour,amount\nT-30,red,10\nT-31,"blue,20\nT-32,red,12\n';
// A column of numbers with texts that are not numbers on lines 3, 5 and 6.
const STRAY = 'ticket,colour,amount\nT-40,red,10\nT-41,blue,unknown\nT-42,red,12\nT-43,blue,x\nT-44,red,unknown\nT-45,blue,12\n';
// csv-spectrum 2.0.0 (npm), comma_in_quotes.csv: a comma inside a quoted field (RFC 4180 §2,
// rule 6). With its quotes taken away the comma splits the field, and the row has 6 fields, not 5.
const SPECTRUM = join(ROOT, 'node_modules/csv-spectrum/csvs');

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'levelwise-bad-input-'));
  writeFileSync(file('tickets.csv'), TICKETS);
  writeFileSync(file('empty.csv'), '');
  writeFileSync(file('header-only.csv'), 'ticket,colour,amount\n');
  writeFileSync(file('picture.csv'), Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]));
  writeFileSync(file('archive.csv'), Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0, 0x08, 0]));
  writeFileSync(file('utf16-no-mark.csv'), Buffer.from('a,b\n1,2\n', 'utf16le'));
  writeFileSync(file('sensors.csv'), 'sensor,reading\nA,1\nB,2\n');
  writeFileSync(file('not-json.json'), '{\n  "kind": "levelwise.recipe"\n  "version": 1\n}');
  writeFileSync(file('empty.json'), '');
  writeFileSync(file('ragged.csv'), RAGGED);
  writeFileSync(file('unclosed.csv'), UNCLOSED);
  writeFileSync(file('stray.csv'), STRAY);
  writeFileSync(file('short-rows.csv'), `ticket,colour,amount\n${Array.from({ length: 8 }, (_, i) => `T-5${i},red\n`).join('')}`);
  writeFileSync(file('tickets-no-amount.csv'), 'ticket,colour\nT-60,red\n');
  writeFileSync(file('tickets-only-ids.csv'), 'ticket,note\nT-70,late\n');
  const quoted = readFileSync(join(SPECTRUM, 'comma_in_quotes.csv'), 'utf8');
  writeFileSync(file('addresses.csv'), quoted);
  writeFileSync(file('addresses-unquoted.csv'), quoted.replaceAll('"', ''));
  const drafted = await levelwise(['draft', 'tickets.csv', '-o', 'tickets.recipe.json'], dir);
  if (drafted.code !== 0) throw new Error(`the command line could not draft a recipe: ${drafted.stderr}`);
  const recipe = JSON.parse(readFileSync(file('tickets.recipe.json'), 'utf8')) as Record<string, unknown>;
  writeFileSync(file('newer.json'), JSON.stringify({ ...recipe, version: 2 }));
  writeFileSync(file('unknown-field.json'), JSON.stringify({ ...recipe, comment: 'mine' }));
  writeFileSync(file('proto.json'), JSON.stringify(recipe).replace('{', '{"__proto__": {"polluted": "yes"}, '));
  writeFileSync(file('huge.json'), `${' '.repeat(65 * 2 ** 20)}{}`);
  writeFileSync(file('two-problems.json'), JSON.stringify(withColumns(recipe, (c, i) => (i === 1 ? { ...c, coding: 'onehot' } : i === 2 ? { ...c, level: 'measured' } : c))));
  writeFileSync(file('one-problem.json'), JSON.stringify(withColumns(recipe, (c, i) => (i === 1 ? { ...c, coding: 'onehot' } : c))));
  // 25 and 21 columns whose level is none of the six: more problems than are listed.
  for (const n of [25, 21]) {
    const colour = (recipe['columns'] as Record<string, unknown>[])[1]!;
    const columns = Array.from({ length: n }, (_, i) => ({ ...colour, name: `c${i + 1}`, level: 'bogus' }));
    writeFileSync(file(`${n}-problems.json`), JSON.stringify({ ...recipe, columns }));
  }
  const excluded = await levelwise(['draft', 'tickets.csv', '-o', 'excluded.json', '--set', 'ticket=excluded', '--set', 'colour=excluded', '--set', 'amount=excluded'], dir);
  if (excluded.code !== 0) throw new Error(`the command line could not draft a recipe: ${excluded.stderr}`);
  // One row: every column is constant, so the draft excludes them all unless told otherwise.
  const addresses = await levelwise(['draft', 'addresses.csv', '-o', 'addresses.recipe.json', '--set', 'first=identifier', '--set', 'city=nominal'], dir);
  if (addresses.code !== 0) throw new Error(`the command line could not draft a recipe: ${addresses.stderr}`);
}, 120_000);

function withColumns(recipe: Record<string, unknown>, change: (column: Record<string, unknown>, index: number) => Record<string, unknown>) {
  return { ...recipe, columns: (recipe['columns'] as Record<string, unknown>[]).map(change) };
}

afterAll(() => {
  if (dir !== '') rmSync(dir, { recursive: true, force: true });
});

describe('bad files', () => {
  it('an empty file: exit 2, says it is empty and what to choose', async () => {
    const run = await levelwise(['profile', 'empty.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe('levelwise profile: cannot read "empty.csv": the file is empty (0 bytes). Choose a file with a header row and data rows.');
  });

  it('a PNG image named .csv: exit 2, says it is a picture', async () => {
    const run = await levelwise(['profile', 'picture.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise profile: cannot read "picture.csv": this is not a text table: it looks like a PNG image. Choose the CSV or text file that holds the table.',
    );
  });

  it('a ZIP archive named .csv: exit 2, says it is an archive (in core\'s words) and what to do', async () => {
    const run = await levelwise(['profile', 'archive.csv'], dir);
    expect(run.code).toBe(2);
    const line = expectOneLine(run.stderr);
    expect(line).toMatch(
      /^levelwise profile: cannot read "archive\.csv": this is not a text table: it looks like a ZIP archive \(an \.xlsx workbook is one\), and not a workbook that can be opened \(.+\)\. /,
    );
    expect(line).toMatch(/If it is an archive, unpack it and give the CSV inside; if it is a workbook, open it in its spreadsheet program and save it again as \.xlsx\.$/);
    expect(line).not.toContain('could not be read as an XLSX workbook');
  });

  it('UTF-16 without a byte order mark: exit 2, names the byte and suggests saving as UTF-8', async () => {
    const run = await levelwise(['profile', 'utf16-no-mark.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise profile: cannot read "utf16-no-mark.csv": this is not a text table: byte 2 is a NUL byte, which text files do not contain. ' +
        'It may be UTF-16 text without a byte order mark: save it again as UTF-8 CSV.',
    );
  });

  it('a file that is not there: exit 2, says where it looked', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'nowhere.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe(`levelwise apply: cannot read "nowhere.csv": there is no such file. Check the path (relative paths start at ${dir}).`);
  });

  it('a header without rows: reads as 0 rows and 3 columns, all left out, with a note', async () => {
    const run = await levelwise(['profile', 'header-only.csv'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain('header-only.csv: 0 rows, 3 columns');
    expect(run.stdout).toContain('excluded: the column has no rows');
    expect(expectOneLine(run.stderr)).toBe('levelwise profile: "header-only.csv" has a header but no data rows: there is nothing to profile, only the columns\' names.');
  });
});

describe('bad recipes', () => {
  it('not JSON: exit 2, with the line and column where it stops being JSON', async () => {
    const run = await levelwise(['apply', 'not-json.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toMatch(/^levelwise apply: the recipe "not-json\.json" cannot be used: The recipe is not valid JSON at line 3, column 3: /);
  });

  it('empty: exit 2, says it is empty', async () => {
    const run = await levelwise(['apply', 'empty.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toContain('The recipe file is empty.');
  });

  it('a newer format version: exit 2, says which version it reads', async () => {
    const run = await levelwise(['check', 'newer.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toContain('This recipe has format version 2 ("version"); this Levelwise reads version 1.');
  });

  it('an unknown field: exit 2, names it and says to remove it', async () => {
    const run = await levelwise(['sql', 'unknown-field.json', '--table', 'tickets'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toContain('The recipe: unknown field "comment"; remove it.');
  });

  it('a __proto__ key: refused as an unknown field', async () => {
    const run = await levelwise(['apply', 'proto.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toContain('unknown field "__proto__"; remove it.');
  });

  it('over 64 MB: exit 2, refused on its size', async () => {
    const run = await levelwise(['apply', 'huge.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toContain('The recipe file is 66 MB; a recipe is at most 64 MB.');
  });

  it('never writes a partial output when the recipe is refused', async () => {
    await levelwise(['apply', 'not-json.json', 'tickets.csv', '-o', 'never.csv'], dir);
    expect(existsSync(file('never.csv'))).toBe(false);
  });
});

describe('a header without data rows', () => {
  it('apply: writes only the header line, says so, exit 0', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'header-only.csv'], dir);
    expect(run.code).toBe(0);
    expect(run.stdout).toBe(ENCODED_HEADER);
    expect(expectOneLine(run.stderr)).toBe('levelwise apply: "header-only.csv" has a header but no data rows: the output holds only the header line.');
  });

  it('check: does not call it a fit (exit 1): there is nothing to check', async () => {
    const run = await levelwise(['check', 'tickets.recipe.json', 'header-only.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe(
      '"header-only.csv" does not fit the recipe "tickets.recipe.json" (0 rows read).\n"header-only.csv" has a header but no data rows: there is nothing to check.\n',
    );
  });

  it('draft: exit 2 and no recipe, for there is nothing to learn from', async () => {
    const run = await levelwise(['draft', 'header-only.csv', '-o', 'header-only.recipe.json'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise draft: cannot draft a recipe from "header-only.csv": it has a header but no data rows, so there is nothing to learn levels or numbers from. ' +
        'Nothing was written. Check that the export included the rows, or choose a file with data rows.',
    );
    expect(existsSync(file('header-only.recipe.json'))).toBe(false);
  });
});

describe('rows with too few or too many fields', () => {
  const found = 'levelwise VERB: "ragged.csv": 2 rows do not have the 3 fields of the header line. Check the delimiter and the quotes on those lines.';
  const short = 'levelwise VERB:   line 2: 2 of 3 fields: kept, with column 3 ("amount") empty (missing)';
  const long = 'levelwise VERB:   line 3: 5 fields instead of 3: the extra cells from column 4 ("extra", "more"); ';
  const as = (verb: string, text: string) => text.replace('VERB', verb);

  it('profile and draft name their lines and what was done, exit 0', async () => {
    const profile = await levelwise(['profile', 'ragged.csv'], dir);
    expect(profile.code).toBe(0);
    expect(lines(profile.stderr)).toEqual([
      as('profile', found),
      as('profile', short),
      `${as('profile', long)}they are not part of any column, so they are left out of the profile`,
    ]);
    expect(profile.stdout).toContain('ragged.csv: 3 rows, 3 columns');
    const draft = await levelwise(['draft', 'ragged.csv'], dir);
    expect(draft.code).toBe(0);
    expect(lines(draft.stderr)).toEqual([
      as('draft', found),
      as('draft', short),
      `${as('draft', long)}they are not part of any column, so the recipe does not learn from them`,
    ]);
  });

  it('apply keeps the short row, rejects the long one into the rejects file with every cell, exit 1', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'ragged.csv', '-o', 'ragged.out.csv', '--rejects', 'ragged.rejects.csv'], dir);
    expect(run.code).toBe(1);
    expect(lines(run.stderr)).toEqual([
      as('apply', found),
      as('apply', short),
      `${as('apply', long)}the row is rejected and left out of the output`,
      'levelwise apply: 1 row rejected and left out of the output; all are in ragged.rejects.csv, with every cell.',
    ]);
    // Line 2's amount is missing: filled with the recipe's mean. Line 3 is not in the output.
    expect(readFileSync(file('ragged.out.csv'), 'utf8')).toBe(`${ENCODED_HEADER}T-20,1,0,0,${MEAN_AMOUNT}\r\nT-22,1,0,0,12\r\n`);
    expect(readFileSync(file('ragged.rejects.csv'), 'utf8')).toBe(
      'levelwise_line,levelwise_column,levelwise_reason,ticket,colour,amount\r\n' +
        '3,,"5 fields instead of 3: the extra cells from column 4 (""extra"", ""more"") belong to no column",T-21,blue,20.5,extra,more\r\n',
    );
  });

  it('apply writes the same bytes whatever the batch size (LEVELWISE_BATCH_ROWS=1)', async () => {
    const whole = await levelwise(['apply', 'tickets.recipe.json', 'ragged.csv', '--rejects', 'whole.rejects.csv'], dir);
    const single = await levelwise(['apply', 'tickets.recipe.json', 'ragged.csv', '--rejects', 'single.rejects.csv'], dir, { LEVELWISE_BATCH_ROWS: '1' });
    expect(single.code).toBe(1);
    expect(single.stdout).toBe(whole.stdout);
    expect(readFileSync(file('single.rejects.csv'), 'utf8')).toBe(readFileSync(file('whole.rejects.csv'), 'utf8'));
  });

  it('apply without --rejects lists the rejected row on standard error', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'ragged.csv'], dir);
    expect(run.code).toBe(1);
    expect(lines(run.stderr).slice(-2)).toEqual([
      'levelwise apply: 1 row rejected and left out of the output.',
      'levelwise apply:   line 3: 5 fields instead of 3: the extra cells from column 4 ("extra", "more") belong to no column',
    ]);
  });

  it('check lists them, does not call the file a fit (exit 1), and counts the long row among those apply rejects', async () => {
    const run = await levelwise(['check', 'tickets.recipe.json', 'ragged.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe(
      [
        '"ragged.csv" does not fit the recipe "tickets.recipe.json" (3 rows read).',
        '"ragged.csv": 2 rows do not have the 3 fields of the header line. Check the delimiter and the quotes on those lines.',
        '  line 2: 2 of 3 fields: kept, with column 3 ("amount") empty (missing)',
        '  line 3: 5 fields instead of 3: the extra cells from column 4 ("extra", "more"); "levelwise apply" rejects the row',
        'Rows "levelwise apply" rejects: 1',
        '  line 3: 5 fields instead of 3: the extra cells from column 4 ("extra", "more") belong to no column',
        'Missing values (handled by the recipe):',
        `  amount: 1, filled with the fitted mean ${MEAN_AMOUNT}`,
        '',
      ].join('\n'),
    );
    const json = JSON.parse((await levelwise(['check', 'tickets.recipe.json', 'ragged.csv', '--format', 'json'], dir)).stdout);
    expect([json.fits, json.rows, json.rowsRejected, json.rowsWritten]).toEqual([false, 3, 1, 2]);
    expect(json.rejected).toEqual([{ row: 1, line: 3, column: '', reason: '5 fields instead of 3: the extra cells from column 4 ("extra", "more") belong to no column' }]);
    expect(json.findings).toEqual({
      headerIssues: [],
      tooFewFields: 1,
      tooManyFields: 1,
      unclosedQuote: null,
      rowIssues: [
        { line: 2, row: 0, kind: 'too-few-fields', expected: 3, found: 2 },
        { line: 3, row: 1, kind: 'too-many-fields', expected: 3, found: 5, extra: ['extra', 'more'] },
      ],
    });
  });

  it('many such rows: the first five with their lines, then how many more', async () => {
    const run = await levelwise(['profile', 'short-rows.csv'], dir);
    expect(lines(run.stderr)).toEqual([
      'levelwise profile: "short-rows.csv": 8 rows do not have the 3 fields of the header line. Check the delimiter and the quotes on those lines.',
      ...[2, 3, 4, 5, 6].map((line) => `levelwise profile:   line ${line}: 2 of 3 fields: kept, with column 3 ("amount") empty (missing)`),
      'levelwise profile:   … and 3 more (3 with too few fields)',
    ]);
  });

  it('csv-spectrum comma_in_quotes.csv with its quotes taken away: apply rejects the split row and keeps all six cells', async () => {
    // The quoted original reads cleanly: no note, and it fits the recipe drafted from it.
    const clean = await levelwise(['check', 'addresses.recipe.json', 'addresses.csv'], dir);
    expect(clean.code).toBe(0);
    expect(clean.stderr).toBe('');
    const run = await levelwise(['apply', 'addresses.recipe.json', 'addresses-unquoted.csv', '--rejects', 'addresses.rejects.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain('levelwise apply:   line 2: 6 fields instead of 5: the extra cell from column 6 ("08123"); the row is rejected and left out of the output');
    expect(run.stdout.split('\r\n').filter((l) => l !== '')).toHaveLength(1);
    const rows = Papa.parse<string[]>(readFileSync(file('addresses.rejects.csv'), 'utf8'), { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['levelwise_line', 'levelwise_column', 'levelwise_reason', 'first', 'last', 'address', 'city', 'zip']);
    expect(rows[1]?.slice(3)).toEqual(['John', 'Doe', '120 any st.', 'Anytown', ' WW', '08123']);
  });
});

describe('a quote never closed', () => {
  const told =
    '"unclosed.csv" line 3: a quote opened in column 2 ("colour") is never closed: everything from there to the end of the file was read as that one cell, ' +
    'so the lines after it are not rows.';
  const fix = 'Look at the quotes on line 3: a quote inside a quoted cell is written twice ("").';

  it('profile names the line and column it opened on', async () => {
    const run = await levelwise(['profile', 'unclosed.csv'], dir);
    expect(run.code).toBe(0);
    expect(expectOneLine(run.stderr)).toBe(`levelwise profile: ${told} ${fix}`);
  });

  it('check does not call the file a fit', async () => {
    const run = await levelwise(['check', 'tickets.recipe.json', 'unclosed.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toContain(`\n${told} "levelwise apply" rejects that row. ${fix}\n`);
    expect(run.stdout).toContain('Rows "levelwise apply" rejects: 1\n  line 3, colour: a quote opened in column 2 ("colour") is never closed: that cell holds the rest of the file\n');
    // The cell that holds the rest of the file is shown on one line, escaped.
    expect(run.stdout).toContain('"blue,20\\nT-32,red,12\\n" ×1 (line 3)');
  });

  it('apply rejects that row and keeps the whole text in the rejects file', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'unclosed.csv', '--rejects', 'unclosed.rejects.csv'], dir);
    expect(run.code).toBe(1);
    expect(lines(run.stderr)[0]).toBe(`levelwise apply: ${told} That row is rejected and left out of the output. ${fix}`);
    expect(run.stdout).toBe(`${ENCODED_HEADER}T-30,1,0,0,10\r\n`);
    const rows = Papa.parse<string[]>(readFileSync(file('unclosed.rejects.csv'), 'utf8'), { skipEmptyLines: true }).data;
    expect(rows[1]).toEqual(['3', 'colour', 'a quote opened in column 2 ("colour") is never closed: that cell holds the rest of the file', 'T-31', 'blue,20\nT-32,red,12\n', '']);
  });
});

describe('a recipe made for another file', () => {
  it('shares no column with the file: apply stops before writing (exit 1), naming the recipe\'s file and the columns on both sides', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'sensors.csv', '-o', 'sensors.encoded.csv'], dir);
    expect(run.code).toBe(1);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise apply: "sensors.csv" is not the kind of file the recipe "tickets.recipe.json" was made for: the recipe was made from "tickets.csv" ' +
        'and encodes the columns ticket, colour, amount; none of them is in "sensors.csv": its columns are sensor, reading. Nothing was written. ' +
        'Choose the recipe made for this kind of file, or make one with "levelwise draft sensors.csv".',
    );
    expect(existsSync(file('sensors.encoded.csv'))).toBe(false);
  });

  it('lacks most of its columns (2 of 3): stopped the same way', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'tickets-only-ids.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe('');
    expect(expectOneLine(run.stderr)).toContain('"tickets-only-ids.csv" lacks 2 of the 3 (colour, amount): its columns are ticket, note.');
  });

  it('lacks one column of three: encoded, the column counted as missing, exit 1', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'tickets-no-amount.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe(`${ENCODED_HEADER}T-60,1,0,0,${MEAN_AMOUNT}\r\n`);
    expect(run.stderr).toContain('levelwise apply: the file lacks 1 recipe column (amount); their cells were treated as missing.');
  });

  it('check says so first, and asks whether it is the right recipe', async () => {
    const run = await levelwise(['check', 'tickets.recipe.json', 'sensors.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout.split('\n')[1]).toBe(
      '"sensors.csv" is not the kind of file the recipe "tickets.recipe.json" was made for: the recipe was made from "tickets.csv" and encodes the columns ' +
        'ticket, colour, amount; none of them is in "sensors.csv": its columns are sensor, reading. Is it the right recipe for this file?',
    );
  });
});

describe('a recipe with several problems, and what to do said once', () => {
  it('every problem on a line of its own, then what to do', async () => {
    const run = await levelwise(['apply', 'two-problems.json', 'tickets.csv'], dir);
    expect(run.code).toBe(2);
    expect(lines(run.stderr)).toEqual([
      'levelwise apply: the recipe "two-problems.json" cannot be used: 2 problems.',
      'levelwise apply:   columns[1] ("colour").coding: expected one of "one-hot", "dummy", "effect", "frequency", found "onehot".',
      'levelwise apply:   columns[2] ("amount").level: expected one of "continuous", "nominal", "ordinal", "binary", "identifier", "excluded", found "measured".',
      'levelwise apply: Fix the recipe, or make a new one with "levelwise draft".',
    ]);
  });

  it('over twenty: the first twenty, then how many more, in the right number', async () => {
    for (const [n, more] of [[25, '… and 5 more problems.'], [21, '… and 1 more problem.']] as const) {
      const run = await levelwise(['check', `${n}-problems.json`, 'tickets.csv'], dir);
      expect(run.code).toBe(2);
      const said = lines(run.stderr);
      expect(said[0]).toBe(`levelwise check: the recipe "${n}-problems.json" cannot be used: ${n} problems.`);
      expect(said.slice(1, 21).every((l, i) => l.startsWith(`levelwise check:   columns[${i}] ("c${i + 1}").level: expected one of`))).toBe(true);
      expect(said.slice(21)).toEqual([`levelwise check:   ${more}`, 'levelwise check: Fix the recipe, or make a new one with "levelwise draft".']);
    }
  });

  it('one problem: one line, with the hint once', async () => {
    const run = await levelwise(['apply', 'one-problem.json', 'tickets.csv'], dir);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise apply: the recipe "one-problem.json" cannot be used: columns[1] ("colour").coding: expected one of "one-hot", "dummy", "effect", "frequency", found "onehot". ' +
        'Fix the recipe, or make a new one with "levelwise draft".',
    );
  });

  it('a problem that says what to do itself gets no second hint', async () => {
    for (const recipe of ['not-json.json', 'empty.json', 'newer.json', 'unknown-field.json']) {
      const line = expectOneLine((await levelwise(['apply', recipe, 'tickets.csv'], dir)).stderr);
      expect(line).not.toContain('Fix the recipe');
      expect(line.match(/make the recipe again|remove it/g)).toHaveLength(1);
    }
  });
});

describe('values that are not numbers, with their lines in every verb', () => {
  it('profile', async () => {
    const run = await levelwise(['profile', 'stray.csv'], dir);
    expect(run.stdout).toContain('; 3 not numbers: "unknown" (lines 3, 6), "x" (line 5)\n');
  });

  it('apply', async () => {
    const run = await levelwise(['apply', 'tickets.recipe.json', 'stray.csv'], dir);
    expect(run.code).toBe(0);
    expect(run.stderr).toContain(`levelwise apply: amount: 3 cells not a number, treated as missing (filled with the fitted mean ${MEAN_AMOUNT}): "unknown" ×2 (lines 3, 6), "x" ×1 (line 5).\n`);
  });

  it('check', async () => {
    const run = await levelwise(['check', 'tickets.recipe.json', 'stray.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stdout).toContain(`  amount (treated as missing (filled with the fitted mean ${MEAN_AMOUNT})): "unknown" ×2 (lines 3, 6), "x" ×1 (line 5)\n`);
  });
});

describe('a recipe whose every column is excluded', () => {
  it('apply refuses it (exit 2) instead of writing empty lines', async () => {
    const run = await levelwise(['apply', 'excluded.json', 'tickets.csv', '-o', 'excluded.out.csv'], dir);
    expect(run.code).toBe(2);
    expect(expectOneLine(run.stderr)).toBe(
      'levelwise apply: the recipe "excluded.json" makes no output columns: all 3 columns in it are excluded, so the output would hold only empty lines. ' +
        'Nothing was written. Give at least one column a level (levelwise draft FILE --set COLUMN=LEVEL), or choose another recipe.',
    );
    expect(existsSync(file('excluded.out.csv'))).toBe(false);
  });
});
