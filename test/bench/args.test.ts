import { describe, expect, it } from 'vitest';
import { DEFAULT_SIZES, measuresEverything, parseBenchArguments, parseSizes } from '../../bench/lib/args.ts';

describe('benchmark arguments', () => {
  it('measures 10k, 100k, 1M and 4M rows, three runs each, by default', () => {
    const args = parseBenchArguments([]);
    expect(args.sizes).toEqual([10_000, 100_000, 1_000_000, 4_000_000]);
    expect(DEFAULT_SIZES).toEqual(args.sizes);
    expect(args).toMatchObject({ reps: 3, apply: 'auto', write: true, page: true, cpuProfile: false, help: false });
    expect(parseBenchArguments(['--no-page']).page).toBe(false);
  });

  it('always adds the 1M-row size, sorts and drops repeats', () => {
    expect(parseBenchArguments(['--sizes', '10000']).sizes).toEqual([10_000, 1_000_000]);
    expect(parseBenchArguments(['--sizes=4_000_000,10000,10000']).sizes).toEqual([10_000, 1_000_000, 4_000_000]);
  });

  it('reads the other options in both spellings', () => {
    const args = parseBenchArguments(['--reps=5', '--apply', 'in-process', '--no-write', '--cpu-prof']);
    expect(args).toMatchObject({ reps: 5, apply: 'in-process', write: false, cpuProfile: true });
  });

  it('says what is wrong with a bad value', () => {
    expect(() => parseSizes('10k')).toThrow('--sizes: "10k" is not a positive whole number of rows');
    expect(() => parseBenchArguments(['--sizes', '0'])).toThrow('"0" is not a positive whole number');
    expect(() => parseBenchArguments(['--reps', '0'])).toThrow('--reps: "0" is not a whole number of at least 1.');
    expect(() => parseBenchArguments(['--apply', 'sql'])).toThrow('--apply: "sql" is not one of auto, cli, in-process.');
    expect(() => parseBenchArguments(['--reps'])).toThrow('--reps needs a value.');
    expect(() => parseBenchArguments(['--fast'])).toThrow('Unknown argument "--fast".');
  });

  it('gives sizes above 1M rows the streamed apply only', () => {
    expect(measuresEverything(1_000_000)).toBe(true);
    expect(measuresEverything(4_000_000)).toBe(false);
  });
});
