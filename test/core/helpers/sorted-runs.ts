/**
 * The reference for counting numbers by value: every number sorted and walked as runs of equal
 * numbers (Float64Array sort puts -0 before 0, and a run takes its first value, so a run of zeros
 * is -0 when any -0 is in it).
 */
export function sortedRuns(numbers: readonly number[]): { values: number[]; counts: number[] } {
  const runs: { values: number[]; counts: number[] } = { values: [], counts: [] };
  for (const v of Float64Array.from(numbers).sort()) {
    const last = runs.values.length - 1;
    if (last >= 0 && runs.values[last] === v) runs.counts[last]!++;
    else {
      runs.values.push(v);
      runs.counts.push(1);
    }
  }
  return runs;
}
