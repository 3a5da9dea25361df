/**
 * Bad input in real Chromium, against the production build served by `vite preview`: files that
 * are empty, pictures, archives, too large, badly quoted, very wide, or with a hundred thousand
 * distinct values; recipes that are not JSON, reach for the object prototype, are far too large
 * or belong to another file. Each gets a message in the page saying what, where and what to do,
 * and the page stays usable: the file that was open stays open and the next file opens.
 *
 * And nothing leaves the machine: every request is recorded, and the Content-Security-Policy is
 * shown to be in force — not merely sent — by trying, from inside the page and from inside its
 * worker, to reach another origin on this machine (127.0.0.2, where a listener of ours counts
 * connections). The browser must block each attempt (a securitypolicyviolation event, the fetch
 * rejects) and no connection may arrive. (CSP Level 3, §6.1 connect-src, §5.3 violation reports.)
 */
import { mkdirSync } from 'node:fs';
import { createServer, type Server } from 'node:net';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, launchChromium } from './helpers/browser.ts';
import { RESULTS, buildAndServe, type ServedApp } from './helpers/server.ts';

const available = browserAvailable();

/** An invented ticket list (no real data). */
const TICKETS_CSV =
  'ticket,colour,amount\nT-01,red,10\nT-02,blue,20.5\nT-03,red,12\nT-04,green,40\nT-05,red,50\nT-06,blue,12\n' +
  'T-07,red,9\nT-08,blue,31\nT-09,red,7\nT-10,red,16\nT-11,blue,3\nT-12,red,18\n';

/** Listens on 127.0.0.2 (loopback, another origin than the page's 127.0.0.1) and counts who connects. */
async function connectionCounter(): Promise<{ url: string; connections: () => number; close: () => Promise<void> }> {
  let connections = 0;
  const server: Server = createServer((socket) => {
    connections++;
    socket.destroy();
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.2', () => resolve());
  });
  const address = server.address();
  const port = typeof address === 'object' && address !== null ? address.port : 0;
  return {
    url: `http://127.0.0.2:${port}/`,
    connections: () => connections,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

describe.skipIf(!available)('bad input in Chromium', () => {
  let app: ServedApp;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let elsewhere: Awaited<ReturnType<typeof connectionCounter>>;
  const requests: string[] = [];
  /** Requests the browser stopped itself, with why ("csp" when the policy blocked them). */
  const stopped = new Map<string, string>();
  const pageErrors: string[] = [];

  beforeAll(async () => {
    mkdirSync(RESULTS, { recursive: true });
    elsewhere = await connectionCounter();
    app = await buildAndServe('e2e-robustness-dist');
    browser = await launchChromium();
    context = await browser.newContext({ viewport: { width: 1280, height: 860 }, acceptDownloads: true });
    context.on('request', (request) => requests.push(request.url()));
    context.on('requestfailed', (request) => stopped.set(request.url(), request.failure()?.errorText ?? ''));
    // Every policy violation in the page from its first script on, before any of the page's own code runs.
    await context.addInitScript(() => {
      const seen: string[] = [];
      (globalThis as unknown as { __policyViolations: string[] }).__policyViolations = seen;
      document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.effectiveDirective} ${e.blockedURI}`));
    });
    page = await context.newPage();
    page.on('pageerror', (error) => pageErrors.push(error.message));
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await elsewhere?.close();
  });

  async function shot(name: string): Promise<void> {
    await page.screenshot({ path: join(RESULTS, `robustness-${name}.png`) });
  }

  /** Drops a file on the page as a person dragging it would; `body` is text or bytes. */
  async function dropFile(name: string, body: string | number[]): Promise<void> {
    await page.evaluate(
      ({ name, body }) => {
        const part = typeof body === 'string' ? body : new Uint8Array(body);
        const transfer = new DataTransfer();
        transfer.items.add(new File([part], name));
        for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
      },
      { name, body },
    );
  }

  async function waitForFile(name: string, timeout = 60_000): Promise<void> {
    await expect.poll(() => page.getByTestId('file-summary').textContent(), { timeout }).toContain(name);
    await page.getByTestId('output-shape').waitFor({ timeout });
  }

  /** The text of the shown notice whose title holds `title` (the page keeps a hidden copy for its dialog). */
  async function notice(title: string, timeout = 30_000): Promise<string> {
    const found = page.locator('.notice:visible').filter({ hasText: title }).first();
    await found.waitFor({ timeout });
    return (await found.textContent()) ?? '';
  }

  async function dismissNotices(): Promise<void> {
    const close = page.locator('.notice-close:visible');
    while ((await close.count()) > 0) await close.first().click();
  }

  /** The page still works: the open file is the one expected and a column can be chosen. */
  async function stillUsable(fileName: string): Promise<void> {
    expect(await page.getByTestId('file-summary').textContent()).toContain(fileName);
    const first = page.locator('.lw-collist__row').first();
    await first.click();
    await expect.poll(() => page.locator('.lw-editor__title').textContent()).toBe(await first.getAttribute('data-column'));
  }

  describe('bad files', () => {
    it('opens a good file first', async () => {
      await page.goto(app.url);
      await waitForFile('household-energy-survey (invented).csv');
      await dropFile('tickets.csv', TICKETS_CSV);
      await waitForFile('tickets.csv');
    });

    it('an empty file: an error that says it is empty and what to choose; tickets.csv stays open', async () => {
      await dropFile('empty.csv', '');
      const text = await notice('Could not open empty.csv');
      expect(text).toContain('The file is empty (0 bytes).');
      expect(text).toContain('Choose a file with a header row and data rows.');
      await shot('01-empty-file');
      await stillUsable('tickets.csv');
      await dismissNotices();
    });

    it('a PNG picture named .csv: says it is a picture', async () => {
      await dropFile('photo.csv', [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
      const text = await notice('Could not open photo.csv');
      expect(text).toContain('This is not a text table: it looks like a PNG image.');
      await shot('02-picture');
      await stillUsable('tickets.csv');
      await dismissNotices();
    });

    it('a ZIP archive named .csv: says it is an archive and no workbook', async () => {
      await dropFile('archive.csv', [0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0, 0x08, 0, 1, 2, 3, 4]);
      const text = await notice('Could not open archive.csv');
      expect(text).toContain('its first bytes say it is a ZIP archive, and it is not an XLSX workbook either');
      expect(text).toContain('unpack it');
      await stillUsable('tickets.csv');
      await dismissNotices();
    });

    it('a header without rows: opens, and a warning says there is nothing to encode', async () => {
      await dropFile('header-only.csv', 'ticket,colour,amount\n');
      await waitForFile('header-only.csv');
      expect(await notice('“header-only.csv” has a header row but no data rows')).toContain('nothing to look at or encode');
      expect(await page.getByTestId('file-summary').textContent()).toContain('0 rows · 3 columns');
      await shot('03-header-only');
      await dismissNotices();
    });

    it('a quote never closed and rows of the wrong length: line, column and what was done', async () => {
      await dropFile('quotes.csv', 'id,comment,n\na1,fine,1\na2,short\na3,"opens here,3\na4,never closed,4\n');
      await waitForFile('quotes.csv');
      const unclosed = await notice('A quote opened on line 4 is never closed');
      expect(unclosed).toContain('Everything from line 4, column 2 (“comment”) to the end of the file was read as that one cell');
      const shape = await notice('1 row has the wrong number of fields');
      expect(shape).toContain('Line 3 has 2 of 3 fields: column 3 (“n”) is empty (missing).');
      await shot('04-quotes-and-fields');
      await dismissNotices();
    });

    it('repeated and blank column names: renamed, and the page says to what', async () => {
      await dropFile('names.csv', 'site,site,,=cmd\nA,B,C,D\nE,F,G,H\n');
      await waitForFile('names.csv');
      const text = await notice('2 column names were changed on line 1');
      expect(text).toContain('column 2 repeats the name “site” and is called “site (2)”');
      expect(text).toContain('column 3 has no name and is called “column 3”');
      await shot('05-renamed-columns');
      await dismissNotices();
    });

    it('Windows-1252 accents and UTF-16 text read as the letters they are, and the encoding used is shown', async () => {
      // Windows-1252: ü is 0xFC, é is 0xE9 (WHATWG Encoding Standard, index-windows-1252).
      const latin = [...'town,n\nZ'].map((c) => c.charCodeAt(0)).concat([0xfc], [...'rich,1\nCaf'].map((c) => c.charCodeAt(0)), [0xe9], [...',2\nZ'].map((c) => c.charCodeAt(0)), [0xfc], [...'rich,3\n'].map((c) => c.charCodeAt(0)));
      await dropFile('towns.csv', latin);
      await waitForFile('towns.csv');
      expect(await page.getByTestId('file-summary').textContent()).toContain('comma-separated, WINDOWS-1252');
      await expect.poll(() => page.locator('.grid-leaf[data-output]').evaluateAll((cells) => cells.map((c) => c.getAttribute('data-output')))).toContain('town=Café');
      // UTF-16 little endian with its byte order mark FF FE.
      const text = 'city,n\nKöln,1\n東京,2\nKöln,3\n';
      const utf16 = [0xff, 0xfe, ...[...text].flatMap((c) => [c.charCodeAt(0) & 0xff, c.charCodeAt(0) >> 8])];
      await dropFile('cities.csv', utf16);
      await waitForFile('cities.csv');
      expect(await page.getByTestId('file-summary').textContent()).toContain('comma-separated, UTF-16LE');
      await expect.poll(() => page.locator('.grid-leaf[data-output]').evaluateAll((cells) => cells.map((c) => c.getAttribute('data-output')))).toContain('city=東京');
    });

    it('a file declared UTF-8 by its byte order mark but holding other bytes: refused, naming the line and showing the bytes', async () => {
      // EF BB BF declares UTF-8; 0xFC on its own is no UTF-8 character (WHATWG Encoding Standard §4.1).
      const ascii = (s: string): number[] => [...s].map((c) => c.charCodeAt(0));
      const bytes = [0xef, 0xbb, 0xbf, ...ascii('town,n\nLyon,1\nZ'), 0xfc, ...ascii('rich,2\nLyon,3\n')];
      await dropFile('declared.csv', bytes);
      const text = await notice('Could not open declared.csv');
      expect(text).toContain('The file is not valid UTF-8: byte \\xFC (offset 18) is not part of any UTF-8 character, in "Z\\xFCrich,2"');
      expect(text).toContain(`"Z\\xFCrich,2" (line 3).`);
      expect(text).toContain('save it again as UTF-8 CSV');
      await shot('05b-not-utf8');
      await dismissNotices();
    });

    it('a file larger than the page holds: refused before reading, pointing to the command line', async () => {
      // The limit is lowered through the page's address so that a 2 MB file is over it.
      await page.goto(`${app.url}?max-file-mb=1`);
      await waitForFile('household-energy-survey (invented).csv');
      await page.evaluate(() => {
        const transfer = new DataTransfer();
        transfer.items.add(new File(['id,n\n' + 'x,1\n'.repeat(500_000)], 'export-2024.csv'));
        for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
      });
      const text = await notice('Could not open export-2024.csv');
      expect(text).toContain('“export-2024.csv” is 1.9 MB; the page opens files up to 1.0 MB');
      expect(text).toContain('Nothing was read.');
      expect(text).toContain('levelwise draft "export-2024.csv" -o recipe.json');
      await shot('06-too-large');
      await stillUsable('household-energy-survey (invented).csv');
      await page.goto(app.url);
      await waitForFile('household-energy-survey (invented).csv');
    });
  });

  describe('very wide and very varied files', () => {
    it('10,000 columns: open, every column listed, a column can be decided about', async () => {
      await page.evaluate(() => {
        const columns = 10_000;
        const header = Array.from({ length: columns }, (_, i) => `q${i + 1}`).join(',');
        const rows = Array.from({ length: 30 }, (_, r) => Array.from({ length: columns }, (_, c) => (r + c) % 3).join(','));
        const transfer = new DataTransfer();
        transfer.items.add(new File([`${header}\n${rows.join('\n')}\n`], 'wide.csv'));
        for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
      });
      await waitForFile('wide.csv', 120_000);
      expect(await page.getByTestId('file-summary').textContent()).toContain('30 rows · 10,000 columns');
      await expect.poll(() => page.getByTestId('output-shape').textContent(), { timeout: 60_000 }).toContain('30 rows × 10,000 columns');
      // Only the rows in view are drawn; the keyboard still reaches every column.
      expect(await page.locator('.lw-collist__row').count()).toBeLessThan(60);
      await page.locator('.lw-collist__row[data-column="q2"]').click();
      await page.getByRole('radio', { name: 'left out', exact: true }).check();
      await expect.poll(() => page.getByTestId('output-shape').textContent(), { timeout: 60_000 }).toContain('30 rows × 9,999 columns');
      await shot('07-ten-thousand-columns');
      await page.locator('.lw-collist__row[data-column="q2"]').focus();
      await page.keyboard.press('End');
      await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-column'))).toBe('q10000');
      await expect.poll(() => page.locator('.lw-editor__title').textContent()).toBe('q10000');
      expect(await page.locator('.lw-collist__row[data-column="q10000"]').getAttribute('aria-posinset')).toBe('10000');
      // The width tab lists the widest 200 and counts the rest.
      await page.getByRole('tab', { name: /Output width/ }).click();
      expect(await page.getByTestId('width-more').textContent()).toBe('… and 9,800 more source columns, making 9,799 output columns in all.');
      await page.getByRole('tab', { name: /^Column/ }).click();
    });

    it('100,000 distinct values: drafted with the rare ones grouped; the width meter steers it further', async () => {
      // 200,000 rows of invented site codes, each code on two rows.
      await page.evaluate(() => {
        const lines = ['row,site,score'];
        for (let r = 0; r < 200_000; r++) lines.push(`${r + 1},S${(r % 100_000).toString(36).padStart(4, '0')},${r % 5}`);
        const transfer = new DataTransfer();
        transfer.items.add(new File([`${lines.join('\n')}\n`], 'sites.csv'));
        for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: transfer, bubbles: true, cancelable: true }));
      });
      await waitForFile('sites.csv', 120_000);
      const site = page.locator('.lw-collist__row[data-column="site"]');
      await expect.poll(() => site.textContent()).toContain('101 output columns');
      expect(await site.textContent()).toContain('100,000 distinct');
      await site.click();
      expect(await page.locator('.lw-editor__reason').textContent()).toContain('only the 100 most frequent keep their own column and the rest are grouped');
      expect(await page.locator('.lw-rare').textContent()).toContain('99,900 levels (199,800 rows) grouped into “(other)”');
      await shot('08-many-levels-column');

      // Stopping the grouping would encode 100,000 levels: refused, with what to do.
      await page.locator('.lw-rare').getByRole('button', { name: 'Stop grouping' }).click();
      const refused = await notice('That change was not made');
      expect(refused).toContain('“site” would have 100,000 levels; a column can be encoded with at most 1,000.');
      expect(refused).toContain('keep only the most frequent ones');
      await shot('09-too-many-levels-refused');
      await dismissNotices();

      await page.getByRole('tab', { name: /Output width/ }).click();
      const warning = page.locator('.lw-width__warning[data-column="site"]');
      expect(await warning.textContent()).toContain('site makes 101 output columns, more than 30.');
      await shot('10-width-meter');
      await page.getByRole('button', { name: 'Keep the 20 most frequent levels of site' }).click();
      await expect.poll(() => page.locator('tr[data-column="site"] [data-after]').getAttribute('data-after')).toBe('21');
      await expect.poll(() => warning.count()).toBe(0);
      await stillUsable('sites.csv');
    });
  });

  describe('bad recipes', () => {
    async function openReuse(): Promise<void> {
      await page.getByRole('button', { name: 'Re-use a recipe…' }).click();
      await page.getByRole('dialog', { name: 'Re-use a recipe on a new file' }).waitFor();
    }

    async function loadRecipe(name: string, text: string): Promise<void> {
      await page.getByTestId('reuse-recipe-input').setInputFiles({ name, mimeType: 'application/json', buffer: Buffer.from(text) });
    }

    async function recipeProblem(): Promise<string> {
      const problem = page.locator('.reuse .inline-problem[role="alert"]').first();
      await problem.waitFor();
      return (await problem.textContent()) ?? '';
    }

    let recipeText = '';

    it('takes away a good recipe first', async () => {
      await dropFile('tickets.csv', TICKETS_CSV);
      await waitForFile('tickets.csv');
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Recipe', exact: true }).click()]);
      const { readFileSync } = await import('node:fs');
      recipeText = readFileSync(await download.path(), 'utf8');
      expect(JSON.parse(recipeText)).toMatchObject({ kind: 'levelwise.recipe', version: 1 });
      await openReuse();
    });

    it('not JSON: says so, with the line and column', async () => {
      await loadRecipe('broken.recipe.json', recipeText.replace('"version": 1,', '"version": 1'));
      const text = await recipeProblem();
      // The comma after "version" (line 3) is gone: the text stops being JSON where line 4's field begins.
      expect(text).toMatch(/The recipe is not valid JSON at line 4, column 3: Expected ',' or '}' after property value\./);
      await page.getByRole('dialog').screenshot({ path: join(RESULTS, 'robustness-11-recipe-not-json.png') });
    });

    it('a __proto__ key: refused as an unknown field, and the page’s objects are untouched', async () => {
      await loadRecipe('proto.recipe.json', recipeText.replace('{', '{"__proto__": {"polluted": "yes"}, "constructor": {"prototype": {"polluted": "yes"}},'));
      expect(await recipeProblem()).toContain('unknown fields "__proto__", "constructor"; remove them.');
      expect(await page.evaluate(() => ({ polluted: ({} as Record<string, unknown>)['polluted'], names: Object.getOwnPropertyNames(Object.prototype).length }))).toEqual({
        polluted: undefined,
        names: await page.evaluate(() => Object.getOwnPropertyNames(Object.getPrototypeOf({})).length),
      });
      expect(await page.evaluate(() => Object.prototype.hasOwnProperty.call(Object.prototype, 'polluted'))).toBe(false);
    });

    it('a 65 MB file: refused on its size, before it is read', async () => {
      await page.evaluate(() => {
        const input = document.querySelector<HTMLInputElement>('[data-testid="reuse-recipe-input"]')!;
        const transfer = new DataTransfer();
        transfer.items.add(new File([new Uint8Array(65 * 1024 * 1024)], 'huge.recipe.json', { type: 'application/json' }));
        input.files = transfer.files;
        input.dispatchEvent(new Event('change', { bubbles: true }));
      });
      await expect.poll(recipeProblem).toContain('The recipe file is 65 MB; a recipe is at most 64 MB.');
      await page.getByRole('dialog').screenshot({ path: join(RESULTS, 'robustness-12-recipe-too-large.png') });
    });

    it('a recipe made for another file: says so with both sets of names, and encodes nothing', async () => {
      await loadRecipe('tickets.recipe.json', recipeText);
      await expect.poll(() => page.getByTestId('reuse-recipe-summary').textContent()).toContain('“tickets.csv”');
      await page.getByTestId('reuse-data-input').setInputFiles({ name: 'sensors.csv', mimeType: 'text/csv', buffer: Buffer.from('sensor,reading\nA,1\nB,2\n') });
      const text = await recipeProblem();
      expect(text).toContain('None of the recipe’s 3 columns (“ticket”, “colour”, “amount”) is in “sensors.csv”');
      expect(text).toContain('It was made for “tickets.csv”.');
      expect(await page.getByTestId('reuse-report').count()).toBe(0);
      await page.getByRole('dialog').screenshot({ path: join(RESULTS, 'robustness-13-recipe-other-file.png') });
    });

    it('the right file then gets its report and its encoded CSV: the dialog still works', async () => {
      await page.getByTestId('reuse-data-input').setInputFiles({ name: 'tickets-again.csv', mimeType: 'text/csv', buffer: Buffer.from(TICKETS_CSV) });
      await page.getByTestId('reuse-report').waitFor({ timeout: 30_000 });
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download the encoded CSV of this file' }).click()]);
      expect(download.suggestedFilename()).toBe('tickets-again — encoded.csv');
      await page.keyboard.press('Escape');
    });
  });

  describe('nothing leaves the machine', () => {
    it('the page’s own code never runs into its policy: no script evaluated from text (a library probing for `new Function` would be reported)', async () => {
      const violations = await page.evaluate(() => (globalThis as unknown as { __policyViolations: string[] }).__policyViolations);
      expect(violations.filter((v) => v.startsWith('script-src'))).toEqual([]);
    });

    it('the page’s own attempts to reach another origin are blocked by its Content-Security-Policy', async () => {
      const outcome = await page.evaluate(async (target) => {
        const violations: { directive: string; blocked: string }[] = [];
        document.addEventListener('securitypolicyviolation', (e) => violations.push({ directive: e.effectiveDirective, blocked: e.blockedURI }));
        const attempts: Record<string, string> = {};
        try {
          await fetch(target, { method: 'POST', body: 'cell values', mode: 'no-cors' });
          attempts['fetch'] = 'sent';
        } catch (error) {
          attempts['fetch'] = `blocked: ${(error as Error).name}`;
        }
        // sendBeacon only queues (it answers true); the policy stops the request itself, reported below.
        navigator.sendBeacon(target, 'cell values');
        attempts['image'] = await new Promise<string>((resolve) => {
          const image = new Image();
          image.onload = () => resolve('loaded');
          image.onerror = () => resolve('blocked');
          image.src = `${target}pixel.png`;
        });
        attempts['websocket'] = await new Promise<string>((resolve) => {
          try {
            const socket = new WebSocket(target.replace('http', 'ws'));
            socket.onopen = () => resolve('open');
            socket.onerror = () => resolve('blocked');
          } catch {
            resolve('blocked');
          }
        });
        await new Promise((resolve) => setTimeout(resolve, 300));
        return { attempts, violations };
      }, elsewhere.url);
      expect(outcome.attempts).toEqual({ fetch: 'blocked: TypeError', image: 'blocked', websocket: 'blocked' });
      // The policy is both sent as a header and written in the page's <meta>: each enforces it, each reports.
      const blocked = [...new Set(outcome.violations.map((v) => `${v.directive} ${v.blocked}`))].sort();
      const ws = elsewhere.url.replace('http', 'ws');
      expect(blocked).toEqual([`connect-src ${elsewhere.url}`, `connect-src ${ws}`, `img-src ${elsewhere.url}pixel.png`].sort());
    });

    it('the worker’s own attempt is blocked by the policy its script was served with', async () => {
      const worker = page.workers().find((w) => /workbench\.worker/.test(w.url()));
      expect(worker, 'the workbench worker is running').toBeDefined();
      const outcome = await worker!.evaluate(async (target) => {
        const violations: string[] = [];
        self.addEventListener('securitypolicyviolation', (e) => violations.push((e as SecurityPolicyViolationEvent).effectiveDirective));
        let attempt: string;
        try {
          await fetch(target, { method: 'POST', body: 'cell values', mode: 'no-cors' });
          attempt = 'sent';
        } catch (error) {
          attempt = `blocked: ${(error as Error).name}`;
        }
        await new Promise((resolve) => setTimeout(resolve, 300));
        return { attempt, violations };
      }, elsewhere.url);
      expect(outcome).toEqual({ attempt: 'blocked: TypeError', violations: ['connect-src'] });
    });

    it('no connection reached the other origin, no request left localhost, and no script error was raised', () => {
      expect(elsewhere.connections()).toBe(0);
      // Chromium reports an image the policy blocked as a request that failed with "csp"; it never left.
      const outside = requests.filter((url) => !url.startsWith(app.url) && !url.startsWith('blob:') && !url.startsWith('data:'));
      expect(outside.filter((url) => stopped.get(url) !== 'csp')).toEqual([]);
      expect(outside.every((url) => url.startsWith(elsewhere.url))).toBe(true);
      expect(requests.length).toBeGreaterThan(3);
      expect(pageErrors).toEqual([]);
    });
  });
});
