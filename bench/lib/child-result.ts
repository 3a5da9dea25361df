/**
 * What a measuring child process (measure.ts) prints, and how the parent finds it in the output:
 * one line, RESULT_PREFIX followed by JSON.
 */

export const RESULT_PREFIX = 'LEVELWISE-BENCH-RESULT ';

export type MeasureKind = 'parse' | 'profile' | 'apply' | 'table-memory';

export interface TimedResult {
  /** Time spent in the measured path only (start-up and loading the input excluded). */
  readonly seconds: number;
  readonly bytes: number;
  readonly rows: number;
  readonly phases?: Readonly<Record<string, number>>;
  readonly bytesWritten?: number;
}

export interface MemoryResult {
  readonly rows: number;
  readonly bytes: number;
  /** Growth of the V8 heap (after full collections) while the table was read and kept. */
  readonly heapBytes: number;
  /** Growth of memory held by ArrayBuffers (the table's typed arrays live there, outside the heap). */
  readonly arrayBufferBytes: number;
}

export function resultLine(result: unknown): string {
  return `${RESULT_PREFIX}${JSON.stringify(result)}\n`;
}

/** The JSON of the last result line in `stdout`; throws with the output when there is none. */
export function findResult<T>(stdout: string): T {
  const line = stdout.split('\n').reverse().find((l) => l.startsWith(RESULT_PREFIX));
  if (line === undefined) throw new Error(`No result line in the output:\n${stdout.slice(-2000)}`);
  return JSON.parse(line.slice(RESULT_PREFIX.length)) as T;
}
