/**
 * Numbers as runs of equal values, ascending: the common ground of every way the profile counts a
 * number column (on a grid, in a hash table, sorted whole) and of the parts of one column counted
 * on different threads. A run of zeros is -0 when any of its zeros is -0, as a sort puts -0 first
 * and a run takes its first value.
 */

export interface NumberRuns {
  readonly values: Float64Array;
  /** counts[i]: the cells that hold values[i]. */
  readonly counts: Float64Array;
  readonly length: number;
}

export const NO_RUNS: NumberRuns = { values: new Float64Array(0), counts: new Float64Array(0), length: 0 };

/**
 * Runs from unsorted (number, count) pairs, one pair per distinct text: the pairs are put in
 * numeric order (an index sort, -0 before 0 as a Float64Array sorts them), and equal numbers
 * written differently ("1.5", "1.50") join one run. Work grows with the distinct texts, not cells.
 */
export function runsFromPairs(numbers: Float64Array, weights: Float64Array): NumberRuns {
  const order = new Uint32Array(numbers.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  order.sort((a, b) => compareNumbers(numbers[a] ?? 0, numbers[b] ?? 0));
  const values = new Float64Array(numbers.length);
  const counts = new Float64Array(numbers.length);
  let n = 0;
  for (let k = 0; k < order.length; k++) {
    const i = order[k] ?? 0;
    const value = numbers[i] ?? 0;
    if (n > 0 && values[n - 1] === value) counts[n - 1] = (counts[n - 1] ?? 0) + (weights[i] ?? 0);
    else {
      values[n] = value;
      counts[n] = weights[i] ?? 0;
      n++;
    }
  }
  return { values, counts, length: n };
}

function compareNumbers(a: number, b: number): number {
  if (a !== b) return a < b ? -1 : 1;
  return a === 0 ? (Object.is(a, -0) ? 0 : 1) - (Object.is(b, -0) ? 0 : 1) : 0;
}

/** Runs of numbers already sorted ascending. */
export function runsFromSorted(sorted: Float64Array): NumberRuns {
  const values = new Float64Array(countDistinctSorted(sorted));
  const counts = new Float64Array(values.length);
  let n = -1;
  for (let i = 0; i < sorted.length; i++) {
    const v = sorted[i] ?? 0;
    if (n < 0 || values[n] !== v) values[++n] = v;
    counts[n] = (counts[n] ?? 0) + 1;
  }
  return { values, counts, length: values.length };
}

function countDistinctSorted(sorted: Float64Array): number {
  let distinct = 0;
  for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) distinct++;
  return distinct;
}

/** Two lists of runs as one, ascending; equal numbers join one run, which is -0 when either is (as a sort puts -0 first). */
export function mergeRuns(a: NumberRuns, b: NumberRuns): NumberRuns {
  if (b.length === 0) return a;
  if (a.length === 0) return b;
  const values = new Float64Array(a.length + b.length);
  const counts = new Float64Array(a.length + b.length);
  let i = 0;
  let j = 0;
  let n = 0;
  while (i < a.length || j < b.length) {
    const x = i < a.length ? a.values[i]! : Infinity;
    const y = j < b.length ? b.values[j]! : Infinity;
    if (i < a.length && (j === b.length || x < y)) {
      values[n] = x;
      counts[n++] = a.counts[i++]!;
    } else if (j < b.length && (i === a.length || y < x)) {
      values[n] = y;
      counts[n++] = b.counts[j++]!;
    } else {
      values[n] = Object.is(x, -0) ? x : y;
      counts[n++] = a.counts[i++]! + b.counts[j++]!;
    }
  }
  return { values: values.subarray(0, n), counts: counts.subarray(0, n), length: n };
}

/** The runs of whole numbers among `runs`. */
export function wholeRuns(runs: NumberRuns): NumberRuns {
  const values = new Float64Array(runs.length);
  const counts = new Float64Array(runs.length);
  let length = 0;
  for (let i = 0; i < runs.length; i++) {
    if (!Number.isInteger(runs.values[i])) continue;
    values[length] = runs.values[i]!;
    counts[length++] = runs.counts[i]!;
  }
  return { values: values.subarray(0, length), counts: counts.subarray(0, length), length };
}
