/**
 * The benchmark's results (what bench/results.json holds) and the one table printed from them.
 */
import { atMost, BYTES_PER_MB, median, megabytesPerSecond, TARGETS, timeRatio, type Verdict } from './stats.ts';
import type { Machine } from './machine.ts';

export interface Timing {
  /** Seconds of each run, in the order run. */
  readonly runsSeconds: readonly number[];
  readonly medianSeconds: number;
  readonly mbPerSecond: number;
}

export interface ProfileTiming extends Timing {
  /** Median seconds of each phase of the profile path. */
  readonly phasesSeconds: Readonly<Record<string, number>>;
}

export interface ApplyTiming extends Timing {
  readonly runsPeakRssBytes: readonly number[];
  readonly peakRssBytes: number;
  /** Bytes of CSV written by one run (known for the in-process path). */
  readonly bytesWritten: number | null;
  /** Through the command line: MB/s with its start-up time taken out of the median. */
  readonly mbPerSecondExcludingStartup: number | null;
}

export interface TableMemory {
  readonly heapBytes: number;
  readonly arrayBufferBytes: number;
  /** (heap + array buffers) ÷ file size. */
  readonly timesFileSize: number;
}

export interface SizeResult {
  readonly rows: number;
  readonly file: string;
  readonly bytes: number;
  readonly parse: Timing | null;
  /**
   * papaparse with its reading and decoding of the file (readFileSync, TextDecoder) before the
   * parse: the work `levelwise draft` does too, for the like-for-like note (no target).
   */
  readonly parseWithRead?: Timing | null;
  /** The page's worker path on one thread, in process (its phases say where time goes). */
  readonly profile: ProfileTiming | null;
  /**
   * The same path on as many threads as the page uses (one segment each, core parallel-read.ts):
   * `levelwise draft FILE -o /dev/null`, start-up included. Null when the command line does not run.
   */
  readonly profileThreads: Timing | null;
  readonly apply: ApplyTiming | null;
  /**
   * Median CPU time (user + system, every thread, start-up included) of `levelwise draft` and
   * `levelwise apply`; null when they were not run through the command line.
   */
  readonly cpuSeconds: { readonly draft: number | null; readonly apply: number | null };
  readonly tableMemory: TableMemory | null;
  /** Profile path time ÷ papaparse time: on threads when measured, else on one thread. */
  readonly profileOverParse: Verdict;
  /** Profile path on one thread ÷ papaparse time, for information. */
  readonly profileOneThreadOverParse: number;
  /** Apply path time ÷ papaparse time. */
  readonly applyOverParse: Verdict;
}

export type ApplyPath =
  | { readonly kind: 'cli'; readonly command: string; readonly startupSeconds: number; readonly matchesInProcess: boolean }
  | { readonly kind: 'in-process'; readonly why: string };

export interface BenchResults {
  readonly machine: Machine;
  /** The 1-minute load average when the measurements started and ended: how busy the machine was. */
  readonly loadAverage: { readonly start: number; readonly end: number };
  /**
   * Shares of the machine's CPU time while the Node paths were measured: busy, and stolen by the
   * host for other guests (a virtual machine's cores are not all its own); null where unknown.
   */
  readonly cpuTime?: { readonly busy: number; readonly steal: number } | null;
  readonly reps: number;
  readonly applyPath: ApplyPath;
  readonly recipe: string;
  readonly targets: typeof TARGETS;
  readonly sizes: readonly SizeResult[];
  /** Peak RSS of apply at the largest size above 1M rows ÷ at 1M rows. */
  readonly rssLargeOverReference: Verdict & { readonly largeRows: number | null };
  /** The 1M-row file with every field quoted, for information (no target); null when not measured. */
  readonly quoted?: QuotedResult | null;
  readonly notes: readonly string[];
}

/**
 * The 1M-row file with every field quoted (bench/lib/data-files.ts), measured in the same
 * repetitions as the others: the reader's path for quoted fields, which the plain file takes for
 * one record in fifty.
 */
export interface QuotedResult {
  readonly rows: number;
  readonly file: string;
  readonly bytes: number;
  readonly parse: Timing;
  /** `levelwise draft`; null when the command line does not run. */
  readonly profileThreads: Timing | null;
  readonly apply: Timing;
  /** Time ÷ papaparse time, each path. */
  readonly draftOverParse: number;
  readonly applyOverParse: number;
}

export function quotedResult(rows: number, file: string, bytes: number, runs: { parse: number[]; draft: number[]; apply: number[] }): QuotedResult {
  const parse = timing(runs.parse, bytes);
  const profileThreads = runs.draft.length > 0 ? timing(runs.draft, bytes) : null;
  const apply = timing(runs.apply, bytes);
  const over = (path: Timing | null): number => (path === null ? NaN : path.medianSeconds / parse.medianSeconds);
  return { rows, file, bytes, parse, profileThreads, apply, draftOverParse: over(profileThreads), applyOverParse: over(apply) };
}

/** The quoted file's line under the table. */
export function quotedNote(quoted: QuotedResult): string {
  const seconds = (t: Timing): string => `${t.medianSeconds.toFixed(2)} s`;
  const draft = quoted.profileThreads === null ? '' : `, levelwise draft ${seconds(quoted.profileThreads)} (${quoted.draftOverParse.toFixed(2)}×)`;
  return (
    `every field quoted (${quoted.file}, ${(quoted.bytes / BYTES_PER_MB).toFixed(1)} MB, ${quoted.rows.toLocaleString('en-US')} rows; for information, no target): ` +
    `papaparse ${seconds(quoted.parse)}${draft}, apply ${seconds(quoted.apply)} (${quoted.applyOverParse.toFixed(2)}×); medians`
  );
}

export function timing(runsSeconds: readonly number[], bytes: number): Timing {
  const medianSeconds = median(runsSeconds);
  return { runsSeconds, medianSeconds, mbPerSecond: megabytesPerSecond(bytes, medianSeconds) };
}

export function sizeVerdicts(parse: Timing | null, profile: Timing | null, profileThreads: Timing | null, apply: Timing | null) {
  const parseRate = parse?.mbPerSecond ?? NaN;
  const oneThread = timeRatio(parseRate, profile?.mbPerSecond ?? NaN);
  return {
    profileOverParse: atMost(profileThreads === null ? oneThread : timeRatio(parseRate, profileThreads.mbPerSecond), TARGETS.profileOverParse),
    profileOneThreadOverParse: oneThread,
    applyOverParse: atMost(timeRatio(parseRate, apply?.mbPerSecond ?? NaN), TARGETS.applyOverParse),
  };
}

/**
 * The work the command line did at one size, beside its wall clock: CPU time counts every thread,
 * so it shows what a change saved even when a busy host hides it in the wall clock. Null when
 * the command line was not measured there.
 */
export function cpuNote(size: SizeResult): string | null {
  const { draft, apply } = size.cpuSeconds;
  if (draft === null && apply === null) return null;
  const part = (name: string, cpu: number | null, wall: Timing | null): string[] =>
    cpu === null || wall === null ? [] : [`levelwise ${name} ${cpu.toFixed(2)} s over ${wall.medianSeconds.toFixed(2)} s of wall clock`];
  const parts = [...part('draft', draft, size.profileThreads), ...part('apply', apply, size.apply)];
  const parse = size.parse === null ? '' : `; papaparse's parse alone ${size.parse.medianSeconds.toFixed(2)} s on one thread`;
  return `CPU time at ${size.rows.toLocaleString('en-US')} rows (every thread, start-up included; medians): ${parts.join(', ')}${parse}`;
}

/**
 * The profile ratio with the file read on both sides, for information: `levelwise draft` reads the
 * file from disk and decodes it (and starts up) within its time, papaparse's parse above is timed
 * on text already in memory. The verdict stays on the parse alone. Null without both figures.
 */
export function likeForLikeNote(size: SizeResult): string | null {
  const withRead = size.parseWithRead;
  const draft = size.profileThreads;
  if (withRead === undefined || withRead === null || draft === null || !Number.isFinite(withRead.medianSeconds)) return null;
  return (
    `with the file read on both sides at ${size.rows.toLocaleString('en-US')} rows (for information; the verdict is on papaparse's parse alone): ` +
    `levelwise draft ${draft.medianSeconds.toFixed(2)} s (start-up, reading and decoding included) ÷ papaparse reading, decoding and parsing ` +
    `${withRead.medianSeconds.toFixed(2)} s = ${(draft.medianSeconds / withRead.medianSeconds).toFixed(2)}×`
  );
}

/**
 * Each repetition's own ratios at one size: every repetition runs papaparse and the command line on
 * the same file one after the other, so its ratios are side by side; their spread shows how much a
 * verdict on the medians owes to the hour. Null without papaparse or with repetitions missing.
 */
export function spreadNote(size: SizeResult): string | null {
  const parse = size.parse?.runsSeconds;
  if (parse === undefined) return null;
  const ratios = (name: string, path: Timing | null): string[] => {
    const runs = path?.runsSeconds;
    if (runs === undefined || runs.length !== parse.length || runs.length < 2) return [];
    return [`${name} ${runs.map((seconds, i) => `${(seconds / parse[i]!).toFixed(2)}×`).join(', ')}`];
  };
  const parts = [...ratios('levelwise draft', size.profileThreads), ...ratios('apply', size.apply)];
  if (parts.length === 0) return null;
  return `at ${size.rows.toLocaleString('en-US')} rows, each repetition's time ÷ papaparse's in the same repetition: ${parts.join('; ')}`;
}

export function rssVerdict(sizes: readonly SizeResult[], referenceRows: number): BenchResults['rssLargeOverReference'] {
  const reference = sizes.find((s) => s.rows === referenceRows)?.apply?.peakRssBytes ?? NaN;
  const large = [...sizes].reverse().find((s) => s.rows > referenceRows && s.apply !== null);
  const value = large?.apply ? large.apply.peakRssBytes / reference : NaN;
  return { ...atMost(value, TARGETS.rssLargeOverReference), largeRows: large?.rows ?? null };
}

// ---------------------------------------------------------------------------------------------
// The printed table

const DASH = '—';

function fixed(value: number | undefined, digits: number): string {
  return value === undefined || !Number.isFinite(value) ? DASH : value.toFixed(digits);
}

function megabytes(bytes: number | undefined): string {
  return bytes === undefined || !Number.isFinite(bytes) ? DASH : `${(bytes / BYTES_PER_MB).toFixed(0)} MB`;
}

export function verdictCell(verdict: Verdict): string {
  if (verdict.pass === null) return DASH;
  return `${verdict.value.toFixed(2)}× ${verdict.pass ? 'pass' : 'FAIL'}`;
}

export const TABLE_HEADER: readonly string[] = [
  'rows',
  'MB',
  'parse MB/s',
  'profile MB/s',
  `profile÷parse ≤${TARGETS.profileOverParse}×`,
  'on 1 thread',
  'apply MB/s',
  `apply÷parse ≤${TARGETS.applyOverParse}×`,
  'table in memory',
  'apply peak RSS',
  `RSS÷RSS(1M) ≤${TARGETS.rssLargeOverReference}×`,
];

export function tableRows(results: Pick<BenchResults, 'sizes' | 'rssLargeOverReference'>): string[][] {
  return results.sizes.map((size) => {
    const memory = size.tableMemory;
    const rss = results.rssLargeOverReference;
    return [
      size.rows.toLocaleString('en-US'),
      fixed(size.bytes / BYTES_PER_MB, 1),
      fixed(size.parse?.mbPerSecond, 1),
      fixed((size.profileThreads ?? size.profile)?.mbPerSecond, 1),
      verdictCell(size.profileOverParse),
      Number.isFinite(size.profileOneThreadOverParse) ? `${size.profileOneThreadOverParse.toFixed(2)}×` : DASH,
      fixed(size.apply?.mbPerSecond, 1),
      verdictCell(size.applyOverParse),
      memory === null ? DASH : `${megabytes(memory.heapBytes + memory.arrayBufferBytes)} (${memory.timesFileSize.toFixed(2)}× file)`,
      megabytes(size.apply?.peakRssBytes),
      rss.largeRows === size.rows ? verdictCell(rss) : DASH,
    ];
  });
}

/** Columns padded to their widest cell: right-aligned (numbers), except those listed in `leftAligned`. */
export function renderTable(header: readonly string[], rows: readonly (readonly string[])[], leftAligned: readonly number[] = []): string {
  const widths = header.map((title, c) => Math.max(title.length, ...rows.map((row) => (row[c] ?? '').length)));
  const pad = (cell: string, c: number): string => (leftAligned.includes(c) ? cell.padEnd(widths[c] ?? 0) : cell.padStart(widths[c] ?? 0));
  const line = (cells: readonly string[]): string => cells.map(pad).join('  ').trimEnd();
  const rule = widths.map((w) => '-'.repeat(w)).join('  ');
  return [line(header), rule, ...rows.map(line)].join('\n');
}
