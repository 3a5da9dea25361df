/**
 * A worker's first run of the reader and of the number profile, on invented data, while the page
 * waits for a file: the segment workers and the workbench's worker, which reads a big file's first
 * segment. Run cold on a big file's segment, V8 has not optimised them yet: reading
 * 60 MB of the benchmark file took ~810 ms cold against ~720 ms after this, and profiling its two
 * number columns ~160 against ~115 ms (Node 20). The warm-up costs ~0.3 s of a thread that has
 * nothing else to do, in slices of a few milliseconds: a request that comes meanwhile stops it.
 */
import { profileColumn, DEFAULT_PROFILE_OPTIONS } from '../core/profile.ts';
import { createTableReader } from '../core/read-table.ts';
import { householdEnergyCsvChunks } from '../demo/household-energy.ts';

/** Rows of the invented demo survey: enough for its amounts to be kept as numbers (past the dictionary's 4,096 values). */
export const WARM_UP_ROWS = 20_000;
/** Characters generated and read per slice. */
const SLICE_CHARS = 64 << 10;

export interface WarmUpOptions {
  readonly rows?: number;
  /** Asked between slices: true ends the warm-up there (a real request has come). */
  readonly stop?: () => boolean;
  /** Between slices: lets the thread's messages in. */
  readonly pause?: () => Promise<void>;
}

/** Reads and profiles the invented survey as a segment is read and profiled; resolves with the number columns profiled. */
export async function warmUp({ rows = WARM_UP_ROWS, stop = () => false, pause = () => Promise.resolve() }: WarmUpOptions = {}): Promise<string[]> {
  const reader = createTableReader({ packValues: true });
  const encoder = new TextEncoder();
  for (const piece of householdEnergyCsvChunks({ rows, chunkChars: SLICE_CHARS })) {
    await pause();
    if (stop()) return [];
    reader.push(encoder.encode(piece));
  }
  const { table } = reader.finish();
  const profiled: string[] = [];
  for (const [index, column] of table.columns.entries()) {
    if (column.kind !== 'number') continue;
    await pause();
    if (stop()) break;
    profileColumn(column, index, DEFAULT_PROFILE_OPTIONS);
    profiled.push(column.name);
  }
  return profiled;
}

/** What warmUpUntilMessage needs of a worker's global scope. */
interface MessageScope {
  addEventListener(type: 'message', listener: () => void): void;
  removeEventListener(type: 'message', listener: () => void): void;
}

/**
 * Runs the warm-up now, in slices that let messages in, until the first message `scope` receives:
 * a real request is never kept waiting for more than a slice.
 */
export function warmUpUntilMessage(scope: MessageScope): void {
  let spoken = false;
  const listener = (): void => void (spoken = true);
  scope.addEventListener('message', listener);
  void warmUp({ stop: () => spoken, pause: () => new Promise((resolve) => setTimeout(resolve, 0)) })
    .catch(() => undefined) // only a head start: a failure here would come again, with its message, on a real request
    .finally(() => scope.removeEventListener('message', listener));
}
