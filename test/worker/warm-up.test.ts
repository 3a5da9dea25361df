/**
 * The segment workers' warm-up (src/worker/warm-up.ts): it must keep running the code a big file's
 * segment runs (the reader, and the profile of columns kept as numbers), and give way at once to a
 * real request.
 */
import { describe, expect, it } from 'vitest';
import { warmUp } from '../../src/worker/warm-up.ts';

describe('the warm-up of a segment worker', () => {
  it('reads the invented survey and profiles its columns kept as numbers', async () => {
    let pauses = 0;
    const profiled = await warmUp({ pause: async () => void pauses++ });
    // The amounts of 20,000 invented households have more distinct values than a dictionary keeps.
    expect(profiled).toEqual(['annual_kwh', 'monthly_bill_eur']);
    // About 2.4 MB read 64 K characters at a time, then a pause before each column: small slices.
    expect(pauses).toBeGreaterThan(30);
  });

  it('stops at the next slice once a request has come', async () => {
    let pauses = 0;
    const profiled = await warmUp({ pause: async () => void pauses++, stop: () => pauses >= 3 });
    expect(profiled).toEqual([]);
    expect(pauses).toBe(3);
  });
});
