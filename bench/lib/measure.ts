/**
 * One measurement in a fresh process, so no run inherits another's heap or JIT state:
 *
 *   node --import tsx bench/lib/measure.ts parse FILE
 *   node --import tsx bench/lib/measure.ts profile FILE
 *   node --import tsx bench/lib/measure.ts apply FILE RECIPE
 *   node --import tsx --expose-gc bench/lib/measure.ts table-memory FILE
 *
 * Only the measured path is timed (not start-up, not reading the file into memory for parse and
 * profile; parse reports its reading and decoding apart, for the like-for-like note). Prints one result line (child-result.ts). bench/run.ts starts these.
 */
import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { parseRecipe } from '../../src/core/index.ts';
import { resultLine, type MemoryResult, type TimedResult } from './child-result.ts';
import { applyFromFile, parseWithPapa, profilePath, readTableFromFile } from './paths.ts';

/** papaparse's parse of the decoded text; reading and decoding the file are timed apart (phases.readAndDecode). */
function measureParse(file: string): TimedResult {
  const read = performance.now();
  const bytes = readFileSync(file);
  const text = new TextDecoder().decode(bytes);
  const start = performance.now();
  const { dataRows } = parseWithPapa(text);
  const seconds = (performance.now() - start) / 1000;
  return { seconds, bytes: bytes.length, rows: dataRows, phases: { readAndDecode: (start - read) / 1000 } };
}

function measureProfile(file: string): TimedResult {
  const bytes = readFileSync(file);
  const start = performance.now();
  const run = profilePath(bytes, basename(file));
  const seconds = (performance.now() - start) / 1000;
  return { seconds, bytes: bytes.length, rows: run.rows, phases: run.phases };
}

function measureApply(file: string, recipeFile: string): TimedResult {
  const parsed = parseRecipe(readFileSync(recipeFile, 'utf8'));
  if (!parsed.ok) throw new Error(`${recipeFile}: not a usable recipe: ${JSON.stringify(parsed.errors).slice(0, 500)}`);
  const start = performance.now();
  const run = applyFromFile(file, parsed.recipe, () => undefined);
  const seconds = (performance.now() - start) / 1000;
  return { seconds, bytes: run.bytesRead, rows: run.rows, bytesWritten: run.bytesWritten };
}

function measureTableMemory(file: string): MemoryResult {
  const collect = (globalThis as { gc?: () => void }).gc;
  if (collect === undefined) throw new Error('table-memory needs node --expose-gc');
  const settle = (): NodeJS.MemoryUsage => {
    collect();
    collect();
    return process.memoryUsage();
  };
  const before = settle();
  const table = readTableFromFile(file);
  const after = settle();
  return {
    rows: table.rowCount,
    bytes: statSync(file).size,
    heapBytes: after.heapUsed - before.heapUsed,
    arrayBufferBytes: after.arrayBuffers - before.arrayBuffers,
  };
}

function run(argv: readonly string[]): TimedResult | MemoryResult {
  const [kind, file, recipe] = argv;
  if (file === undefined) throw new Error('Usage: measure.ts parse|profile|apply|table-memory FILE [RECIPE]');
  switch (kind) {
    case 'parse':
      return measureParse(file);
    case 'profile':
      return measureProfile(file);
    case 'apply':
      if (recipe === undefined) throw new Error('apply needs a recipe file after the data file');
      return measureApply(file, recipe);
    case 'table-memory':
      return measureTableMemory(file);
    default:
      throw new Error(`Unknown measurement "${kind}"`);
  }
}

process.stdout.write(resultLine(run(process.argv.slice(2))));
