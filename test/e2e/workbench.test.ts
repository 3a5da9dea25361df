/**
 * The workbench in real Chromium, against the production build served by `vite preview`: the demo,
 * opening CSV and XLSX files, deciding about columns (keyboard reordering included), the preview,
 * the three take-aways, re-using a recipe on a second file, decisions surviving a reload, cancelling
 * a long read — while every network request is recorded and none may leave localhost.
 *
 * Expected numbers are worked out by hand in the comments beside them from the invented files below.
 */
import { readFileSync } from 'node:fs';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, BrowserContext, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, launchChromium } from './helpers/browser.ts';
import { RESULTS, buildAndServe, type ServedApp } from './helpers/server.ts';
import { buildXlsx } from './helpers/xlsx.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { profileTable } from '../../src/core/profile.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';
import { readTable } from '../../src/core/read-table.ts';
import { gunzipSync, gzipSync } from 'node:zlib';
import { formatCount, formatValue } from '../../src/ui/columns/labels.ts';

/** An invented ticket list: identifiers, a nominal colour, an unordered-looking priority, amounts with one gap. */
const TICKETS_CSV =
  'ticket,colour,priority,amount\n' +
  'T-01,red,later,10\n' +
  'T-02,blue,soon,20.5\n' +
  'T-03,red,now,\n' +
  'T-04,green,soon,40\n' +
  'T-05,red,later,50\n' +
  'T-06,blue,now,12\n';

/** A second invented file for the same recipe: an unseen colour (twice), one never seen, a stray text amount, no priority, an extra column. */
const SECOND_CSV = 'ticket,colour,amount,region\nU-01,red,5,north\nU-02,purple,7,south\nU-03,purple,x,north\nU-04,teal,,east\n';

const available = browserAvailable();

describe.skipIf(!available)('the workbench in Chromium', () => {
  let app: ServedApp;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  const requests: string[] = [];
  const cspByUrl = new Map<string, string | undefined>();
  const pageErrors: string[] = [];
  const workerUrls: string[] = [];

  beforeAll(async () => {
    mkdirSync(RESULTS, { recursive: true });
    app = await buildAndServe('e2e-workbench-dist');
    browser = await launchChromium();
    context = await browser.newContext({ viewport: { width: 1280, height: 800 }, acceptDownloads: true });
    context.on('request', (request) => requests.push(request.url()));
    context.on('response', (response) => cspByUrl.set(response.url(), response.headers()['content-security-policy']));
    page = await context.newPage();
    page.on('pageerror', (error) => pageErrors.push(error.message));
    page.on('worker', (worker) => workerUrls.push(worker.url()));
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  async function shot(name: string): Promise<void> {
    await page.screenshot({ path: join(RESULTS, `e2e-${name}.png`) });
  }

  /** Drops a text file on the page as a person dragging it from their desktop would. */
  async function dropFile(name: string, text: string): Promise<void> {
    await page.evaluate(
      ({ name, text }) => {
        const transfer = new DataTransfer();
        transfer.items.add(new File([text], name, { type: 'text/csv' }));
        for (const type of ['dragenter', 'dragover', 'drop']) {
          window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
        }
      },
      { name, text },
    );
  }

  async function waitForFile(name: string, rows: number): Promise<void> {
    const summary = page.getByTestId('file-summary');
    await expect.poll(() => summary.textContent(), { timeout: 30_000 }).toContain(name);
    await expect.poll(() => summary.textContent(), { timeout: 30_000 }).toContain(`${rows.toLocaleString('en-GB')} rows`);
    await page.getByTestId('output-shape').waitFor();
  }

  /** Output column names in the preview's header, in order. */
  async function outputHeaders(): Promise<string[]> {
    return page.locator('.grid-leaf[data-output]').evaluateAll((cells) => cells.map((c) => c.getAttribute('data-output') ?? ''));
  }

  /** The text of one preview cell: data row `row` (0-based) under output column `output`. */
  async function previewCell(row: number, output: string): Promise<string> {
    const header = page.locator(`.grid-leaf[data-output="${output}"]`);
    await header.waitFor();
    const column = await header.getAttribute('aria-colindex');
    const cell = page.locator(`[role="row"][aria-rowindex="${row + 3}"] [role="gridcell"][aria-colindex="${column}"]`);
    await expect.poll(() => cell.evaluate((c) => (c.classList.contains('is-pending') ? null : c.textContent))).not.toBeNull();
    return (await cell.textContent()) ?? '';
  }

  async function chooseColumn(name: string): Promise<void> {
    await page.getByRole('option', { name: new RegExp(`^${name}\\b`) }).click();
    await expect.poll(() => page.locator('.lw-editor__title').textContent()).toBe(name);
  }

  async function downloadText(click: () => Promise<void>): Promise<{ name: string; text: string; download: Download }> {
    const [download] = await Promise.all([page.waitForEvent('download'), click()]);
    const path = await download.path();
    return { name: download.suggestedFilename(), text: readFileSync(path, 'utf8'), download };
  }

  it('opens with the invented demo survey, labelled as invented', async () => {
    const response = await page.goto(app.url);
    expect(response?.status()).toBe(200);
    await waitForFile('household-energy-survey (invented).csv', 2000);
    await expect.poll(() => page.getByTestId('file-summary').textContent()).toContain('Invented demo');
    // The first row of the demo is HH-000001 on line 2 (the header is line 1).
    expect(await previewCell(0, 'household_id')).toBe('HH-000001');
    await shot('01-demo');
  });

  it('sends the content security policy with the page and with the worker script', async () => {
    const pageCsp = cspByUrl.get(app.url);
    expect(pageCsp).toContain("connect-src 'none'");
    expect(pageCsp).toContain("worker-src 'self' blob:");
    const workerUrl = requests.find((url) => /workbench\.worker.*\.js$/.test(url));
    expect(workerUrl).toBeDefined();
    expect(cspByUrl.get(workerUrl!)).toContain("connect-src 'none'");
    // The <meta> copy in index.html is there for static hosts.
    expect(await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content')).toContain("connect-src 'none'");
  });

  it('scrolls through every row of the demo: the last line is reachable and encoded', async () => {
    const grid = page.getByRole('grid', { name: 'Encoded output preview' });
    await grid.evaluate((el) => el.scrollTo({ top: el.scrollHeight }));
    // 2000 data rows; the last starts on line 2001 or later (a few invented comments span two lines).
    const last = page.locator('[role="row"][aria-rowindex="2002"] [role="rowheader"]');
    await expect.poll(async () => Number(await last.textContent()), { timeout: 15_000 }).toBeGreaterThanOrEqual(2001);
    expect(await previewCell(1999, 'household_id')).toBe('HH-002000');
    // Only a window of rows exists in the page, not all 2000.
    expect(await page.locator('.grid-row').count()).toBeLessThan(80);
    await grid.evaluate((el) => el.scrollTo({ top: 0 }));
  });

  it('opens a dropped CSV file and drafts a recipe for it', async () => {
    await dropFile('tickets.csv', TICKETS_CSV);
    await waitForFile('tickets.csv', 6);
    await expect.poll(() => page.getByTestId('file-summary').textContent()).toContain('comma-separated');
    // Read with the WebAssembly record scanner: the policy served allows compiling it ('wasm-unsafe-eval').
    expect(await page.getByTestId('file-summary').getAttribute('data-scanner')).toBe('webassembly');
    expect(await outputHeaders()).toContain('colour=red');
    await shot('02-dropped-csv');
  });

  it('keeps identifiers as text and reads amounts as numbers', async () => {
    await chooseColumn('ticket');
    await page.getByRole('radio', { name: 'identifier (kept as is)', exact: true }).check();
    await chooseColumn('amount');
    await page.getByRole('radio', { name: 'continuous', exact: true }).check();
    await expect.poll(outputHeaders).toEqual([
      'ticket',
      'colour=red',
      'colour=blue',
      'colour=green',
      'priority=later',
      'priority=soon',
      'priority=now',
      'amount',
      'amount (missing)',
    ]);
    // T-03 has no amount: filled with the mean of 10, 20.5, 40, 50, 12 = 132.5 / 5 = 26.5, and flagged.
    expect(await previewCell(2, 'amount')).toBe('26.5');
    expect(await previewCell(2, 'amount (missing)')).toBe('1');
    expect(await previewCell(0, 'ticket')).toBe('T-01');
  });

  it('changes a nominal column to dummy coding with a chosen reference level, and the preview follows', async () => {
    await chooseColumn('colour');
    await page.getByRole('radio', { name: 'dummy', exact: true }).check();
    await page.getByLabel('Reference level').selectOption('blue');
    // Levels by count: red 3, blue 2, green 1; dummy coding drops the reference "blue".
    await expect.poll(outputHeaders).toContain('colour=green');
    const headers = await outputHeaders();
    expect(headers.filter((h) => h.startsWith('colour'))).toEqual(['colour=red', 'colour=green']);
    expect(await previewCell(0, 'colour=red')).toBe('1'); // T-01 red
    expect(await previewCell(1, 'colour=red')).toBe('0'); // T-02 blue: the reference, all zeros
    expect(await previewCell(1, 'colour=green')).toBe('0');
    expect(await previewCell(3, 'colour=green')).toBe('1'); // T-04 green
    await shot('03-dummy-coding');
  });

  it('undoes and redoes with the keyboard', async () => {
    await page.locator('body').press('Control+z');
    await expect.poll(async () => (await outputHeaders()).filter((h) => h.startsWith('colour'))).toEqual(['colour=blue', 'colour=green']);
    await page.locator('body').press('Control+Shift+z');
    await expect.poll(async () => (await outputHeaders()).filter((h) => h.startsWith('colour'))).toEqual(['colour=red', 'colour=green']);
  });

  it('makes a column ordinal and reorders its levels with the keyboard alone', async () => {
    await chooseColumn('priority');
    await page.getByRole('radio', { name: 'ordinal', exact: true }).check();
    // Levels in order of count, ties first-seen first: later, soon, now → ranks 1, 2, 3.
    await expect.poll(outputHeaders).toContain('priority');
    expect(await previewCell(2, 'priority')).toBe('3'); // T-03 now
    const liveRegion = page.locator('[id^="DndLiveRegion"]');
    const handle = page.getByRole('button', { name: /^Move “now”/ });
    await handle.focus();
    await page.keyboard.press('Space');
    await expect.poll(() => liveRegion.textContent()).toContain('Lifted “now”');
    await page.keyboard.press('ArrowUp');
    await expect.poll(() => liveRegion.textContent()).toContain('over place 2');
    await page.keyboard.press('ArrowUp');
    await expect.poll(() => liveRegion.textContent()).toContain('over place 1');
    await page.keyboard.press('Space');
    await expect.poll(() => liveRegion.textContent()).toContain('put down at place 1');
    // New order now < later < soon: T-03 (now) = 1, T-01 (later) = 2, T-02 (soon) = 3.
    await expect.poll(() => previewCell(2, 'priority')).toBe('1');
    expect(await previewCell(0, 'priority')).toBe('2');
    expect(await previewCell(1, 'priority')).toBe('3');
    await shot('04-ordinal-reordered');
  });

  it('shows the original values beside the outputs on demand', async () => {
    await page.getByLabel('Show original values').check();
    await expect.poll(() => page.locator('.grid-leaf.kind-original').count()).toBe(4);
    const originals = page.locator('[role="row"][aria-rowindex="3"] .grid-cell.kind-original');
    await expect.poll(() => originals.allTextContents()).toEqual(['T-01', 'red', 'later', '10']);
    await shot('05-originals');
    await page.getByLabel('Show original values').uncheck();
  });

  let recipeText = '';

  it('takes away the encoded CSV, the recipe and the codebook', async () => {
    const csv = await downloadText(() => page.getByRole('button', { name: 'Encoded CSV' }).click());
    expect(csv.name).toBe('tickets — encoded.csv');
    // RFC 4180: CRLF line ends. Values worked out above: dummy colour (reference blue), ranks now < later < soon,
    // amount with the mean 26.5 filled in for T-03 and flagged.
    expect(csv.text).toBe(
      'ticket,colour=red,colour=green,priority,amount,amount (missing)\r\n' +
        'T-01,1,0,2,10,0\r\n' +
        'T-02,0,0,3,20.5,0\r\n' +
        'T-03,1,0,1,26.5,1\r\n' +
        'T-04,0,1,3,40,0\r\n' +
        'T-05,1,0,2,50,0\r\n' +
        'T-06,0,0,1,12,0\r\n',
    );

    // The same CSV gzip-compressed (RFC 1952), made in the worker by CompressionStream.
    await page.getByLabel('Encoded CSV file type').selectOption('gzip');
    const [packed] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Encoded CSV', exact: true }).click()]);
    expect(packed.suggestedFilename()).toBe('tickets — encoded.csv.gz');
    expect(gunzipSync(readFileSync(await packed.path())).toString('utf8')).toBe(csv.text);
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'gzip-compressed' }).first().textContent()).toMatch(/Encoded CSV of tickets\.csv ready: 6 rows, \d+ bytes gzip-compressed \(\d+ bytes of CSV\)/);
    await page.getByLabel('Encoded CSV file type').selectOption('plain');

    const recipe = await downloadText(() => page.getByRole('button', { name: 'Recipe', exact: true }).click());
    expect(recipe.name).toBe('tickets.recipe.json');
    recipeText = recipe.text;
    const parsed = JSON.parse(recipe.text) as { kind: string; source: { file: string; rows: number }; columns: { name: string; level: string; coding?: string; reference?: string; levels?: { value: string }[] }[] };
    expect(parsed.kind).toBe('levelwise.recipe');
    expect(parsed.source).toMatchObject({ file: 'tickets.csv', rows: 6 });
    expect(parsed.columns.map((c) => c.level)).toEqual(['identifier', 'nominal', 'ordinal', 'continuous']);
    expect(parsed.columns[1]).toMatchObject({ coding: 'dummy', reference: 'blue' });
    expect(parsed.columns[2]?.levels?.map((l) => l.value)).toEqual(['now', 'later', 'soon']);

    const markdown = await downloadText(() => page.getByRole('button', { name: 'Codebook', exact: true }).click());
    expect(markdown.name).toBe('tickets — codebook.md');
    expect(markdown.text).toContain('colour=green');
    expect(markdown.text).toContain('amount (missing)');

    await page.getByLabel('Codebook format').selectOption('html');
    const html = await downloadText(() => page.getByRole('button', { name: 'Codebook', exact: true }).click());
    expect(html.name).toBe('tickets — codebook.html');
    expect(html.text).toMatch(/<table/i);
    expect(html.text).toContain('colour=red');
    await shot('06-after-downloads');
  });

  it('re-applies the saved recipe to a second file and reports everything it met', async () => {
    await page.getByRole('button', { name: 'Re-use a recipe…' }).click();
    const dialog = page.getByRole('dialog', { name: 'Re-use a recipe on a new file' });
    await dialog.waitFor();
    await page.getByTestId('reuse-recipe-input').setInputFiles({ name: 'tickets.recipe.json', mimeType: 'application/json', buffer: Buffer.from(recipeText) });
    await expect.poll(() => page.getByTestId('reuse-recipe-summary').textContent()).toContain('“tickets.csv” (6 rows)');
    await page.getByTestId('reuse-data-input').setInputFiles({ name: 'second.csv', mimeType: 'text/csv', buffer: Buffer.from(SECOND_CSV) });
    const report = page.getByTestId('reuse-report');
    await report.waitFor({ timeout: 30_000 });
    const text = (await report.textContent()) ?? '';
    expect(text).toContain('Columns the file lacks');
    expect(text).toContain('priority');
    expect(text).toContain('“region”');
    // purple on lines 3 and 4, teal on line 5 (line 1 is the header).
    const colour = report.locator('[data-column="colour"]');
    await expect.poll(() => colour.locator('tbody tr').allTextContents()).toEqual(['purple2lines 3, 4', 'teal1line 5']);
    const amount = report.locator('[data-column="amount"]');
    expect(await amount.textContent()).toContain('line 4');
    expect(await amount.textContent()).toContain('26.5');
    await dialog.screenshot({ path: join(RESULTS, 'e2e-07-reuse-report.png') });

    const encoded = await downloadText(() => page.getByRole('button', { name: 'Download the encoded CSV of this file' }).click());
    expect(encoded.name).toBe('second — encoded.csv');
    // Unseen colours → all zeros; no priority column → missing → zeros policy → 0; "x" and "" → mean 26.5, flagged.
    expect(encoded.text).toBe(
      'ticket,colour=red,colour=green,priority,amount,amount (missing)\r\n' +
        'U-01,1,0,0,5,0\r\n' +
        'U-02,0,0,0,7,0\r\n' +
        'U-03,0,0,0,26.5,1\r\n' +
        'U-04,0,0,0,26.5,1\r\n',
    );
    await page.keyboard.press('Escape');
    await expect.poll(() => dialog.isVisible()).toBe(false);
  });

  it('reads the first sheet of an XLSX workbook, and another sheet on request', async () => {
    const xlsx = buildXlsx([
      { name: 'Plots', rows: [['plot', 'soil', 'yield_t'], ['P1', 'clay', 4.2], ['P2', 'sand', 3.1], ['P3', 'clay', null]] },
      { name: 'Visits', rows: [['visit', 'plot'], ['V1', 'P1'], ['V2', 'P3']] },
    ]);
    await page.getByTestId('open-file-input').setInputFiles({ name: 'plots.xlsx', mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer: Buffer.from(xlsx) });
    await waitForFile('plots.xlsx', 3);
    await expect.poll(() => page.getByTestId('file-summary').textContent()).toContain('sheet “Plots”');
    // plot (3 distinct), soil (clay twice, sand once) and yield_t (two numbers, one gap) all appear.
    await expect.poll(async () => (await outputHeaders()).map((h) => h.replace(/(=.*| \(missing\))$/, '')).filter((h, i, all) => all.indexOf(h) === i)).toEqual(['plot', 'soil', 'yield_t']);
    await shot('08-xlsx');
    await page.getByLabel('Sheet').selectOption('Visits');
    await expect.poll(() => page.getByTestId('file-summary').textContent(), { timeout: 30_000 }).toContain('sheet “Visits”');
    await waitForFile('plots.xlsx', 2);
  });

  it('unpacks a gzip-compressed CSV as it reads it (RFC 1952; DecompressionStream in the worker)', async () => {
    await page.getByTestId('open-file-input').setInputFiles({ name: 'tickets-export.csv.gz', mimeType: 'application/gzip', buffer: gzipSync(TICKETS_CSV) });
    await waitForFile('tickets-export.csv.gz', 6);
    await expect.poll(() => page.getByTestId('file-summary').textContent()).toContain('comma-separated, UTF-8, gzip-compressed');
    expect((await outputHeaders()).filter((h) => h.startsWith('colour'))).toEqual(['colour=red', 'colour=blue', 'colour=green']);
    // T-01 red, T-02 blue, T-04 green: the rows of the file unpacked.
    expect(await previewCell(0, 'colour=red')).toBe('1');
    expect(await previewCell(1, 'colour=blue')).toBe('1');
    expect(await previewCell(3, 'colour=green')).toBe('1');
  });

  it('restores the decisions made on a file when it is opened again after a reload', async () => {
    await page.reload();
    await waitForFile('household-energy-survey (invented).csv', 2000);
    await dropFile('tickets.csv', TICKETS_CSV);
    await waitForFile('tickets.csv', 6);
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Restored' }).first().textContent()).toContain('Restored 6 decisions');
    await expect.poll(async () => (await outputHeaders()).filter((h) => h.startsWith('colour'))).toEqual(['colour=red', 'colour=green']);
    expect(await previewCell(2, 'priority')).toBe('1');
    await shot('09-restored');
  });

  it('shows progress while reading a large file and stops when cancelled', async () => {
    // About 120 MB of invented rows, made in the page; reading and profiling it takes long enough to cancel.
    await page.evaluate(() => {
      const line = 'R-000001,red,soon,12.5,some words here to make the line longer\n';
      const text = 'ticket,colour,priority,amount,note\n' + line.repeat(1_900_000);
      const transfer = new DataTransfer();
      transfer.items.add(new File([text], 'large.csv', { type: 'text/csv' }));
      for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
    });
    const bar = page.getByRole('progressbar', { name: 'Reading large.csv' });
    await bar.waitFor({ timeout: 15_000 });
    await shot('10-progress');
    await page.getByRole('button', { name: 'Cancel' }).click();
    await expect.poll(() => bar.count()).toBe(0);
    // The file that was open stays open.
    expect(await page.getByTestId('file-summary').textContent()).toContain('tickets.csv');
  });

  it('gives the output more room with the keyboard, through the splitter', async () => {
    const splitter = page.getByRole('separator', { name: /Share of height/ });
    const before = (await page.locator('.pane-preview').boundingBox())?.height ?? 0;
    expect(await splitter.getAttribute('aria-valuenow')).toBe('50');
    await splitter.focus();
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('ArrowUp');
    expect(await splitter.getAttribute('aria-valuenow')).toBe('40');
    await expect.poll(async () => (await page.locator('.pane-preview').boundingBox())?.height ?? 0).toBeGreaterThan(before + 40);
    await page.keyboard.press('Home');
    expect(await splitter.getAttribute('aria-valuenow')).toBe('20');
    await shot('11-splitter');
  });

  it('scrolls to the last row of a table taller than the browser lays out (1,300,000 rows)', async () => {
    // 1,300,000 rows of 28 px would be 36.4 million pixels, more than Chromium lays out (about 33.5
    // million, from memory) and past the scroll cap (useFixedRows.ts): the scroll range is scaled,
    // and its end must still show the last row, encoded.
    const rows = 1_300_000;
    const text = `code,kind\n${Array.from({ length: rows }, (_, i) => `C${i + 1},${i % 3 === 0 ? 'a' : 'b'}`).join('\n')}\n`;
    await page.getByTestId('open-file-input').setInputFiles({ name: 'tall.csv', mimeType: 'text/csv', buffer: Buffer.from(text) });
    await waitForFile('tall.csv', rows);
    const grid = page.getByRole('grid', { name: 'Encoded output preview' });
    await grid.evaluate((el) => el.scrollTo({ top: el.scrollHeight }));
    // Row 600,000 is aria-rowindex 600,002 (two header rows) and starts on line 600,001.
    const last = page.locator(`[role="row"][aria-rowindex="${rows + 2}"] [role="rowheader"]`);
    await expect.poll(async () => Number(await last.textContent()), { timeout: 15_000 }).toBe(rows + 1);
    expect(await previewCell(rows - 1, 'code')).toBe(`C${rows}`);
    // The last row is in view: its bottom is at or above the grid's bottom edge.
    const gridBox = await grid.boundingBox();
    const rowBox = await page.locator(`[role="row"][aria-rowindex="${rows + 2}"]`).boundingBox();
    expect(rowBox!.y + rowBox!.height).toBeLessThanOrEqual(gridBox!.y + gridBox!.height + 1);
    expect(rowBox!.y).toBeGreaterThanOrEqual(gridBox!.y);
    await shot('12-tall-table-end');
  });

  it('reads a big file on several workers, segment by segment, into the table one worker reads', async () => {
    // 500,000 invented rows (~18 MB, past the size from which segment workers read: segment-pool.ts).
    // Every 5th note is quoted and holds a line break, so cuts can fall inside quoted fields; every
    // row after one such note starts a line later. Row r (1-based) starts on line
    // 1 + r + floor((r - 1) / 5): the header, the rows before it, and their quoted line breaks.
    const rows = 500_000;
    const lines = ['id,kind,note,amount'];
    for (let r = 1; r <= rows; r++) {
      const note = r % 5 === 0 ? `"first line\nsecond, line ${r % 97}"` : `plain note ${r % 89}`;
      // Identifiers in ascending order: each worker keeps them as bytes, joined without a lookup (core concat-tables.ts).
      lines.push(`N-${String(r).padStart(6, '0')},${['alpha', 'beta', 'gamma'][r % 3]},${note},${(r % 1000) / 4}`);
    }
    const text = `${lines.join('\n')}\n`;
    expect(text.length).toBeGreaterThan(16 << 20);
    await page.getByTestId('open-file-input').setInputFiles({ name: 'segments.csv', mimeType: 'text/csv', buffer: Buffer.from(text) });
    await waitForFile('segments.csv', rows);
    // The segment workers run (their script is its own file in the build); started with the page.
    expect(workerUrls.some((url) => url.includes('segment.worker'))).toBe(true);
    const grid = page.getByRole('grid', { name: 'Encoded output preview' });
    await grid.evaluate((el) => el.scrollTo({ top: el.scrollHeight }));
    const last = page.locator(`[role="row"][aria-rowindex="${rows + 2}"] [role="rowheader"]`);
    // Row 500,000: line 1 + 500,000 + 99,999 = 600,000.
    await expect.poll(async () => Number(await last.textContent()), { timeout: 15_000 }).toBe(600_000);
    expect(await previewCell(rows - 1, 'id')).toBe(`N-${rows}`);
    expect(await previewCell(rows - 2, 'id')).toBe('N-499999');
    await shot('13-segments-end');
  });

  it('shows what core finds on one thread for a column of a big file kept as numbers, read and profiled in segment workers', async () => {
    // 450,000 invented meter readings (~19 MB, read in segments): most readings distinct (past the
    // 4,096-value dictionary: number storage), every 97th missing ("NA"), every 1000th not a
    // number, every 101st the meter's code for "no reading" (-1), every 13th with two fixed decimals.
    // The column is profiled in a segment worker (core number-profiles.ts), on opening and again
    // when -1 is read as missing.
    const rows = 450_000;
    const lines = ['meter,reading,site,visit'];
    for (let r = 1; r <= rows; r++) {
      const reading = r % 97 === 0 ? 'NA' : r % 1000 === 0 ? `faulty ${r}` : r % 101 === 0 ? '-1' : r % 13 === 0 ? `${r}.50` : String(r * 3 + (r % 7) / 4);
      lines.push(`M-${r},${reading},${['north', 'south'][r % 2]},reading taken on visit ${r % 53}`);
    }
    const text = `${lines.join('\n')}\n`;
    expect(text.length).toBeGreaterThan(16 << 20);
    await page.getByTestId('open-file-input').setInputFiles({ name: 'meters.csv', mimeType: 'text/csv', buffer: Buffer.from(text) });
    await waitForFile('meters.csv', rows);

    // What one thread finds: core's profile and draft of the same bytes, in Node.
    const table = readTable(new TextEncoder().encode(text)).table;
    expect(table.columns[1]!.kind).toBe('number');
    const fitted = draftRecipe(profileTable(table), { file: 'meters.csv', rows }).columns[1]!;
    if (fitted.level !== 'continuous') throw new Error(`reading drafted as ${fitted.level}`);
    await chooseColumn('reading');
    const shown = await page.locator('[aria-label="Learned from this file"] dt').allTextContents();
    const values = await page.locator('[aria-label="Learned from this file"] dd').allTextContents();
    const byTerm = Object.fromEntries(shown.map((term, i) => [term, values[i]]));
    expect(byTerm).toMatchObject({
      'numbers read': formatCount(fitted.fitted.count),
      mean: formatValue(fitted.fitted.mean),
      'standard deviation': formatValue(fitted.fitted.sd),
      median: formatValue(fitted.fitted.median),
    });
    // 450,000 rows less 4,639 "NA" (every 97th) and 446 "faulty" (every 1000th, but for the four
    // rows that are multiples of 97 000 too, which are "NA").
    expect(fitted.fitted.count).toBe(444_915);

    // -1 read as missing: the table is profiled again in the worker, its number column in a segment worker.
    await page.getByRole('tab', { name: /Missing values/ }).click();
    await page.getByLabel('Also read as missing').fill('-1');
    await page.getByRole('button', { name: 'Read as missing', exact: true }).click();
    await expect.poll(() => page.getByRole('status').filter({ hasText: '“-1” is read as missing now' }).count()).toBe(1);
    const missingTokens = [...DEFAULT_MISSING_TOKENS, '-1'];
    const refitted = draftRecipe(profileTable(table, { missingTokens }), { file: 'meters.csv', rows }, { missingTokens }).columns[1]!;
    if (refitted.level !== 'continuous') throw new Error(`reading drafted as ${refitted.level}`);
    // Every 101st row, less those that are multiples of 97 (45, "NA") or of 1000 (4, "faulty"): 4,455 − 45 − 4 = 4,406 cells of -1.
    expect(refitted.fitted.count).toBe(444_915 - 4_406);
    await page.getByRole('tab', { name: /^Column/ }).click();
    await chooseColumn('reading');
    await expect.poll(() => page.locator('[aria-label="Learned from this file"]').textContent()).toContain(formatCount(refitted.fitted.count));
    const shownAgain = await page.locator('[aria-label="Learned from this file"] dt').allTextContents();
    const valuesAgain = await page.locator('[aria-label="Learned from this file"] dd').allTextContents();
    expect(Object.fromEntries(shownAgain.map((term, i) => [term, valuesAgain[i]]))).toMatchObject({
      'numbers read': formatCount(refitted.fitted.count),
      mean: formatValue(refitted.fitted.mean),
      'standard deviation': formatValue(refitted.fitted.sd),
      median: formatValue(refitted.fitted.median),
    });
  });

  it('a big file with a Windows-1252 byte near its end, found by a segment worker, is read again as Windows-1252', async () => {
    // 900,000 invented rows (~18 MB, read in segments); the last one names a café written in
    // Windows-1252 (0xE9 is é there, and no UTF-8 on its own: WHATWG Encoding Standard index).
    const rows = 900_000;
    const lines = ['id,kind,amount'];
    for (let r = 1; r < rows; r++) lines.push(`S-${r},${['alpha', 'beta', 'gamma'][r % 3]},${(r % 1000) / 4}`);
    const head = Buffer.from(`${lines.join('\n')}\nS-${rows},caf`);
    const bytes = Buffer.concat([head, Buffer.from([0xe9]), Buffer.from(',7\n')]);
    expect(bytes.length).toBeGreaterThan(16 << 20);
    await page.getByTestId('open-file-input').setInputFiles({ name: 'latin.csv', mimeType: 'text/csv', buffer: bytes });
    await waitForFile('latin.csv', rows);
    await expect.poll(() => page.getByTestId('file-summary').textContent()).toContain('WINDOWS-1252');
    const grid = page.getByRole('grid', { name: 'Encoded output preview' });
    await grid.evaluate((el) => el.scrollTo({ top: el.scrollHeight }));
    await expect.poll(() => previewCell(rows - 1, 'id'), { timeout: 15_000 }).toBe(`S-${rows}`);
  });

  it('reads prices written with a euro sign, and a misread number format is corrected in the page', async () => {
    // An invented price list: euro prices with decimal commas; weights with decimal commas too, the
    // first two of which ("1,234", "5,678") the draft reads as thousands (numbers.ts: ties go to the point).
    const weights = ['1,234', '5,678', '12', '7', '3', '9', '4', '8', '6', '10', '11', '2'];
    const prices = ['€ 1.234,50', '€ 19,99', '-€ 4,50', '€ 7', '€ 250', '€ 99,90', '€ 12,00', '€ 7,25', '€ 1.000', '€ 30', '€ 45,10', '€ 2'];
    const rows = prices.map((price, i) => `P${i + 1};${price};${weights[i]}`);
    await dropFile('prices (invented).csv', `item;price;weight\n${rows.join('\n')}\n`);
    await waitForFile('prices (invented).csv', 12);
    await chooseColumn('price');
    await expect.poll(() => page.locator('.lw-editor').textContent()).toContain('12 of 12 values read as numbers written with "€" (100%)');
    expect(await previewCell(0, 'price')).toBe('1234.5');
    expect(await previewCell(2, 'price')).toBe('-4.5');
    await chooseColumn('weight');
    expect(await previewCell(0, 'weight')).toBe('1234');
    await page.getByLabel('Decimal separator').selectOption(',');
    await page.getByLabel('Digit groups').selectOption('');
    await page.getByRole('button', { name: 'Read in this format' }).click();
    await expect.poll(() => previewCell(0, 'weight')).toBe('1.234');
    expect(await previewCell(1, 'weight')).toBe('5.678');
    // The reason follows the chosen format: all 12 weights read with a decimal comma.
    await expect.poll(() => page.locator('.lw-editor').textContent()).toContain('set by hand: numbers written like "1234,5"; 12 of 12 values read so (100%)');
    expect(await page.getByRole('button', { name: /Undo/ }).getAttribute('title')).toMatch(/weight: numbers written like 1234,5/);
    await shot('number-format');
  });

  it('notes a spelling read as missing that fills most of a column, reads it as a value on request, and keeps the spellings for the file', async () => {
    // An invented strike log: "None" says there was no damage (4 of 6 rows); -999 is a sensor's "no reading".
    const log = 'strike,damage,reading\nS1,None,21.5\nS2,None,-999\nS3,Minor,19\nS4,None,-999\nS5,None,20\nS6,Severe,22\n';
    await dropFile('strikes (invented).csv', log);
    await waitForFile('strikes (invented).csv', 6);
    const doubt = page.getByRole('status').filter({ hasText: '“None” may be a value of damage' });
    await expect.poll(() => doubt.textContent()).toContain('It is read as missing in 4 cells, more than all of the column\'s values together (2 cells).');
    // With "None" missing, damage has two values, Minor and Severe: a binary column (Severe, the later seen of equal counts, coded 1) and its missing indicator.
    expect((await outputHeaders()).filter((h) => h.startsWith('damage'))).toEqual(['damage=Severe', 'damage (missing)']);
    await doubt.getByRole('button', { name: 'Read “None” as a value' }).click();
    const damageHeaders = async () => (await outputHeaders()).filter((h) => h.startsWith('damage'));
    await expect.poll(damageHeaders).toEqual(['damage=None', 'damage=Minor', 'damage=Severe']);
    expect(await previewCell(0, 'damage=None')).toBe('1');
    // The change can be taken back from its notice, and made again.
    const changed = page.getByRole('status').filter({ hasText: '“None” is read as a value now' });
    await changed.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(damageHeaders).toEqual(['damage=Severe', 'damage (missing)']);
    await page.getByRole('status').filter({ hasText: '“None” may be a value of damage' }).getByRole('button', { name: 'Read “None” as a value' }).click();
    await expect.poll(damageHeaders).toEqual(['damage=None', 'damage=Minor', 'damage=Severe']);

    await page.getByRole('tab', { name: /Missing values/ }).click();
    await page.getByLabel('Also read as missing').fill('-999');
    await page.getByRole('button', { name: 'Read as missing', exact: true }).click();
    const met = page.getByRole('list', { name: 'Missing spellings in this file' });
    await expect.poll(() => met.textContent()).toContain('-9992 cells');
    // Only the latest change keeps its notice and its Undo.
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'now' }).allTextContents()).toEqual([expect.stringContaining('“-999” is read as missing now')]);
    expect(await met.textContent()).not.toContain('None');
    await shot('missing-spellings');
    const { text } = await downloadText(() => page.getByRole('button', { name: 'Recipe', exact: true }).click());
    expect(JSON.parse(text).reading.missingTokens).toEqual(['NA', 'N/A', 'n/a', '#N/A', 'NaN', 'null', 'NULL', '.', '?', '-', '-999']);

    // The same file after a reload: read with the spellings chosen for it.
    await page.reload();
    await waitForFile('household-energy-survey (invented).csv', 2000);
    await dropFile('strikes (invented).csv', log);
    await waitForFile('strikes (invented).csv', 6);
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Restored' }).first().textContent()).toContain('Restored the missing spellings saved for this file');
    await expect.poll(async () => (await outputHeaders()).filter((h) => h.startsWith('damage'))).toEqual(['damage=None', 'damage=Minor', 'damage=Severe']);
  });

  it('raised no script errors and sent nothing beyond localhost', () => {
    expect(pageErrors).toEqual([]);
    const outside = requests.filter((url) => !url.startsWith(app.url) && !url.startsWith('blob:') && !url.startsWith('data:'));
    expect(outside).toEqual([]);
    expect(requests.length).toBeGreaterThan(3);
  });
});
