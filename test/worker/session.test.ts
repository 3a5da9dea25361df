/**
 * The worker's session, driven through the same client the page uses (over the in-page port, so it
 * runs in Node). Expected numbers are computed by hand from the small table below.
 */
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../src/core/recipe.ts';
import { WorkbenchClient } from '../../src/worker/client.ts';
import { createInPagePort } from '../../src/worker/in-page-port.ts';
import { Cancelled, WorkerProblem, type FromWorker, type OpenedTable } from '../../src/worker/protocol.ts';
import { createSession, PROGRESS_EVERY_MS, throttledProgress } from '../../src/worker/session.ts';
import { buildXlsx } from '../e2e/helpers/xlsx.ts';

const SMALL_CSV = 'id,colour,size,score\na1,red,S,1\na2,blue,M,2\na3,red,L,\na4,green,M,4\n';

function newClient(): WorkbenchClient {
  return new WorkbenchClient(createInPagePort());
}

function openSmall(client: WorkbenchClient, text = SMALL_CSV, name = 'small.csv'): Promise<OpenedTable> {
  return client.call('open', { slot: 'work', source: { kind: 'file', file: new File([text], name) }, draft: true });
}

/** Opens `file` with a draft, keeping the bytes-read figures of the reading progress. */
async function openWatchingProgress(client: WorkbenchClient, file: File): Promise<{ opened: OpenedTable; progress: number[] }> {
  const progress: number[] = [];
  const opened = await client.call('open', { slot: 'work', source: { kind: 'file', file }, draft: true }, { onProgress: (p) => p.phase === 'reading' && progress.push(p.done) });
  return { opened, progress };
}

/** The decisions a person would make on the small table. */
const DECISIONS: Decision[] = [
  { type: 'set-level', column: 'id', level: 'identifier' },
  { type: 'set-nominal-coding', column: 'colour', coding: 'dummy' },
  { type: 'set-reference', column: 'colour', reference: 'blue' },
  { type: 'set-level', column: 'score', level: 'continuous' },
];

function decided(opened: OpenedTable): Recipe {
  return DECISIONS.reduce((recipe, d) => decide(recipe, d, opened.profiles), opened.draft!);
}

describe('opening a file', () => {
  it('reads the table, profiles it and drafts a recipe', async () => {
    const client = newClient();
    const { opened, progress } = await openWatchingProgress(client, new File([SMALL_CSV], 'small.csv'));
    expect(opened.rowCount).toBe(4);
    expect(opened.names).toEqual(['id', 'colour', 'size', 'score']);
    expect(opened.format).toEqual({ kind: 'text', delimiter: ',', encoding: 'utf-8', scanner: 'webassembly' });
    expect(opened.byteSize).toBe(SMALL_CSV.length);
    expect(progress.at(-1)).toBe(SMALL_CSV.length);
    expect(opened.profiles.map((p) => p.missing)).toEqual([0, 0, 0, 1]);
    expect(opened.draft?.columns.map((c) => c.name)).toEqual(opened.names);
    expect(opened.fingerprint).toMatch(/^67-[0-9a-z]+-small\.csv$/);
  });

  it('reads semicolon- and pipe-separated text the same way', async () => {
    const client = newClient();
    const semicolon = await openSmall(client, SMALL_CSV.replaceAll(',', ';'), 'small.txt');
    const pipe = await openSmall(client, SMALL_CSV.replaceAll(',', '|'), 'small.txt');
    expect(semicolon.format).toMatchObject({ delimiter: ';' });
    expect(pipe.format).toMatchObject({ delimiter: '|' });
    expect(semicolon.names).toEqual(['id', 'colour', 'size', 'score']);
    expect(pipe.rowCount).toBe(4);
  });

  it('reads the first sheet of a workbook, or the sheet asked for', async () => {
    const client = newClient();
    const bytes = buildXlsx([
      { name: 'Survey', rows: [['site', 'depth'], ['north', 1.5], ['south', null], ['north', 3]] },
      { name: 'Notes', rows: [['note'], ['invented']] },
    ]);
    const file = new File([bytes], 'sites.xlsx');
    const first = await client.call('open', { slot: 'work', source: { kind: 'file', file }, draft: true });
    expect(first.format).toEqual({ kind: 'sheet', sheet: 'Survey', sheets: ['Survey', 'Notes'] });
    expect(first.names).toEqual(['site', 'depth']);
    expect(first.rowCount).toBe(3);
    expect(first.profiles[1]?.missing).toBe(1);
    const second = await client.call('open', { slot: 'work', source: { kind: 'file', file, sheet: 'Notes' }, draft: true });
    expect(second.names).toEqual(['note']);
    await expect(client.call('open', { slot: 'work', source: { kind: 'file', file, sheet: 'Nope' }, draft: true })).rejects.toMatchObject({
      problem: { code: 'no-sheet', hint: 'Choose one of: Survey, Notes.' },
    });
  });

  it('turns an empty file into a problem with a hint, not a crash', async () => {
    const client = newClient();
    const error = await openSmall(client, '', 'empty.csv').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(WorkerProblem);
    expect((error as WorkerProblem).problem.code).toBe('empty-file');
    expect((error as WorkerProblem).problem.hint).not.toBe('');
  });

  it('unpacks a gzip-compressed file as it reads it (RFC 1952), to the table of the file unpacked', async () => {
    const client = newClient();
    const plain = await openSmall(client);
    const packed = gzipSync(SMALL_CSV);
    const { opened, progress } = await openWatchingProgress(client, new File([packed], 'small.csv.gz'));
    expect(opened.rowCount).toBe(4);
    expect(opened.names).toEqual(plain.names);
    expect(opened.profiles).toEqual(plain.profiles);
    expect(opened.draft?.columns).toEqual(plain.draft?.columns);
    expect(opened.draft?.source.file).toBe('small.csv.gz');
    expect(opened.format).toEqual({ kind: 'text', delimiter: ',', encoding: 'utf-8', scanner: 'webassembly', compressed: 'gzip' });
    // The bar follows the compressed bytes.
    expect(opened.byteSize).toBe(packed.length);
    expect(progress.at(-1)).toBe(packed.length);
  });

  it('refuses a compressed file that unpacks past the page limit, and one it cannot unpack, saying what to do', async () => {
    const client = newClient();
    const rows = `id,n\n${Array.from({ length: 5000 }, (_, i) => `r${i},${i % 7}`).join('\n')}\n`;
    const packed = gzipSync(rows);
    // A limit above the compressed size (so the file is not refused before reading) and below the unpacked one.
    const maxBytes = packed.length + 1000;
    expect(rows.length).toBeGreaterThan(maxBytes);
    const big = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([packed], 'rows.csv.gz') }, draft: true, maxBytes }).catch((e: unknown) => e);
    expect(big).toBeInstanceOf(WorkerProblem);
    expect((big as WorkerProblem).problem.code).toBe('too-large-for-page');
    expect((big as WorkerProblem).problem.message).toMatch(/^“rows\.csv\.gz” \([\d.]+ KB compressed\) unpacks to more than [\d.]+ KB; the page opens files up to/);
    expect((big as WorkerProblem).problem.hint).toContain('levelwise apply recipe.json "rows.csv.gz"');
    const cut = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([packed.subarray(0, packed.length >> 1)], 'cut.csv.gz') }, draft: true }).catch((e: unknown) => e);
    expect(cut).toBeInstanceOf(WorkerProblem);
    expect((cut as WorkerProblem).problem.code).toBe('bad-gzip');
    expect((cut as WorkerProblem).problem.message).toMatch(/^“cut\.csv\.gz” is gzip-compressed, but it could not be unpacked \(.+\): its data is damaged or cut short/);
    expect((cut as WorkerProblem).problem.hint).toContain('Unpack it');
  });

  it('generates the invented demo survey inside the worker', async () => {
    const client = newClient();
    const demo = await client.call('open', { slot: 'work', source: { kind: 'demo', rows: 50 }, draft: true });
    expect(demo.fileName).toContain('invented');
    expect(demo.rowCount).toBe(50);
    expect(demo.names[0]).toBe('household_id');
  });
});

describe('the preview window', () => {
  it('holds the encoded numbers of the rows asked for, computed by hand', async () => {
    const client = newClient();
    const opened = await openSmall(client);
    const recipe = decided(opened);
    const inUse = await client.call('use-recipe', { slot: 'work', version: opened.version, revision: 7, recipe });
    // colour levels by count: red 2, blue 1, green 1; dummy coding without the reference "blue".
    // score: continuous, the missing cell filled with the mean (1 + 2 + 4) / 3 and flagged.
    expect(inUse.outputs).toEqual(['id', 'colour=red', 'colour=green', 'size', 'score', 'score (missing)']);
    const window = await client.call('window', { slot: 'work', version: opened.version, revision: 7, start: 1, end: 10 });
    expect(window.start).toBe(1);
    expect(window.end).toBe(4);
    expect(window.width).toBe(6);
    expect(Array.from(window.lines)).toEqual([3, 4, 5]);
    expect(Array.from(window.rejected)).toEqual([0, 0, 0]);
    const rows = [0, 1, 2].map((r) => Array.from(window.values.subarray(r * 6, r * 6 + 6)));
    // size: S < M < L, ranks from 1.
    expect(rows[0]).toEqual([NaN, 0, 0, 2, 2, 0]);
    expect(rows[1]?.slice(0, 4)).toEqual([NaN, 1, 0, 3]);
    expect(rows[1]?.[4]).toBeCloseTo(7 / 3, 12);
    expect(rows[1]?.[5]).toBe(1);
    expect(rows[2]).toEqual([NaN, 0, 1, 2, 4, 0]);
    expect(window.cells.slice(0, 4)).toEqual(['a2', 'blue', 'M', '2']);
  });

  it('refuses to answer for an older file or recipe', async () => {
    const client = newClient();
    const opened = await openSmall(client);
    await client.call('use-recipe', { slot: 'work', version: opened.version, revision: 1, recipe: opened.draft! });
    await expect(client.call('window', { slot: 'work', version: opened.version, revision: 0, start: 0, end: 4 })).rejects.toBeInstanceOf(Cancelled);
    const newer = await openSmall(client);
    expect(newer.version).toBeGreaterThan(opened.version);
    await expect(client.call('window', { slot: 'work', version: opened.version, revision: 1, start: 0, end: 4 })).rejects.toBeInstanceOf(Cancelled);
  });
});

describe('exporting', () => {
  it('writes the same bytes as core encodeToCsv, in parts', async () => {
    const client = newClient();
    const opened = await openSmall(client);
    const recipe = decided(opened);
    const parts: Uint8Array[] = [];
    const summary = await client.call('export', { slot: 'work', version: opened.version, recipe }, { onChunk: (b) => parts.push(b) });
    const text = new TextDecoder().decode(Buffer.concat(parts));
    const direct = encodeToCsv(recipe, readTable(new TextEncoder().encode(SMALL_CSV)).table);
    expect(text).toBe(new TextDecoder().decode(direct.bytes));
    // RFC 4180 §2: CRLF line ends; 7/3 in its shortest round-trip spelling (ECMA-262 Number::toString).
    expect(text).toBe(
      'id,colour=red,colour=green,size,score,score (missing)\r\n' +
        'a1,1,0,1,1,0\r\n' +
        'a2,0,0,2,2,0\r\n' +
        'a3,1,0,3,2.3333333333333335,1\r\n' +
        'a4,0,1,2,4,0\r\n',
    );
    expect(summary.bytes).toBe(text.length);
    expect(summary.rowsWritten).toBe(4);
    expect(summary.report.columns.find((c) => c.name === 'score')?.missing).toBe(1);
  });

  it('stops when cancelled and says so', async () => {
    const messages: FromWorker[] = [];
    const session = createSession((m) => messages.push(m));
    session.receive({ type: 'open', id: 1, slot: 'work', source: { kind: 'demo', rows: 40_000 }, draft: true });
    await until(() => messages.some((m) => m.id === 1 && m.type === 'done'));
    const opened = messages.find((m) => m.type === 'done')!;
    const { version, draft } = (opened as { result: OpenedTable }).result;
    session.receive({ type: 'export', id: 2, slot: 'work', version, recipe: draft! });
    session.receive({ type: 'cancel', id: 2 });
    await until(() => messages.some((m) => m.id === 2 && (m.type === 'cancelled' || m.type === 'done')));
    const ends = messages.filter((m) => m.id === 2 && ['done', 'cancelled', 'failed'].includes(m.type));
    expect(ends.map((m) => m.type)).toEqual(['cancelled']);
  });
});

describe('checking a recipe against a second file', () => {
  it('reports unseen levels with counts and lines, and missing and extra columns', async () => {
    const client = newClient();
    const opened = await openSmall(client);
    const recipe = decided(opened);
    const second = 'id,colour,score,weight\nb1,red,5,1\nb2,purple,x,2\nb3,purple,6,3\nb4,teal,,4\n';
    const reuse = await client.call('open', {
      slot: 'reuse',
      source: { kind: 'file', file: new File([second], 'second.csv') },
      draft: false,
      missingTokens: recipe.reading.missingTokens,
    });
    const report = await client.call('check', { slot: 'reuse', version: reuse.version, recipe });
    expect(report.rows).toBe(4);
    expect(report.missingColumns).toEqual(['size']);
    expect(report.extraColumns).toEqual(['weight']);
    const colour = report.columns.find((c) => c.name === 'colour')!;
    expect(colour.unseen).toEqual([
      { value: 'purple', count: 2, lines: [3, 4] },
      { value: 'teal', count: 1, lines: [5] },
    ]);
    const score = report.columns.find((c) => c.name === 'score')!;
    expect(score.invalid).toEqual([{ value: 'x', count: 1, lines: [3] }]);
    expect(report.fits).toBe(false);
  });
});

describe('a recipe made in the page', () => {
  it('leaves the delimiter to detection, so it reads a semicolon export of the same data', async () => {
    const client = newClient();
    const opened = await openSmall(client);
    expect(opened.draft?.reading.delimiter).toBeNull();
    const recipe = decided(opened);
    const reuse = await client.call('open', {
      slot: 'reuse',
      source: { kind: 'file', file: new File([SMALL_CSV.replaceAll(',', ';')], 'small-semicolon.csv') },
      draft: false,
      delimiter: recipe.reading.delimiter,
    });
    const report = await client.call('check', { slot: 'reuse', version: reuse.version, recipe });
    expect(report.missingColumns).toEqual([]);
    expect(report.fits).toBe(true);
  });
});

describe('reading the open file with other missing spellings', () => {
  // An invented damage log: "None" says there was no damage; -999 is a sensor's "no reading".
  const LOG = 'strike,damage,reading\nS1,None,21.5\nS2,None,-999\nS3,Minor,19\nS4,None,-999\nS5,None,20\nS6,Severe,22\n';

  it('profiles and drafts the table again without reading it, the spellings in the recipe', async () => {
    const client = newClient();
    const opened = await openSmall(client, LOG, 'log.csv');
    expect(opened.profiles.map((p) => p.missing)).toEqual([0, 4, 0]);
    const tokens = [...DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None'), '-999'];
    const again = await client.call('reprofile', { slot: 'work', version: opened.version, missingTokens: tokens });
    expect(again.profiles.map((p) => p.missing)).toEqual([0, 0, 2]);
    expect(again.profiles[1]?.levels?.map((l) => [l.value, l.count])).toEqual([['None', 4], ['Minor', 1], ['Severe', 1]]);
    expect(again.draft.reading.missingTokens).toEqual(tokens);
    // The table is the one read before: the preview still answers for its version.
    await client.call('use-recipe', { slot: 'work', version: opened.version, revision: 1, recipe: again.draft });
    await expect(client.call('reprofile', { slot: 'work', version: opened.version + 99, missingTokens: tokens })).rejects.toBeInstanceOf(Cancelled);
  });

  it('sends a long list of levels ahead, packed, as the first reading did', async () => {
    const rows = Array.from({ length: 30_000 }, (_, i) => `K${i},${i % 2 === 0 ? 'None' : 'hit'}`);
    const client = newClient();
    const opened = await openSmall(client, `key,damage\n${rows.join('\n')}\n`, 'keys.csv');
    const again = await client.call('reprofile', { slot: 'work', version: opened.version, missingTokens: ['NA'] });
    expect(again.profiles[0]?.levels?.length).toBe(30_000);
    expect(again.profiles[0]?.levels?.[29_999]).toEqual(opened.profiles[0]?.levels?.[29_999]);
    expect(again.profiles[1]?.levels?.map((l) => [l.value, l.count])).toEqual([['None', 15_000], ['hit', 15_000]]);
  });
});

async function until(condition: () => boolean): Promise<void> {
  while (!condition()) await new Promise((resolve) => setTimeout(resolve, 5));
}

describe('progress reports', () => {
  it('pass on only steps of half a percent, phase changes and the end', () => {
    const sent: [string, number][] = [];
    // A clock that moves on by a whole interval between reports: only the steps hold reports back.
    let clock = 0;
    const progress = throttledProgress((phase, done) => sent.push([phase, done]), () => (clock += PROGRESS_EVERY_MS));
    for (let done = 0; done <= 1000; done += 1) progress('reading', done, 1000);
    progress('profiling', 0, null);
    progress('profiling', 0, null);
    // 0, 5, 10, … 995 (every 0.5 %), then 1000 (the end), then the new phase once per report without a total.
    expect(sent.filter(([p]) => p === 'reading').map(([, d]) => d)).toEqual([...Array.from({ length: 200 }, (_, i) => i * 5), 1000]);
    expect(sent.filter(([p]) => p === 'profiling')).toHaveLength(2);
  });

  it('pass on at most one report of a phase per interval, but a phase change and the end at once', () => {
    const sent: [string, number][] = [];
    let clock = 0;
    const progress = throttledProgress((phase, done) => sent.push([phase, done]), () => clock);
    // 1,000 reports 1 ms apart, each a step of 0.1 %: one report per 100 ms gets through.
    for (let done = 0; done < 1000; done += 1, clock += 1) progress('reading', done, 1000);
    progress('reading', 1000, 1000);
    progress('writing', 0, 1000);
    expect(sent.map(([, d]) => d)).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000, 0]);
    expect(PROGRESS_EVERY_MS).toBe(100);
  });
});
