/**
 * The page served with a Content-Security-Policy that does not allow WebAssembly (the production
 * policy without 'wasm-unsafe-eval', as a host that kept an older policy would send it): the
 * worker and the segment workers cannot compile the record scanner, read with its JavaScript twin,
 * and the file opens all the same, every row and value read; the encoded CSV is written by the
 * writer's JavaScript row loop, every line.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, launchChromium } from './helpers/browser.ts';
import { RESULTS, buildAndServe, type ServedApp } from './helpers/server.ts';
import { CONTENT_SECURITY_POLICY } from '../../vite.config.ts';

const available = browserAvailable();

/** An invented 900,000-row file of ~20 MB: past 16 MB, so segment workers read part of it. */
const ROWS = 900_000;
function inventedFile(): Buffer {
  const colours = ['red', 'blue', 'green'];
  const lines = ['id,colour,amount'];
  for (let i = 1; i <= ROWS; i++) lines.push(`R-${String(i).padStart(7, '0')},${colours[i % 3]},${(i % 1000) / 4}`);
  return Buffer.from(`${lines.join('\n')}\n`);
}

describe.skipIf(!available)('the page under a policy that refuses WebAssembly', () => {
  let app: ServedApp;
  let browser: Browser;
  let page: Page;
  const pageErrors: string[] = [];
  const policy = CONTENT_SECURITY_POLICY.replace(" 'wasm-unsafe-eval'", '');

  beforeAll(async () => {
    mkdirSync(RESULTS, { recursive: true });
    app = await buildAndServe('e2e-strict-policy-dist', { contentSecurityPolicy: policy });
    browser = await launchChromium();
    page = await (await browser.newContext({ viewport: { width: 1280, height: 800 } })).newPage();
    page.on('pageerror', (error) => pageErrors.push(error.message));
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('is served without WebAssembly in its policy', () => {
    expect(policy).not.toContain('wasm-unsafe-eval');
    expect(policy).toContain("script-src 'self';");
  });

  it('opens a 20 MB file read in segments with the JavaScript scanner: every row, every value', async () => {
    await page.goto(app.url);
    await page.getByTestId('output-shape').waitFor({ timeout: 60_000 });
    // The segment workers start two seconds after the page (src/worker/segment-pool.ts).
    await page.waitForTimeout(2500);
    await page.getByTestId('open-file-input').setInputFiles({ name: 'invented.csv', mimeType: 'text/csv', buffer: inventedFile() });
    const summary = page.getByTestId('file-summary');
    await expect.poll(() => summary.textContent(), { timeout: 60_000 }).toContain('900,000 rows');
    expect(await summary.getAttribute('data-scanner')).toBe('javascript');
    // colour: red, blue, green in turn; amount: (i mod 1000) ÷ 4, so 1,000 distinct values.
    const columns = page.getByRole('listbox').first();
    await expect.poll(() => columns.textContent(), { timeout: 30_000 }).toContain('3 distinct');
    expect(await columns.textContent()).toContain('1,000 distinct');
    expect(await page.getByTestId('output-shape').textContent()).toContain('900,000 rows');
    await page.screenshot({ path: join(RESULTS, 'strict-policy-javascript-scanner.png') });
    expect(pageErrors).toEqual([]);
  });

  it('writes the encoded CSV with the JavaScript row loop: a header and every row', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Encoded CSV', exact: true }).click()]);
    const lines = readFileSync(await download.path(), 'utf8').split('\r\n');
    // RFC 4180 §2.1: CRLF after every record, the last included; so one empty string after the split.
    expect(lines).toHaveLength(ROWS + 2);
    expect(lines.at(-1)).toBe('');
    // Row 1: R-0000001, blue (1 mod 3 = 1), amount 0.25; the columns as the preview shows them.
    expect(lines[0]).toBe('id,colour=blue,colour=green,colour=red,amount');
    expect(lines[1]).toBe('R-0000001,1,0,0,0.25');
    expect(lines[ROWS]).toBe('R-0900000,0,0,1,0');
  });
});
