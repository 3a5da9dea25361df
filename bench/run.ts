/**
 * The benchmark: how fast and how lean the big-file paths are, as ratios to papaparse measured side
 * by side in one run (absolute MB/s drift on a shared machine; ratios measured together hold).
 *
 *   npm run bench                       10k, 100k and 1M rows fully, 4M rows for the memory check
 *   npm run bench -- --sizes 1000000    only the 1M-row file (it is always measured)
 *   npm run bench -- --cpu-prof         where the time goes: CPU profiles at 1M rows, no table
 *
 * With /usr/bin/chromium installed, the page side (bench/page.ts, also `npm run bench:page`) runs
 * after the Node measurements; its figures join the notes and bench/results.json ("page").
 *
 * Prints one table and writes bench/results.json. Missed targets are reported, never an exit code:
 * this is a report, not a test. See bench/README.md for what each column means.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { stringifyRecipe, type Recipe } from '../src/core/index.ts';
import { measuresEverything, parseBenchArguments, REFERENCE_ROWS, USAGE, type ApplyChoice, type BenchArguments } from './lib/args.ts';
import { findResult, type MemoryResult, type TimedResult } from './lib/child-result.ts';
import { CLI, launcherFlags, measureInChild, PROJECT_ROOT, runCli, runNode } from './lib/children.ts';
import { cpuShares, describeMachine, machineLine, readCpuTicks } from './lib/machine.ts';
import { applyFromFile, readTableFromFile } from './lib/paths.ts';
import { benchRecipeForTable, describeRecipe } from './lib/recipe.ts';
import { benchDataFile, QUOTED_ROWS } from './lib/data-files.ts';
import {
  cpuNote,
  likeForLikeNote,
  renderTable,
  quotedNote,
  quotedResult,
  rssVerdict,
  sizeVerdicts,
  spreadNote,
  TABLE_HEADER,
  tableRows,
  timing,
  verdictCell,
  type ApplyPath,
  type ApplyTiming,
  type BenchResults,
  type ProfileTiming,
  type QuotedResult,
  type SizeResult,
  type TableMemory,
} from './lib/report.ts';
import { median, megabytesPerSecond, TARGETS } from './lib/stats.ts';
import { pageMeasurementsForBench } from './page.ts';
import type { ProfileSummary } from './lib/summarise-cpu-profile.ts';

const BENCH_DIR = dirname(fileURLToPath(import.meta.url));
const RESULTS_FILE = join(BENCH_DIR, 'results.json');
/** The recipe is fitted on this size when it is on disk (a sample, as a person would fit one), else on 1M. */
const FIT_ROWS = 100_000;
const TOP_FUNCTIONS = 20;

const dataFile = (rows: number): string => benchDataFile(rows);
const shown = (path: string): string => relative(process.cwd(), path);
const progress = (text: string): void => void process.stderr.write(`${text}\n`);

function requireDataFiles(sizes: readonly number[]): void {
  const missing = sizes.filter((rows) => !existsSync(dataFile(rows)));
  if (missing.length === 0) return;
  throw new Error(
    `Missing benchmark inputs: ${missing.map((rows) => shown(dataFile(rows))).join(', ')}.\n` +
      `Write them with: npm run bench:generate -- --rows ${missing.join(',')}`,
  );
}

/** Fits the benchmark recipe and writes it where the measuring processes can read it. */
function writeBenchRecipe(scratch: string): { file: string; recipe: Recipe } {
  const fitFile = existsSync(dataFile(FIT_ROWS)) ? dataFile(FIT_ROWS) : dataFile(REFERENCE_ROWS);
  const recipe = benchRecipeForTable(readTableFromFile(fitFile), shown(fitFile));
  const file = join(scratch, 'bench-recipe.json');
  writeFileSync(file, stringifyRecipe(recipe));
  return { file, recipe };
}

// ---------------------------------------------------------------------------------------------
// How apply is measured: the command line when it runs, else the same path in process.

/** `levelwise apply` wrote its output: exit 0, or 1 when some rows did not fit the recipe (its documented exit codes). */
function finished(exitCode: number | null): boolean {
  return exitCode === 0 || exitCode === 1;
}

function sha256OfInProcessApply(file: string, recipe: Recipe): string {
  const hash = createHash('sha256');
  applyFromFile(file, recipe, (part) => hash.update(part));
  return hash.digest('hex');
}

async function chooseApplyPath(choice: ApplyChoice, recipeFile: string, recipe: Recipe, checkFile: string, scratch: string): Promise<ApplyPath> {
  if (choice === 'in-process') return { kind: 'in-process', why: 'chosen with --apply in-process' };
  const out = join(scratch, 'cli-check.csv');
  const run = await runCli(['apply', recipeFile, checkFile, '-o', out]);
  const wrote = existsSync(out) && statSync(out).size > 0;
  if (!finished(run.exitCode) || !wrote) {
    const said = (run.stderr.trim() || run.stdout.trim()).split('\n')[0]?.slice(0, 80) ?? '';
    const why = `\`levelwise apply\` is not runnable yet (exit ${run.exitCode}${wrote ? '' : ', no output file'}${said ? `: ${said}` : ''})`;
    if (choice === 'cli') throw new Error(`--apply cli: ${why}`);
    return { kind: 'in-process', why };
  }
  const cliHash = createHash('sha256').update(readFileSync(out)).digest('hex');
  const startups: number[] = [];
  for (let i = 0; i < 3; i++) startups.push((await runCli(['--help'])).wallSeconds);
  return {
    kind: 'cli',
    command: ['node', ...launcherFlags(readFileSync(CLI, 'utf8')), 'bin/levelwise.js apply RECIPE FILE -o /dev/null'].join(' '),
    startupSeconds: median(startups),
    matchesInProcess: cliHash === sha256OfInProcessApply(checkFile, recipe),
  };
}

/** The profile path on threads, through the command line: `levelwise draft` reads, profiles and drafts. */
async function measureDraftCli(file: string): Promise<{ seconds: number; cpuSeconds: number }> {
  const run = await runCli(['draft', file, '-o', '/dev/null']);
  if (run.exitCode !== 0) throw new Error(`levelwise draft ${shown(file)} failed (exit ${run.exitCode}):\n${run.stderr.slice(-3000)}`);
  return { seconds: run.wallSeconds, cpuSeconds: run.cpuSeconds };
}

/** `cpuSeconds`: of the whole command (NaN for the in-process path, whose process does more than the timed part). */
async function measureApply(path: ApplyPath, file: string, recipeFile: string): Promise<{ seconds: number; cpuSeconds: number; peakRssBytes: number; bytesWritten: number | null }> {
  if (path.kind === 'cli') {
    const run = await runCli(['apply', recipeFile, file, '-o', '/dev/null']);
    if (!finished(run.exitCode)) throw new Error(`levelwise apply ${shown(file)} failed (exit ${run.exitCode}):\n${run.stderr.slice(-3000)}`);
    return { seconds: run.wallSeconds, cpuSeconds: run.cpuSeconds, peakRssBytes: run.peakRssBytes, bytesWritten: null };
  }
  const { result, peakRssBytes } = await measureInChild<TimedResult>('apply', [file, recipeFile]);
  return { seconds: result.seconds, cpuSeconds: NaN, peakRssBytes, bytesWritten: result.bytesWritten ?? null };
}

// ---------------------------------------------------------------------------------------------
// The measurements, interleaved: each repetition runs every path on every size before the next
// repetition starts, so a slow spell on a shared machine hits all paths alike.

interface Runs {
  parse: number[];
  /** papaparse's reading and decoding of the file, before its parse. */
  parseRead: number[];
  profile: number[];
  profileThreads: number[];
  profileThreadsCpu: number[];
  phases: Record<string, number>[];
  apply: number[];
  applyCpu: number[];
  applyRss: number[];
  bytesWritten: number | null;
}

async function measureAll(args: BenchArguments, applyPath: ApplyPath, recipeFile: string): Promise<{ sizes: SizeResult[]; quoted: QuotedResult | null }> {
  const runs = new Map<number, Runs>(args.sizes.map((rows) => [rows, { parse: [], parseRead: [], profile: [], profileThreads: [], profileThreadsCpu: [], phases: [], apply: [], applyCpu: [], applyRss: [], bytesWritten: null }]));
  const quotedFile = benchDataFile(QUOTED_ROWS, true);
  const quoted = existsSync(quotedFile) ? { parse: [] as number[], draft: [] as number[], apply: [] as number[] } : null;
  for (let rep = 1; rep <= args.reps; rep++) {
    if (quoted !== null) await measureQuoted(quotedFile, quoted, applyPath, recipeFile, `run ${rep}/${args.reps} · every field quoted`);
    for (const rows of args.sizes) {
      const file = dataFile(rows);
      const r = runs.get(rows)!;
      const label = `run ${rep}/${args.reps} · ${rows.toLocaleString('en-US')} rows`;
      if (measuresEverything(rows)) {
        const parse = await measureInChild<TimedResult>('parse', [file]);
        r.parse.push(parse.result.seconds);
        r.parseRead.push(parse.result.phases?.['readAndDecode'] ?? NaN);
        const profile = await measureInChild<TimedResult>('profile', [file]);
        r.profile.push(profile.result.seconds);
        r.phases.push({ ...profile.result.phases });
        if (applyPath.kind === 'cli') {
          const draft = await measureDraftCli(file);
          r.profileThreads.push(draft.seconds);
          r.profileThreadsCpu.push(draft.cpuSeconds);
        }
        checkRows(rows, 'parse', parse.result.rows);
        checkRows(rows, 'profile', profile.result.rows);
      }
      const apply = await measureApply(applyPath, file, recipeFile);
      r.apply.push(apply.seconds);
      r.applyCpu.push(apply.cpuSeconds);
      r.applyRss.push(apply.peakRssBytes);
      r.bytesWritten = apply.bytesWritten;
      progress(`${label}: parse ${last(r.parse)} s, profile ${last(r.profile)} s (threads ${last(r.profileThreads)} s), apply ${last(r.apply)} s`);
    }
  }
  const results: SizeResult[] = [];
  for (const rows of args.sizes) {
    const file = dataFile(rows);
    const bytes = statSync(file).size;
    const r = runs.get(rows)!;
    const full = measuresEverything(rows);
    const parse = full ? timing(r.parse, bytes) : null;
    // Each repetition's read, decode and parse together, so the median is of whole runs.
    const parseWithRead = full ? timing(r.parse.map((seconds, i) => seconds + r.parseRead[i]!), bytes) : null;
    const profile: ProfileTiming | null = full ? { ...timing(r.profile, bytes), phasesSeconds: medianPhases(r.phases) } : null;
    const profileThreads = full && r.profileThreads.length > 0 ? timing(r.profileThreads, bytes) : null;
    const applyTiming = timing(r.apply, bytes);
    const startup = applyPath.kind === 'cli' ? applyPath.startupSeconds : null;
    const apply: ApplyTiming = {
      ...applyTiming,
      runsPeakRssBytes: r.applyRss,
      peakRssBytes: median(r.applyRss),
      bytesWritten: r.bytesWritten,
      mbPerSecondExcludingStartup: startup === null ? null : megabytesPerSecond(bytes, applyTiming.medianSeconds - startup),
    };
    const tableMemory = full ? await measureTableMemory(file, bytes) : null;
    const cpuSeconds = { draft: medianOrNull(r.profileThreadsCpu), apply: medianOrNull(r.applyCpu) };
    results.push({ rows, file: shown(file), bytes, parse, parseWithRead, profile, profileThreads, apply, cpuSeconds, tableMemory, ...sizeVerdicts(parse, profile, profileThreads, apply) });
  }
  return { sizes: results, quoted: quoted === null ? null : quotedResult(QUOTED_ROWS, shown(quotedFile), statSync(quotedFile).size, quoted) };
}

/** One repetition on the 1M-row file with every field quoted: papaparse, `levelwise draft`, apply. */
async function measureQuoted(file: string, runs: { parse: number[]; draft: number[]; apply: number[] }, applyPath: ApplyPath, recipeFile: string, label: string): Promise<void> {
  const parse = await measureInChild<TimedResult>('parse', [file]);
  checkRows(QUOTED_ROWS, 'parse (every field quoted)', parse.result.rows);
  runs.parse.push(parse.result.seconds);
  if (applyPath.kind === 'cli') runs.draft.push((await measureDraftCli(file)).seconds);
  runs.apply.push((await measureApply(applyPath, file, recipeFile)).seconds);
  progress(`${label}: parse ${last(runs.parse)} s, draft ${last(runs.draft)} s, apply ${last(runs.apply)} s`);
}

/** The median of the values measured (NaN ones left out), or null when there are none. */
function medianOrNull(values: readonly number[]): number | null {
  const measured = values.filter((v) => !Number.isNaN(v));
  return measured.length === 0 ? null : median(measured);
}

function last(values: readonly number[]): string {
  const value = values[values.length - 1];
  return value === undefined ? '—' : value.toFixed(2);
}

function checkRows(expected: number, path: string, found: number): void {
  if (found !== expected) progress(`warning: ${path} read ${found} rows from the ${expected}-row file`);
}

function medianPhases(phases: readonly Record<string, number>[]): Record<string, number> {
  const names = Object.keys(phases[0] ?? {});
  return Object.fromEntries(names.map((name) => [name, median(phases.map((p) => p[name] ?? NaN))]));
}

async function measureTableMemory(file: string, bytes: number): Promise<TableMemory> {
  progress(`table memory · ${shown(file)}`);
  const { result } = await measureInChild<MemoryResult>('table-memory', [file]);
  return { heapBytes: result.heapBytes, arrayBufferBytes: result.arrayBufferBytes, timesFileSize: (result.heapBytes + result.arrayBufferBytes) / bytes };
}

// ---------------------------------------------------------------------------------------------
// Printing

function describeApplyPath(path: ApplyPath): string {
  if (path.kind === 'in-process') return `apply measured in process (same streamed path as the command line): ${path.why}`;
  const match = path.matchesInProcess ? 'its output matches the in-process path byte for byte' : 'WARNING: its output differs from the in-process path';
  return `apply measured through the command line (${path.command}), start-up ${path.startupSeconds.toFixed(2)} s included; ${match}`;
}

function loadLine({ loadAverage, machine, cpuTime }: BenchResults): string {
  const percent = (share: number): string => `${(100 * share).toFixed(0)} %`;
  const cpu = cpuTime ? `; of the machine's CPU time while Node was measured, ${percent(cpuTime.busy)} busy and ${percent(cpuTime.steal)} stolen by the host for other guests` : '';
  const line = `load average (1 min) at start ${loadAverage.start.toFixed(1)}, at end ${loadAverage.end.toFixed(1)}${cpu}`;
  const busy = Math.max(loadAverage.start, loadAverage.end) > machine.cores;
  return busy ? `${line}: above the core count, so other work shared the machine and every MB/s is low; the side-by-side ratios still compare` : line;
}

function printResults(results: BenchResults): void {
  const lines = [
    `Levelwise benchmark — median of ${results.reps} runs each`,
    `machine: ${machineLine(results.machine)}`,
    loadLine(results),
    describeApplyPath(results.applyPath),
    `recipe: ${results.recipe}`,
    '',
    renderTable(TABLE_HEADER, tableRows(results)),
    '',
    'ratios are time ÷ papaparse time on the same file (lower is better); targets are upper bounds',
    `peak RSS at ${results.rssLargeOverReference.largeRows?.toLocaleString('en-US') ?? '—'} rows ÷ at 1,000,000 rows: ${verdictCell(results.rssLargeOverReference)} (target ≤ ${TARGETS.rssLargeOverReference}×)`,
    ...results.notes.map((note) => `note: ${note}`),
  ];
  console.log(lines.join('\n'));
}

// ---------------------------------------------------------------------------------------------
// --cpu-prof: where the time goes

/** The main thread's profile in `dir` (--cpu-prof also writes one per loader thread). */
function mainThreadProfile(dir: string): string {
  const names = readdirSync(dir).filter((name) => name.endsWith('.cpuprofile'));
  // CPU.<date>.<time>.<pid>.<thread>.<seq>.cpuprofile; the main thread is thread 0.
  const main = names.find((name) => name.split('.')[4] === '0') ?? names[0];
  if (main === undefined) throw new Error(`No .cpuprofile written in ${dir}`);
  return join(dir, main);
}

async function whereTimeGoes(applyPath: ApplyPath, recipeFile: string): Promise<void> {
  const file = dataFile(REFERENCE_ROWS);
  const keep = mkdtempSync(join(tmpdir(), 'levelwise-cpu-profiles-'));
  const flags = (name: string): string[] => ['--cpu-prof', `--cpu-prof-dir=${join(keep, name)}`];
  progress(`CPU-profiling the profile path on ${shown(file)}…`);
  await measureInChild<TimedResult>('profile', [file], flags('profile-path'));
  progress(`CPU-profiling the apply path on ${shown(file)}…`);
  if (applyPath.kind === 'cli') {
    const run = await runCli(['apply', recipeFile, file, '-o', '/dev/null'], flags('apply-path'));
    if (!finished(run.exitCode)) throw new Error(`levelwise apply failed (exit ${run.exitCode}):\n${run.stderr.slice(-3000)}`);
  } else {
    await measureInChild<TimedResult>('apply', [file, recipeFile], flags('apply-path'));
  }
  const profiles = [mainThreadProfile(join(keep, 'profile-path')), mainThreadProfile(join(keep, 'apply-path'))];
  const summariser = join(BENCH_DIR, 'lib', 'summarise-cpu-profile.ts');
  const run = await runNode(['--enable-source-maps', '--import', 'tsx'], summariser, [PROJECT_ROOT, String(TOP_FUNCTIONS), ...profiles]);
  if (run.exitCode !== 0) throw new Error(`Summarising the profiles failed:\n${run.stderr.slice(-3000)}`);
  const summaries = findResult<ProfileSummary[]>(run.stdout);
  const applyTitle = applyPath.kind === 'cli' ? 'levelwise apply, start-up included' : 'in process: batches of 65,536 rows → encodeBatch → CSV writer';
  const titles = ['profile path (1 MB slices → table → profileTable → draftRecipe)', `apply path (${applyTitle})`];
  const out: string[] = [`CPU profiles of ${shown(file)} — ${machineLine(describeMachine())}`, `(.cpuprofile files kept in ${keep}; open them in Chrome DevTools)`];
  summaries.forEach((summary, i) => {
    out.push('', `${titles[i]}: ${(summary.busyMilliseconds / 1000).toFixed(2)} s busy of ${(summary.wallMilliseconds / 1000).toFixed(2)} s`);
    out.push(renderTable(['self ms', 'share', 'function (self time)'], summary.functions.map(selfRow), [2]));
    out.push('', renderTable(['self ms', 'share', 'file (self time)'], summary.files.slice(0, 10).map(selfRow), [2]));
  });
  console.log(out.join('\n'));
}

function selfRow(entry: { label: string; milliseconds: number; share: number }): string[] {
  return [entry.milliseconds.toFixed(0), `${(entry.share * 100).toFixed(1)}%`, entry.label];
}

// ---------------------------------------------------------------------------------------------

async function main(): Promise<void> {
  const args = parseBenchArguments(process.argv.slice(2));
  if (args.help) {
    console.log(USAGE);
    return;
  }
  requireDataFiles(args.cpuProfile ? [REFERENCE_ROWS] : args.sizes);
  const scratch = mkdtempSync(join(tmpdir(), 'levelwise-bench-'));
  try {
    progress('fitting the benchmark recipe…');
    const { file: recipeFile, recipe } = writeBenchRecipe(scratch);
    const checkFile = dataFile(args.sizes.find((rows) => existsSync(dataFile(rows))) ?? REFERENCE_ROWS);
    const applyPath = await chooseApplyPath(args.apply, recipeFile, recipe, checkFile, scratch);
    progress(describeApplyPath(applyPath));
    if (args.cpuProfile) return await whereTimeGoes(applyPath, recipeFile);

    const loadAtStart = loadavg()[0] ?? NaN;
    const ticksAtStart = readCpuTicks();
    const { sizes, quoted } = await measureAll(args, applyPath, recipeFile);
    const cpuTime = cpuShares(ticksAtStart, readCpuTicks());
    const notes: string[] = [];
    const reference = sizes.find((size) => size.rows === REFERENCE_ROWS);
    const cpu = reference === undefined ? null : cpuNote(reference);
    if (cpu !== null) notes.push(cpu);
    const spread = reference === undefined ? null : spreadNote(reference);
    if (spread !== null) notes.push(spread);
    const likeForLike = reference === undefined ? null : likeForLikeNote(reference);
    if (likeForLike !== null) notes.push(likeForLike);
    if (!args.sizes.some((rows) => rows > REFERENCE_ROWS)) notes.push('no size above 1M rows: the peak RSS check was not run');
    notes.push(quoted === null ? `no copy of the 1M-row file with every field quoted (${shown(benchDataFile(QUOTED_ROWS, true))}): npm run bench:generate writes it` : quotedNote(quoted));
    const loadAtEnd = loadavg()[0] ?? NaN;
    // The page side (bench/page.ts) after the Node measurements, when /usr/bin/chromium exists.
    const { page, notes: pageLines } = args.page ? await pageMeasurementsForBench() : { page: null, notes: ['the page side was left out (--no-page)'] };
    notes.push(...pageLines);
    const results: BenchResults = {
      machine: describeMachine(),
      loadAverage: { start: loadAtStart, end: loadAtEnd },
      cpuTime,
      reps: args.reps,
      applyPath,
      recipe: describeRecipe(recipe),
      targets: TARGETS,
      sizes,
      rssLargeOverReference: rssVerdict(sizes, REFERENCE_ROWS),
      quoted,
      notes,
    };
    printResults(results);
    if (args.write) {
      writeFileSync(RESULTS_FILE, `${JSON.stringify(page === null ? results : { ...results, page }, null, 2)}\n`);
      progress(`wrote ${shown(RESULTS_FILE)}`);
    }
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 1;
});
