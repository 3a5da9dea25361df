/**
 * Long level lists of a profile, packed for the trip from the worker to the page.
 *
 * A column with a value per row (an identifier) has a million levels in a million-row file. Sent
 * as a million `{ value, count }` objects, unpacking them took the page's main thread about a
 * second in one task, and holding them made every later garbage collection in the page slow
 * (bench/README.md, "In the page"). Packed, a run of levels is one string and two typed arrays:
 * a few milliseconds to receive, almost nothing to collect. The page needs the objects only when a
 * decision refits that column (core `decide` reads `profile.levels`), so they are built then, once.
 * An identifier's levels, read as ASCII bytes, travel as those bytes (moved, not copied) and become
 * a string only then too: making and sending a 10 MB string for a million identifiers took the
 * worker ~80 ms in a trace, between the file read and its summary shown.
 */
import type { ColumnProfile, LevelCount, LevelSource } from '../core/profile.ts';
import { utf8Text } from '../core/utf8-text.ts';

/** Profiles with more levels than this travel packed; shorter lists stay plain objects. */
export const PACK_ABOVE_LEVELS = 10_000;
/** A run ends after this many levels… */
export const RUN_LEVELS = 1 << 16;
/** …or once its text passes this many UTF-16 code units, so no run's string grows huge. */
export const RUN_TEXT_UNITS = 1 << 24;

/** Levels end to end: level i is `lengths[i]` code units of the run's text, counted `counts[i]` times. */
interface LevelRun {
  readonly lengths: Uint32Array<ArrayBuffer>;
  readonly counts: Float64Array<ArrayBuffer>;
}

/** A run whose text is a string. */
export interface TextLevels extends LevelRun {
  readonly text: string;
}

/** A run of ASCII levels whose text is still its bytes, one byte a code unit. */
export interface AsciiLevels extends LevelRun {
  readonly ascii: Uint8Array<ArrayBuffer>;
}

/**
 * A run of ASCII levels each counted once (an identifier's), as they lie in the column's storage:
 * level i is `ascii` from `starts[i] - starts[0]` to `starts[i + 1] - starts[0]`. Made with two
 * copies and no loop over the levels: a million of them took the worker ~100 ms (a trace, profiler
 * on) as lengths and counts, on the way to the summary.
 */
export interface SpanLevels {
  readonly ascii: Uint8Array<ArrayBuffer>;
  readonly starts: Int32Array<ArrayBuffer>;
}

export type PackedLevels = TextLevels | AsciiLevels | SpanLevels;

/** The buffers of a run, to move rather than copy to the page. */
export function runBuffers(run: PackedLevels): ArrayBuffer[] {
  if ('starts' in run) return [run.ascii.buffer, run.starts.buffer];
  const buffers = [run.lengths.buffer, run.counts.buffer];
  if ('ascii' in run) buffers.push(run.ascii.buffer);
  return buffers;
}

/** Splits `levels` into packed runs, in order. */
export function packLevels(levels: readonly LevelCount[]): TextLevels[] {
  return runsOf(levels.length, (i) => levels[i]!.value.length).map(([start, end]) => {
    // Plain loops into arrays made once: the mapping forms of Array/TypedArray.from cost several
    // times as much on a million levels.
    const values = new Array<string>(end - start);
    const lengths = new Uint32Array(end - start);
    const counts = new Float64Array(end - start);
    for (let i = start; i < end; i++) {
      const { value, count } = levels[i]!;
      values[i - start] = value;
      lengths[i - start] = value.length;
      counts[i - start] = count;
    }
    return { text: values.join(''), lengths, counts };
  });
}

/**
 * packLevels for levels kept as bytes (core profile.ts LevelSource: codes into a column of ASCII
 * values): the same runs, made from the bytes, without a string or an object per level.
 */
export function packLevelsFromBytes(source: LevelSource): PackedLevels[] {
  const { codes, counts, packed } = source;
  const { bytes, starts } = packed;
  // Ascending codes, each counted once, from the first to the last with none left out: one span of storage.
  if (source.onceEach && codes.length > 0 && codes[codes.length - 1]! - codes[0]! === codes.length - 1) return spanRuns(bytes, starts.subarray(codes[0]!, codes[0]! + codes.length + 1));
  // ASCII: a byte is a UTF-16 code unit.
  const unitsOf = (i: number): number => starts[codes[i]! + 1]! - starts[codes[i]!]!;
  return runsOf(codes.length, unitsOf).map(([start, end]) => runFromBytes(codes.subarray(start, end), counts, bytes, starts));
}

/**
 * Where the runs of `count` levels start and end: a run ends after RUN_LEVELS levels, or once its
 * text (`unitsOf(i)` code units for level i) passes RUN_TEXT_UNITS, holding one level at least.
 */
function runsOf(count: number, unitsOf: (i: number) => number): [number, number][] {
  const runs: [number, number][] = [];
  let start = 0;
  while (start < count) {
    let end = start;
    let units = 0;
    while (end < count && end - start < RUN_LEVELS && (units < RUN_TEXT_UNITS || end === start)) units += unitsOf(end++);
    runs.push([start, end]);
    start = end;
  }
  return runs;
}

/**
 * The levels whose bytes `starts` bound (level i: bytes starts[i] to starts[i + 1]), in runs as
 * runsOf cuts them: a run ends after RUN_LEVELS levels, or at the first level that takes its text
 * to RUN_TEXT_UNITS (found by bisection: the starts ascend), holding one level at least.
 */
export function spanRuns(bytes: Uint8Array, starts: Int32Array): SpanLevels[] {
  const runs: SpanLevels[] = [];
  const count = starts.length - 1;
  for (let start = 0; start < count; ) {
    let end = Math.min(count, start + RUN_LEVELS);
    if (starts[end]! - starts[start]! >= RUN_TEXT_UNITS) {
      // The smallest end whose text reaches the limit.
      let low = start + 1;
      while (low < end) {
        const middle = (low + end) >>> 1;
        if (starts[middle]! - starts[start]! >= RUN_TEXT_UNITS) end = middle;
        else low = middle + 1;
      }
    }
    // Copies: the column's storage stays here.
    runs.push({ ascii: bytes.slice(starts[start], starts[end]), starts: starts.slice(start, end + 1) });
    start = end;
  }
  return runs;
}

function runFromBytes(codes: Int32Array, counts: readonly number[], bytes: Uint8Array, starts: Int32Array): AsciiLevels {
  const lengths = new Uint32Array(codes.length);
  const levelCounts = new Float64Array(codes.length);
  let units = 0;
  // Codes one after another (an identifier's levels, every count 1, stay in dictionary order):
  // their bytes already lie end to end in the column's storage.
  let consecutive = true;
  for (let i = 0; i < codes.length; i++) {
    const code = codes[i]!;
    lengths[i] = starts[code + 1]! - starts[code]!;
    levelCounts[i] = counts[code]!;
    units += lengths[i]!;
    if (i > 0 && code !== codes[i - 1]! + 1) consecutive = false;
  }
  // A copy: the column's bytes stay here.
  if (consecutive && codes.length > 0) return { ascii: bytes.slice(starts[codes[0]!]!, starts[codes[0]!]! + units), lengths, counts: levelCounts };
  const text = new Uint8Array(units);
  let at = 0;
  // A byte at a time: values are short, and a subarray per value cost more than its copy.
  for (let i = 0; i < codes.length; i++) {
    const from = starts[codes[i]!]!;
    const end = from + lengths[i]!;
    for (let b = from; b < end; b++) text[at++] = bytes[b]!;
  }
  return { ascii: text, lengths, counts: levelCounts };
}

export function unpackLevels(runs: readonly PackedLevels[]): LevelCount[] {
  const levels: LevelCount[] = [];
  for (const run of runs) {
    if ('starts' in run) {
      const text = utf8Text(run.ascii, 0, run.ascii.length);
      const { starts } = run;
      const first = starts[0]!;
      for (let i = 0; i + 1 < starts.length; i++) levels.push({ value: text.slice(starts[i]! - first, starts[i + 1]! - first), count: 1 });
      continue;
    }
    const { lengths, counts } = run;
    // ASCII: one decode of the run's bytes gives one UTF-16 unit per byte.
    const text = 'text' in run ? run.text : utf8Text(run.ascii, 0, run.ascii.length);
    let at = 0;
    for (let i = 0; i < lengths.length; i++) {
      const end = at + lengths[i]!;
      levels.push({ value: text.slice(at, end), count: counts[i]! });
      at = end;
    }
  }
  return levels;
}

/** `profile` whose `levels` are unpacked from `runs` the first time they are read. */
export function withPackedLevels(profile: ColumnProfile, runs: readonly PackedLevels[]): ColumnProfile {
  let levels: LevelCount[] | null = null;
  const lazy = { ...profile };
  Object.defineProperty(lazy, 'levels', { enumerable: true, configurable: false, get: () => (levels ??= unpackLevels(runs)) });
  return lazy;
}
