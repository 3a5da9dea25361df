import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ColumnBuilder, TableBuilder, numberValue, printsBack } from '../../src/core/columns-builder.ts';
import { cellText, tableBuffers, type Column, type NumberColumn, type TextColumn } from '../../src/core/columns.ts';
import { hashBytes } from '../../src/core/parse.ts';
import { createTableReader, readTable } from '../../src/core/read-table.ts';
import { encodeUtf8 } from '../../src/core/utf8-text.ts';

function build(cells: readonly string[], cap?: number): Column {
  const builder = new ColumnBuilder('x', cap);
  for (const cell of cells) builder.push(cell);
  return builder.build();
}

function textsOf(column: Column): string[] {
  return Array.from({ length: column.length }, (_, row) => cellText(column, row));
}

describe('dictionary storage', () => {
  it('codes take one byte a cell up to 256 values, two up to 65,536, four beyond, and give back every cell', () => {
    const cases = [
      { distinct: 3, width: Uint8Array },
      { distinct: 256, width: Uint8Array },
      { distinct: 257, width: Uint16Array },
      { distinct: 65_536, width: Uint16Array },
      { distinct: 65_537, width: Uint32Array },
    ];
    for (const { distinct, width } of cases) {
      // Each value twice, the second time in another order, so codes repeat: v0 v1 … then v1 v0 ….
      const values = Array.from({ length: distinct }, (_, i) => `v${i}`);
      const cells = [...values, ...values.map((_, i) => values[(i + 1) % distinct]!)];
      const one = build(cells, 1 << 20) as TextColumn;
      expect(one.codes).toBeInstanceOf(width);
      expect(one.values).toHaveLength(distinct);
      expect(textsOf(one)).toEqual(cells);
      // The same cells read from a file: a block at a time, ascending runs included (v0 < v1 < … by bytes only in part).
      const read = readTable(encodeUtf8(`x\n${cells.join('\n')}\n`), { dictionaryCap: 1 << 20 }).table.columns[0] as TextColumn;
      expect(read.codes).toBeInstanceOf(width);
      expect(textsOf(read)).toEqual(cells);
    }
  });

  it('an ascending identifier read a block at a time past the cap widens its codes before the run needs them', () => {
    const ids = Array.from({ length: 70_000 }, (_, i) => `ID-${String(i).padStart(6, '0')}`);
    const read = readTable(encodeUtf8(`id\n${ids.join('\n')}\n`), { dictionaryCap: 16 }).table.columns[0] as TextColumn;
    expect(read.codes).toBeInstanceOf(Uint32Array);
    expect(textsOf(read)).toEqual(ids);
  });

  it('stores codes, distinct values in order of first appearance, and counts', () => {
    const column = build(['red', 'blue', 'red', '', 'red', 'blue']) as TextColumn;
    expect(column.kind).toBe('text');
    expect(column.length).toBe(6);
    expect(column.values).toEqual(['red', 'blue', '']);
    expect(column.counts).toEqual([3, 2, 1]);
    expect(Array.from(column.codes.subarray(0, 6))).toEqual([0, 1, 0, 2, 0, 1]);
  });

  it('reads a run of ascending identifiers past the cap from a file, up to the first that is not greater, then as a dictionary', () => {
    // Cap 4: from the 5th value on the block path takes the run (pushAscendingValues); values that
    // share long prefixes, differ in the last byte or in a whole word, are not ASCII ("ID-ü…"
    // sorts after "ID-z" in UTF-8), and one long enough to make the value bytes grow. The run ends
    // at a smaller value ("ID-0003"), or at a repeat of the one before; then come known values, a
    // new one, and the empty cell.
    const ids = ['ID-0001', 'ID-0002', 'ID-0003', 'ID-0010', 'ID-0011', 'ID-00110', 'ID-0012', 'ID-z', 'ID-ü1', 'ID-ü2', `ID-ü3${'x'.repeat(600)}`];
    const cases = [
      { cells: [...ids, 'ID-0003', 'ID-ü1', 'ID-new', '', 'ID-0001'], values: [...ids, 'ID-new', ''], counts: [2, 1, 2, 1, 1, 1, 1, 1, 2, 1, 1, 1, 1] },
      { cells: [...ids.slice(0, 8), 'ID-z', 'ID-0001', 'ID-zz'], values: [...ids.slice(0, 8), 'ID-zz'], counts: [2, 1, 1, 1, 1, 1, 1, 2, 1] },
    ];
    for (const { cells, values, counts } of cases) {
      const bytes = encodeUtf8(`id,n\n${cells.map((id, i) => `${id},${i}`).join('\n')}\n`);
      for (const [sliceBytes, packValues] of [[7, false], [64, true], [1 << 20, false], [1 << 20, true]] as const) {
        const reader = createTableReader({ dictionaryCap: 4, packValues });
        for (let at = 0; at < bytes.length; at += sliceBytes) reader.push(bytes.subarray(at, at + sliceBytes));
        const column = reader.finish().table.columns[0] as TextColumn;
        expect(column.kind).toBe('text');
        expect(textsOf(column)).toEqual(cells);
        expect(column.values).toEqual(values);
        expect(column.counts).toEqual(counts);
      }
    }
  });

  it('keeps text untrimmed: " a", "a" and "a " are three values', () => {
    expect((build([' a', 'a', 'a ']) as TextColumn).values).toEqual([' a', 'a', 'a ']);
  });

  it('stays a dictionary past the cap when more than 1 in 8 distinct values are not numbers', () => {
    // Cap 4: the choice is made at the 5th distinct value; 'n/a' is 1 of 5, more than 1 in 8.
    const cells = ['n/a', ...Array.from({ length: 20 }, (_, i) => String(i))];
    const column = build(cells, 4);
    expect(column.kind).toBe('text');
    expect(textsOf(column)).toEqual(cells);
  });

  it('moves to numbers past the cap when at most 1 in 8 distinct values is not a number, keeping those texts', () => {
    // Cap 16: the choice is made at the 17th distinct value; 'NA' and '12 504' are 2 of 17.
    const cells = ['NA', '12 504', ...Array.from({ length: 30 }, (_, i) => String(i * 10)), 'NA', 'later text'];
    const column = build(cells, 16) as NumberColumn;
    expect(column.kind).toBe('number');
    expect(textsOf(column)).toEqual(cells);
    expect([...column.exceptions.values()]).toEqual(['NA', '12 504', 'NA', 'later text']);
  });

  it('stays a dictionary past the cap when a missing spelling fills more than 1 in 8 cells, however few distinct texts', () => {
    // Cap 16: at the 17th distinct value (row 27), 'NA' is 1 of 17 distinct values but 12 of 28
    // cells; in number storage each of them would be an exception.
    const cells = Array.from({ length: 40 }, (_, i) => (i % 5 < 2 ? 'NA' : String(i)));
    const column = build(cells, 16);
    expect(column.kind).toBe('text');
    expect(textsOf(column)).toEqual(cells);
  });

  it('grows past its first capacity', () => {
    const cells = Array.from({ length: 5000 }, (_, i) => `k${i % 7}`);
    expect(textsOf(build(cells))).toEqual(cells);
  });
});

describe('switching to number storage', () => {
  const before = ['1', '2.5', '', '-3', '4', '5'];
  const after = ['6', '1.50', 'n/a', '', ' 7', '-0', '1e3', '007', '0.1', '12345678901234567'];
  const column = build([...before, ...after], 4) as NumberColumn;

  it('happens when distinct values exceed the cap and all are numbers or empty', () => {
    expect(column.kind).toBe('number');
    expect(column.length).toBe(16);
  });

  it('keeps cellText exact for every cell, before and after the switch', () => {
    expect(textsOf(column)).toEqual([...before, ...after]);
  });

  it('holds the numbers, NaN for empty and non-number text', () => {
    expect(Array.from(column.values.subarray(0, 16))).toEqual([
      1, 2.5, NaN, -3, 4, 5, 6, 1.5, NaN, NaN, NaN, -0, 1000, 7, 0.1, 12345678901234568,
    ]);
  });

  it('keeps the text only of cells neither String(value) nor a fixed count of decimals gives back', () => {
    expect([...column.exceptions.entries()].sort((a, b) => a[0] - b[0])).toEqual([
      [8, 'n/a'],
      [10, ' 7'],
      [11, '-0'],
      [12, '1e3'],
      [13, '007'],
      [15, '12345678901234567'],
    ]);
    // "1.50" is 1.5 written with two decimals: (1.5).toFixed(2), a byte instead of a text.
    expect(column.fixedDigits?.[7]).toBe(2);
    expect(Array.from(column.fixedDigits?.subarray(0, 16) ?? []).filter((d) => d > 0)).toEqual([2]);
  });

  it('with the default cap, 5000 distinct prices with two fixed decimals become numbers', () => {
    const cells = Array.from({ length: 5000 }, (_, i) => (i / 4).toFixed(2));
    const prices = build(cells) as NumberColumn;
    expect(prices.kind).toBe('number');
    expect(textsOf(prices)).toEqual(cells);
    // Of i/4 for i < 5000, those ending in .00 and .50 (i % 2 === 0) are not how String() writes
    // them: their two decimals are kept, one byte per row, and no text at all.
    expect(prices.exceptions.size).toBe(0);
    expect(Array.from(prices.fixedDigits?.subarray(0, 5000) ?? []).filter((d) => d === 2)).toHaveLength(2500);
  });
});

describe('number storage, read from a file (block by block)', () => {
  it('keeps fixed decimals as a byte per row and other texts as exceptions, whatever the slices', () => {
    // 5000 distinct prices: past the cap (4096) the column moves to numbers, and the rest of each
    // block is read by pushNumberCells. "1.50"-like cells keep their decimals, "n/a" and "007" their text.
    const cells = Array.from({ length: 6000 }, (_, i) => (i === 5500 ? 'n/a' : i === 5600 ? '007' : (i / 4).toFixed(2)));
    const bytes = encodeUtf8(`price\n${cells.join('\n')}\n`);
    for (const sliceBytes of [333, 1 << 20]) {
      const reader = createTableReader({});
      for (let at = 0; at < bytes.length; at += sliceBytes) reader.push(bytes.subarray(at, at + sliceBytes));
      const prices = reader.finish().table.columns[0] as NumberColumn;
      expect(prices.kind).toBe('number');
      expect(textsOf(prices)).toEqual(cells);
      expect([...prices.exceptions.entries()].sort((a, b) => a[0] - b[0])).toEqual([[5500, 'n/a'], [5600, '007']]);
      // i/4 with i even ends in .00 or .50: 3000 of the 6000 rows, less the two exceptions (5500 and 5600 are even).
      expect(Array.from(prices.fixedDigits?.subarray(0, 6000) ?? []).filter((d) => d === 2)).toHaveLength(2998);
    }
  });
});

describe('fixed decimals', () => {
  it('gives back every plain decimal of up to 15 digits from its number and its count of decimals (toFixed)', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: -(10n ** 15n) + 1n, max: 10n ** 15n - 1n }), fc.integer({ min: 1, max: 14 }), (digits, decimals) => {
        const sign = digits < 0n ? '-' : '';
        const body = (digits < 0n ? -digits : digits).toString().padStart(decimals + 1, '0');
        const text = `${sign}${body.slice(0, body.length - decimals)}.${body.slice(body.length - decimals)}`;
        if (text.replace(/[-.]/g, '').length > 15) return; // beyond 15 digits such cells keep their text
        const column = build([...Array.from({ length: 20 }, (_, i) => String(i)), text], 4) as NumberColumn;
        expect(cellText(column, 20)).toBe(text);
      }),
      { numRuns: 2000 },
    );
  });

  it('keeps the text of "-0.00", whose sign toFixed would drop', () => {
    const column = build([...Array.from({ length: 20 }, (_, i) => String(i)), '-0.00', '0.00'], 4) as NumberColumn;
    expect([...column.exceptions.values()]).toEqual(['-0.00']);
    expect(textsOf(column).slice(20)).toEqual(['-0.00', '0.00']);
  });
});

describe('numberValue and printsBack', () => {
  it('printsBack(t) holds exactly when String(Number(t)) === t for a finite number (or t is empty)', () => {
    const numberish = fc.string({ unit: fc.constantFrom('0', '1', '9', '.', '-', '+', 'e', 'E', ' ', 'x'), maxLength: 12 });
    fc.assert(
      fc.property(fc.oneof(numberish, fc.string()), (text) => {
        const value = Number(text);
        const reference = text === '' || (Number.isFinite(value) && String(value) === text);
        expect(printsBack(text)).toBe(reference);
      }),
      { numRuns: 5000 },
    );
  });

  it('any finite double printed by String() reads back as itself', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const text = String(x);
        expect(numberValue(text)).toBe(Number(text));
        expect(printsBack(text)).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it('decimal text of up to 17 digits reads as Number(text) (exact fast path)', () => {
    const decimal = fc
      .tuple(fc.boolean(), fc.stringMatching(/^[0-9]{1,9}$/), fc.option(fc.stringMatching(/^[0-9]{1,8}$/)))
      .map(([negative, int, frac]) => `${negative ? '-' : ''}${int}${frac === null ? '' : `.${frac}`}`);
    fc.assert(
      fc.property(decimal, (text) => {
        expect(numberValue(text)).toBe(Number(text));
      }),
      { numRuns: 5000 },
    );
  });
});

describe('TableBuilder', () => {
  it('pads short rows with empty cells and keeps extra cells, reporting both with lines', () => {
    const builder = new TableBuilder(['a', 'b', 'c'], { firstRowIndex: 10 });
    builder.addRow(['1', '2', '3'], 2);
    builder.addRow(['4'], 3);
    builder.addRow(['5', '6', '7', '8', '9'], 5);
    builder.addRow(['x', 'y'], 6, true);
    const table = builder.build();
    expect(table.rowCount).toBe(4);
    expect(Array.from(table.lineOfRow)).toEqual([2, 3, 5, 6]);
    expect(table.columns.map(textsOf)).toEqual([
      ['1', '4', '5', 'x'],
      ['2', '', '6', 'y'],
      ['3', '', '7', ''],
    ]);
    expect(table.rowIssues).toEqual([
      { line: 3, row: 11, kind: 'too-few-fields', expected: 3, found: 1 },
      { line: 5, row: 12, kind: 'too-many-fields', expected: 3, found: 5, extra: ['8', '9'] },
      { line: 6, row: 13, kind: 'too-few-fields', expected: 3, found: 2 },
      { line: 6, row: 13, kind: 'unclosed-quote', expected: 3, found: 2 },
    ]);
  });
});

describe('the dictionary against a Map-based one, on random cells (common practice: a reference implementation)', () => {
  const cellArb = fc.constantFrom('', 'a', 'b', 'ab', 'é', 'e\u0301', '😀', '\uD800', '\uFFFD', ' a', '1', '01', '1.0', 'NA', 'x'.repeat(20));

  function reference(cells: readonly string[]) {
    const codeOf = new Map<string, number>();
    const counts: number[] = [];
    const codes = cells.map((cell) => {
      let code = codeOf.get(cell);
      if (code === undefined) {
        code = codeOf.size;
        codeOf.set(cell, code);
        counts.push(0);
      }
      counts[code]! += 1;
      return code;
    });
    return { values: [...codeOf.keys()], counts, codes };
  }

  it('gives the same values in first-seen order, counts and codes', () => {
    fc.assert(
      fc.property(fc.array(cellArb, { maxLength: 200 }), (cells) => {
        const column = build(cells) as TextColumn;
        const expected = reference(cells);
        expect(column.values).toEqual(expected.values);
        expect(column.counts).toEqual(expected.counts);
        expect(Array.from(column.codes.subarray(0, cells.length))).toEqual(expected.codes);
      }),
      { numRuns: 500 },
    );
  });

  it('gives the same through the block path the file reader takes, where cells of known values are compared four bytes at a time', () => {
    // Pairs of one length with the same hash (found by search), so that the bytes must be compared:
    // one differs only in its first four bytes, one only in its last four, others throughout.
    const sameHash = [['7yzxtail', 'e6adtail'], ['00009pf8', '0000arj6'], ['000003vl8', '00000kpd6'], ['00036wu', '000ewfa'], ['7yzx', 'e6ad'], ['0vo8v', '10020']] as const;
    for (const [a, b] of sameHash) expect(hashBytes(encodeUtf8(a), 0, a.length)).toBe(hashBytes(encodeUtf8(b), 0, b.length));
    const plainArb = fc.constantFrom('', 'a', 'abc', 'abcd', 'abce', 'abcdefgh', 'abcdefgi', 'é', 'éé', 'x'.repeat(20), ...sameHash.flat());
    fc.assert(
      fc.property(fc.array(plainArb, { minLength: 1, maxLength: 300 }), (cells) => {
        const text = `x,y\n${cells.map((cell) => `${cell},1`).join('\n')}\n`;
        const column = readTable(encodeUtf8(text)).table.columns[0] as TextColumn;
        const expected = reference(cells);
        expect(column.values).toEqual(expected.values);
        expect(column.counts).toEqual(expected.counts);
        expect(Array.from(column.codes.subarray(0, cells.length))).toEqual(expected.codes);
      }),
      { numRuns: 300 },
    );
  });

  it('stays exact when sorted identifiers stop being sorted: the hash table is built from the stored values', () => {
    const ids = Array.from({ length: 3000 }, (_, i) => `HH-${String(i).padStart(7, '0')}`);
    const cells = [...ids, ids[5]!, 'HH-9', ids[2999]!, ids[0]!, 'HH-9'];
    const column = build(cells) as TextColumn;
    const expected = reference(cells);
    expect(column.values).toEqual(expected.values);
    expect(column.counts).toEqual(expected.counts);
    expect(Array.from(column.codes.subarray(0, cells.length))).toEqual(expected.codes);
  });
});

describe('values kept as bytes (ReadOptions.packValues), for columns that cross to another thread', () => {
  const cellsOf = (column: Column) => Array.from({ length: column.length }, (_, row) => cellText(column, row));

  function packedBuild(cells: readonly string[]): TextColumn {
    const builder = new ColumnBuilder('x');
    for (const cell of cells) builder.push(cell);
    return builder.build(true) as TextColumn;
  }

  it('an identifier column keeps its ASCII values as bytes, and gives the same values, counts and cells once read', () => {
    const ids = ['ID-3', 'ID-1', 'ID-2', '=ID-4', 'ID-1'];
    const column = packedBuild(ids);
    expect(column.packed).toBeDefined();
    expect(new TextDecoder().decode(column.packed!.bytes)).toBe('ID-3ID-1ID-2=ID-4');
    expect(Array.from(column.packed!.starts)).toEqual([0, 4, 8, 12, 17]);
    expect(column.counts).toEqual([1, 2, 1, 1]);
    expect(column.values).toEqual(['ID-3', 'ID-1', 'ID-2', '=ID-4']);
    expect(cellsOf(column)).toEqual(ids);
    // The bytes cross to another thread with the codes, transferred, not copied.
    const buffers = tableBuffers({ names: ['x'], columns: [column], rowCount: 5, lineOfRow: new Uint32Array(5), rowIssues: [], headerIssues: [] });
    expect(buffers).toContain(column.packed!.bytes.buffer);
  });

  it('keeps strings for columns of few values, for values that are not ASCII, and for numbers', () => {
    expect(packedBuild(['a', 'b', 'a', 'a', 'b']).packed).toBeUndefined();
    expect(packedBuild(['Zoë', 'Ann', 'Bo']).packed).toBeUndefined();
    const numbers = new ColumnBuilder('n', 4);
    for (let i = 0; i < 10; i++) numbers.push(String(i * 1.5));
    expect(numbers.build(true).kind).toBe('number');
  });

  it('spreading the column, as some code does, reads its values: they are never lost', () => {
    const copy = { ...packedBuild(['k1', 'k2', 'k3']) };
    expect(copy.values).toEqual(['k1', 'k2', 'k3']);
  });
});
