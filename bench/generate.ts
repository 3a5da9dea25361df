/**
 * Writes the invented household-energy survey at benchmark sizes:
 *
 *   npm run bench:generate -- [--rows 10000,100000,1000000,4000000] [--force]
 *
 * Each size goes to bench/data/household-<rows>.csv (git-ignored) with 5,000 supplier levels, streamed to disk one
 * piece at a time so even the 4M-row file (~490 MB) never exists as one string. A file that already exists with
 * the byte size the current generator produces is kept; --force rewrites it. Writing goes to a ".partial" file that
 * is renamed at the end, so an interrupted run never leaves a short file that looks finished.
 *
 * Beside the 1M-row file goes household-1000000-quoted.csv: the same records with every field quoted, as some
 * exporters write them, so that the benchmark also measures the reader's path for quoted fields.
 */
import { createWriteStream, mkdirSync } from 'node:fs';
import { rename, rm, stat } from 'node:fs/promises';
import { once } from 'node:events';
import { relative } from 'node:path';
import { householdEnergyCsvChunks, type HouseholdEnergyOptions } from '../src/demo/household-energy.ts';
import { benchDataFile, DATA_DIR, QUOTED_ROWS, quoteEveryField } from './lib/data-files.ts';

const DEFAULT_ROW_COUNTS = [10_000, 100_000, 1_000_000, 4_000_000];
/** Many supplier levels, most of them rare: the case that stresses profiling and one-hot output. */
const BENCH_MANY_LEVELS = 5000;

interface Arguments {
  rowCounts: number[];
  force: boolean;
}

function parseArguments(argv: readonly string[]): Arguments {
  let rowCounts = DEFAULT_ROW_COUNTS;
  let force = false;
  for (let i = 0; i < argv.length; i += 1) {
    const argument = argv[i] as string;
    if (argument === '--force') force = true;
    else if (argument === '--rows' || argument.startsWith('--rows=')) {
      const value = argument === '--rows' ? argv[(i += 1)] : argument.slice('--rows='.length);
      rowCounts = parseRowCounts(value);
    } else if (argument === '--help' || argument === '-h') {
      console.log('Usage: tsx bench/generate.ts [--rows 10000,100000,1000000,4000000] [--force]');
      process.exit(0);
    } else {
      throw new Error(`Unknown argument "${argument}". Use --rows 10000,100000 and/or --force.`);
    }
  }
  return { rowCounts, force };
}

function parseRowCounts(value: string | undefined): number[] {
  if (value === undefined || value.trim() === '') {
    throw new Error('--rows needs a comma-separated list of row counts, e.g. --rows 10000,1000000.');
  }
  return value.split(',').map((part) => {
    const text = part.trim().replaceAll('_', '');
    const count = Number(text);
    if (text === '' || !Number.isSafeInteger(count) || count < 0) {
      throw new Error(`--rows: "${part}" is not a whole number of rows.`);
    }
    return count;
  });
}

/** The pieces of a file: the generator's, or with every field quoted. */
function* pieces(options: HouseholdEnergyOptions, quoted: boolean): Generator<string> {
  for (const piece of householdEnergyCsvChunks(options)) yield quoted ? quoteEveryField(piece) : piece;
}

/** The byte size the current generator produces, counted without writing (cheaper than writing the file). */
function expectedBytes(options: HouseholdEnergyOptions, quoted: boolean): number {
  let bytes = 0;
  for (const piece of pieces(options, quoted)) bytes += Buffer.byteLength(piece, 'utf8');
  return bytes;
}

async function existingSize(path: string): Promise<number | undefined> {
  try {
    return (await stat(path)).size;
  } catch {
    return undefined;
  }
}

/** Streams the pieces to `path`, waiting for 'drain' whenever the stream's buffer is full. */
async function writeCsv(path: string, options: HouseholdEnergyOptions, quoted: boolean): Promise<number> {
  const partial = `${path}.partial`;
  const out = createWriteStream(partial);
  let bytes = 0;
  try {
    for (const piece of pieces(options, quoted)) {
      bytes += Buffer.byteLength(piece, 'utf8');
      if (!out.write(piece)) await once(out, 'drain');
    }
    out.end();
    await once(out, 'finish');
  } catch (error) {
    out.destroy();
    await rm(partial, { force: true });
    throw error;
  }
  await rename(partial, path);
  return bytes;
}

function megabytes(bytes: number): string {
  return `${(bytes / 1e6).toFixed(1)} MB`;
}

async function generateOne(rows: number, force: boolean, quoted = false): Promise<void> {
  const path = benchDataFile(rows, quoted);
  const shown = relative(process.cwd(), path);
  const options: HouseholdEnergyOptions = { rows, manyLevels: BENCH_MANY_LEVELS };
  const started = performance.now();
  const onDisk = await existingSize(path);
  if (!force && onDisk !== undefined) {
    const wanted = expectedBytes(options, quoted);
    if (onDisk === wanted) {
      console.log(`${shown}: kept (${megabytes(onDisk)}, ${rows} rows, size checked)`);
      return;
    }
    console.log(`${shown}: is ${onDisk} bytes, the generator makes ${wanted}; rewriting`);
  }
  const bytes = await writeCsv(path, options, quoted);
  const seconds = (performance.now() - started) / 1000;
  console.log(`${shown}: wrote ${megabytes(bytes)} (${bytes} bytes, ${rows} rows${quoted ? ', every field quoted' : ''}) in ${seconds.toFixed(1)} s`);
}

async function main(): Promise<void> {
  const { rowCounts, force } = parseArguments(process.argv.slice(2));
  mkdirSync(DATA_DIR, { recursive: true });
  for (const rows of rowCounts) {
    await generateOne(rows, force);
    if (rows === QUOTED_ROWS) await generateOne(rows, force, true);
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
