/**
 * The page side of the benchmark: the workbench's production build, served by `vite preview`, in
 * Debian's Chromium (/usr/bin/chromium) driven by playwright-core, with the 1M-row file.
 *
 *   npm run bench:page                     measures; writes the figures under "page" in bench/results.json
 *   npm run bench:page -- --no-write       prints only
 *   npm run bench:page -- --rows 100000    another file from bench/data (the targets are set for 1M rows)
 *
 * What is measured, in this order, in one fresh browser profile:
 *   cancel     a load of the file is started over the demo, cancelled at ~20 %: the bar goes, the demo
 *              stays, and the worker answers the next preview at once (it really stopped);
 *   load       the file set on the page's file input (`setInputFiles`, the worker streams the File):
 *              time until the preview shows encoded rows, the progress bar's values sampled every
 *              250 ms, every main-thread task over 50 ms (PerformanceObserver 'longtask', registered
 *              before the page's own scripts run), and the JS heap of page and worker sampled over CDP;
 *   decisions  five decisions on the loaded file, each timed from the click's event time to the
 *              preview grid showing the new header or cells (a MutationObserver in the page);
 *   download   the "Encoded CSV" button, until playwright's download has finished; its size, line
 *              count and first and last lines are checked, and the main thread watched as during load;
 *   side by side  in a fresh browser context, three times in turn: papaparse alone in a worker of
 *              this browser (Papa.parse of the File's text, the text read first and not counted),
 *              then the workbench in a fresh page loading the same File 3 s after its demo is shown
 *              (a person choosing a file), from the change event to the file summary shown (read,
 *              profiled, drafted, told to the page): profiling in the worker against papaparse
 *              parsing alone, the ratio the Node table gives for the command line.
 *
 * Missed targets are printed as FAIL and recorded; the exit code stays 0 (a report, not a test).
 */
import { createReadStream, existsSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from 'playwright-core';
import { CHROMIUM, CHROMIUM_ARGS } from '../test/e2e/helpers/browser.ts';
import { buildAndServe, type ServedApp } from '../test/e2e/helpers/server.ts';
import { describeMachine, machineLine, type Machine } from './lib/machine.ts';
import { renderTable } from './lib/report.ts';
import { atMost, BYTES_PER_MB, median, TARGETS, type Verdict } from './lib/stats.ts';

const BENCH_DIR = dirname(fileURLToPath(import.meta.url));
const PROJECT_ROOT = join(BENCH_DIR, '..');
const RESULTS_FILE = join(BENCH_DIR, 'results.json');

export const PAGE_REFERENCE_ROWS = 1_000_000;

export const PAGE_TARGETS = {
  /** Longest main-thread task while loading or writing the encoded CSV, ms. */
  longestTaskMs: 100,
  /** JS heap (V8 heap + array buffers) of page and worker together after loading ÷ file size. */
  heapOverFile: 2,
  /** Median time from a decision's click to the preview showing its result, ms. */
  decisionMs: 100,
} as const;

const SAMPLE_EVERY_MS = 250;
/** After a cancel, a decision on the previous table must reach its preview within this (a worker still reading takes seconds). */
const CANCEL_NEXT_PREVIEW_MS = 1000;
const LOAD_TIMEOUT_MS = 10 * 60_000;
const DEMO_NAME = 'household-energy-survey (invented).csv';
const DEMO_ROWS = 2000;

const progress = (text: string): void => void process.stderr.write(`${text}\n`);
const sleep = (ms: number): Promise<void> => new Promise((done) => setTimeout(done, ms));
const rowsText = (rows: number): string => `${rows.toLocaleString('en-GB')} rows`;

// ---------------------------------------------------------------------------------------------
// Results

export interface LongTasks {
  /** Tasks over 50 ms (the 'longtask' threshold). */
  readonly count: number;
  /** Of those, tasks over the target. */
  readonly overTarget: number;
  readonly maxMs: number;
  /** Every duration, longest first (at most 20). */
  readonly longestMs: readonly number[];
}

export interface HeapFigures {
  /** V8 heap in use. */
  readonly heapBytes: number;
  /** Array buffers and external strings (the table's typed arrays live here). */
  readonly backingBytes: number;
}

export interface MemoryFigures {
  readonly page: HeapFigures;
  readonly worker: HeapFigures;
  /** The segment workers the worker starts for big files (src/worker/segment-pool.ts), summed. */
  readonly segmentWorkers: HeapFigures;
  readonly totalBytes: number;
}

export interface PageResults {
  readonly machine: Machine;
  /** The 1-minute load average when the page measurements started and ended: how busy the machine was. */
  readonly loadAverage: { readonly start: number; readonly end: number };
  readonly browser: string;
  readonly file: string;
  readonly rows: number;
  readonly bytes: number;
  readonly targets: typeof PAGE_TARGETS;
  readonly cancel: {
    readonly percentAtCancel: number;
    /** From the click on Cancel to the progress bar gone. */
    readonly barGoneMs: number;
    readonly previousTableKept: boolean;
    /** A decision on the previous table right after: time until its preview updated (the worker is free). */
    readonly nextPreviewMs: number;
    readonly pass: boolean;
  };
  readonly load: {
    /** From the file input's change event to the preview showing encoded rows of the file. */
    readonly seconds: number;
    /** Milestones from the change event, seconds: reading done (profiling shown), file summary shown, preview filled. */
    readonly milestonesSeconds: Readonly<Record<string, number | null>>;
    /** Distinct values of the progress bar, in the order seen. */
    readonly progressValues: readonly number[];
    readonly progressSamples: number;
    readonly progressStrictlyIncreasing: boolean;
    readonly longTasks: LongTasks;
    readonly longestTask: Verdict;
    /** Largest page + worker total seen while loading (sampled every 250 ms, garbage not yet collected included). */
    readonly peakMemory: MemoryFigures;
    /** After loading and two full collections in each: what holding the file costs. */
    readonly settledMemory: MemoryFigures;
    /** settledMemory ÷ file size: the target. */
    readonly settledOverFile: Verdict;
    /** peakMemory ÷ file size, judged against the same bound for information. */
    readonly peakOverFile: Verdict;
  };
  readonly decisions: {
    readonly runs: readonly { readonly decision: string; readonly ms: number }[];
    readonly medianMs: number;
    readonly verdict: Verdict;
    readonly longTasks: LongTasks;
  };
  readonly download: {
    readonly seconds: number;
    readonly bytes: number;
    readonly lines: number;
    readonly firstLine: string;
    readonly lastLine: string;
    readonly matches: boolean;
    /** How the page assembles the file (read from src/ui/files/save.ts). */
    readonly how: string;
    readonly longTasks: LongTasks;
    readonly longestTask: Verdict;
    readonly peakPageMemory: HeapFigures;
  };
  /** Profiling in the page's worker against papaparse in a worker of the same browser, same File, interleaved. */
  readonly sideBySide: {
    readonly runs: readonly { readonly profileSeconds: number; readonly parseSeconds: number; readonly textSeconds: number }[];
    /** Medians: change event → file summary shown; Papa.parse alone; the File's text read for it (not counted). */
    readonly profileSeconds: number;
    readonly parseSeconds: number;
    readonly textSeconds: number;
    /** profileSeconds ÷ parseSeconds against TARGETS.profileOverParse. */
    readonly verdict: Verdict;
    /**
     * For information: profileSeconds ÷ the median of each run's File.text() + Papa.parse, the file
     * read on both sides (the workbench's time includes reading the File).
     */
    readonly withReadRatio: number;
  };
  readonly notes: readonly string[];
}

// ---------------------------------------------------------------------------------------------
// Serving the production build

// ---------------------------------------------------------------------------------------------
// What runs in the page before its own scripts: the long-task observer, and no save picker.

/** State the probes keep in the page; read back with page.evaluate. */
interface BenchState {
  longTasks: { start: number; duration: number }[];
  marks: Record<string, number | null>;
  samples: { t: number; value: number | null; label: string }[];
}

declare global {
  interface Window {
    __levelwiseBench?: BenchState;
  }
}

function installPageProbes(): void {
  const state: BenchState = { longTasks: [], marks: {}, samples: [] };
  window.__levelwiseBench = state;
  new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) state.longTasks.push({ start: entry.startTime, duration: entry.duration });
  }).observe({ type: 'longtask', buffered: true });
  // The encoded CSV of 1M rows is estimated above the page's streaming threshold, where Chromium
  // would open a save dialog; without the picker the page takes its other path, one Blob of the
  // parts and a download, as in browsers without the File System Access API.
  Object.defineProperty(window, 'showSaveFilePicker', { value: undefined, configurable: true });
}

async function longTasksBetween(page: Page, from: number, to: number): Promise<LongTasks> {
  const durations = await page.evaluate(
    ([a, b]) => (window.__levelwiseBench?.longTasks ?? []).filter((t) => t.start + t.duration >= a && t.start <= b).map((t) => t.duration),
    [from, to] as const,
  );
  const sorted = [...durations].sort((x, y) => y - x);
  return {
    count: sorted.length,
    overTarget: sorted.filter((d) => d > PAGE_TARGETS.longestTaskMs).length,
    maxMs: sorted[0] ?? 0,
    longestMs: sorted.slice(0, 20).map((d) => Math.round(d)),
  };
}

const now = (page: Page): Promise<number> => page.evaluate(() => performance.now());

// ---------------------------------------------------------------------------------------------
// Heap of the page, its worker and the worker's segment workers, over CDP. The worker is reached
// through Target.setAutoAttach without flattening: its protocol messages travel inside
// Target.sendMessageToTarget. The segment workers are the worker's own children, so they are
// auto-attached inside the worker's session, and reached through one more such envelope.

class HeapProbe {
  private workerSession: string | null = null;
  /** Sessions of the segment workers, inside the worker's session. */
  private readonly segmentSessions = new Set<string>();
  private nextId = 1;
  private readonly waiting = new Map<number, (result: unknown) => void>();

  private constructor(private readonly cdp: CDPSession) {}

  static async attach(page: Page): Promise<HeapProbe> {
    const cdp = await page.context().newCDPSession(page);
    const probe = new HeapProbe(cdp);
    cdp.on('event', ({ method, params }) => probe.onEvent(method, params as Record<string, unknown>));
    await cdp.send('Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: false, flatten: false });
    for (let i = 0; i < 50 && probe.workerSession === null; i++) await sleep(100);
    if (probe.workerSession === null) throw new Error('The page has no worker to measure (Target.setAutoAttach found none).');
    await probe.inWorker('Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: false, flatten: false });
    return probe;
  }

  private onEvent(method: string, params: Record<string, unknown>): void {
    if (method === 'Target.attachedToTarget') {
      const info = params['targetInfo'] as { type?: string } | undefined;
      if (info?.type === 'worker') this.workerSession = String(params['sessionId']);
    } else if (method === 'Target.detachedFromTarget' && params['sessionId'] === this.workerSession) {
      this.workerSession = null;
    } else if (method === 'Target.receivedMessageFromTarget' && params['sessionId'] === this.workerSession) {
      this.fromWorker(JSON.parse(String(params['message'])) as WorkerMessage);
    }
  }

  /** A message from the worker: an answer, or an event about (or from) one of its segment workers. */
  private fromWorker(message: WorkerMessage): void {
    if (message.id !== undefined) {
      this.answered(message);
      return;
    }
    const params = message.params ?? {};
    if (message.method === 'Target.attachedToTarget') this.segmentSessions.add(String(params['sessionId']));
    else if (message.method === 'Target.detachedFromTarget') this.segmentSessions.delete(String(params['sessionId']));
    else if (message.method === 'Target.receivedMessageFromTarget') this.answered(JSON.parse(String(params['message'])) as WorkerMessage);
  }

  private answered(message: WorkerMessage): void {
    if (message.id === undefined) return;
    this.waiting.get(message.id)?.(message.result ?? message.error);
    this.waiting.delete(message.id);
  }

  /** A protocol command inside the worker; answered when the worker's thread next takes messages. */
  private inWorker(method: string, params: Record<string, unknown> = {}): Promise<unknown> {
    const sessionId = this.workerSession;
    if (sessionId === null) return Promise.reject(new Error('The worker went away.'));
    const id = this.nextId++;
    const answered = new Promise<unknown>((done) => this.waiting.set(id, done));
    // The non-flattened form is not in playwright's typed parameter list, hence the cast.
    void this.cdp.send('Target.sendMessageToTarget', { sessionId, message: JSON.stringify({ id, method, params }) } as never);
    return answered;
  }

  /** A protocol command inside a segment worker: one envelope more. A worker that ends first answers nothing. */
  private inSegmentWorker(sessionId: string, method: string): Promise<unknown> {
    const id = this.nextId++;
    const answered = new Promise<unknown>((done) => this.waiting.set(id, done));
    void this.inWorker('Target.sendMessageToTarget', { sessionId, message: JSON.stringify({ id, method }) });
    return Promise.race([answered, sleep(SAMPLE_EVERY_MS).then(() => ({}))]);
  }

  async sample(): Promise<MemoryFigures> {
    const [page, worker, ...segments] = await Promise.all([
      this.cdp.send('Runtime.getHeapUsage'),
      this.inWorker('Runtime.getHeapUsage'),
      ...[...this.segmentSessions].map((session) => this.inSegmentWorker(session, 'Runtime.getHeapUsage')),
    ]);
    const figures = (usage: unknown): HeapFigures => {
      const u = usage as { usedSize?: number; backingStorageSize?: number };
      return { heapBytes: u.usedSize ?? 0, backingBytes: u.backingStorageSize ?? 0 };
    };
    const pageFigures = { heapBytes: page.usedSize, backingBytes: page.backingStorageSize };
    const workerFigures = figures(worker);
    const segmentFigures = segments.map(figures).reduce((a, b) => ({ heapBytes: a.heapBytes + b.heapBytes, backingBytes: a.backingBytes + b.backingBytes }), { heapBytes: 0, backingBytes: 0 });
    return { page: pageFigures, worker: workerFigures, segmentWorkers: segmentFigures, totalBytes: sum(pageFigures) + sum(workerFigures) + sum(segmentFigures) };
  }

  async settled(): Promise<MemoryFigures> {
    for (let i = 0; i < 2; i++) {
      await this.cdp.send('HeapProfiler.collectGarbage');
      await this.inWorker('HeapProfiler.collectGarbage');
      await Promise.all([...this.segmentSessions].map((session) => this.inSegmentWorker(session, 'HeapProfiler.collectGarbage')));
    }
    return this.sample();
  }
}

interface WorkerMessage {
  readonly id?: number;
  readonly method?: string;
  readonly params?: Record<string, unknown>;
  readonly result?: unknown;
  readonly error?: unknown;
}

const sum = (h: HeapFigures): number => h.heapBytes + h.backingBytes;

/** Samples memory every SAMPLE_EVERY_MS until `work` settles; returns its value and the sample with the largest total. */
async function peakWhile<T>(probe: HeapProbe, work: Promise<T>): Promise<{ value: T; peak: MemoryFigures }> {
  let finished = false;
  let peak: MemoryFigures | null = null;
  const sampling = (async () => {
    while (!finished) {
      const sample = await probe.sample();
      if (peak === null || sample.totalBytes > peak.totalBytes) peak = sample;
      await sleep(SAMPLE_EVERY_MS);
    }
  })();
  try {
    const value = await work;
    return { value, peak: peak ?? (await probe.sample()) };
  } finally {
    finished = true;
    await sampling;
  }
}

// ---------------------------------------------------------------------------------------------
// The page, as a person uses it

async function waitForTable(page: Page, name: string, rows: number): Promise<void> {
  await page.waitForFunction(
    ([n, r]) => {
      const text = document.querySelector('[data-testid="file-summary"]')?.textContent ?? '';
      return text.includes(n) && text.includes(r) && document.querySelector('[data-testid="output-shape"]') !== null;
    },
    [name, rowsText(rows)] as const,
    { timeout: LOAD_TIMEOUT_MS, polling: 200 },
  );
  await waitForFilledPreview(page);
}

/** The preview grid has cells, none waiting for the worker. */
async function waitForFilledPreview(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelector('.grid-cell') !== null && document.querySelector('.grid-cell.is-pending') === null, undefined, {
    timeout: LOAD_TIMEOUT_MS,
    polling: 100,
  });
}

async function chooseColumn(page: Page, name: string): Promise<void> {
  await page.getByRole('option', { name: new RegExp(`^${name}\\b`) }).click();
  await page.waitForFunction((n) => document.querySelector('.lw-editor__title')?.textContent === n, name);
  await waitForFilledPreview(page);
}

/**
 * Starts watching the preview grid: resolves with the time (performance.now) at which the grid,
 * with no cell waiting, differs from now in its output headers or its first rows' cells; and
 * records the event time of the next click or change as the start.
 */
async function watchPreviewChange(page: Page): Promise<void> {
  await page.evaluate(() => {
    const state = window.__levelwiseBench!;
    const snapshot = (): string => {
      const heads = [...document.querySelectorAll('.grid-leaf[data-output]')].map((h) => h.getAttribute('data-output')).join('|');
      const cells = [...document.querySelectorAll('[role="row"][aria-rowindex="3"] .grid-cell, [role="row"][aria-rowindex="4"] .grid-cell')]
        .map((c) => c.textContent)
        .join('|');
      return `${heads}#${cells}`;
    };
    const before = snapshot();
    state.marks['actionAt'] = null;
    state.marks['shownAt'] = null;
    const onAction = (event: Event): void => {
      state.marks['actionAt'] ??= event.timeStamp;
    };
    document.addEventListener('click', onAction, { capture: true, once: true });
    const observer = new MutationObserver(() => {
      if (state.marks['actionAt'] === null) return;
      if (document.querySelector('.grid-cell.is-pending') !== null || document.querySelector('.grid-cell') === null) return;
      if (snapshot() === before) return;
      state.marks['shownAt'] = performance.now();
      observer.disconnect();
    });
    observer.observe(document.body, { subtree: true, childList: true, characterData: true, attributes: true });
  });
}

/** NaN when the preview did not change within a minute. */
async function previewChangeMs(page: Page): Promise<number> {
  const changed = await page
    .waitForFunction(() => window.__levelwiseBench?.marks['shownAt'] != null, undefined, { timeout: 60_000, polling: 50 })
    .then(() => true, () => false);
  if (!changed) return NaN;
  return page.evaluate(() => {
    const marks = window.__levelwiseBench!.marks;
    return (marks['shownAt'] ?? NaN) - (marks['actionAt'] ?? NaN);
  });
}

async function progressValue(page: Page): Promise<number | null> {
  const value = await page.locator('[role="progressbar"]').first().getAttribute('aria-valuenow', { timeout: 1000 }).catch(() => null);
  return value === null ? null : Number(value);
}

// ---------------------------------------------------------------------------------------------
// 1. Cancel

async function measureCancel(page: Page, file: string): Promise<PageResults['cancel']> {
  progress('cancel: starting a load of the file over the demo, cancelling it at ~20 %…');
  await page.getByTestId('open-file-input').setInputFiles(file);
  let percent: number | null = null;
  for (let i = 0; i < 600; i++) {
    percent = await progressValue(page);
    if (percent !== null && percent >= 20) break;
    await sleep(50);
  }
  await page.evaluate(() => {
    const state = window.__levelwiseBench!;
    state.marks['cancelAt'] = null;
    state.marks['barGoneAt'] = null;
    document.addEventListener('click', (e) => void (state.marks['cancelAt'] ??= e.timeStamp), { capture: true, once: true });
    const observer = new MutationObserver(() => {
      if (document.querySelector('[role="progressbar"]') !== null) return;
      state.marks['barGoneAt'] = performance.now();
      observer.disconnect();
    });
    observer.observe(document.body, { subtree: true, childList: true });
  });
  await page.getByRole('button', { name: 'Cancel' }).click();
  await page.waitForFunction(() => window.__levelwiseBench?.marks['barGoneAt'] != null, undefined, { timeout: 30_000 });
  const barGoneMs = await page.evaluate(() => (window.__levelwiseBench!.marks['barGoneAt'] ?? NaN) - (window.__levelwiseBench!.marks['cancelAt'] ?? NaN));
  const summary = (await page.getByTestId('file-summary').textContent()) ?? '';
  const previousTableKept = summary.includes(DEMO_NAME) && summary.includes(rowsText(DEMO_ROWS));
  // Usable at once: a decision on the demo reaches the preview while a still-busy worker would hold it for seconds.
  await chooseColumn(page, 'heating');
  await watchPreviewChange(page);
  await page.getByRole('radio', { name: 'dummy', exact: true }).check();
  const nextPreviewMs = await previewChangeMs(page);
  await page.getByRole('radio', { name: 'one-hot', exact: true }).check();
  await waitForFilledPreview(page);
  const pass = previousTableKept && Number.isFinite(barGoneMs) && nextPreviewMs < CANCEL_NEXT_PREVIEW_MS;
  return { percentAtCancel: percent ?? NaN, barGoneMs, previousTableKept, nextPreviewMs, pass };
}

// ---------------------------------------------------------------------------------------------
// 2. Load

/**
 * Watches a load about to start: marks the file input's change event, the taskbar saying the
 * columns are being looked at, the file summary naming the file and its rows, and the preview
 * filled; samples the progress bar every `every` ms.
 */
async function watchLoad(page: Page, name: string, rows: number, every: number): Promise<void> {
  await page.evaluate(
    ([n, r, every]) => {
      const state = window.__levelwiseBench!;
      for (const key of ['changeAt', 'profilingAt', 'summaryAt', 'filledAt']) state.marks[key] = null;
      state.samples = [];
      document.addEventListener(
        'change',
        (e) => {
          if (e.target instanceof HTMLInputElement && e.target.type === 'file') state.marks['changeAt'] ??= e.timeStamp;
        },
        { capture: true },
      );
      const timer = setInterval(() => {
        const bar = document.querySelector('[role="progressbar"]');
        if (bar === null) return;
        const value = bar.getAttribute('aria-valuenow');
        state.samples.push({ t: performance.now(), value: value === null ? null : Number(value), label: document.querySelector('.taskbar-label')?.textContent ?? '' });
      }, every);
      const observer = new MutationObserver(() => {
        const at = performance.now();
        if (state.marks['profilingAt'] === null && (document.querySelector('.taskbar-label')?.textContent ?? '').includes('looking at the columns')) state.marks['profilingAt'] = at;
        const summary = document.querySelector('[data-testid="file-summary"]')?.textContent ?? '';
        if (state.marks['summaryAt'] === null && summary.includes(n) && summary.includes(r)) state.marks['summaryAt'] = at;
        if (state.marks['summaryAt'] !== null && document.querySelector('[data-testid="output-shape"]') !== null && document.querySelector('.grid-cell') !== null && document.querySelector('.grid-cell.is-pending') === null) {
          state.marks['filledAt'] = at;
          observer.disconnect();
          clearInterval(timer);
        }
      });
      observer.observe(document.body, { subtree: true, childList: true, characterData: true, attributes: true });
    },
    [name, rowsText(rows), every] as const,
  );
}

/** Sets `file` on the page's file input and waits until the load watched by watchLoad has filled the preview. */
async function loadFile(page: Page, file: string): Promise<void> {
  await page.getByTestId('open-file-input').setInputFiles(file);
  await page.waitForFunction(() => window.__levelwiseBench?.marks['filledAt'] != null, undefined, { timeout: LOAD_TIMEOUT_MS, polling: 500 });
}

/** Seconds from the change event to each mark of watchLoad. */
async function loadMilestones(page: Page): Promise<{ start: number; since: (key: string) => number | null; samples: BenchState['samples'] }> {
  const { marks, samples } = await page.evaluate(() => ({ marks: window.__levelwiseBench!.marks, samples: window.__levelwiseBench!.samples }));
  const start = marks['changeAt'] ?? NaN;
  return { start, since: (key) => (marks[key] == null ? null : ((marks[key] ?? NaN) - start) / 1000), samples };
}

async function measureLoad(page: Page, probe: HeapProbe, file: string, rows: number, bytes: number): Promise<PageResults['load']> {
  progress(`load: ${relative(process.cwd(), file)} through the file input…`);
  await watchLoad(page, file.split('/').at(-1)!, rows, SAMPLE_EVERY_MS);
  const { peak } = await peakWhile(probe, loadFile(page, file));
  const { start, since, samples } = await loadMilestones(page);
  await sleep(1000); // tasks that follow the first paint of the preview belong to loading too
  const longTasks = await longTasksBetween(page, start, await now(page));
  const settledMemory = await probe.settled();
  const values = distinctInOrder(samples.filter((s) => s.value !== null).map((s) => s.value!));
  return {
    seconds: since('filledAt') ?? NaN,
    milestonesSeconds: { readingDone: since('profilingAt'), summaryShown: since('summaryAt'), previewFilled: since('filledAt') },
    progressValues: values,
    progressSamples: samples.length,
    progressStrictlyIncreasing: values.length >= 3 && values.every((v, i) => i === 0 || v > values[i - 1]!),
    longTasks,
    longestTask: atMost(longTasks.maxMs, PAGE_TARGETS.longestTaskMs),
    peakMemory: peak,
    settledMemory,
    settledOverFile: atMost(settledMemory.totalBytes / bytes, PAGE_TARGETS.heapOverFile),
    peakOverFile: atMost(peak.totalBytes / bytes, PAGE_TARGETS.heapOverFile),
  };
}

/** Consecutive repeats collapsed: [0, 0, 4, 4, 9] → [0, 4, 9]. */
function distinctInOrder(values: readonly number[]): number[] {
  return values.filter((v, i) => i === 0 || v !== values[i - 1]);
}

// ---------------------------------------------------------------------------------------------
// 3. Decisions

interface DecisionStep {
  readonly label: string;
  readonly column: string;
  /** The radio button's accessible name. */
  readonly choice: string;
}

/** Five decisions of different kinds on the benchmark file's columns (bench/generate.ts). */
const DECISIONS: readonly DecisionStep[] = [
  { label: 'heating: dummy coding', column: 'heating', choice: 'dummy' },
  { label: 'region: effect coding', column: 'region', choice: 'effect' },
  { label: 'floor_area_m2: z-score', column: 'floor_area_m2', choice: 'z-score' },
  { label: 'occupant_age_band: level nominal', column: 'occupant_age_band', choice: 'nominal' },
  { label: 'insulation_rating: level ordinal', column: 'insulation_rating', choice: 'ordinal' },
];

async function measureDecisions(page: Page): Promise<PageResults['decisions']> {
  progress('decisions: five changes on the loaded file…');
  const from = await now(page);
  const runs: { decision: string; ms: number }[] = [];
  for (const step of DECISIONS) {
    await chooseColumn(page, step.column);
    await watchPreviewChange(page);
    await page.getByRole('radio', { name: step.choice, exact: true }).check();
    runs.push({ decision: step.label, ms: await previewChangeMs(page) });
    progress(`  ${step.label}: ${runs.at(-1)!.ms.toFixed(0)} ms`);
  }
  const longTasks = await longTasksBetween(page, from, await now(page));
  const medianMs = median(runs.map((r) => r.ms));
  return { runs, medianMs, verdict: atMost(medianMs, PAGE_TARGETS.decisionMs), longTasks };
}

// ---------------------------------------------------------------------------------------------
// 4. Download

const DOWNLOAD_PATH_NOTE =
  'Blobs all the way: the worker writes the CSV into a reusable 4 MB buffer (core createCsvWriter), makes a Blob of each full buffer and posts it (a handle, not the bytes); the page keeps the Blobs and makes one Blob of them for the download (src/worker/session.ts export, src/ui/files/save.ts openPartSink); no string of the file is built and its bytes never pass through the main thread';

async function measureDownload(page: Page, probe: HeapProbe, rows: number): Promise<PageResults['download']> {
  progress('download: the encoded CSV of the loaded file…');
  const from = await now(page);
  const started = performance.now();
  const downloading = (async () => {
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: LOAD_TIMEOUT_MS }), page.getByRole('button', { name: 'Encoded CSV' }).click()]);
    const path = await download.path();
    return { path, seconds: (performance.now() - started) / 1000 };
  })();
  const { value, peak } = await peakWhile(probe, downloading);
  const longTasks = await longTasksBetween(page, from, await now(page));
  const shape = await csvShape(value.path);
  // The benchmark files number their households HH-…1 to HH-…rows (bench/generate.ts, src/demo).
  const lastId = /^HH-(\d+),/.exec(shape.lastLine)?.[1];
  const matches = shape.lines === rows + 1 && shape.firstLine.startsWith('household_id,') && Number(lastId) === rows;
  return {
    seconds: value.seconds,
    ...shape,
    matches,
    how: DOWNLOAD_PATH_NOTE,
    longTasks,
    longestTask: atMost(longTasks.maxMs, PAGE_TARGETS.longestTaskMs),
    peakPageMemory: peak.page,
  };
}

// ---------------------------------------------------------------------------------------------
// 5. Side by side: profiling in the worker against papaparse in a worker of the same browser

const PAPAPARSE_SOURCE = join(PROJECT_ROOT, 'node_modules', 'papaparse', 'papaparse.min.js');
const SIDE_BY_SIDE_REPS = 3;

/**
 * The script a page evaluates to run papaparse in a worker on its file input's File, as
 * bench/lib/paths.ts runs it in Node: records counted by a step, nothing kept. A string, so that
 * nothing of this file's compiled code has to exist in a page that is not the workbench's.
 */
function papaparseDriver(papaparse: string): string {
  const inWorker = `${papaparse}
onmessage = async (event) => {
  const t0 = performance.now();
  const text = await event.data.text();
  const t1 = performance.now();
  let records = 0;
  Papa.parse(text, { step: () => { records++; } });
  postMessage({ textMs: t1 - t0, parseMs: performance.now() - t1, records });
};`;
  return `new Promise((resolve, reject) => {
  const worker = new Worker(URL.createObjectURL(new Blob([${JSON.stringify(inWorker)}], { type: 'text/javascript' })));
  worker.onmessage = (event) => { worker.terminate(); resolve(event.data); };
  worker.onerror = (event) => reject(new Error(event.message));
  worker.postMessage(document.getElementById('file').files[0]);
})`;
}

async function papaparseInWorker(context: BrowserContext, file: string, rows: number): Promise<{ parseSeconds: number; textSeconds: number }> {
  const page = await context.newPage();
  try {
    await page.setContent('<input type="file" id="file">');
    await page.locator('#file').setInputFiles(file);
    const result = (await page.evaluate(papaparseDriver(readFileSync(PAPAPARSE_SOURCE, 'utf8')))) as { textMs: number; parseMs: number; records: number };
    // The header, the rows, and the empty record papaparse reports after the final line break.
    if (result.records !== rows + 2) throw new Error(`papaparse in the browser read ${result.records} records from a file of ${rows} rows`);
    return { parseSeconds: result.parseMs / 1000, textSeconds: result.textMs / 1000 };
  } finally {
    await page.close();
  }
}

/**
 * A person takes a few seconds to choose a file: by then the page has started its segment workers
 * (workbench.worker.ts, 2 s after start) and they have run the reader once (warm-up.ts).
 */
const CHOOSING_A_FILE_MS = 3000;

/** The workbench in a fresh page: seconds from the file input's change to the file summary shown. */
async function profileInPage(context: BrowserContext, url: string, file: string, rows: number): Promise<number> {
  const page = await context.newPage();
  try {
    await page.goto(url);
    await waitForTable(page, DEMO_NAME, DEMO_ROWS);
    await sleep(CHOOSING_A_FILE_MS);
    await watchLoad(page, file.split('/').at(-1)!, rows, SAMPLE_EVERY_MS);
    await loadFile(page, file);
    return (await loadMilestones(page)).since('summaryAt') ?? NaN;
  } finally {
    await page.close();
  }
}

async function measureSideBySide(browser: Browser, url: string, file: string, rows: number): Promise<PageResults['sideBySide']> {
  progress(`side by side: papaparse in a worker, then the workbench, ${SIDE_BY_SIDE_REPS} times in turn…`);
  // A context of its own: nothing saved by the measurements before (decisions for this file) is restored.
  const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  await context.addInitScript({ content: 'globalThis.__name = (fn) => fn;' });
  await context.addInitScript(installPageProbes);
  const runs: PageResults['sideBySide']['runs'][number][] = [];
  try {
    for (let rep = 1; rep <= SIDE_BY_SIDE_REPS; rep++) {
      const papa = await papaparseInWorker(context, file, rows);
      const profileSeconds = await profileInPage(context, url, file, rows);
      runs.push({ profileSeconds, ...papa });
      progress(`  run ${rep}/${SIDE_BY_SIDE_REPS}: papaparse ${papa.parseSeconds.toFixed(2)} s (text ${papa.textSeconds.toFixed(2)} s), workbench to summary ${profileSeconds.toFixed(2)} s`);
    }
  } finally {
    await context.close();
  }
  const profileSeconds = median(runs.map((r) => r.profileSeconds));
  const parseSeconds = median(runs.map((r) => r.parseSeconds));
  const withRead = median(runs.map((r) => r.textSeconds + r.parseSeconds));
  return {
    runs,
    profileSeconds,
    parseSeconds,
    textSeconds: median(runs.map((r) => r.textSeconds)),
    verdict: atMost(profileSeconds / parseSeconds, TARGETS.profileOverParse),
    withReadRatio: profileSeconds / withRead,
  };
}

/** Size, line count (CRLF lines) and first and last lines of a file, read as a stream. */
async function csvShape(path: string): Promise<{ bytes: number; lines: number; firstLine: string; lastLine: string }> {
  let lines = 0;
  let head = '';
  let tail = Buffer.alloc(0);
  for await (const part of createReadStream(path, { highWaterMark: 1 << 22 }) as AsyncIterable<Buffer>) {
    for (let i = part.indexOf(10); i !== -1; i = part.indexOf(10, i + 1)) lines++;
    if (head.length < 4096) head += part.subarray(0, 4096).toString('utf8');
    tail = Buffer.concat([tail, part]).subarray(-4096);
  }
  const tailLines = tail.toString('utf8').split('\r\n').filter((l) => l !== '');
  return { bytes: statSync(path).size, lines, firstLine: head.split('\r\n')[0] ?? '', lastLine: tailLines.at(-1) ?? '' };
}

// ---------------------------------------------------------------------------------------------
// The whole run

export interface PageOptions {
  readonly file: string;
  readonly rows: number;
}

export async function measurePage({ file, rows }: PageOptions): Promise<PageResults> {
  const bytes = statSync(file).size;
  const loadAtStart = loadavg()[0] ?? NaN;
  const outDir = mkdtempSync(join(tmpdir(), 'levelwise-bench-page-'));
  let served: ServedApp | null = null;
  let browser: Browser | null = null;
  try {
    progress('page: building the app and serving it with vite preview…');
    served = await buildAndServe(outDir);
    browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS, headless: true });
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 }, acceptDownloads: true });
    // tsx compiles this file keeping function names (esbuild's keepNames wraps them in __name());
    // functions handed to page.evaluate run in the page, where that helper has to exist too.
    await context.addInitScript({ content: 'globalThis.__name = (fn) => fn;' });
    await context.addInitScript(installPageProbes);
    const page = await context.newPage();
    const errors: string[] = [];
    page.on('pageerror', (error) => errors.push(error.message));
    await page.goto(served.url);
    await waitForTable(page, DEMO_NAME, DEMO_ROWS);
    const probe = await HeapProbe.attach(page);

    const cancel = await measureCancel(page, file);
    const load = await measureLoad(page, probe, file, rows, bytes);
    progress(`  loaded in ${load.seconds.toFixed(1)} s`);
    const decisions = await measureDecisions(page);
    const download = await measureDownload(page, probe, rows);
    await page.close();
    const sideBySide = await measureSideBySide(browser, served.url, file, rows);
    const notes = errors.map((e) => `page error: ${e}`);
    return {
      machine: describeMachine(),
      loadAverage: { start: loadAtStart, end: loadavg()[0] ?? NaN },
      browser: `Chromium ${browser.version()}`,
      file: relative(PROJECT_ROOT, file),
      rows,
      bytes,
      targets: PAGE_TARGETS,
      cancel,
      load,
      decisions,
      download,
      sideBySide,
      notes,
    };
  } finally {
    await browser?.close();
    await served?.close();
    rmSync(outDir, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// Printing

const mb = (bytes: number): string => `${(bytes / BYTES_PER_MB).toFixed(0)} MB`;
const passWord = (pass: boolean | null): string => (pass === null ? '—' : pass ? 'pass' : 'FAIL');
const ms = (value: number): string => `${value.toFixed(0)} ms`;

function memoryText(m: MemoryFigures): string {
  const part = (h: HeapFigures): string => `${mb(h.heapBytes)} heap + ${mb(h.backingBytes)} buffers`;
  return `${mb(m.totalBytes)} (page ${part(m.page)}; worker ${part(m.worker)}; segment workers ${part(m.segmentWorkers)})`;
}

/** One row per figure: what, the measured value, the target, pass or FAIL. */
export function pageRows(r: PageResults): string[][] {
  const load = r.load;
  const longText = (l: LongTasks): string =>
    l.count === 0 ? 'no task over 50 ms' : `longest ${ms(l.maxMs)}; ${l.count} over 50 ms, ${l.overTarget} over ${PAGE_TARGETS.longestTaskMs} ms`;
  const at = (key: string): string => (load.milestonesSeconds[key] == null ? '—' : `${load.milestonesSeconds[key]!.toFixed(1)} s`);
  return [
    [
      'time to loaded (change → preview filled)',
      `${load.seconds.toFixed(1)} s (${(r.bytes / BYTES_PER_MB / load.seconds).toFixed(1)} MB/s; read by ${at('readingDone')}, summary at ${at('summaryShown')})`,
      '—',
      '—',
    ],
    ['progress bar values while reading', `${load.progressValues.length} distinct of ${load.progressSamples} samples: ${abbreviated(load.progressValues)}`, 'strictly increasing', passWord(load.progressStrictlyIncreasing)],
    ['cancel at ~20 %', `bar gone in ${ms(r.cancel.barGoneMs)}, previous table ${r.cancel.previousTableKept ? 'kept' : 'LOST'}, next preview in ${ms(r.cancel.nextPreviewMs)}`, 'works', passWord(r.cancel.pass)],
    ['main thread while loading', longText(load.longTasks), `≤ ${PAGE_TARGETS.longestTaskMs} ms`, passWord(load.longestTask.pass)],
    ['JS heap after loading (collected)', `${memoryText(load.settledMemory)} = ${load.settledOverFile.value.toFixed(2)}× file`, `≤ ${PAGE_TARGETS.heapOverFile}× file`, passWord(load.settledOverFile.pass)],
    ['JS heap, peak sample while loading', `${memoryText(load.peakMemory)} = ${load.peakOverFile.value.toFixed(2)}× file`, `≤ ${PAGE_TARGETS.heapOverFile}× file (info)`, passWord(load.peakOverFile.pass)],
    ['decision → preview, median of 5', `${ms(r.decisions.medianMs)} (${r.decisions.runs.map((d) => d.ms.toFixed(0)).join(', ')})`, `≤ ${PAGE_TARGETS.decisionMs} ms`, passWord(r.decisions.verdict.pass)],
    ['encoded CSV download', `${r.download.seconds.toFixed(1)} s, ${mb(r.download.bytes)}, ${r.download.lines.toLocaleString('en-US')} lines`, 'header + every row', passWord(r.download.matches)],
    ['main thread while writing', longText(r.download.longTasks), `≤ ${PAGE_TARGETS.longestTaskMs} ms`, passWord(r.download.longestTask.pass)],
    [
      'profile in the worker ÷ papaparse in a worker',
      `${r.sideBySide.verdict.value.toFixed(2)}× — change → summary ${r.sideBySide.profileSeconds.toFixed(2)} s, Papa.parse ${r.sideBySide.parseSeconds.toFixed(2)} s (its File.text() ${r.sideBySide.textSeconds.toFixed(2)} s not counted; counted, as the workbench's reading is: ${r.sideBySide.withReadRatio.toFixed(2)}×, for information); medians of ${r.sideBySide.runs.length}, in turn`,
      `≤ ${TARGETS.profileOverParse}×`,
      passWord(r.sideBySide.verdict.pass),
    ],
    ['page JS heap while writing (peak)', `${mb(r.download.peakPageMemory.heapBytes)} heap + ${mb(r.download.peakPageMemory.backingBytes)} buffers`, '—', '—'],
  ];
}

function abbreviated(values: readonly number[]): string {
  return values.length <= 8 ? values.join(', ') : `${values.slice(0, 4).join(', ')}, …, ${values.slice(-3).join(', ')}`;
}

export function renderPageResults(r: PageResults): string {
  return [
    `Levelwise in the page — ${r.file} (${r.rows.toLocaleString('en-US')} rows, ${(r.bytes / BYTES_PER_MB).toFixed(1)} MB), ${r.browser}, production build via vite preview`,
    `machine: ${machineLine(r.machine)}; load average (1 min) ${r.loadAverage.start.toFixed(1)} at start, ${r.loadAverage.end.toFixed(1)} at end${
      Math.max(r.loadAverage.start, r.loadAverage.end) > r.machine.cores ? ' (above the core count: other work shared the machine, times are long)' : ''
    }`,
    '',
    renderTable(['page figure', 'measured', 'target', ''], pageRows(r), [0, 1, 2]),
    '',
    `download: ${r.download.how}`,
    `first line: ${r.download.firstLine.slice(0, 100)}${r.download.firstLine.length > 100 ? '…' : ''}`,
    `last line:  ${r.download.lastLine.slice(0, 100)}${r.download.lastLine.length > 100 ? '…' : ''}`,
    ...r.notes.map((note) => `note: ${note}`),
  ].join('\n');
}

/** Short lines for the Node benchmark's notes (bench/run.ts). */
export function pageNotes(r: PageResults): string[] {
  return pageRows(r).map(([what, measured, target, verdict]) => `page · ${what}: ${measured}${target === '—' ? '' : ` (target ${target}: ${verdict})`}`);
}

// ---------------------------------------------------------------------------------------------

function pageFile(rows: number): string {
  return join(BENCH_DIR, 'data', `household-${rows}.csv`);
}

/**
 * For `npm run bench` (bench/run.ts): the page figures and note lines for its table, or only a
 * note when Chromium is missing or the page could not be measured; never throws, so the Node
 * figures are kept whatever happens in the browser.
 */
export async function pageMeasurementsForBench(): Promise<{ page: PageResults | null; notes: string[] }> {
  try {
    const page = await measurePageIfPossible();
    return page === null ? { page, notes: [`page measurements skipped: ${CHROMIUM} is missing`] } : { page, notes: pageNotes(page) };
  } catch (error) {
    return { page: null, notes: [`page measurements failed: ${error instanceof Error ? error.message.split('\n')[0] : String(error)}`] };
  }
}

/** Runs the page measurements when Chromium is installed; null (with a message) when it is not. */
export async function measurePageIfPossible(rows = PAGE_REFERENCE_ROWS): Promise<PageResults | null> {
  if (!existsSync(CHROMIUM)) {
    progress(`page measurements skipped: ${CHROMIUM} is missing (install the Debian package "chromium").`);
    return null;
  }
  const file = pageFile(rows);
  if (!existsSync(file)) throw new Error(`Missing ${relative(process.cwd(), file)}. Write it with: npm run bench:generate -- --rows ${rows}`);
  return measurePage({ file, rows });
}

function parseArguments(argv: readonly string[]): { rows: number; write: boolean } {
  let rows = PAGE_REFERENCE_ROWS;
  let write = true;
  for (let i = 0; i < argv.length; i++) {
    const argument = argv[i];
    if (argument === '--no-write') write = false;
    else if (argument === '--rows') rows = Number(argv[++i]);
    else if (argument?.startsWith('--rows=')) rows = Number(argument.slice('--rows='.length));
    else throw new Error(`Unknown argument "${argument}". Usage: npm run bench:page -- [--rows 1000000] [--no-write]`);
    if (!Number.isSafeInteger(rows) || rows < 1) throw new Error('--rows needs a positive whole number of rows.');
  }
  return { rows, write };
}

/** Puts the page figures under "page" in bench/results.json, leaving the Node figures as they are. */
export function writePageResults(results: PageResults): void {
  const existing: Record<string, unknown> = existsSync(RESULTS_FILE) ? (JSON.parse(readFileSync(RESULTS_FILE, 'utf8')) as Record<string, unknown>) : {};
  writeFileSync(RESULTS_FILE, `${JSON.stringify({ ...existing, page: results }, null, 2)}\n`);
  progress(`wrote the "page" figures to ${relative(process.cwd(), RESULTS_FILE)}`);
}

async function main(): Promise<void> {
  const args = parseArguments(process.argv.slice(2));
  const results = await measurePageIfPossible(args.rows);
  if (results === null) return;
  console.log(renderPageResults(results));
  if (args.write) writePageResults(results);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? (error.stack ?? error.message) : error);
    process.exitCode = 1;
  });
}
