/**
 * Numbers counted on a grid: the profile's fast way to the distinct numbers of a column and their
 * counts when the numbers are whole, or have a few decimals, over a span not much wider than the
 * column is long (readings in kWh, amounts in cents, ages, years). Each number becomes an integer
 * key (its value times a power of ten) and is counted in an array indexed by key: one multiply,
 * one round and one increment per cell, where a hash table mixes the number's bits and probes, and
 * the distinct numbers come out ascending, with no sort. The benchmark file's two number columns
 * (a million cells each) were profiled in ~153 against ~179 ms, first calls in a fresh process
 * (bench/README.md); columns it does not fit go the hash table's way.
 *
 * A key stands for exactly one number: a scale is taken only when every number comes back from its
 * key as the very same double (`Math.round(v * scale) / scale === v`), so no two numbers share a key
 * and the runs hold the numbers as read, not numbers rounded to the grid.
 */
import type { NumberRuns } from './number-runs.ts';

/** The finest grid tried: numbers with more decimals than this are counted by hashing. */
const MAX_SCALE = 1e6;
/** The array of counts may be at most this many slots (16 MB)… */
const MAX_SLOTS = 1 << 22;
/** …and at most this many per number counted, beyond a small floor (a few distinct numbers over a wide span go by hashing). */
const SLOTS_PER_NUMBER = 2;
const MIN_SLOTS = 1 << 12;

/** What the caller knows of the numbers counted from its own pass over them. */
export interface GridFacts {
  /** How many numbers are counted. */
  readonly count: number;
  readonly min: number;
  readonly max: number;
  /** Whether any of them is not whole (then a scale above 1 is looked for). */
  readonly hasFractions: boolean;
  /** Whether any of them is -0: the run of zeros is then -0, as a sort puts -0 before 0. */
  readonly negativeZero: boolean;
}

/**
 * The runs of the numbers in `values` that are not NaN and not marked in `leftOut` (1: not
 * counted), counted on a grid; or null when no grid fits them: a span too wide for their count, or
 * more decimals than MAX_SCALE keeps. `facts` describe the numbers counted.
 */
export function countOnGrid(values: Float64Array, leftOut: Uint8Array, facts: GridFacts): NumberRuns | null {
  if (facts.count === 0) return null;
  const slotsAllowed = Math.min(MAX_SLOTS, MIN_SLOTS + SLOTS_PER_NUMBER * facts.count);
  const scale = gridScale(values, leftOut, facts, slotsAllowed);
  if (scale === null) return null;
  const first = Math.round(facts.min * scale);
  const counts = new Int32Array(Math.round(facts.max * scale) - first + 1);
  // The scale was checked on every number, so each lands on its own slot.
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (leftOut[i] === 0 && v === v) counts[Math.round(v * scale) - first]! += 1;
  }
  return runsOfSlots(counts, first, scale, facts.negativeZero);
}

/**
 * The smallest power of ten, 1 to MAX_SCALE, at which every number is a whole number of steps and
 * the span fits `slotsAllowed`; null when there is none.
 */
function gridScale(values: Float64Array, leftOut: Uint8Array, facts: GridFacts, slotsAllowed: number): number | null {
  for (let scale = facts.hasFractions ? 10 : 1; scale <= MAX_SCALE; scale *= 10) {
    const first = Math.round(facts.min * scale);
    const last = Math.round(facts.max * scale);
    // Keys past 2^53 are not every integer: two numbers could share one.
    if (!Number.isSafeInteger(first) || !Number.isSafeInteger(last) || last - first + 1 > slotsAllowed) return null;
    if (scale === 1 || onGrid(values, leftOut, scale)) return scale;
  }
  return null;
}

/** Whether every number counted comes back from its key at `scale` unchanged. */
function onGrid(values: Float64Array, leftOut: Uint8Array, scale: number): boolean {
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    // NaN !== NaN: the test is written so that NaN passes.
    if (leftOut[i] === 0 && Math.round(v * scale) / scale !== v && v === v) return false;
  }
  return true;
}

function runsOfSlots(counts: Int32Array, first: number, scale: number, negativeZero: boolean): NumberRuns {
  let length = 0;
  for (let slot = 0; slot < counts.length; slot++) if (counts[slot] !== 0) length++;
  const values = new Float64Array(length);
  const runCounts = new Float64Array(length);
  let run = 0;
  for (let slot = 0; slot < counts.length; slot++) {
    const count = counts[slot]!;
    if (count === 0) continue;
    // Division, not multiplication by 1/scale: it gives back the very double the check saw.
    const value = (first + slot) / scale;
    values[run] = value === 0 && negativeZero ? -0 : value;
    runCounts[run++] = count;
  }
  return { values, counts: runCounts, length };
}
