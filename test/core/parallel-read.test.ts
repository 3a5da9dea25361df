/**
 * How a whole-table read is cut: one segment per thread, the calling thread's larger by its head
 * start (it reads while the others start up and wait for the header).
 */
import { describe, expect, it } from 'vitest';
import { readInParallel, type SegmentRequest, type SegmentRunner } from '../../src/core/parallel-read.ts';
import type { SegmentResult } from '../../src/core/read-segment.ts';

/** Runners that only note the segments they are asked for. */
function noting(count: number): { runners: SegmentRunner[]; asked: SegmentRequest[] } {
  const asked: SegmentRequest[] = [];
  const runners = Array.from({ length: count }, (): SegmentRunner => (request) => {
    asked.push(request);
    return new Promise<SegmentResult>(() => undefined);
  });
  return { runners, asked };
}

const segmenting = { names: ['a'], delimiter: ',' as const, encodingGuessed: false };
/** The calling thread's reader as readInParallel sees it, `bytesRead` into the file; it notes where it is told to stop. */
function firstReader(bytesRead = 0): { segmenting: typeof segmenting; bytesRead: number; stopEarlier(at: number): boolean; stops: number[] } {
  return { segmenting, bytesRead, stops: [], stopEarlier(at) { this.stops.push(at); return true; } };
}

describe('the segments of a whole-table read', () => {
  it('are equal shares without a head start', () => {
    const { runners, asked } = noting(1);
    const read = readInParallel(1000, runners);
    read.pushed(firstReader());
    expect(read.firstStop).toBe(500);
    // A segment starts a byte early, to see whether a line break ends the one before; the last one reads to the end.
    expect(asked.map((r) => [r.job.firstByte, r.job.stopAt])).toEqual([[499, Infinity]]);
  });

  it('give the calling thread its head start on top of an equal share of the rest', () => {
    const { runners, asked } = noting(3);
    // 1,000 bytes, 100 of head start: the other three read 225 each, this thread 325.
    const read = readInParallel(1000, runners, { headStartBytes: 100 });
    read.pushed(firstReader());
    expect(read.firstStop).toBe(325);
    expect(asked.map((r) => [r.job.firstByte, r.job.stopAt])).toEqual([[324, 550], [549, 775], [774, Infinity]]);
  });

  it('give the calling thread at most twice what another reads, however long its head start', () => {
    const { runners } = noting(1);
    // 1,000 bytes on two threads: a head start of at most 333 bytes, then 334 each: 667 and 333.
    expect(readInParallel(1000, runners, { headStartBytes: 10_000 }).firstStop).toBe(667);
  });

  it('leave sizes given for tests as they are', () => {
    const { runners } = noting(1);
    expect(readInParallel(1000, runners, { headStartBytes: 100, segmentBytes: 300 }).firstStop).toBe(300);
  });

  it('hand the second half of what the calling thread has left to a runner done with its segment', async () => {
    let finish: (result: SegmentResult) => void = () => undefined;
    const asked: SegmentRequest[] = [];
    const runner: SegmentRunner = (request) => {
      asked.push(request);
      return new Promise<SegmentResult>((resolve) => (finish = resolve));
    };
    // 1,000 bytes on two threads: this thread to 500, the runner from 499.
    const read = readInParallel(1000, [runner], { handOverFromBytes: 100 });
    const reader = firstReader();
    read.pushed(reader);
    reader.bytesRead = 100;
    read.pushed(reader);
    expect(reader.stops).toEqual([]); // the runner is still busy
    finish({} as SegmentResult);
    await new Promise((resolve) => setTimeout(resolve, 0));
    // 400 bytes left: the last 200 go to the runner, this thread stops at the first record from 300 on.
    read.pushed(reader);
    expect(reader.stops).toEqual([300]);
    expect(asked.map((r) => [r.job.firstByte, r.job.stopAt])).toEqual([[499, Infinity], [299, 500]]);
  });

  it('keep what is left when half of it is less than handOverFromBytes', async () => {
    const read = readInParallel(1000, [async () => ({}) as SegmentResult], { handOverFromBytes: 100 });
    const reader = firstReader();
    read.pushed(reader);
    await new Promise((resolve) => setTimeout(resolve, 0));
    reader.bytesRead = 320; // 180 left: 90 would be handed over
    read.pushed(reader);
    expect(reader.stops).toEqual([]);
  });
});
