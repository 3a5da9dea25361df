import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { benchDataFile, quoteEveryField } from '../../bench/lib/data-files.ts';
import { readTable } from '../../src/core/index.ts';
import { cellText } from '../../src/core/columns.ts';
import { generateHouseholdEnergyCsv } from '../../src/demo/household-energy.ts';

const rowsOf = (text: string): string[][] => Papa.parse<string[]>(text, { skipEmptyLines: true }).data;

describe('the copy of a benchmark file with every field quoted', () => {
  it('quotes every field, doubles inner quotes and keeps quoted line breaks (RFC 4180 §2.5–2.7)', () => {
    expect(quoteEveryField('a,"b,c",,"say ""hi"""\r\n"line\nbreak",2,x\n')).toBe('"a","b,c","","say ""hi"""\n"line\nbreak","2","x"\n');
  });

  it('holds the same records as the file it copies: papaparse and our reader agree, on the invented survey with its quoted comments', () => {
    const plain = generateHouseholdEnergyCsv({ rows: 2000, manyLevels: 200 });
    const quoted = quoteEveryField(plain);
    expect(quoted.length).toBeGreaterThan(plain.length);
    expect(rowsOf(quoted)).toEqual(rowsOf(plain));
    const a = readTable(new TextEncoder().encode(plain)).table;
    const b = readTable(new TextEncoder().encode(quoted)).table;
    expect(b.rowCount).toBe(2000);
    expect(b.columns.map((c) => Array.from({ length: b.rowCount }, (_, r) => cellText(c, r)))).toEqual(
      a.columns.map((c) => Array.from({ length: a.rowCount }, (_, r) => cellText(c, r))),
    );
  });

  it('lies beside the plain file', () => {
    expect(benchDataFile(1_000_000, true).endsWith('bench/data/household-1000000-quoted.csv')).toBe(true);
    expect(benchDataFile(10_000).endsWith('bench/data/household-10000.csv')).toBe(true);
  });
});
