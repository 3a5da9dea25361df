/**
 * Joining segment tables: small hand-computed cases for each pair of storages, each also checked
 * against reading all the rows in one go (the join must give the table the whole file gives).
 * Storage rule (columns-builder.ts): at the value past the cap, number storage when at most 1 in 8
 * of the distinct values, and 1 in 8 of the cells before it, are neither empty nor a number.
 */
import { describe, expect, it } from 'vitest';
import { cellText, type Column, type NumberColumn, type Table, type TextColumn } from '../../src/core/columns.ts';
import { concatTables } from '../../src/core/concat-tables.ts';
import { readNumberText, TableBuilder } from '../../src/core/columns-builder.ts';
import { readInSegments } from '../../src/core/read-in-segments.ts';
import { likelyRecordStart, rebaseRows } from '../../src/core/read-segment.ts';
import { readTable, tableFromRows, type ReadResult } from '../../src/core/read-table.ts';

const HEADER = ['v', 'note'];

/** A segment's table holding `cells` in column v (note: 'k' + row), its rows numbered from `rowsBefore`. */
function segment(cells: readonly string[], rowsBefore: number, cap: number): Table {
  const rows = [HEADER, ...cells.map((cell, i) => [cell, `k${rowsBefore + i}`])];
  // tableFromRows numbers lines from the header's (line 1): a data row r is on line r + 2.
  return rebaseRows(tableFromRows(rows, { dictionaryCap: cap }).table, rowsBefore, rowsBefore);
}

/** The segments of `cells` cut after each count in `cuts`, joined; and the whole read in one go. */
function joinedAndWhole(cells: readonly string[], cuts: readonly number[], cap: number): { parts: Table[]; joined: Table; whole: Table } {
  const bounds = [0, ...cuts, cells.length];
  const parts = bounds.slice(1).map((end, k) => segment(cells.slice(bounds[k], end), bounds[k]!, cap));
  const whole = tableFromRows([HEADER, ...cells.map((cell, i) => [cell, `k${i}`])], { dictionaryCap: cap }).table;
  return { parts, joined: concatTables(parts, { dictionaryCap: cap }), whole };
}

/** A column's storage, capacity left out, for exact comparison. */
function storageOf(column: Column): unknown {
  if (column.kind === 'text') {
    return { kind: 'text', values: column.values, counts: column.counts, codes: Array.from(column.codes.subarray(0, column.length)), bytesPerCode: column.codes.BYTES_PER_ELEMENT };
  }
  return {
    kind: 'number',
    values: Array.from(column.values.subarray(0, column.length)),
    exceptions: [...column.exceptions].sort((a, b) => a[0] - b[0]),
    fixedDigits: column.fixedDigits === null ? null : Array.from(column.fixedDigits.subarray(0, column.length)),
  };
}

function sameAsWhole(joined: Table, whole: Table): void {
  expect(joined.rowCount).toBe(whole.rowCount);
  expect(joined.columns.map(storageOf)).toEqual(whole.columns.map(storageOf));
  expect(Array.from(joined.lineOfRow)).toEqual(Array.from(whole.lineOfRow));
  expect(joined.rowIssues).toEqual(whole.rowIssues);
  for (let row = 0; row < whole.rowCount; row++) expect(cellText(joined.columns[0]!, row)).toBe(cellText(whole.columns[0]!, row));
}

const text = (table: Table): TextColumn => table.columns[0] as TextColumn;
const numbers = (table: Table): NumberColumn => table.columns[0] as NumberColumn;

describe('concatTables: dictionary + dictionary', () => {
  it('one dictionary in order of first appearance, counts summed, later codes remapped', () => {
    // Part 0: red blue red; part 1: green red (missing). 'red' is in both.
    const { parts, joined, whole } = joinedAndWhole(['red', 'blue', 'red', 'green', 'red', ''], [3], 8);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['text', 'text']);
    expect(text(joined).values).toEqual(['red', 'blue', 'green', '']);
    expect(text(joined).counts).toEqual([3, 1, 1, 1]);
    expect(Array.from(text(joined).codes)).toEqual([0, 1, 0, 2, 0, 3]);
    expect(Array.from(joined.lineOfRow)).toEqual([2, 3, 4, 5, 6, 7]);
    sameAsWhole(joined, whole);
  });

  it('values that sort after all those before are appended without a lookup, same result', () => {
    const { joined, whole } = joinedAndWhole(['H-01', 'H-02', 'H-03', 'H-04'], [2], 100);
    expect(text(joined).values).toEqual(['H-01', 'H-02', 'H-03', 'H-04']);
    expect(Array.from(text(joined).codes)).toEqual([0, 1, 2, 3]);
    sameAsWhole(joined, whole);
  });

  it('codes one byte wide in the first part, two in the join, when the values outgrow 256 there; in place or not', () => {
    // 300 values, each twice, in an order that is not ascending: the first part holds 200 of them.
    const cells = Array.from({ length: 600 }, (_, i) => `v${(i * 7) % 300}`);
    const { parts, joined, whole } = joinedAndWhole(cells, [200], 1000);
    expect(text(parts[0]!).codes).toBeInstanceOf(Uint8Array);
    expect(text(joined).codes).toBeInstanceOf(Uint16Array);
    expect(text(joined).values).toHaveLength(300);
    sameAsWhole(joined, whole);
    sameAsWhole(concatTables(parts, { dictionaryCap: 1000, reuseFirst: true }), whole);
    // Under 256 values in all, the first part's one-byte codes are filled on in place.
    const few = joinedAndWhole(cells.map((cell) => cell.slice(0, 3)), [200], 1000);
    const inPlace = concatTables(few.parts, { dictionaryCap: 1000, reuseFirst: true });
    expect(text(inPlace).codes.buffer).toBe(text(few.parts[0]!).codes.buffer);
    sameAsWhole(inPlace, few.whole);
  });

  it('past the cap in the second part with numbers: number storage, as the whole read chooses', () => {
    // Cap 2. Part 0: 1 1 2 (two values). Part 1 alone: 2 3 x, past its cap at 'x' with 1 of 3 values
    // not a number (3 > 8 × 1 fails): it stays a dictionary. The whole file passes the cap at '3'
    // (row 4) with no text before it: numbers, 'x' kept as an exception.
    const { parts, joined, whole } = joinedAndWhole(['1', '1', '2', '2', '3', 'x'], [3], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['text', 'text']);
    expect(joined.columns[0]!.kind).toBe('number');
    expect(Array.from(numbers(joined).values)).toEqual([1, 1, 2, 2, 3, NaN]);
    expect([...numbers(joined).exceptions]).toEqual([[5, 'x']]);
    expect(numbers(joined).fixedDigits).toBeNull();
    sameAsWhole(joined, whole);
  });

  it('past the cap in the second part with text: stays a dictionary', () => {
    // Cap 2. The whole file passes the cap at 'c' (row 3): 2 of 3 values are text, so dictionary.
    const { joined, whole } = joinedAndWhole(['a', '1', 'a', 'c', '2'], [2], 2);
    expect(text(joined).values).toEqual(['a', '1', 'c', '2']);
    expect(text(joined).counts).toEqual([2, 1, 1, 1]);
    sameAsWhole(joined, whole);
  });

  it('the cell rule: a frequent missing spelling before the cap keeps the dictionary', () => {
    // Cap 8. Rows: NA ×2, then 1…7 (9 distinct values at '7', row 8). Values: 1 of 9 not a number
    // (8 × 1 ≤ 9 holds), but cells before it: 2 of 8 (8 × 2 > 8): dictionary.
    const cells = ['NA', 'NA', '1', '2', '3', '4', '5', '6', '7'];
    const { joined, whole } = joinedAndWhole(cells, [4], 8);
    expect(joined.columns[0]!.kind).toBe('text');
    expect(text(joined).values).toEqual(['NA', '1', '2', '3', '4', '5', '6', '7']);
    sameAsWhole(joined, whole);
  });

  it('the cell rule counts the cells before the value past the cap, not its own', () => {
    // Cap 15. Rows 1…14, y, x: 'x' is the 16th value, at row 15. Values: 2 of 16 text (16 ≤ 16);
    // cells before it: 1 of 15 ('y': 8 ≤ 15). Counting x's own cell too (16 > 15) would keep text.
    const cells = [...Array.from({ length: 14 }, (_, i) => String(i + 1)), 'y', 'x', '15', ...Array.from({ length: 8 }, () => '16'), '17', '18', '19', '20', '21', '22'];
    for (const cut of [15, 7]) {
      const { parts, joined, whole } = joinedAndWhole(cells, [cut], 15);
      expect(whole.columns[0]!.kind).toBe('number');
      // Cut at 7, the second part alone passes its cap with numbers: the join replays its cells.
      expect(parts.map((p) => p.columns[0]!.kind)).toEqual(cut === 15 ? ['text', 'text'] : ['text', 'number']);
      expect([...numbers(joined).exceptions]).toEqual([[14, 'y'], [15, 'x']]);
      sameAsWhole(joined, whole);
    }
  });
});

describe('concatTables: identifiers kept as bytes', () => {
  it('in ascending order, joined in the first part\'s storage when its reader made room for the whole file (reuseFirst)', () => {
    const ids = Array.from({ length: 30_000 }, (_, i) => `ID-${String(i).padStart(5, '0')}`);
    const csv = (rows: readonly string[]): Uint8Array => new TextEncoder().encode(`id\n${rows.join('\n')}\n`);
    const whole = readTable(csv(ids), { packValues: true }).table;
    // The first part's reader is told the whole file's size, as the first thread's is.
    const first = readTable(csv(ids.slice(0, 18_000)), { packValues: true, totalBytes: csv(ids).length }).table;
    const second = rebaseRows(readTable(csv(ids.slice(18_000)), { packValues: true }).table, 18_000, 18_000);
    const firstPack = text(first).packed!;
    for (const reuseFirst of [false, true]) {
      const joined = concatTables([first, second], { reuseFirst });
      const pack = text(joined).packed!;
      expect(pack.ascending).toBe(true);
      expect(pack.bytes.buffer === firstPack.bytes.buffer && pack.starts.buffer === firstPack.starts.buffer).toBe(reuseFirst);
      expect(Array.from({ length: 30_000 }, (_, row) => cellText(joined.columns[0]!, row))).toEqual(ids);
      expect(text(joined).values).toEqual(text(whole).values);
      expect(text(joined).counts).toEqual(text(whole).counts);
    }
    // The first part's own cells are as they were.
    expect(Array.from({ length: 18_000 }, (_, row) => cellText(first.columns[0]!, row))).toEqual(ids.slice(0, 18_000));
  });
});

describe('concatTables: numbers + numbers', () => {
  it('values concatenated, exceptions moved by the rows before, fixed decimals joined', () => {
    // Cap 2. Part 0: 1 2.50 3 n/a → numbers ('3' passes the cap). Part 1: 134.00 7 '' 007 8 → numbers.
    const { parts, joined, whole } = joinedAndWhole(['1', '2.50', '3', 'n/a', '134.00', '7', '', '007', '8'], [4], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['number', 'number']);
    const column = numbers(joined);
    expect(Array.from(column.values)).toEqual([1, 2.5, 3, NaN, 134, 7, NaN, 7, 8]);
    expect([...column.exceptions]).toEqual([[3, 'n/a'], [7, '007']]);
    expect(Array.from(column.fixedDigits ?? [])).toEqual([0, 2, 0, 0, 2, 0, 0, 0, 0]);
    expect(Array.from({ length: 9 }, (_, row) => cellText(column, row))).toEqual(['1', '2.50', '3', 'n/a', '134.00', '7', '', '007', '8']);
    sameAsWhole(joined, whole);
  });

  it('fixed decimals stay null when no part has any', () => {
    const { joined, whole } = joinedAndWhole(['1', '2', '3', '4', '5', '6'], [3], 2);
    expect(numbers(joined).fixedDigits).toBeNull();
    sameAsWhole(joined, whole);
  });
});

describe('concatTables: mixed storages', () => {
  it('dictionary then numbers, whole file numbers: the dictionary part is read as numbers', () => {
    // Cap 2. Part 0: 5 5 6.10 (two values: dictionary). Part 1: 7 8 9 n/a (numbers at '9').
    // The whole file passes the cap at '7' (row 3), no text before: numbers.
    const { parts, joined, whole } = joinedAndWhole(['5', '5', '6.10', '7', '8', '9', 'n/a'], [3], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['text', 'number']);
    const column = numbers(joined);
    expect(Array.from(column.values)).toEqual([5, 5, 6.1, 7, 8, 9, NaN]);
    expect(Array.from(column.fixedDigits ?? [])).toEqual([0, 0, 2, 0, 0, 0, 0]);
    expect([...column.exceptions]).toEqual([[6, 'n/a']]);
    sameAsWhole(joined, whole);
  });

  it('numbers then a dictionary of mostly text, whole file numbers: one exception per text cell', () => {
    // Cap 2. Part 0: 1 2 3 → numbers. Part 1: n/a NA 4.50 n/a stays a dictionary on its own (2 of 3
    // values text at '4.50'), but the whole file chose numbers in part 0.
    const { parts, joined, whole } = joinedAndWhole(['1', '2', '3', 'n/a', 'NA', '4.50', 'n/a'], [3], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['number', 'text']);
    const column = numbers(joined);
    expect(Array.from(column.values)).toEqual([1, 2, 3, NaN, NaN, 4.5, NaN]);
    expect([...column.exceptions]).toEqual([[3, 'n/a'], [4, 'NA'], [6, 'n/a']]);
    expect(Array.from(column.fixedDigits ?? [])).toEqual([0, 0, 0, 0, 0, 2, 0]);
    sameAsWhole(joined, whole);
  });

  it('a dictionary past the cap (text) then numbers: the whole file is a dictionary', () => {
    // Cap 2. Part 0: a b c stays a dictionary ('c' past the cap, all text). Part 1: 1 2 3 → numbers alone.
    const { parts, joined, whole } = joinedAndWhole(['a', 'b', 'c', '1', '2.50', '3', '1'], [3], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['text', 'number']);
    expect(text(joined).values).toEqual(['a', 'b', 'c', '1', '2.50', '3']);
    expect(text(joined).counts).toEqual([1, 1, 1, 2, 1, 1]);
    expect(Array.from(text(joined).codes)).toEqual([0, 1, 2, 3, 4, 5, 3]);
    sameAsWhole(joined, whole);
  });

  it('a dictionary under the cap then numbers whose cells bring the cap with text first: a dictionary', () => {
    // Cap 2. Part 0: x 1 (dictionary). Part 1: 2 3 4 5 alone is numbers. The whole file passes the
    // cap at '2' (row 2) with 'x' one of 3 values: dictionary; part 1's numbers become its values.
    const { parts, joined, whole } = joinedAndWhole(['x', '1', '2', '3', '4', '5'], [2], 2);
    expect(parts.map((p) => p.columns[0]!.kind)).toEqual(['text', 'number']);
    expect(text(joined).values).toEqual(['x', '1', '2', '3', '4', '5']);
    sameAsWhole(joined, whole);
  });
});

describe('concatTables: rows, lines, issues', () => {
  it('row issues in order with file rows and lines; header issues from the first part', () => {
    // Part 0 has a duplicate header name; a short row in each part.
    const part0 = tableFromRows([['v', 'v'], ['1', 'a'], ['2']], { dictionaryCap: 8 }).table;
    const part1 = rebaseRows(tableFromRows([['v', 'v'], ['3', 'b', 'extra'], ['4']], { dictionaryCap: 8 }).table, 2, 2);
    const joined = concatTables([part0, part1], { dictionaryCap: 8 });
    expect(joined.headerIssues).toEqual(part0.headerIssues);
    expect(joined.headerIssues).toHaveLength(1);
    expect(joined.rowIssues).toEqual([
      { line: 3, row: 1, kind: 'too-few-fields', expected: 2, found: 1 },
      { line: 4, row: 2, kind: 'too-many-fields', expected: 2, found: 3, extra: ['extra'] },
      { line: 5, row: 3, kind: 'too-few-fields', expected: 2, found: 1 },
    ]);
    expect(Array.from(joined.lineOfRow)).toEqual([2, 3, 4, 5]);
    expect(joined.rowCount).toBe(4);
  });

  it('three parts, one of them empty', () => {
    const cells = ['b', 'a', 'b', 'c', 'a'];
    const parts = [segment(cells.slice(0, 2), 0, 8), segment([], 2, 8), segment(cells.slice(2), 2, 8)];
    const joined = concatTables(parts, { dictionaryCap: 8 });
    expect(text(joined).values).toEqual(['b', 'a', 'c']);
    expect(Array.from(text(joined).codes)).toEqual([0, 1, 0, 2, 1]);
    expect(text(joined).counts).toEqual([2, 2, 1]);
  });

  it('two parts appended whole, then a part with a value of the first: the lookup covers both', () => {
    const parts = [segment(['a', 'b'], 0, 8), segment(['c', 'd'], 2, 8), segment(['b', 'e', 'c'], 4, 8)];
    const joined = concatTables(parts, { dictionaryCap: 8 });
    expect(text(joined).values).toEqual(['a', 'b', 'c', 'd', 'e']);
    expect(Array.from(text(joined).codes)).toEqual([0, 1, 2, 3, 1, 4, 2]);
    expect(text(joined).counts).toEqual([1, 2, 2, 1, 1]);
  });

  it('one part is returned as it is', () => {
    const part = segment(['1', '2'], 0, 8);
    expect(concatTables([part])).toBe(part);
  });

  it('parts with other columns are refused', () => {
    const other = tableFromRows([['w', 'note'], ['1', 'a']]).table;
    expect(() => concatTables([segment(['1'], 0, 8), other])).toThrow(/different columns/);
  });
});

/** Every cell, line and issue of a read, for comparing two reads. */
function contentOf(result: ReadResult): unknown {
  const { table } = result;
  return {
    names: table.names,
    cells: table.columns.map((column) => Array.from({ length: table.rowCount }, (_, row) => cellText(column, row))),
    storage: table.columns.map(storageOf),
    lines: Array.from(table.lineOfRow),
    rowIssues: table.rowIssues,
    headerIssues: table.headerIssues,
    encoding: result.encoding,
    delimiter: result.delimiter,
    emptyLinesSkipped: result.emptyLinesSkipped,
    totalRows: result.totalRows,
  };
}

/** Rows of an invented survey, enough of them to pass the first reader's first 64 KiB (parse.ts). */
function surveyRows(count: number): string {
  return Array.from({ length: count }, (_, i) => `${i},${['north', 'south', 'east'][i % 3]},${(i % 97) / 4}\n`).join('');
}

describe('readInSegments gives what readTable gives', () => {
  const utf8 = (text: string) => new TextEncoder().encode(text);

  it('quoted fields spanning many segments: segments inside them are left out, some read again', async () => {
    // Quoted notes of many short lines: a 32-byte segment cut near a note's end begins inside it
    // and reaches past it (read again from where the one before stopped); those cut earlier in it
    // hold no record of their own (left out).
    const note = (lines: number) => `"${'x\n'.repeat(lines)}end"`;
    const notes = [40, 53, 67, 81].map((lines, i) => `${9000 + i},${note(lines)},1.50\n${surveyRows(3)}`).join('');
    const text = `id,region,score\n${surveyRows(5000)}${notes}${surveyRows(20)}`;
    const bytes = utf8(text);
    const segmented = await readInSegments(bytes, 32, { dictionaryCap: 4 });
    expect(segmented.segments.skipped).toBeGreaterThan(0);
    expect(segmented.segments.redone).toBeGreaterThan(0);
    expect(contentOf(segmented)).toEqual(contentOf(readTable(bytes, { dictionaryCap: 4 })));
    expect(segmented.table.rowCount).toBe(5000 + 4 * 4 + 20);
  });

  it('CR line breaks and one-column files are read whole by the first reader', async () => {
    for (const text of [`a,b\r${surveyRows(4000).replaceAll('\n', '\r')}`, `a\n${'7\n\n'.repeat(30000)}`]) {
      const bytes = utf8(text);
      const segmented = await readInSegments(bytes, 100);
      expect(segmented.segments).toEqual({ taken: 1, redone: 0, skipped: 0 });
      expect(contentOf(segmented)).toEqual(contentOf(readTable(bytes)));
    }
  });

  it('a byte that is not UTF-8 late in the file: read again whole as Windows-1252', async () => {
    // 0xE9 is é in Windows-1252 (WHATWG Encoding Standard index) and not UTF-8 on its own.
    const head = utf8(`id,region,score\n${surveyRows(4000)}`);
    const bytes = new Uint8Array([...head, ...utf8('9001,caf'), 0xe9, ...utf8(',3\n')]);
    const segmented = await readInSegments(bytes, 1000);
    expect(segmented.encoding).toBe('windows-1252');
    expect(contentOf(segmented)).toEqual(contentOf(readTable(bytes)));
    expect(cellText(segmented.table.columns[1]!, 4000)).toBe('café');
  });
});

describe('readNumberText: number storage grammar for one text', () => {
  it.each([
    ['12', 12, true, 0],
    ['134.00', 134, false, 2],
    ['007', 7, false, 0],
    ['1e3', 1000, false, 0],
    ['-0', -0, false, 0],
    ['', NaN, true, 0],
    ['n/a', NaN, false, 0],
  ])('%j', (input, value, printsBack, fixed) => {
    const read = readNumberText(input);
    expect({ value: read.value, printsBack: read.printsBack, fixed: read.fixed }).toEqual({ value, printsBack, fixed });
  });
});

describe('concatTables with reuseFirst: the first part, read into storage for the whole file, is filled in place', () => {
  /** The first part read as a reader sized for the whole file reads it: room for every row. */
  function roomyFirst(cells: readonly string[], cut: number, cap: number): Table[] {
    const builder = new TableBuilder(HEADER, { dictionaryCap: cap });
    builder.reserve(cells.length);
    cells.slice(0, cut).forEach((cell, i) => builder.addRow([cell, `k${i}`], i + 2));
    return [builder.build(), segment(cells.slice(cut), cut, cap)];
  }

  it.each([
    ['dictionary + dictionary', ['red', 'blue', 'red', 'teal', 'blue', 'red'], 3, 16],
    ['numbers + numbers, fixed decimals and an exception', ['1', '134.00', '2.5', 'n/a', '7', '8.25', '9', '10.00'], 4, 2],
  ])('%s: same table as reading all rows at once, in the first part\'s buffers', (_, cells, cut, cap) => {
    const parts = roomyFirst(cells, cut, cap);
    const before = parts[0]!.columns.map((column) => (column.kind === 'text' ? column.codes.buffer : column.values.buffer));
    const lineBuffer = parts[0]!.lineOfRow.buffer;
    const joined = concatTables(parts, { dictionaryCap: cap, reuseFirst: true });
    const whole = tableFromRows([HEADER, ...cells.map((cell, i) => [cell, `k${i}`])], { dictionaryCap: cap }).table;
    sameAsWhole(joined, whole);
    expect(joined.columns.map((column) => (column.kind === 'text' ? column.codes.buffer : column.values.buffer))).toEqual(before);
    expect(joined.lineOfRow.buffer).toBe(lineBuffer);
  });

  it('without room in the first part, new arrays are made and the result is the same', () => {
    const cells = ['a', 'b', 'a', 'c'];
    const parts = [segment(cells.slice(0, 2), 0, 16), segment(cells.slice(2), 2, 16)];
    const joined = concatTables(parts, { dictionaryCap: 16, reuseFirst: true });
    sameAsWhole(joined, tableFromRows([HEADER, ...cells.map((cell, i) => [cell, `k${i}`])], { dictionaryCap: 16 }).table);
  });
});

describe('likelyRecordStart: where a segment begins after its cut', () => {
  const bytes = (text: string) => new TextEncoder().encode(text);
  const comma = 0x2c;

  it('outside quotes, the first line break', () => {
    expect(likelyRecordStart(bytes('ab,c\nd,e\n'), comma)).toBe(5);
  });

  it('a first quote that closes a field (a delimiter follows it): the cut fell inside it', () => {
    // `x\nend",7\nnext`: the line break at 1 is inside the quoted field, the one at 8 ends the record; the next starts at 9.
    expect(likelyRecordStart(bytes('x\nend",7\nnext,1\n'), comma)).toBe(9);
  });

  it('a first quote that opens a field (a delimiter comes before it): the cut fell outside', () => {
    expect(likelyRecordStart(bytes('7\nnext,"a\nb",1\n'), comma)).toBe(2);
  });

  it('doubled quotes say nothing; with no line break outside quotes, no answer', () => {
    expect(likelyRecordStart(bytes('say ""hi"" now\nrest'), comma)).toBe(15);
    expect(likelyRecordStart(bytes('x\nend",7 and no line break after'), comma)).toBe(-1);
  });
});
