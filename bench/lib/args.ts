/**
 * The benchmark's command-line arguments:
 *
 *   npm run bench -- [--sizes 10000,100000,1000000,4000000] [--reps 3] [--apply auto|cli|in-process]
 *                    [--no-write] [--no-page] [--cpu-prof]
 *
 * Sizes up to FULL_MEASURE_MAX_ROWS get every measurement; larger ones only the streamed apply,
 * whose peak memory must stay flat (the whole-string parse and the in-memory profile of a 490 MB
 * file are what the streaming path exists to avoid). The 1M-row size is always measured.
 */

export const REFERENCE_ROWS = 1_000_000;
export const FULL_MEASURE_MAX_ROWS = REFERENCE_ROWS;
export const DEFAULT_SIZES: readonly number[] = [10_000, 100_000, 1_000_000, 4_000_000];
export const DEFAULT_REPS = 3;

export type ApplyChoice = 'auto' | 'cli' | 'in-process';

export interface BenchArguments {
  /** Row counts, ascending, without repeats, 1M included. */
  readonly sizes: readonly number[];
  readonly reps: number;
  readonly apply: ApplyChoice;
  /** Write bench/results.json (off for quick local runs). */
  readonly write: boolean;
  /** Measure the page too (Chromium), when it is installed. */
  readonly page: boolean;
  /** Instead of the table: CPU profiles of the profile and apply paths at 1M rows. */
  readonly cpuProfile: boolean;
  readonly help: boolean;
}

export const USAGE = [
  'Usage: npm run bench -- [options]',
  '  --sizes 10000,100000,1000000,4000000   row counts to measure (1000000 is always added);',
  '                                          sizes above 1,000,000 get the streamed apply only (peak RSS check)',
  '  --reps 3                                runs of each measurement; the median is reported',
  '  --apply auto|cli|in-process             how apply is measured (auto: the command line when it runs)',
  '  --no-write                              do not write bench/results.json',
  '  --no-page                               leave out the page side (Chromium), for a quick look',
  '  --cpu-prof                              CPU-profile the profile and apply paths at 1M rows and list',
  '                                          the functions with the most self time (no table)',
].join('\n');

export function parseBenchArguments(argv: readonly string[]): BenchArguments {
  let sizes: readonly number[] = DEFAULT_SIZES;
  let reps = DEFAULT_REPS;
  let apply: ApplyChoice = 'auto';
  let write = true;
  let cpuProfile = false;
  let page = true;
  let help = false;
  for (let i = 0; i < argv.length; i++) {
    const argument = argv[i] ?? '';
    const [flag, inline] = splitFlag(argument);
    const value = (): string => {
      const next = inline ?? argv[++i];
      if (next === undefined || next === '') throw new Error(`${flag} needs a value.\n${USAGE}`);
      return next;
    };
    switch (flag) {
      case '--sizes':
        sizes = parseSizes(value());
        break;
      case '--reps':
        reps = parseReps(value());
        break;
      case '--apply':
        apply = parseApplyChoice(value());
        break;
      case '--no-write':
        write = false;
        break;
      case '--no-page':
        page = false;
        break;
      case '--cpu-prof':
        cpuProfile = true;
        break;
      case '--help':
      case '-h':
        help = true;
        break;
      default:
        throw new Error(`Unknown argument "${argument}".\n${USAGE}`);
    }
  }
  return { sizes: withReference(sizes), reps, apply, write, page, cpuProfile, help };
}

function splitFlag(argument: string): [string, string | undefined] {
  const at = argument.indexOf('=');
  return argument.startsWith('--') && at > 0 ? [argument.slice(0, at), argument.slice(at + 1)] : [argument, undefined];
}

export function parseSizes(text: string): number[] {
  return text.split(',').map((part) => {
    const cleaned = part.trim().replaceAll('_', '');
    const rows = Number(cleaned);
    if (cleaned === '' || !Number.isSafeInteger(rows) || rows < 1) {
      throw new Error(`--sizes: "${part}" is not a positive whole number of rows (e.g. --sizes 10000,1000000).`);
    }
    return rows;
  });
}

function parseReps(text: string): number {
  const reps = Number(text);
  if (!Number.isSafeInteger(reps) || reps < 1) throw new Error(`--reps: "${text}" is not a whole number of at least 1.`);
  return reps;
}

function parseApplyChoice(text: string): ApplyChoice {
  if (text === 'auto' || text === 'cli' || text === 'in-process') return text;
  throw new Error(`--apply: "${text}" is not one of auto, cli, in-process.`);
}

/** Ascending, without repeats, with the 1M-row reference size the ratios are judged on. */
function withReference(sizes: readonly number[]): number[] {
  return [...new Set([...sizes, REFERENCE_ROWS])].sort((a, b) => a - b);
}

/** Whether a size gets parse, profile and table-memory measurements, or the streamed apply alone. */
export function measuresEverything(rows: number): boolean {
  return rows <= FULL_MEASURE_MAX_ROWS;
}
