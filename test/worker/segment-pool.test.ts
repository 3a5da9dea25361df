/**
 * The page's segment pool (src/worker/segment-pool.ts), with a stand-in for the browser's Worker:
 * requests carry ids, so a worker may hold several and answer them in any order; progress goes to
 * the pool's count; a failure or a cancel ends the requests it concerns, and a pool that was not
 * left clean does not hand its workers to the next read.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { NumberColumn } from '../../src/core/columns.ts';
import { profileNumberParts, type NumberPartsRequest } from '../../src/core/number-profiles.ts';
import { DEFAULT_PROFILE_OPTIONS, profileTable, type ColumnProfile } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { Cancelled } from '../../src/worker/protocol.ts';
import {
  openSegmentPool,
  profileSharingWorkers,
  SegmentWorkerFailure,
  SHARE_PROFILING_FROM_ROWS,
  warmSegmentWorkers,
  type FromSegmentWorker,
  type ToSegmentWorker,
} from '../../src/worker/segment-pool.ts';

/** A Worker that keeps what it is sent and answers when the test says. */
class StandInWorker {
  static made: StandInWorker[] = [];
  onmessage: ((event: MessageEvent<FromSegmentWorker>) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  readonly sent: { message: ToSegmentWorker; transfer: Transferable[] }[] = [];
  terminated = false;
  constructor() {
    StandInWorker.made.push(this);
  }
  postMessage(message: ToSegmentWorker, transfer: Transferable[] = []): void {
    this.sent.push({ message, transfer });
  }
  reply(data: FromSegmentWorker): void {
    this.onmessage?.({ data } as MessageEvent<FromSegmentWorker>);
  }
  terminate(): void {
    this.terminated = true;
  }
}

const realWorker = (globalThis as { Worker?: unknown }).Worker;
const realNavigator = Object.getOwnPropertyDescriptor(globalThis, 'navigator');
beforeEach(() => {
  (globalThis as { Worker?: unknown }).Worker = StandInWorker;
  // Two cores: the workbench's worker and one segment worker (segment-pool.ts readingThreadCount).
  Object.defineProperty(globalThis, 'navigator', { value: { hardwareConcurrency: 2 }, configurable: true });
  // Workers a test left idle would be taken by the next: a cancelled pool takes them and stops them.
  const drain = new AbortController();
  openSegmentPool(null, 8, drain.signal, () => undefined);
  drain.abort();
  StandInWorker.made = [];
});
afterEach(() => {
  (globalThis as { Worker?: unknown }).Worker = realWorker;
  if (realNavigator === undefined) delete (globalThis as { navigator?: unknown }).navigator;
  else Object.defineProperty(globalThis, 'navigator', realNavigator);
});

function request(index: number): NumberPartsRequest {
  const part: NumberColumn = { kind: 'number', name: `c${index}`, length: 2, values: Float64Array.of(1, 2), exceptions: new Map(), fixedDigits: Uint8Array.of(0, 0) };
  return { parts: [part], rowCounts: [2], index, options: DEFAULT_PROFILE_OPTIONS };
}

const profileNamed = (name: string): ColumnProfile => ({ name }) as ColumnProfile;

describe('the segment pool', () => {
  it('gives a worker several requests and matches each answer to its request by id, in any order', async () => {
    const pool = openSegmentPool(null, 1, new AbortController().signal, () => undefined);
    const [profile] = pool.profilers;
    const first = profile!(request(0));
    const second = profile!(request(1));
    const worker = StandInWorker.made.at(-1)!;
    const [a, b] = worker.sent;
    expect([a!.message.type, b!.message.type]).toEqual(['profile', 'profile']);
    expect(a!.message.id).not.toBe(b!.message.id);
    // The copies travel transferred: the values' and the fixed decimals' buffers.
    expect(a!.transfer).toHaveLength(2);
    worker.reply({ type: 'profile', id: b!.message.id, profile: profileNamed('second') });
    worker.reply({ type: 'profile', id: a!.message.id, profile: profileNamed('first') });
    expect((await first).name).toBe('first');
    expect((await second).name).toBe('second');
    pool.close();
    // Left clean: kept for the next pool.
    expect(worker.terminated).toBe(false);
    openSegmentPool(null, 1, new AbortController().signal, () => undefined).close();
    expect(StandInWorker.made.at(-1)).toBe(worker);
  });

  it('counts progress, and fails only the request a failure names; the pool then stops its workers', async () => {
    const bytes: number[] = [];
    const pool = openSegmentPool(null, 1, new AbortController().signal, (n) => bytes.push(n));
    const worker = StandInWorker.made.at(-1)!;
    const failing = pool.profilers[0]!(request(0));
    const fine = pool.profilers[0]!(request(1));
    worker.reply({ type: 'progress', bytes: 4096 });
    worker.reply({ type: 'failed', id: worker.sent[0]!.message.id, code: null, message: 'out of memory', hint: '' });
    await expect(failing).rejects.toThrow(SegmentWorkerFailure);
    await expect(failing).rejects.toThrow('out of memory');
    worker.reply({ type: 'profile', id: worker.sent[1]!.message.id, profile: profileNamed('fine') });
    expect((await fine).name).toBe('fine');
    expect(bytes).toEqual([4096]);
    pool.close();
    expect(worker.terminated).toBe(true);
  });

  it('on cancel, ends every request still waiting with Cancelled and stops the workers', async () => {
    const controller = new AbortController();
    warmSegmentWorkers(2);
    const pool = openSegmentPool(new Blob(['a,b\n']), 2, controller.signal, () => undefined);
    const workers = StandInWorker.made.slice(-2);
    const reading = pool.runners[0]!({ job: { firstByte: 0, stopAt: 10 } } as Parameters<(typeof pool.runners)[0]>[0]);
    const profiling = pool.profilers[1]!(request(0));
    controller.abort();
    await expect(reading).rejects.toBeInstanceOf(Cancelled);
    await expect(profiling).rejects.toBeInstanceOf(Cancelled);
    expect(workers.map((w) => w.terminated)).toEqual([true, true]);
    // A request after the cancel is refused at once.
    await expect(pool.profilers[0]!(request(1))).rejects.toBeInstanceOf(Cancelled);
  });
});

describe('a table profiled again on the segment workers', () => {
  // 120,000 invented readings, past the size from which the number columns are sent: two columns
  // kept as numbers (more distinct values than a dictionary keeps), one text column.
  const rows = Array.from({ length: SHARE_PROFILING_FROM_ROWS + 20_000 }, (_, i) => `${i * 3},${i % 97 === 0 ? 'NA' : (i / 8).toFixed(3)},${['a', 'b'][i % 2]}`);
  const table = readTable(new TextEncoder().encode(`x,y,z\n${rows.join('\n')}\n`)).table;
  const options = { missingTokens: ['NA'] };

  /** Lets the pool post its requests and the stand-in's answers come back. */
  const answerEachRequest = async (answer: (worker: StandInWorker, message: Extract<ToSegmentWorker, { type: 'profile' }>) => void, done: Promise<unknown>): Promise<void> => {
    const answered = new Set<number>();
    while (!(await Promise.race([done.then(() => true, () => true), new Promise<false>((r) => setTimeout(() => r(false), 1))]))) {
      for (const worker of StandInWorker.made) {
        for (const { message } of worker.sent) {
          if (message.type !== 'profile' || answered.has(message.id)) continue;
          answered.add(message.id);
          answer(worker, message);
        }
      }
    }
  };

  it('gives profileTable\'s profiles, its number columns answered by a segment worker', async () => {
    expect(table.columns.map((c) => c.kind)).toEqual(['number', 'number', 'text']);
    const profiling = profileSharingWorkers(table, options, new AbortController().signal);
    await answerEachRequest((worker, message) => worker.reply({ type: 'profile', id: message.id, profile: profileNumberParts(message.request) }), profiling);
    expect(await profiling).toEqual(profileTable(table, options));
    // Both number columns went to the one segment worker (two in hand), as one part each: the table's.
    const sent = StandInWorker.made.flatMap((w) => w.sent.map((s) => s.message)).filter((m) => m.type === 'profile');
    expect(sent.map((m) => [m.request.index, m.request.rowCounts])).toEqual([
      [0, [table.rowCount]],
      [1, [table.rowCount]],
    ]);
  });

  it('profiles here when the segment worker breaks down, without failing', async () => {
    const profiling = profileSharingWorkers(table, options, new AbortController().signal);
    await answerEachRequest((worker) => worker.onerror?.({ message: 'the worker crashed' } as ErrorEvent), profiling);
    expect(await profiling).toEqual(profileTable(table, options));
  });
});
