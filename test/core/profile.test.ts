import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Column } from '../../src/core/columns.ts';
import {
  DEFAULT_PROFILE_OPTIONS,
  HISTOGRAM_BINS,
  MAX_INVALID_EXAMPLES,
  profileColumn,
  profileTable,
  profileTableSharing,
  type ColumnProfile,
} from '../../src/core/profile.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';
import { columnTable, vegaTable } from './helpers/tables.ts';
import { readTable } from '../../src/core/read-table.ts';

function firstColumn(cells: readonly string[], dictionaryCap?: number): Column {
  const column = columnTable('x', cells, dictionaryCap).columns[0];
  if (column === undefined) throw new Error('no column');
  return column;
}

function profileOf(cells: readonly string[], dictionaryCap?: number): ColumnProfile {
  return profileColumn(firstColumn(cells, dictionaryCap), 0);
}

const byName = (profiles: readonly ColumnProfile[], name: string): ColumnProfile => {
  const found = profiles.find((p) => p.name === name);
  if (found === undefined) throw new Error(`no column ${name}`);
  return found;
};

const asRecord = (levels: readonly { value: string; count: number }[] | null) =>
  Object.fromEntries((levels ?? []).map((l) => [l.value, l.count]));

describe('numeric summary, hand-computed', () => {
  // 2, 4, 4, 4, 5, 5, 7, 9: mean 40 / 8 = 5; squared deviations 9+1+1+1+0+0+4+16 = 32;
  // sample variance 32 / 7, sd √(32/7) = 2.1380899…; median (4 + 5) / 2 = 4.5.
  const p = profileOf(['2', '4', '4', '4', '5', '5', '7', '9']);

  it('mean, sample sd, median, min, max', () => {
    const n = p.numeric!;
    expect(n.count).toBe(8);
    expect(n.share).toBe(1);
    expect(n.mean).toBe(5);
    expect(n.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(n.median).toBe(4.5);
    expect(n.min).toBe(2);
    expect(n.max).toBe(9);
    expect(n.distinct).toBe(5);
    expect(n.integer).toBe(true);
    expect(n.format).toEqual({ decimal: '.', group: '' });
  });

  it('a 20-bin histogram over [2, 9]: 2 → bin 0, 4 → bin 5, 5 → bin 8, 7 → bin 14, 9 → bin 19', () => {
    const { edges, counts } = p.numeric!.histogram;
    expect(edges).toHaveLength(HISTOGRAM_BINS + 1);
    expect(edges[0]).toBe(2);
    expect(edges[1]).toBeCloseTo(2.35, 12);
    expect(edges[HISTOGRAM_BINS]).toBe(9);
    const expected = new Array<number>(20).fill(0);
    expected[0] = 1;
    expected[5] = 3; // (4 − 2) / 7 × 20 = 5.71
    expected[8] = 2; // (5 − 2) / 7 × 20 = 8.57
    expected[14] = 1; // (7 − 2) / 7 × 20 = 14.29
    expected[19] = 1; // the maximum falls in the last bin
    expect(counts).toEqual(expected);
  });

  it('median of an odd count is the middle value; the sd of one value is 0', () => {
    expect(profileOf(['10', '1', '3']).numeric!.median).toBe(3);
    const one = profileOf(['7.5']).numeric!;
    expect([one.mean, one.sd, one.median]).toEqual([7.5, 0, 7.5]);
    expect(one.histogram).toEqual({ edges: [7.5, 7.5], counts: [1] });
  });

  it('counts "1.5" and "1.50" as one number and two raw values', () => {
    const q = profileOf(['1.5', '1.50', '2']);
    expect(q.distinct).toBe(3);
    expect(q.numeric!.distinct).toBe(2);
    expect(q.numeric!.integer).toBe(false);
    expect(q.numeric!.median).toBe(1.5);
  });

  it('stays accurate far from zero (mean 1e9 + 5, sd √(32/7))', () => {
    const shifted = ['2', '4', '4', '4', '5', '5', '7', '9'].map((v) => String(1e9 + Number(v)));
    const n = profileOf(shifted).numeric!;
    expect(n.mean).toBe(1e9 + 5);
    expect(n.sd).toBeCloseTo(Math.sqrt(32 / 7), 9);
  });

  it('many distinct values, shuffled: 1…3001 → mean = median = 1501, sample variance n(n+1)/12', () => {
    // For 1…n the sample variance is n(n + 1) / 12 (sum of squares about the mean, over n − 1).
    const n = 3001;
    const cells = Array.from({ length: n }, (_, i) => String(((i * 1237) % n) + 1));
    for (const cap of [undefined, 16]) {
      const s = profileOf(cells, cap).numeric!;
      expect([s.count, s.distinct, s.min, s.max, s.median]).toEqual([n, n, 1, n, 1501]);
      expect(s.mean).toBeCloseTo(1501, 9);
      expect(s.sd).toBeCloseTo(Math.sqrt((n * (n + 1)) / 12), 9);
      expect(s.histogram.counts.reduce((a, b) => a + b, 0)).toBe(n);
    }
  });

  it('reads a decimal-comma column: 12,5 / 3,75 / 1,25 → mean 17.5 / 3', () => {
    const n = profileOf(['12,5', '3,75', '1,25']).numeric!;
    expect(n.format).toEqual({ decimal: ',', group: '' });
    expect(n.mean).toBeCloseTo(17.5 / 3, 12);
    expect(n.median).toBe(3.75);
  });

  it('reads numbers in a format given in the options instead of detecting one', () => {
    const column = firstColumn(['1,234', '2,000']);
    const detected = profileColumn(column, 0).numeric!;
    expect(detected.mean).toBe(1617);
    const forced = profileColumn(column, 0, { ...DEFAULT_PROFILE_OPTIONS, format: { decimal: ',', group: '' } }).numeric!;
    expect(forced.mean).toBe(1.617);
  });
});

describe('missing values', () => {
  it('empty, white space and the default tokens are missing; tokens match after trimming, case matters', () => {
    const p = profileOf(['', ' ', 'NA', ' NA ', 'na', '3', '.', 'N/A', '-', '-3']);
    expect(p.count).toBe(10);
    expect(p.missing).toBe(7);
    expect(asRecord(p.missingSpellings)).toEqual({ '': 1, ' ': 1, NA: 1, ' NA ': 1, '.': 1, 'N/A': 1, '-': 1 });
    expect(asRecord(p.levels)).toEqual({ na: 1, '3': 1, '-3': 1 });
    expect(p.distinct).toBe(3);
  });

  it('missing tokens come from the options', () => {
    const p = profileColumn(firstColumn(['na', 'NA', '4']), 0, { missingTokens: ['na'] });
    expect(asRecord(p.missingSpellings)).toEqual({ na: 1 });
    expect(asRecord(p.levels)).toEqual({ NA: 1, '4': 1 });
  });

  it('spellings are listed most frequent first', () => {
    const p = profileOf(['NA', '', '', 'x', '?', '']);
    expect(p.missingSpellings).toEqual([
      { value: '', count: 3 },
      { value: 'NA', count: 1 },
      { value: '?', count: 1 },
    ]);
  });
});

describe('levels', () => {
  it('most frequent first, ties in order of first appearance, raw text kept', () => {
    const p = profileOf(['b', 'a ', 'b', 'a ', 'c', 'd', 'd', 'd']);
    expect(p.levels).toEqual([
      { value: 'd', count: 3 },
      { value: 'b', count: 2 },
      { value: 'a ', count: 2 },
      { value: 'c', count: 1 },
    ]);
  });
});

describe('invalid numbers', () => {
  it('counts cells that do not read as numbers and lists them with their row', () => {
    const n = profileOf(['1', '2', 'x', '3', '$4', 'x']).numeric!;
    expect(n.count).toBe(3);
    expect(n.share).toBe(0.5);
    expect(n.invalidCount).toBe(3);
    expect(n.invalidExamples).toEqual([
      { row: 2, text: 'x' },
      { row: 4, text: '$4' },
      { row: 5, text: 'x' },
    ]);
  });

  it('keeps the first 100 examples only', () => {
    const cells = Array.from({ length: 400 }, (_, i) => (i % 3 === 0 ? 'bad' : String(i)));
    const n = profileOf(cells).numeric!;
    expect(n.invalidCount).toBe(134);
    expect(n.invalidExamples).toHaveLength(MAX_INVALID_EXAMPLES);
    expect(n.invalidExamples[99]).toEqual({ row: 297, text: 'bad' });
  });

  it('a column without any number has no numeric summary', () => expect(profileOf(['red', 'green']).numeric).toBeNull());
});

describe('number-stored columns (one pass over the numbers, then the exceptions)', () => {
  // With a dictionary cap of 4, the fifth distinct plain number moves the column to number storage.
  const cells = ['1', '2', '3', '4', '5', '6', '', 'NA', '1.50', 'oops', '7', ' 8 '];
  const column = firstColumn(cells, 4);

  it('is stored as numbers', () => expect(column.kind).toBe('number'));

  it('classifies exceptions as missing, number text or invalid', () => {
    const p = profileColumn(column, 0);
    expect(p.count).toBe(12);
    expect(p.missing).toBe(2);
    expect(asRecord(p.missingSpellings)).toEqual({ '': 1, NA: 1 });
    const n = p.numeric!;
    // 1, 2, 3, 4, 5, 6, 1.5, 7, 8: sum 37.5, mean 37.5 / 9; sorted 1, 1.5, 2, 3, 4, … → median 4.
    expect(n.count).toBe(9);
    expect(n.mean).toBeCloseTo(37.5 / 9, 12);
    expect(n.median).toBe(4);
    expect(n.invalidCount).toBe(1);
    expect(n.invalidExamples).toEqual([{ row: 9, text: 'oops' }]);
    expect(n.distinct).toBe(9);
    expect(p.distinct).toBe(10); // 1…7 plain, then "1.50", "oops", " 8 " as written
    expect(p.levels).toBeNull();
    expect(p.text).toBeNull();
  });

  it('gives the same numbers as the dictionary storage of the same cells', () => {
    const fromNumbers = profileColumn(column, 0).numeric!;
    const fromText = profileOf(cells).numeric!;
    expect(fromNumbers).toEqual({ ...fromText, mean: fromNumbers.mean, sd: fromNumbers.sd });
    expect(fromNumbers.mean).toBeCloseTo(fromText.mean, 12);
    expect(fromNumbers.sd).toBeCloseTo(fromText.sd, 12);
  });

  it('counts the numbers of a big column as a sort of all its cells does, with few distinct numbers or many', () => {
    // Number storage counts distinct numbers in a hash table, and sorts all the cells once more than
    // 1 in 8 are distinct; text storage reads each distinct text. Both must give the same summary.
    let seed = 11;
    const next = (): number => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 2 ** 32;
    const few = Array.from({ length: 20_000 }, () => (Math.floor(next() * 500) / 4 - 20).toString());
    const many = Array.from({ length: 20_000 }, () => (next() * 1e6 - 5e5).toString());
    for (const cells of [[...few, '-0', '0', 'n/a', '1.50'], [...many, '-0', '0', 'NA']]) {
      const asText = profileOf(cells, 1 << 20).numeric!;
      const asNumbers = profileOf(cells, 64);
      expect(asNumbers.distinct).toBe(profileOf(cells, 1 << 20).distinct);
      const b = asNumbers.numeric!;
      expect([b.count, b.min, b.max, b.median, b.distinct, b.invalidCount, b.integer]).toEqual([
        asText.count, asText.min, asText.max, asText.median, asText.distinct, asText.invalidCount, asText.integer,
      ]);
      expect(b.histogram.counts).toEqual(asText.histogram.counts);
      expect(b.mean).toBeCloseTo(asText.mean, 6);
      expect(b.sd).toBeCloseTo(asText.sd, 6);
    }
  });

  it('counts an exception\'s number when the plain numbers fill the hash table to its last slot', () => {
    // 8,192 cells hold 1,024 distinct plain numbers (the most a column of 8,192 cells is counted
    // for, 1 in 8); "007" (kept as its text) adds a 1,025th number, 7, which must not be lost.
    const cells = Array.from({ length: 8192 }, (_, i) => String(100 + (i % 1024)));
    cells.push('007');
    const asNumbers = profileColumn(firstColumn(cells, 64), 0);
    const asText = profileColumn(firstColumn(cells, 1 << 20), 0);
    expect(firstColumn(cells, 64).kind).toBe('number');
    expect(asNumbers.numeric!.min).toBe(7);
    expect(asNumbers.numeric!.count).toBe(8193);
    expect([asNumbers.distinct, asNumbers.numeric!.median, asNumbers.numeric!.leadingZeros]).toEqual([asText.distinct, asText.numeric!.median, asText.numeric!.leadingZeros]);
    expect(asNumbers.numeric!.histogram.counts).toEqual(asText.numeric!.histogram.counts);
  });

  it('lists missing spellings of equal counts in the order they first appear, whichever way number storage keeps them', () => {
    // "-999" is a number a token spells, "0.00" a fixed-decimal cell, "NA" kept as its text: three
    // ways number storage holds a cell, each spelling twice, first seen in this order.
    const numbers = Array.from({ length: 200 }, (_, i) => String(i + 1));
    const cells = [...numbers.slice(0, 50), '-999', ...numbers.slice(50, 100), '0.00', 'NA', ...numbers.slice(100), 'NA', '0.00', '-999'];
    const options = { missingTokens: ['NA', '-999', '0.00'] };
    const asText = profileColumn(firstColumn(cells, 1 << 20), 0, options);
    const asNumbers = profileColumn(firstColumn(cells, 16), 0, options);
    expect(firstColumn(cells, 16).kind).toBe('number');
    expect(asText.missingSpellings).toEqual([
      { value: '-999', count: 2 },
      { value: '0.00', count: 2 },
      { value: 'NA', count: 2 },
    ]);
    expect(asNumbers.missingSpellings).toEqual(asText.missingSpellings);
  });

  it('property: storage does not change the profile of the cells', () => {
    const cell = fc.oneof(
      fc.integer({ min: -50, max: 50 }).map(String),
      fc.double({ min: -1e6, max: 1e6, noNaN: true }).map(String),
      fc.constantFrom('', 'NA', '1.50', 'n/a', '007', '  3 ', '-0', '0', '0.0'),
    );
    fc.assert(
      fc.property(fc.array(cell, { minLength: 1, maxLength: 60 }), (cells) => {
        const asText = profileOf(cells);
        const asNumbers = profileOf(cells, 2);
        expect(asNumbers.missing).toBe(asText.missing);
        expect(asRecord(asNumbers.missingSpellings)).toEqual(asRecord(asText.missingSpellings));
        expect(asNumbers.missingSpellings.filter((s) => s.value !== "").map((s) => s.value)).toEqual(asText.missingSpellings.filter((s) => s.value !== "").map((s) => s.value));
        expect(asNumbers.distinct).toBe(asText.distinct);
        const a = asText.numeric;
        const b = asNumbers.numeric;
        if (a === null || b === null) {
          expect(b).toEqual(a);
          return;
        }
        expect([b.count, b.min, b.max, b.median, b.distinct, b.invalidCount, b.integer, b.leadingZeros]).toEqual([
          a.count, a.min, a.max, a.median, a.distinct, a.invalidCount, a.integer, a.leadingZeros,
        ]);
        expect(b.invalidExamples).toEqual(a.invalidExamples);
        expect(b.histogram.counts).toEqual(a.histogram.counts);
        expect(b.mean).toBeCloseTo(a.mean, 6);
        expect(b.sd).toBeCloseTo(a.sd, 6);
      }),
      { numRuns: 300 },
    );
  });
});

describe('flags', () => {
  it('constant: one distinct value', () => {
    expect(profileOf(['UK', 'UK', '', 'UK']).flags.constant).toBe(true);
    expect(profileOf(['UK', 'FR']).flags.constant).toBe(false);
  });

  it('identifier: text codes, all distinct', () => {
    const ids = Array.from({ length: 30 }, (_, i) => `H-${String(i + 1).padStart(4, '0')}`);
    expect(profileOf(ids).flags.identifier).toBe(true);
  });

  it('identifier: whole numbers counting the rows', () => {
    const p = profileOf(Array.from({ length: 30 }, (_, i) => String(i + 1)));
    expect(p.flags.identifier).toBe(true);
  });

  it('identifier: numbers written with leading zeros', () => {
    const p = profileOf(Array.from({ length: 12 }, (_, i) => String(i * 7 + 3).padStart(5, '0')));
    expect(p.numeric!.leadingZeros).toBe(12);
    expect(p.flags.identifier).toBe(true);
  });

  it('identifier: distinct whole numbers of one width (5-digit customer numbers)', () => {
    const p = profileOf(Array.from({ length: 20 }, (_, i) => String(10000 + ((i * 7919) % 89999))));
    expect(p.flags.identifier).toBe(true);
  });

  it('not an identifier: distinct measurements, or too few rows to tell', () => {
    const p = profileOf(Array.from({ length: 30 }, (_, i) => String(1.5 + i * 0.37)));
    expect(p.flags.identifier).toBe(false);
    expect(profileOf(['a', 'b', 'c']).flags.identifier).toBe(false);
  });

  it('date: ISO dates and day-first dates', () => {
    const p = profileOf(['2024-03-01', '2024-03-02', '01/04/2024', '2024-03-01T10:00:00Z', '']);
    expect(p.flags.date).toBe(true);
    expect(p.text?.dates).toBe(4);
    expect(profileOf(['2024-03-01', 'soon', 'later']).flags.date).toBe(false);
  });

  it('free text: long distinct texts with spaces, not an identifier at the same time', () => {
    const comments = [
      'The boiler is too loud at night',
      'Happy with the new windows overall',
      'Draughts in the back bedroom',
      'Meter readings are hard to reach',
      'Would like advice on solar panels',
      'No complaints this year',
      'Radiators heat up slowly in winter',
      'Bills went up after the tariff change',
      'Insulation work left a mess',
      'Thermostat is confusing to use',
      'Grateful for the quick repair',
    ];
    const p = profileOf(comments);
    expect(p.flags.freeText).toBe(true);
    expect(p.flags.identifier).toBe(false);
    expect(p.text?.withSpaces).toBe(11);
    expect(profileOf(['heat pump', 'gas boiler', 'heat pump', 'gas boiler', 'heat pump', 'gas boiler']).flags.freeText).toBe(false);
  });

  it('counts values with white space inside, of any kind, and measures lengths trimmed', () => {
    // A space, a tab, a no-break space (U+00A0) and an ideographic space (U+3000) are white space
    // to \s (ECMAScript WhiteSpace and LineTerminator); "A-1" and "x" are not. Edge blanks are
    // trimmed first, so " edge " is "edge": 4 characters, no space inside.
    const p = profileOf(['a b', 'a\tb', 'a\u00a0b', 'a\u3000b', 'A-1', 'x', ' edge ']);
    expect(p.text?.withSpaces).toBe(4);
    expect(p.text?.meanLength).toBeCloseTo((3 + 3 + 3 + 3 + 3 + 1 + 4) / 7, 10);
  });
});

describe('Palmer penguins (vega-datasets penguins.json, 344 rows; Gorman, Williams & Fraser 2014; palmerpenguins documentation)', () => {
  const profiles = profileTable(vegaTable('penguins'), { missingTokens: DEFAULT_MISSING_TOKENS });

  it('Species: Adelie 152, Gentoo 124, Chinstrap 68 (published counts)', () => {
    const p = byName(profiles, 'Species');
    expect(p.count).toBe(344);
    expect(p.levels).toEqual([
      { value: 'Adelie', count: 152 },
      { value: 'Gentoo', count: 124 },
      { value: 'Chinstrap', count: 68 },
    ]);
    expect(p.missing).toBe(0);
  });

  it('Island: Biscoe 168, Dream 124, Torgersen 52 (published counts)', () =>
    expect(asRecord(byName(profiles, 'Island').levels)).toEqual({ Biscoe: 168, Dream: 124, Torgersen: 52 }));

  it('Sex: 11 missing, 10 empty (null in the file) and one "."', () => {
    const p = byName(profiles, 'Sex');
    expect(p.missing).toBe(11);
    expect(p.missingSpellings).toEqual([
      { value: '', count: 10 },
      { value: '.', count: 1 },
    ]);
    expect(asRecord(p.levels)).toEqual({ MALE: 168, FEMALE: 165 });
  });

  it('body mass: 342 values, mean 4201.754 g, sd 801.9545 g, median 4050 g (palmerpenguins summary, quoted from memory)', () => {
    const p = byName(profiles, 'Body Mass (g)');
    expect(p.missing).toBe(2);
    const n = p.numeric!;
    expect(n.count).toBe(342);
    expect(n.mean).toBeCloseTo(4201.754, 3);
    expect(n.sd).toBeCloseTo(801.9545, 4);
    expect(n.median).toBe(4050);
    expect([n.min, n.max]).toEqual([2700, 6300]);
  });

  it('bill length: mean 43.92193 mm, sd 5.459584 mm, median 44.45 mm (palmerpenguins summary, quoted from memory)', () => {
    const n = byName(profiles, 'Beak Length (mm)').numeric!;
    expect(n.mean).toBeCloseTo(43.92193, 5);
    expect(n.sd).toBeCloseTo(5.459584, 6);
    expect(n.median).toBe(44.45);
    expect([n.min, n.max]).toEqual([32.1, 59.6]);
  });

  it('the histogram of body mass holds every one of the 342 numbers', () => {
    const counts = byName(profiles, 'Body Mass (g)').numeric!.histogram.counts;
    expect(counts.reduce((a, b) => a + b, 0)).toBe(342);
  });
});

describe('cars (vega-datasets cars.json, 406 rows; the UCI Auto MPG data)', () => {
  const profiles = profileTable(vegaTable('cars'));

  it('Origin: USA 254, Japan 79, Europe 73', () =>
    expect(byName(profiles, 'Origin').levels).toEqual([
      { value: 'USA', count: 254 },
      { value: 'Japan', count: 79 },
      { value: 'Europe', count: 73 },
    ]));

  it('Horsepower has the 6 missing values the UCI documentation mentions; Miles_per_Gallon 8 (from memory)', () => {
    expect(byName(profiles, 'Horsepower').missing).toBe(6);
    expect(byName(profiles, 'Miles_per_Gallon').missing).toBe(8);
  });

  it('Year is written as dates ("1970-01-01") and flagged as such', () => {
    const p = byName(profiles, 'Year');
    expect(p.flags.date).toBe(true);
    expect(p.numeric).toBeNull();
  });

  it('Cylinders: 5 distinct whole numbers 3 to 8', () => {
    const n = byName(profiles, 'Cylinders').numeric!;
    expect([n.distinct, n.min, n.max, n.integer]).toEqual([5, 3, 8, true]);
    expect(asRecord(byName(profiles, 'Cylinders').levels)).toEqual({ '3': 4, '4': 207, '5': 3, '6': 84, '8': 108 });
  });
});

describe('profileTableSharing', () => {
  it('gives profileTable\'s profiles whether each number column is profiled elsewhere or left here', async () => {
    // 3,000 invented rows: three columns in number storage (more distinct values than the cap of 64), one text column.
    const rows = Array.from({ length: 3000 }, (_, i) => `${i * 7},${(i % 500) / 4},${i % 50 === 0 ? 'NA' : String(i * 13)},${['red', 'blue'][i % 2]}`);
    const { table } = readTable(new TextEncoder().encode(`a,b,c,colour\n${rows.join('\n')}\n`), { dictionaryCap: 64 });
    expect(table.columns.map((column) => column.kind)).toEqual(['number', 'number', 'number', 'text']);
    const expected = profileTable(table, DEFAULT_PROFILE_OPTIONS);
    for (const taken of [[], [0], [1, 2], [0, 1, 2]]) {
      const asked: number[] = [];
      const profiles = await profileTableSharing(table, DEFAULT_PROFILE_OPTIONS, (column, index, options) => {
        asked.push(index);
        return taken.includes(index) ? Promise.resolve(profileColumn(column, index, options)) : null;
      });
      expect(asked).toEqual([0, 1, 2]);
      expect(profiles).toEqual(expected);
    }
  });

  it('fails with the failure of a column profiled elsewhere', async () => {
    const { table } = readTable(new TextEncoder().encode(`a\n${Array.from({ length: 200 }, (_, i) => i).join('\n')}\n`), { dictionaryCap: 8 });
    await expect(profileTableSharing(table, DEFAULT_PROFILE_OPTIONS, () => Promise.reject(new Error('a reading thread stopped')))).rejects.toThrow('a reading thread stopped');
  });
});
