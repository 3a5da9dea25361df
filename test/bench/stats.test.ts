import { describe, expect, it } from 'vitest';
import { atMost, median, megabytesPerSecond, TARGETS, timeRatio } from '../../bench/lib/stats.ts';

describe('benchmark arithmetic', () => {
  it('takes the middle run, or the mean of the two middle runs', () => {
    expect(median([3.1, 1.2, 2.5])).toBe(2.5);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNaN();
  });

  it('counts megabytes as 10^6 bytes', () => {
    // The 1M-row benchmark file: 122,670,040 bytes in 2 s.
    expect(megabytesPerSecond(122_670_040, 2)).toBeCloseTo(61.33502, 5);
    expect(megabytesPerSecond(1, 0)).toBeNaN();
  });

  it('turns two throughputs on the same file into a time ratio', () => {
    // papaparse at 70 MB/s, a path at 14 MB/s: the path takes 5 times as long.
    expect(timeRatio(70, 14)).toBe(5);
    expect(timeRatio(70, 0)).toBeNaN();
    expect(timeRatio(NaN, 14)).toBeNaN();
  });

  it('passes a ratio equal to its target and reports an unmeasured one as unknown', () => {
    expect(atMost(1.3, TARGETS.profileOverParse)).toEqual({ value: 1.3, target: 1.3, pass: true });
    expect(atMost(2.01, TARGETS.applyOverParse).pass).toBe(false);
    expect(atMost(NaN, TARGETS.rssLargeOverReference).pass).toBeNull();
  });
});
