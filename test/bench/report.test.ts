import { describe, expect, it } from 'vitest';
import { cpuNote, likeForLikeNote, quotedNote, quotedResult, renderTable, rssVerdict, sizeVerdicts, spreadNote, tableRows, timing, verdictCell, type SizeResult } from '../../bench/lib/report.ts';

const MB = 1e6;

function size(rows: number, bytes: number, seconds: { parse?: number; profile?: number; profileThreads?: number; apply: number; rss: number; cpu?: { draft: number; apply: number } }): SizeResult {
  const parse = seconds.parse === undefined ? null : timing([seconds.parse], bytes);
  const profile = seconds.profile === undefined ? null : { ...timing([seconds.profile], bytes), phasesSeconds: {} };
  const profileThreads = seconds.profileThreads === undefined ? null : timing([seconds.profileThreads], bytes);
  const apply = { ...timing([seconds.apply], bytes), runsPeakRssBytes: [seconds.rss], peakRssBytes: seconds.rss, bytesWritten: null, mbPerSecondExcludingStartup: null };
  const cpuSeconds = seconds.cpu ?? { draft: null, apply: null };
  return { rows, file: `household-${rows}.csv`, bytes, parse, profile, profileThreads, apply, cpuSeconds, tableMemory: null, ...sizeVerdicts(parse, profile, profileThreads, apply) };
}

describe('benchmark report', () => {
  // 1M rows: 120 MB parsed in 1 s, profiled in 5 s on one thread and 4 s on several, applied in
  // 2.4 s; 4M rows applied with 390 MB peak RSS.
  const sizes = [
    size(1_000_000, 120 * MB, { parse: 1, profile: 5, profileThreads: 4, apply: 2.4, rss: 325 * MB }),
    size(4_000_000, 480 * MB, { apply: 9.6, rss: 390 * MB }),
  ];

  it('judges each ratio against its target, the profile path on threads', () => {
    const [reference] = sizes;
    expect(reference?.profileOverParse).toEqual({ value: 4, target: 1.3, pass: false });
    expect(reference?.profileOneThreadOverParse).toBe(5);
    expect(reference?.applyOverParse.value).toBeCloseTo(2.4, 10);
    expect(reference?.applyOverParse.pass).toBe(false);
    const rss = rssVerdict(sizes, 1_000_000);
    expect(rss.largeRows).toBe(4_000_000);
    expect(rss.value).toBeCloseTo(1.2, 10);
    expect(rss.pass).toBe(true);
  });

  it('says how much CPU time the command line used beside its wall clock, when it was measured', () => {
    const measured = size(1_000_000, 120 * MB, { parse: 1, profileThreads: 2, apply: 2.4, rss: 325 * MB, cpu: { draft: 3.1, apply: 3.55 } });
    expect(cpuNote(measured)).toBe(
      "CPU time at 1,000,000 rows (every thread, start-up included; medians): levelwise draft 3.10 s over 2.00 s of wall clock, levelwise apply 3.55 s over 2.40 s of wall clock; papaparse's parse alone 1.00 s on one thread",
    );
    expect(cpuNote(sizes[0]!)).toBeNull();
  });

  it('gives each repetition\'s own ratios, papaparse taken from the same repetition', () => {
    // Three repetitions: papaparse 1.0, 2.0, 1.6 s; draft 2.0, 2.2, 2.4 s; apply 2.5, 3.0, 4.0 s.
    const measured: SizeResult = {
      ...sizes[0]!,
      parse: timing([1, 2, 1.6], 120 * MB),
      profileThreads: timing([2, 2.2, 2.4], 120 * MB),
      apply: { ...sizes[0]!.apply!, ...timing([2.5, 3, 4], 120 * MB) },
    };
    expect(spreadNote(measured)).toBe(
      "at 1,000,000 rows, each repetition's time ÷ papaparse's in the same repetition: levelwise draft 2.00×, 1.10×, 1.50×; apply 2.50×, 1.50×, 2.50×",
    );
    // One repetition says nothing about spread; without papaparse there is nothing to divide by.
    expect(spreadNote(sizes[0]!)).toBeNull();
    expect(spreadNote({ ...measured, parse: null })).toBeNull();
  });

  it('gives the draft ratio with the file read on both sides beside the verdict, which stays on the parse alone', () => {
    // papaparse: 0.3 s reading and decoding + 1 s parsing = 1.3 s; draft 1.56 s: 1.2×, where the verdict says 1.56×.
    const measured: SizeResult = { ...size(1_000_000, 120 * MB, { parse: 1, profileThreads: 1.56, apply: 2.4, rss: 325 * MB }), parseWithRead: timing([1.3], 120 * MB) };
    expect(measured.profileOverParse.value).toBeCloseTo(1.56, 10);
    expect(likeForLikeNote(measured)).toBe(
      "with the file read on both sides at 1,000,000 rows (for information; the verdict is on papaparse's parse alone): levelwise draft 1.56 s (start-up, reading and decoding included) ÷ papaparse reading, decoding and parsing 1.30 s = 1.20×",
    );
    expect(likeForLikeNote(sizes[0]!)).toBeNull();
  });

  it('reports the file with every field quoted as medians and ratios to papaparse on it, without a verdict', () => {
    // Three repetitions: papaparse 3, 2, 4 s (median 3), draft 3.3, 3.9, 3.6 (3.6), apply 6, 5.4, 6.6 (6).
    const quoted = quotedResult(1_000_000, 'bench/data/household-1000000-quoted.csv', 162.6 * MB, { parse: [3, 2, 4], draft: [3.3, 3.9, 3.6], apply: [6, 5.4, 6.6] });
    expect(quoted.parse.medianSeconds).toBe(3);
    expect(quoted.draftOverParse).toBeCloseTo(1.2, 10);
    expect(quoted.applyOverParse).toBe(2);
    expect(quotedNote(quoted)).toBe(
      'every field quoted (bench/data/household-1000000-quoted.csv, 162.6 MB, 1,000,000 rows; for information, no target): papaparse 3.00 s, levelwise draft 3.60 s (1.20×), apply 6.00 s (2.00×); medians',
    );
    const withoutCli = quotedResult(1_000_000, 'q.csv', 162.6 * MB, { parse: [3], draft: [], apply: [6] });
    expect(withoutCli.profileThreads).toBeNull();
    expect(quotedNote(withoutCli)).toContain('papaparse 3.00 s, apply 6.00 s (2.00×)');
  });

  it('has no memory verdict without a size above 1M rows', () => {
    expect(rssVerdict(sizes.slice(0, 1), 1_000_000)).toEqual({ value: NaN, target: 1.2, pass: null, largeRows: null });
  });

  it('prints one row per size, with dashes where a path was not measured', () => {
    const rows = tableRows({ sizes, rssLargeOverReference: rssVerdict(sizes, 1_000_000) });
    expect(rows[0]).toEqual(['1,000,000', '120.0', '120.0', '30.0', '4.00× FAIL', '5.00×', '50.0', '2.40× FAIL', '—', '325 MB', '—']);
    expect(rows[1]).toEqual(['4,000,000', '480.0', '—', '—', '—', '—', '50.0', '—', '—', '390 MB', '1.20× pass']);
  });

  it('writes verdicts as ratio and outcome', () => {
    expect(verdictCell({ value: 1.234, target: 1.3, pass: true })).toBe('1.23× pass');
    expect(verdictCell({ value: NaN, target: 1.3, pass: null })).toBe('—');
  });

  it('right-aligns every column to its widest cell', () => {
    expect(renderTable(['rows', 'MB/s'], [['10', '1.5'], ['1,000', '12.25']])).toBe(
      [' rows   MB/s', '-----  -----', '   10    1.5', '1,000  12.25'].join('\n'),
    );
  });

  it('left-aligns the columns asked for, without trailing spaces', () => {
    expect(renderTable(['ms', 'function'], [['1200', 'pushCode'], ['80', 'parse']], [1])).toBe(
      ['  ms  function', '----  --------', '1200  pushCode', '  80  parse'].join('\n'),
    );
  });
});
