/**
 * `levelwise apply` and `check` read a file in segments on several threads, and `profile` and
 * `draft` read a whole table in one segment per thread (src/cli/read-thread.ts).
 * Here the segments are made tiny (LEVELWISE_SEGMENT_BYTES) and the threads many, on a file whose
 * quoted fields hold line breaks, so that many cuts fall inside a quoted field and those segments
 * must be read again; the bytes written, the rejects file and every message must be those of one
 * thread reading the file from start to end (the command line run from its TypeScript sources).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { stringifyRecipe } from '../../src/core/recipe-io.ts';

const BIN = join(import.meta.dirname, '../../bin/levelwise.js');
const work = mkdtempSync(join(tmpdir(), 'levelwise-threads-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function levelwise(args: readonly string[], threaded: boolean): { status: number | null; stdout: Buffer; stderr: string } {
  const env: NodeJS.ProcessEnv = { ...process.env, LEVELWISE_DEBUG: '' };
  if (threaded) Object.assign(env, { LEVELWISE_SEGMENT_BYTES: '3000', LEVELWISE_READING_THREADS: '3', LEVELWISE_PARALLEL_FROM_BYTES: '10000' });
  else env['LEVELWISE_NO_BUNDLE'] = '1';
  const run = spawnSync(process.execPath, [BIN, ...args], { env, cwd: work, maxBuffer: 1 << 28 });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr.toString('utf8') };
}

/**
 * An invented sheet of 4,000 rows (~136 kB, past the 64 kB the first thread reads alone): CRLF
 * line breaks; every 7th note quoted, with line breaks and doubled quotes inside; every 500th row
 * with a field too many; an empty line every 300 rows.
 */
function sheet(rows: number): string {
  let seed = 7;
  const next = (n: number): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed % n;
  };
  const colours = ['red', 'blue', 'green', ' Red', 'n/a', '', 'teal'];
  const lines = ['id,colour,note,amount,size'];
  for (let i = 1; i <= rows; i++) {
    const note = i % 7 === 0 ? `"line one\r\nline ""two""\nline three, with a comma"` : `note ${next(40)}`;
    const amount = i % 11 === 0 ? 'n/a' : i % 5 === 0 ? `${next(900)}.50` : String(next(100000) / 100);
    const extra = i % 500 === 0 ? ',surplus' : '';
    lines.push(`R-${i},${colours[next(colours.length)]},${note},${amount},${['S', 'M', 'L'][next(3)]}${extra}`);
    if (i % 300 === 0) lines.push('');
  }
  return lines.join('\r\n') + '\r\n';
}

describe('reading in segments on several threads', () => {
  const csv = sheet(4000);
  const input = join(work, 'sheet (invented).csv');
  writeFileSync(input, csv);
  // The recipe is drafted from the first rows only, so later rows bring unseen levels too.
  const fitted = readTable(new TextEncoder().encode(csv.split('\r\n').slice(0, 400).join('\r\n'))).table;
  const recipePath = join(work, 'sheet.recipe.json');
  writeFileSync(recipePath, stringifyRecipe(draftRecipe(profileTable(fitted), { file: 'sheet.csv', rows: fitted.rowCount })));

  it('apply writes the same bytes, rejects and messages as one thread', () => {
    const runs = [true, false].map((threaded) => {
      const rejects = join(work, 'rejects.csv'); // one name: the messages name it
      const run = levelwise(['apply', recipePath, input, '--rejects', rejects], threaded);
      return { ...run, rejects: readFileSync(rejects, 'utf8') };
    });
    const [threaded, single] = runs as [(typeof runs)[0], (typeof runs)[0]];
    expect(single.status).toBe(1); // rows with a field too many
    expect(threaded.status).toBe(single.status);
    expect(threaded.stdout.length).toBeGreaterThan(100_000);
    expect(Buffer.compare(threaded.stdout, single.stdout)).toBe(0);
    expect(threaded.stderr).toBe(single.stderr);
    expect(threaded.rejects).toBe(single.rejects);
    // Row 3000 has a field too many; the lines before it include the quoted line breaks (2 in
    // every 7th row) and the empty lines (one per 300 rows): 1 + 3000 + 2 × 428 + 9 = 3866.
    expect(threaded.rejects).toContain('\n3866,');
  });

  it('apply reads again, as one thread would, the segments whose cut falls between the two quotes of a doubled quote', () => {
    // Invented: every third note is a run of doubled quotes around a line break, so many cuts land
    // between the two quotes of a pair. Seen from such a cut the quotes pair up the wrong way and
    // the segment starts at a line break inside the field; it does not line up with the segment
    // before it and is read again from the true boundary, on the thread that takes it.
    const quotes = '""'.repeat(150);
    const lines = ['id,note,size'];
    for (let i = 1; i <= 600; i++) lines.push(`Q-${i},${i % 3 === 0 ? `"${quotes}\n${quotes}"` : `plain ${i % 40}`},${['S', 'M', 'L'][i % 3]}`);
    const file = join(work, 'quotes (invented).csv');
    writeFileSync(file, lines.join('\n') + '\n');
    const fitted = readTable(new TextEncoder().encode(lines.slice(0, 100).join('\n'))).table;
    const recipe = join(work, 'quotes.recipe.json');
    writeFileSync(recipe, stringifyRecipe(draftRecipe(profileTable(fitted), { file: 'quotes.csv', rows: fitted.rowCount })));
    const [threaded, single] = [true, false].map((onThreads) => levelwise(['apply', recipe, file], onThreads));
    expect(single!.status).toBe(0);
    expect(threaded!.status).toBe(0);
    // The header and 600 rows (the identifier, then the note's and size's columns).
    expect(single!.stdout.toString().split('\r\n')).toHaveLength(602);
    expect(Buffer.compare(threaded!.stdout, single!.stdout)).toBe(0);
    expect(threaded!.stderr).toBe(single!.stderr);
  });

  it('profile and draft, reading the whole file in one segment per thread, print what one thread prints', () => {
    for (const verb of ['profile', 'draft']) {
      const threaded = levelwise([verb, input], true);
      const single = levelwise([verb, input], false);
      expect(single.status).toBe(0);
      expect(threaded.status).toBe(0);
      expect(threaded.stdout.toString()).toBe(single.stdout.toString());
      expect(threaded.stderr).toBe(single.stderr);
    }
  });

  it('profile and draft profile the columns kept as numbers on the reading threads, with what one thread finds', () => {
    // Invented: 30,000 meter readings, most distinct (past the 4,096-value dictionary: number
    // storage, in every thread's part too, which then profiles the column from the parts while
    // the table is joined), some missing ("NA"), some with two fixed decimals, a few not numbers at all.
    const lines = ['meter,reading,site'];
    for (let i = 1; i <= 30_000; i++) {
      const reading = i % 97 === 0 ? 'NA' : i % 1000 === 0 ? `faulty ${i}` : i % 13 === 0 ? `${i}.50` : String(i * 3 + (i % 7) / 4);
      lines.push(`M-${i},${reading},${['north', 'south'][i % 2]}`);
    }
    const meters = join(work, 'meters (invented).csv');
    writeFileSync(meters, lines.join('\n') + '\n');
    const threaded = levelwise(['profile', meters, '--format', 'json'], true);
    const single = levelwise(['profile', meters, '--format', 'json'], false);
    expect(threaded.status).toBe(0);
    expect(threaded.stdout.toString()).toBe(single.stdout.toString());
    const reading = (JSON.parse(threaded.stdout.toString()) as { columns: { name: string; levels: unknown; numeric: { count: number; invalidCount: number; invalidExamples: { line: number }[] } }[] }).columns[1]!;
    expect(reading.levels).toBeNull(); // number storage
    // 30,000 rows: 309 "NA" (every 97th), 30 "faulty" (every 1000th, none a multiple of 97); the
    // first of those on row 1000, line 1001.
    expect([reading.numeric.count, reading.numeric.invalidCount]).toEqual([29_661, 30]);
    expect(reading.numeric.invalidExamples[0]!.line).toBe(1001);
    const drafts = [true, false].map((onThreads) => levelwise(['draft', meters], onThreads));
    expect(drafts[0]!.stdout.toString()).toBe(drafts[1]!.stdout.toString());
    expect(drafts[0]!.stderr).toBe(drafts[1]!.stderr);
  });

  it('check reports the same, as text and as JSON (every tally, with its example lines)', () => {
    for (const format of ['text', 'json']) {
      const threaded = levelwise(['check', recipePath, input, '--format', format], true);
      const single = levelwise(['check', recipePath, input, '--format', format], false);
      expect(threaded.status).toBe(single.status);
      expect(threaded.stdout.toString()).toBe(single.stdout.toString());
      expect(threaded.stderr).toBe(single.stderr);
    }
    const report = JSON.parse(levelwise(['check', recipePath, input, '--format', 'json'], true).stdout.toString()) as { rowsRejected: number; rejected: unknown[] };
    expect(report.rowsRejected).toBe(8);
    expect(report.rejected).toHaveLength(8);
  });

  it('a byte that is not UTF-8 late in the file starts the reading over as Windows-1252, as on one thread', () => {
    const bytes = new TextEncoder().encode(csv.replace('R-3900,', 'R-3900\u00e9,'));
    const at = bytes.indexOf(0xc3, bytes.length - 40_000);
    const latin = new Uint8Array(bytes.length - 1);
    latin.set(bytes.subarray(0, at));
    latin[at] = 0xe9; // "é" in Windows-1252
    latin.set(bytes.subarray(at + 2), at + 1);
    const file = join(work, 'latin (invented).csv');
    writeFileSync(file, latin);
    const outputs = [true, false].map((threaded) => {
      const out = join(work, `latin-${threaded}.csv`);
      const run = levelwise(['apply', recipePath, file, '-o', out], threaded);
      return { status: run.status, stderr: run.stderr, bytes: readFileSync(out) };
    });
    expect(outputs[0]!.status).toBe(outputs[1]!.status);
    expect(outputs[0]!.stderr).toBe(outputs[1]!.stderr);
    expect(Buffer.compare(outputs[0]!.bytes, outputs[1]!.bytes)).toBe(0);
    expect(outputs[0]!.bytes.toString('utf8')).toContain('R-3900é');
  });

  it('read as UTF-8 on request, that byte is an error naming its line and showing it, as on one thread', () => {
    const bytes = new TextEncoder().encode(csv.replace('R-3900,', 'R-3900\u00e9,'));
    const at = bytes.indexOf(0xc3, bytes.length - 40_000);
    const latin = new Uint8Array(bytes.length - 1);
    latin.set(bytes.subarray(0, at));
    latin[at] = 0xe9;
    latin.set(bytes.subarray(at + 2), at + 1);
    const file = join(work, 'latin-forced (invented).csv');
    writeFileSync(file, latin);
    // Physical lines before row 3,900: the header, 3,899 rows, their quoted line breaks, the empty lines.
    const line = csv.slice(0, csv.indexOf('R-3900,')).split(/\r\n|\n/).length;
    for (const verb of [['profile'], ['apply', recipePath]]) {
      const runs = [true, false].map((threaded) => levelwise([...verb, file, '--encoding', 'utf-8', '-o', join(work, 'forced.out')], threaded));
      for (const run of runs) {
        expect(run.status).toBe(2);
        expect(run.stderr).toContain(`byte \\xE9 (offset ${at.toLocaleString('en-US')}) is not part of any UTF-8 character, in "R-3900\\xE9,`);
        expect(run.stderr).toContain(`(line ${line.toLocaleString('en-US')})`);
        expect(run.stderr).toContain('run again with --encoding windows-1252');
      }
      expect(runs[0]!.stderr).toBe(runs[1]!.stderr);
    }
  });
});
