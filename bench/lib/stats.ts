/**
 * Small arithmetic of the report: medians of repeated runs, throughput, and ratios judged against
 * their targets. A missed target is reported, never thrown: the benchmark is a report, not a test.
 */

/** Megabytes are decimal (10^6 bytes), as file managers and `ls -h --si` show them. */
export const BYTES_PER_MB = 1e6;

export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

export function megabytesPerSecond(bytes: number, seconds: number): number {
  return seconds > 0 ? bytes / BYTES_PER_MB / seconds : NaN;
}

export interface Verdict {
  /** Measured ratio; NaN when one side was not measured. */
  readonly value: number;
  /** The ratio must not exceed this. */
  readonly target: number;
  /** null when the ratio could not be measured. */
  readonly pass: boolean | null;
}

/** Judges `value` against an upper bound. */
export function atMost(value: number, target: number): Verdict {
  return { value, target, pass: Number.isFinite(value) ? value <= target : null };
}

/**
 * How many times longer the path takes than the baseline on the same bytes. With both measured as
 * MB/s on one file this is baseline MB/s ÷ path MB/s.
 */
export function timeRatio(baselineMbPerSecond: number, pathMbPerSecond: number): number {
  return pathMbPerSecond > 0 && Number.isFinite(baselineMbPerSecond) ? baselineMbPerSecond / pathMbPerSecond : NaN;
}

/** The targets of the big-files work, all "at most". */
export const TARGETS = {
  /** Profile path time ÷ papaparse time on the same file. */
  profileOverParse: 1.3,
  /** Apply path time ÷ papaparse time on the same file. */
  applyOverParse: 2,
  /** Peak RSS of apply at 4M rows ÷ at 1M rows: memory must not grow with the file. */
  rssLargeOverReference: 1.2,
} as const;
