import { describe, expect, it } from 'vitest';
import { profileMilliseconds, selfTimeByFile, selfTimeByFunction, shortPlace, type CpuProfile } from '../../bench/lib/cpu-profile.ts';

const ROOT = '/work/levelwise';

/**
 * A hand-made profile in the .cpuprofile shape (V8's Profiler.Profile): root → build → lookup,
 * plus V8's idle node. Samples at 100, 300, 600 and 1000 µs; the profile ends at 1500 µs. Each
 * sample lasts until the next one: build 200 µs, lookup 300 + 400 µs, idle 500 µs (not counted).
 */
const profile: CpuProfile = {
  nodes: [
    { id: 1, callFrame: { functionName: '(root)', url: '', lineNumber: -1, columnNumber: -1 }, children: [2, 4] },
    { id: 2, callFrame: { functionName: 'build', url: `file://${ROOT}/src/core/columns-builder.ts`, lineNumber: 0, columnNumber: 10 }, children: [3] },
    { id: 3, callFrame: { functionName: 'lookup', url: `file://${ROOT}/node_modules/papaparse/papaparse.js`, lineNumber: 1401, columnNumber: 2 } },
    { id: 4, callFrame: { functionName: '(idle)', url: '', lineNumber: -1, columnNumber: -1 } },
  ],
  startTime: 0,
  endTime: 1500,
  samples: [2, 3, 3, 4],
  timeDeltas: [100, 200, 300, 400],
};

describe('CPU profile summary', () => {
  it('adds up self time per function, leaving idle time out of the shares', () => {
    const times = selfTimeByFunction(profile, ROOT);
    expect(times.map((t) => [t.label, t.milliseconds])).toEqual([
      ['lookup (papaparse/papaparse.js:1402)', 0.7],
      ['build (src/core/columns-builder.ts:1)', 0.2],
    ]);
    expect(times[0]?.share).toBeCloseTo(7 / 9, 12);
    expect(times[1]?.share).toBeCloseTo(2 / 9, 12);
    expect(profileMilliseconds(profile)).toEqual({ wall: 1.5, busy: 0.9 });
  });

  it('uses the source line a source map gives', () => {
    const locate = (url: string, line: number, column: number) => (url.endsWith('.ts') && line === 0 && column === 10 ? 56 : null);
    expect(selfTimeByFunction(profile, ROOT, locate).map((s) => s.label)).toEqual([
      'lookup (papaparse/papaparse.js:1402)',
      'build (src/core/columns-builder.ts:56)',
    ]);
  });

  it('adds up self time per file', () => {
    expect(selfTimeByFile(profile, ROOT).map((s) => [s.label, s.milliseconds])).toEqual([
      ['papaparse/papaparse.js', 0.7],
      ['src/core/columns-builder.ts', 0.2],
    ]);
  });

  it('names places from the project root, or from node_modules', () => {
    expect(shortPlace(`file://${ROOT}/bench/lib/paths.ts`, ROOT)).toBe('bench/lib/paths.ts');
    expect(shortPlace(`file://${ROOT}/node_modules/tsx/dist/x.mjs`, ROOT)).toBe('tsx/dist/x.mjs');
    expect(shortPlace('node:internal/buffer', ROOT)).toBe('node:internal/buffer');
  });
});
