/**
 * Files that are not what the page expects: empty, a header alone, a picture or an archive named
 * .csv, very wide, a column of a hundred thousand different values. Each either reads with every
 * change reported, or is refused with a message saying what is wrong and what to do. File
 * signatures ("magic numbers") are from the formats' own specifications: PNG (ISO/IEC 15948 §5.2),
 * ZIP (PKWARE APPNOTE.TXT §4.3.7), JPEG (ITU-T T.81, SOI marker), PDF (ISO 32000-1 §7.5.2), gzip
 * (RFC 1952 §2.3.1).
 */
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { LevelwiseError, isLevelwiseError } from '../../src/core/errors.ts';
import { OTHER_LEVEL } from '../../src/core/fit.ts';
import { MAX_CATEGORICAL_LEVELS, WIDE_DRAFT_KEEP_TOP } from '../../src/core/level-limit.ts';
import { readTable } from '../../src/core/read-table.ts';
import { forecastWidth } from '../../src/core/width.ts';
import { readingNotices } from '../../src/ui/files/reading-notices.ts';
import { concat, pipeline, thrownBy, utf8 } from './helpers.ts';

function readError(bytes: Uint8Array): LevelwiseError {
  const error = thrownBy(() => readTable(bytes));
  expect(isLevelwiseError(error)).toBe(true);
  return error as LevelwiseError;
}

describe('empty and header-only files', () => {
  it('an empty file is refused: it says it is empty and what to choose instead', () => {
    const error = readError(new Uint8Array(0));
    expect(error.code).toBe('empty-file');
    expect(error.message).toBe('The file is empty (0 bytes).');
    expect(error.hint).toBe('Choose a file with a header row and data rows.');
  });

  it('a file of empty lines has no header: refused the same way', () => {
    const error = readError(utf8('\n\r\n\n'));
    expect(error.code).toBe('empty-file');
    expect(error.message).toContain('no header row');
  });

  it('a header without rows reads as a table of 0 rows whose columns are all left out, and the page says why', () => {
    const run = pipeline(utf8('household,heating,kwh\n'), 'header-only.csv');
    expect(run.read.table.names).toEqual(['household', 'heating', 'kwh']);
    expect(run.read.table.rowCount).toBe(0);
    expect(run.recipe.columns.map((c) => [c.level, c.reason])).toEqual([
      ['excluded', 'the column has no rows'],
      ['excluded', 'the column has no rows'],
      ['excluded', 'the column has no rows'],
    ]);
    // No output columns, no rows: an empty header line (RFC 4180 CRLF) and nothing else.
    expect(run.csv).toBe('\r\n');
    expect(run.report.rows).toBe(0);
    const notices = readingNotices({ fileName: 'header-only.csv', rowCount: 0, names: run.read.table.names, rowIssues: [], rowIssueCount: 0, headerIssues: [] });
    expect(notices).toEqual([
      {
        tone: 'warning',
        title: '“header-only.csv” has a header row but no data rows',
        detail: 'Its 3 columns are listed, but there is nothing to look at or encode.',
        hint: 'Check that the export included the rows, or open another file.',
      },
    ]);
  });
});

describe('binary files named .csv', () => {
  const signatures: [string, number[], string][] = [
    ['PNG image', [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], 'This is not a text table: it looks like a PNG image.'],
    ['ZIP archive', [0x50, 0x4b, 0x03, 0x04, 0x14, 0x00], 'This is not a text table: it looks like a ZIP archive (an .xlsx workbook is one).'],
    ['JPEG image', [0xff, 0xd8, 0xff, 0xe0], 'This is not a text table: it looks like a JPEG image.'],
    ['PDF document', [...utf8('%PDF-1.7\n')], 'This is not a text table: it looks like a PDF document.'],
    ['gzip file', [0x1f, 0x8b, 0x08, 0x00], 'This is not a text table: it looks like a gzip-compressed file.'],
  ];
  for (const [what, head, message] of signatures) {
    it(`a ${what} is refused by its signature, with what to do`, () => {
      // The signature followed by bytes that would otherwise pass as text: the signature alone decides.
      const error = readError(concat(new Uint8Array(head), utf8('a,b\n1,2\n')));
      expect(error.code).toBe('not-text');
      expect(error.message).toBe(message);
      expect(error.hint.length).toBeGreaterThan(20);
    });
  }

  it('other binary data is refused at its first NUL byte, which names the byte', () => {
    const error = readError(concat(utf8('a,b\n1,2\n'), new Uint8Array([0x00, 0x01, 0x02])));
    expect(error.code).toBe('not-text');
    expect(error.message).toBe('This is not a text table: byte 9 is a NUL byte, which text files do not contain.');
  });
});

describe('a table 10,000 columns wide', () => {
  const columns = 10_000;
  const header = Array.from({ length: columns }, (_, i) => `q${i + 1}`).join(',');
  // Row r, column c holds (r + c) mod 3: three answers per column, every column the same shape.
  const rows = Array.from({ length: 12 }, (_, r) => Array.from({ length: columns }, (_, c) => (r + c) % 3).join(','));
  const run = pipeline(utf8(`${header}\n${rows.join('\n')}\n`), 'wide.csv');

  it('keeps every column and row', () => {
    expect(run.read.table.names).toHaveLength(columns);
    expect(run.read.table.names[9_999]).toBe('q10000');
    expect(run.read.table.rowCount).toBe(12);
    expect(run.read.table.rowIssues).toEqual([]);
  });

  it('drafts and encodes every column: 3 whole numbers read as an ordered scale, one rank column each', () => {
    expect(run.recipe.columns).toHaveLength(columns);
    expect(new Set(run.recipe.columns.map((c) => c.level))).toEqual(new Set(['ordinal']));
    const lines = run.csv.split('\r\n');
    expect(lines).toHaveLength(12 + 2); // header, 12 rows, and the empty string after the last CRLF
    expect(lines[0]?.split(',')).toHaveLength(columns);
    // Row 0, column c holds c mod 3, ranked from 1: 0 → 1, 1 → 2, 2 → 3.
    expect(lines[1]?.split(',').slice(0, 4)).toEqual(['1', '2', '3', '1']);
    expect(run.report.rowsWritten).toBe(12);
  });
});

describe('a column of 100,000 distinct values', () => {
  const distinct = 100_000;
  // Invented site codes, each on two rows: 200,000 rows. Too many for categories, not an identifier
  // (every value repeats), so it is nominal: one-hot would make 100,000 output columns.
  const lines = ['row,site,score'];
  for (let r = 0; r < 2 * distinct; r++) lines.push(`${r + 1},S${(r % distinct).toString(36).padStart(4, '0')},${r % 5}`);
  const run = pipeline(utf8(`${lines.join('\n')}\n`), 'sites.csv');
  const site = run.recipe.columns[1];
  if (site?.level !== 'nominal') throw new Error('site should be drafted nominal');

  it('is drafted nominal with its 100 most frequent levels kept and the rest grouped, and the reason says so', () => {
    expect(run.profiles[1]?.distinct).toBe(distinct);
    expect(site.rare).toEqual({ minCount: null, minShare: null, keepTop: WIDE_DRAFT_KEEP_TOP });
    expect(site.levels).toHaveLength(WIDE_DRAFT_KEEP_TOP + 1);
    expect(site.levels.at(-1)).toEqual({ value: OTHER_LEVEL, count: 2 * (distinct - WIDE_DRAFT_KEEP_TOP) });
    // The recipe stays complete: every value is either a level or listed as grouped.
    expect(site.grouped).toHaveLength(distinct - WIDE_DRAFT_KEEP_TOP);
    expect(site.reason).toBe(
      '100,000 distinct values with no order recognised; 100,000 levels are more than one column can encode (1,000), ' +
        'so only the 100 most frequent keep their own column and the rest are grouped',
    );
  });

  it('shows as a wide column in the width forecast (more than the meter’s 30), so the meter offers its remedies', () => {
    const width = forecastWidth(run.recipe).perColumn.find((c) => c.name === 'site');
    expect(width?.after).toBe(101);
  });

  it('encodes a grouped value in the other level’s column', () => {
    const header = run.csv.slice(0, run.csv.indexOf('\r\n')).split(',');
    const other = header.indexOf(`site=${OTHER_LEVEL}`);
    expect(other).toBeGreaterThan(0);
    // Row 1 holds S0000, the first seen and one of the 100 kept (all counts are 2; ties keep first-seen order).
    // Row 201 holds S005k (200 in base 36), beyond the first 100: grouped.
    const rows = run.csv.split('\r\n');
    expect(rows[1]?.split(',')[other]).toBe('0');
    expect(rows[201]?.split(',')[other]).toBe('1');
  });

  it('refuses a decision that would encode all 100,000 levels, saying what to do instead', () => {
    const all = { minCount: null, minShare: null, keepTop: null };
    const error = thrownBy(() => decide(run.recipe, { type: 'set-rare', column: 'site', rare: all }, run.profiles));
    expect(isLevelwiseError(error, 'too-many-levels')).toBe(true);
    expect((error as LevelwiseError).message).toBe(`“site” would have 100,000 levels; a column can be encoded with at most ${MAX_CATEGORICAL_LEVELS.toLocaleString('en-US')}.`);
    expect((error as LevelwiseError).hint).toContain('keep only the most frequent');
    for (const level of ['ordinal', 'binary'] as const) {
      expect(isLevelwiseError(thrownBy(() => decide(run.recipe, { type: 'set-level', column: 'site', level }, run.profiles)), 'too-many-levels')).toBe(true);
    }
  });

  it('accepts the width meter’s remedies: keep the 20 most frequent, frequency coding, or leave it out', () => {
    const top20 = decide(run.recipe, { type: 'set-rare', column: 'site', rare: { minCount: null, minShare: null, keepTop: 20 } }, run.profiles);
    expect(top20.columns[1]?.outputs).toHaveLength(21);
    const frequency = decide(run.recipe, { type: 'set-nominal-coding', column: 'site', coding: 'frequency' }, run.profiles);
    expect(frequency.columns[1]?.outputs).toEqual(['site']);
    const out = decide(run.recipe, { type: 'set-level', column: 'site', level: 'excluded' }, run.profiles);
    expect(out.columns[1]?.outputs).toEqual([]);
  });
});

describe('a wide column with missing values', () => {
  // Invented town names: 1,500 of them, each on two rows, and every 100th row empty or "NA".
  const lines = ['row,town'];
  for (let r = 0; r < 3000; r++) lines.push(`${r + 1},${r % 100 === 0 ? (r % 200 === 0 ? '' : 'NA') : `Town ${r % 1500}`}`);
  const run = pipeline(utf8(`${lines.join('\n')}\n`), 'towns.csv');
  const town = run.recipe.columns[1];

  it('counts missing values as one of the levels over the limit, and says so beside the distinct values', () => {
    // Rows 0, 100, …, 2900 are missing: 30 cells. Town t sits on rows t and t + 1,500, both missing for
    // t = 0, 100, …, 1400: those 15 towns never show, so 1,485 towns (each twice) and the missing level.
    expect(run.profiles[1]?.missing).toBe(30);
    expect(run.profiles[1]?.distinct).toBe(1485);
    expect(town?.reason).toBe(
      '1,485 distinct values with no order recognised; 1,486 levels (missing values one of them) are more than one column can encode (1,000), ' +
        'so only the 100 most frequent keep their own column and the rest are grouped',
    );
  });
});

describe('a column whose 100,000 values are all different', () => {
  const lines = ['code,score'];
  for (let r = 0; r < 100_000; r++) lines.push(`K${r.toString(36)},${r % 5}`);
  const run = pipeline(utf8(`${lines.join('\n')}\n`), 'codes.csv');

  it('is an identifier, copied as is', () => {
    expect(run.recipe.columns[0]?.level).toBe('identifier');
    expect(run.recipe.columns[0]?.reason).toBe('100,000 of 100,000 values distinct: looks like an identifier');
  });

  it('made nominal by hand, it keeps its 100 most frequent levels and says why', () => {
    const nominal = decide(run.recipe, { type: 'set-level', column: 'code', level: 'nominal' }, run.profiles);
    const code = nominal.columns[0];
    expect(code?.outputs).toHaveLength(101);
    expect(code?.reason).toBe(
      'set by hand; 100,000 levels are more than one column can encode (1,000), so only the 100 most frequent keep their own column and the rest are grouped',
    );
  });
});
