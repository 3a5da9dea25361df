/**
 * Missing values coded as numbers ("-999", common practice in survey exports) must be missing
 * whatever storage the reader chose for the column: a dictionary (few distinct values) or number
 * storage (many), where plain numbers are kept without their text.
 */
import { describe, expect, it } from 'vitest';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { missingNumbers } from '../../src/core/missing.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';

const TOKENS = ['', 'NA', '-999'];

/** 6,000 invented readings; every tenth is coded missing as -999, one is "NA". */
function readings(): Uint8Array {
  const rows = ['id,amount'];
  for (let i = 0; i < 6000; i++) rows.push(`${i},${i === 7 ? 'NA' : i % 10 === 0 ? '-999' : String(i * 1.5)}`);
  return new TextEncoder().encode(`${rows.join('\n')}\n`);
}

describe('missingNumbers', () => {
  it('keeps the numbers the tokens spell, however written', () => {
    expect([...missingNumbers(['', 'NA', '-999', ' 0 ', '1.50', '007', '1e3', '1,5', '12 504'])]).toEqual([-999, 0, 1.5, 7, 1000]);
  });
});

describe('numbers coded as missing', () => {
  const bytes = readings();
  const numberStored = readTable(bytes).table;
  const dictionary = readTable(bytes, { dictionaryCap: 1e9 }).table;

  it('the two storages differ (so the check below compares both paths)', () => {
    expect(numberStored.columns[1]!.kind).toBe('number');
    expect(dictionary.columns[1]!.kind).toBe('text');
  });

  it('profile the same in number storage as in a dictionary: 601 missing, -999 among the spellings', () => {
    const fromNumbers = profileTable(numberStored, { missingTokens: TOKENS })[1]!;
    const fromDictionary = profileTable(dictionary, { missingTokens: TOKENS })[1]!;
    expect(fromNumbers.missing).toBe(601);
    expect(fromNumbers.missingSpellings).toEqual([{ value: '-999', count: 600 }, { value: 'NA', count: 1 }]);
    expect(fromNumbers.missingSpellings).toEqual(fromDictionary.missingSpellings);
    expect(fromNumbers.numeric?.min).toBe(1.5);
    expect(fromNumbers.numeric).toEqual(fromDictionary.numeric);
  });

  it('encode the same bytes and report from both storages, -999 filled as missing', () => {
    const profiles = profileTable(dictionary, { missingTokens: TOKENS });
    const recipe = draftRecipe(profiles, { file: 'readings.csv', rows: dictionary.rowCount }, { missingTokens: TOKENS });
    const a = encodeToCsv(recipe, numberStored);
    const b = encodeToCsv(recipe, dictionary);
    expect(Buffer.compare(Buffer.from(a.bytes), Buffer.from(b.bytes))).toBe(0);
    expect(a.report).toEqual(b.report);
    // Row 10 held -999: its output is not -999 (the column is filled, not read as a number).
    const lines = new TextDecoder().decode(a.bytes).split('\r\n');
    expect(lines[11]?.split(',')[1]).not.toBe('-999');
  });
});
