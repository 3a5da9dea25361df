import { thrownLevelwiseError } from './helpers/tables.ts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cellText, type Table } from '../../src/core/columns.ts';
import {
  createTableReader,
  readTable,
  readTableFromSource,
  tableFromRows,
  type Delimiter,
  type ReadOptions,
  type ReadResult,
} from '../../src/core/read-table.ts';

const VEGA = join(import.meta.dirname, '../../node_modules/vega-datasets/data');
const utf8 = (text: string) => new TextEncoder().encode(text);

function rowsOf(table: Table): string[][] {
  return Array.from({ length: table.rowCount }, (_, row) => table.columns.map((c) => cellText(c, row)));
}

function readInPieces(bytes: Uint8Array, size: number, options: ReadOptions = {}): ReadResult {
  const reader = createTableReader(options);
  for (let at = 0; at < bytes.length; at += size) reader.push(bytes.subarray(at, at + size));
  return reader.finish();
}


describe('readTable', () => {
  it('reads header, cells, line numbers and what it chose', () => {
    const result = readTable(utf8('name;score\r\nAda;3,5\r\n\r\nGrace;4\r\n'));
    expect(result.table.names).toEqual(['name', 'score']);
    expect(rowsOf(result.table)).toEqual([['Ada', '3,5'], ['Grace', '4']]);
    expect(Array.from(result.table.lineOfRow)).toEqual([2, 4]);
    expect(result).toMatchObject({ encoding: 'utf-8', delimiter: ';', emptyLinesSkipped: 1, bytes: 32, totalRows: 2 });
  });

  it('an empty file (0 bytes) is an error saying so', () => {
    const error = thrownLevelwiseError(() => readTable(new Uint8Array(0)));
    expect(error.code).toBe('empty-file');
    expect(error.message).toMatch(/0 bytes/);
  });

  it('a file of blank lines only has no header: empty-file', () => {
    expect(thrownLevelwiseError(() => readTable(utf8('\n\r\n\n'))).code).toBe('empty-file');
  });

  it('a header-only file is a table with no rows, not an error', () => {
    const { table } = readTable(utf8('a,b,c\n'));
    expect(table.names).toEqual(['a', 'b', 'c']);
    expect(table.rowCount).toBe(0);
    expect(table.columns.map((c) => c.length)).toEqual([0, 0, 0]);
  });

  it('a PNG image is not-text with a hint (PNG signature, ISO/IEC 15948)', () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    const error = thrownLevelwiseError(() => readTable(png));
    expect(error.code).toBe('not-text');
    expect(error.hint).not.toBe('');
  });

  it('reads UTF-8 with a byte order mark without putting it into the first name', () => {
    const result = readTable(new Uint8Array([0xef, 0xbb, 0xbf, ...utf8('id,név\n1,Ödön\n')]));
    expect(result.table.names).toEqual(['id', 'név']);
    expect(rowsOf(result.table)).toEqual([['1', 'Ödön']]);
  });

  it('reads UTF-16 LE and BE with a byte order mark', () => {
    const le = new Uint8Array([0xff, 0xfe, 0x61, 0, 0x09, 0, 0x62, 0, 0x0a, 0, 0xe9, 0, 0x09, 0, 0xac, 0x20, 0x0a, 0]);
    const be = new Uint8Array([0xfe, 0xff, 0, 0x61, 0, 0x09, 0, 0x62, 0, 0x0a, 0, 0xe9, 0, 0x09, 0x20, 0xac, 0, 0x0a]);
    for (const [bytes, encoding] of [[le, 'utf-16le'], [be, 'utf-16be']] as const) {
      const result = readTable(bytes);
      expect(result.encoding).toBe(encoding);
      expect(result.delimiter).toBe('\t');
      expect(rowsOf(result.table)).toEqual([['é', '€']]);
    }
  });

  it('reads Windows-1252 accents: "café" as 63 61 66 E9', () => {
    const result = readTable(new Uint8Array([...utf8('drink\n'), 0x63, 0x61, 0x66, 0xe9, 0x0a]));
    expect(result.encoding).toBe('windows-1252');
    expect(rowsOf(result.table)).toEqual([['café']]);
  });

  it('starts over as Windows-1252 when such bytes first appear after a megabyte of ASCII', () => {
    const filler = 'plain,ascii\n'.repeat(100_000);
    const bytes = new Uint8Array([...utf8(`a,b\n${filler}`), 0x63, 0x61, 0x66, 0xe9, 0x2c, 0x31, 0x0a]);
    const result = readTable(bytes);
    expect(result.encoding).toBe('windows-1252');
    expect(result.table.rowCount).toBe(100_001);
    expect(rowsOf(result.table).at(-1)).toEqual(['café', '1']);
  });

  it('readTableFromSource re-opens the source to start over', async () => {
    const bytes = new Uint8Array([...utf8(`a,b\n${'x,y\n'.repeat(5000)}`), 0xe9, 0x2c, 0x31, 0x0a]);
    async function* open(): AsyncIterable<Uint8Array> {
      for (let at = 0; at < bytes.length; at += 4096) yield bytes.subarray(at, at + 4096);
    }
    const result = await readTableFromSource(open);
    expect(result.encoding).toBe('windows-1252');
    expect(rowsOf(result.table).at(-1)).toEqual(['é', '1']);
  });

  it('reports ragged rows at their physical lines when earlier records hold quoted newlines', () => {
    const text = ['id,note,score', '1,"first', 'second",10', '2,short', '3,"a ""b""\r\nc",30,extra', '4,fine,40'].join('\n');
    const { table } = readTable(utf8(text));
    expect(Array.from(table.lineOfRow)).toEqual([2, 4, 5, 7]);
    expect(rowsOf(table)).toEqual([
      ['1', 'first\nsecond', '10'],
      ['2', 'short', ''],
      ['3', 'a "b"\r\nc', '30'],
      ['4', 'fine', '40'],
    ]);
    expect(table.rowIssues).toEqual([
      { line: 4, row: 1, kind: 'too-few-fields', expected: 3, found: 2 },
      { line: 5, row: 2, kind: 'too-many-fields', expected: 3, found: 4, extra: ['extra'] },
    ]);
  });

  it('skips and counts empty lines in a table of several columns', () => {
    const result = readTable(utf8('a,b\n\n1,2\n\n\n3,4\n\n'));
    expect(rowsOf(result.table)).toEqual([['1', '2'], ['3', '4']]);
    expect(Array.from(result.table.lineOfRow)).toEqual([3, 6]);
    expect(result.emptyLinesSkipped).toBe(4);
  });

  it('in a one-column table reads an empty line as an empty cell, except at the end of the file', () => {
    // A one-column sheet with an empty cell is saved as CSV with an empty line (common practice).
    const result = readTable(utf8('answer\r\nyes\r\n\r\nno\r\n\r\n\r\n'));
    expect(rowsOf(result.table)).toEqual([['yes'], [''], ['no']]);
    expect(Array.from(result.table.lineOfRow)).toEqual([2, 3, 4]);
    expect(result.emptyLinesSkipped).toBe(2);
  });

  it('keeps the rest of the file in a field whose quote is never closed, and reports it', () => {
    const { table } = readTable(utf8('a,b\n1,"x\n2,3\n'));
    expect(rowsOf(table)).toEqual([['1', 'x\n2,3\n']]);
    expect(table.rowIssues).toEqual([{ line: 2, row: 0, kind: 'unclosed-quote', expected: 2, found: 2 }]);
  });

  it('counts the bytes pushed, for progress', () => {
    const reader = createTableReader();
    reader.push(utf8('a,b\n'));
    reader.push(utf8('1,2\n'));
    expect(reader.bytesRead).toBe(8);
    expect(reader.finish().bytes).toBe(8);
  });

  it('renames blank and duplicate headers and reports them', () => {
    const { table } = readTable(utf8('price,,price\n1,2,3\n'));
    expect(table.names).toEqual(['price', 'column 2', 'price (2)']);
    expect(table.headerIssues.map((i) => i.kind)).toEqual(['blank', 'duplicate']);
  });

  it('gives the same table when bytes arrive one at a time', () => {
    const bytes = utf8('név,ár\r\n"Zoë, ""Z""",1\r\n\r\nÉva,"2\r\n3"\r\nÜ,😀\r\n');
    const whole = readTable(bytes);
    const pieces = readInPieces(bytes, 1);
    expect(rowsOf(pieces.table)).toEqual(rowsOf(whole.table));
    expect(rowsOf(whole.table)).toEqual([['Zoë, "Z"', '1'], ['Éva', '2\r\n3'], ['Ü', '😀']]);
    expect(Array.from(pieces.table.lineOfRow)).toEqual([2, 4, 6]);
    expect(pieces.emptyLinesSkipped).toBe(1);
  });

  it('with the source size known, makes room for the rows once instead of doubling, and reads the same table', () => {
    const text = `id,kind,value\n${Array.from({ length: 50_000 }, (_, i) => `${i},k${i % 3},${(i * 0.5).toFixed(1)}`).join('\n')}\n`;
    const bytes = utf8(text);
    const sized = readInPieces(bytes, 4096, { totalBytes: bytes.length, dictionaryCap: 64 });
    const unsized = readInPieces(bytes, 4096, { dictionaryCap: 64 });
    expect(rowsOf(sized.table)).toEqual(rowsOf(unsized.table));
    const kind = sized.table.columns[1]!;
    const value = sized.table.columns[2]!;
    if (kind.kind !== 'text' || value.kind !== 'number') throw new Error('expected a text and a number column');
    // Estimated from the rows of the first parse, not the 65,536 that doubling from 1,024 gives
    // (an overestimate here: the first rows, with ids of fewer digits, are shorter than the rest).
    expect(kind.codes.length).toBeGreaterThanOrEqual(50_000);
    expect(kind.codes.length).toBeLessThan(62_000);
    expect(value.values.length).toBeLessThan(62_000);
    const plain = unsized.table.columns[1]!;
    expect(plain.kind === 'text' && plain.codes.length).toBe(65_536);
  });

  it('keeps cellText exact after a column switches to number storage', () => {
    const values = Array.from({ length: 30 }, (_, i) => (i % 3 === 0 ? `${i}.50` : i % 7 === 0 ? 'NA' : String(i * 1.25)));
    const text = `id,value\n${values.map((v, i) => `${i},${v}`).join('\n')}\n`;
    const { table } = readTable(utf8(text), { dictionaryCap: 5 });
    expect(table.columns.map((c) => c.kind)).toEqual(['number', 'number']);
    expect(rowsOf(table).map((r) => r[1])).toEqual(values);
  });
});

describe('batch mode', () => {
  // Blank and repeated header names, quoted newlines, short rows and blank lines along the way.
  const body: string[] = [];
  for (let i = 0; i < 2500; i++) {
    if (i % 97 === 0) body.push(`${i},"multi\nline",${i % 5}`);
    else if (i % 211 === 0) body.push(`${i},short`);
    else if (i % 113 === 0) body.push('');
    else body.push(`${i},v${i % 13},${(i * 0.5).toFixed(1)}`);
  }
  const bytes = utf8(`a,,a\r\n${body.join('\r\n')}\r\n`);

  it('hands over consecutive tables with absolute rows and lines, equal to whole-file reading', () => {
    const whole = readTable(bytes);
    const batches: { table: Table; first: number }[] = [];
    const result = readInPieces(bytes, 777, { batchRows: 300, dictionaryCap: 50, onBatch: (table, first) => batches.push({ table, first }) });

    expect(batches.map((b) => b.first)).toEqual(batches.map((_, i) => i * 300));
    expect(batches.every((b) => b.table.rowCount <= 300)).toBe(true);
    expect(batches.flatMap((b) => rowsOf(b.table))).toEqual(rowsOf(whole.table));
    expect(batches.flatMap((b) => Array.from(b.table.lineOfRow))).toEqual(Array.from(whole.table.lineOfRow));
    expect(batches.flatMap((b) => b.table.rowIssues)).toEqual(whole.table.rowIssues);
    expect(batches[0]?.table.headerIssues).toEqual(whole.table.headerIssues);
    expect(whole.table.headerIssues).toHaveLength(2);
    expect(batches.slice(1).every((b) => b.table.headerIssues.length === 0)).toBe(true);

    expect(result.totalRows).toBe(whole.table.rowCount);
    expect(result.table.rowCount).toBe(0);
    expect(result.table.names).toEqual(whole.table.names);
    expect(result.emptyLinesSkipped).toBe(whole.emptyLinesSkipped);
  });

  it('starts a batch in number storage when the batch before it ended there, keeping every cell exact', () => {
    // The first batch has 300 distinct numbers (past the cap of 50); the second only two values.
    const cells = [...Array.from({ length: 300 }, (_, i) => (i * 0.25).toFixed(2)), ...Array.from({ length: 300 }, (_, i) => (i % 2 ? 'NA' : '7'))];
    const text = utf8(`x\n${cells.join('\n')}\n`);
    const batches: Table[] = [];
    readInPieces(text, 1000, { batchRows: 300, dictionaryCap: 50, onBatch: (table) => batches.push(table) });
    expect(batches.map((b) => b.columns[0]!.kind)).toEqual(['number', 'number']);
    expect(batches.flatMap((b) => rowsOf(b).map((r) => r[0]))).toEqual(cells);
  });

  it('keeps empty cells of a one-column table across batch boundaries', () => {
    const bytes = utf8('v\n1\n\n\n2\n\n3\n\n');
    const whole = readTable(bytes);
    const batches: Table[] = [];
    const result = readTable(bytes, { batchRows: 2, onBatch: (t) => batches.push(t) });
    expect(rowsOf(whole.table)).toEqual([['1'], [''], [''], ['2'], [''], ['3']]);
    expect(batches.flatMap(rowsOf)).toEqual(rowsOf(whole.table));
    expect(batches.flatMap((b) => Array.from(b.lineOfRow))).toEqual([2, 3, 4, 5, 6, 7]);
    expect(result.emptyLinesSkipped).toBe(1);
  });

  it('hands over one empty table for a header-only file', () => {
    const seen: number[] = [];
    readTable(utf8('a,b\n'), { batchRows: 10, onBatch: (t) => seen.push(t.rowCount) });
    expect(seen).toEqual([0]);
  });
});

describe('tableFromRows', () => {
  it('takes the first row as header, keeps rows of empty cells, numbers lines by position', () => {
    const result = tableFromRows([['a', 'a'], ['1', '2'], ['', ''], [], ['3']]);
    expect(result.table.names).toEqual(['a', 'a (2)']);
    expect(rowsOf(result.table)).toEqual([['1', '2'], ['', ''], ['3', '']]);
    expect(Array.from(result.table.lineOfRow)).toEqual([2, 3, 5]);
    expect(result.emptyLinesSkipped).toBe(1);
    expect(result.table.rowIssues).toEqual([{ line: 5, row: 2, kind: 'too-few-fields', expected: 2, found: 1 }]);
  });
});

describe('published datasets (npm package vega-datasets 3.2.1)', () => {
  it('seattle-weather.csv: the columns of datapackage.json, 1461 days, weather levels', () => {
    const bytes = new Uint8Array(readFileSync(join(VEGA, 'seattle-weather.csv')));
    const result = readTable(bytes);
    // Field names and byte size as listed in the package's datapackage.json.
    expect(result.table.names).toEqual(['date', 'precipitation', 'temp_max', 'temp_min', 'wind', 'weather']);
    expect(result.bytes).toBe(48219);
    // 2012-01-01 … 2015-12-31 is 1461 days; level counts tallied with `cut | sort | uniq -c`.
    expect(result.table.rowCount).toBe(1461);
    const weather = result.table.columns[5];
    expect(weather?.kind).toBe('text');
    if (weather?.kind !== 'text') return;
    const counts = Object.fromEntries(weather.values.map((v, i) => [v, weather.counts[i]]));
    expect(counts).toEqual({ drizzle: 53, rain: 641, sun: 640, snow: 26, fog: 101 });
  });

  it('unemployment.tsv: tab delimiter, as its datapackage.json dialect says', () => {
    const result = readTable(new Uint8Array(readFileSync(join(VEGA, 'unemployment.tsv'))));
    expect(result.delimiter).toBe('\t');
    expect(result.table.names).toEqual(['id', 'rate']);
    expect(rowsOf(result.table)[0]).toEqual(['1001', '.097']);
  });

  it('airports.csv: quoted names with commas and doubled quotes', () => {
    const { table } = readTable(new Uint8Array(readFileSync(join(VEGA, 'airports.csv'))));
    // Counts and the record on line 1253 checked with Python's csv module.
    expect(table.rowCount).toBe(3376);
    expect(table.rowIssues).toEqual([]);
    const row = Array.from(table.lineOfRow).indexOf(1253);
    expect(rowsOf(table)[row]?.slice(0, 3)).toEqual(['DBN', 'W. H. "Bud" Barron', 'Dublin']);
  });

  it('airports.csv with every field quoted and CRLF line ends (as some exporters write): the same table', () => {
    const published = readTable(new Uint8Array(readFileSync(join(VEGA, 'airports.csv')))).table;
    // RFC 4180 §2.5–2.7: any field may be quoted, a quote inside doubled; §2.1: CRLF line ends.
    const quoteAll = [published.names, ...rowsOf(published)].map((row) => row.map((cell) => `"${cell.replace(/"/g, '""')}"`).join(',')).join('\r\n');
    for (const result of [readTable(utf8(quoteAll)), readInPieces(utf8(quoteAll), 4096)]) {
      expect(result.table.names).toEqual(published.names);
      expect(result.table.rowCount).toBe(3376);
      expect(rowsOf(result.table)).toEqual(rowsOf(published));
      expect(Array.from(result.table.lineOfRow)).toEqual(Array.from({ length: 3376 }, (_, row) => row + 2));
      expect(result.table.rowIssues).toEqual([]);
    }
  });

  it('zipcodes.csv: 42049 zip codes move to number storage and keep their leading zeros', () => {
    const { table } = readTable(new Uint8Array(readFileSync(join(VEGA, 'zipcodes.csv'))));
    const zip = table.columns[0]!;
    expect(table.rowCount).toBe(42049);
    expect(zip.kind).toBe('number');
    expect(cellText(zip, 0)).toBe('00501');
    // 3256 codes start with 0 (counted with Python's csv module): exactly those keep their text.
    if (zip.kind === 'number') expect(zip.exceptions.size).toBe(3256);
  });
});

/**
 * RFC 4180 writer for the round-trip property: quote fields holding the delimiter, a quote, CR or
 * LF. RFC 4180 prescribes CRLF; LF and CR are tried too, as files carry them.
 */
function writeCsv(rows: readonly (readonly string[])[], delimiter: Delimiter, lineBreak: string): string {
  const field = (cell: string) => (/["\r\n]/.test(cell) || cell.includes(delimiter) ? `"${cell.replace(/"/g, '""')}"` : cell);
  // A one-field row holding '' would be a blank line; RFC 4180 lets it be written as "".
  const record = (row: readonly string[]) => (row.length === 1 && row[0] === '' ? '""' : row.map(field).join(delimiter));
  return rows.map(record).join(lineBreak);
}

describe('round trip (RFC 4180 section 2)', () => {
  const cell = fc.string({ unit: fc.constantFrom('a', 'Z', ' ', '"', ',', ';', '\t', '|', '\r', '\n', 'é', '€', '😀', '0', '.'), maxLength: 6 });

  it('writing random cells as CSV and reading them back gives the same cells and row count', () => {
    const table = fc.integer({ min: 1, max: 5 }).chain((width) =>
      fc.record({
        header: fc.uniqueArray(cell.filter((c) => c.trim() !== ''), { minLength: width, maxLength: width }),
        rows: fc.array(fc.array(cell, { minLength: width, maxLength: width }), { maxLength: 12 }),
        delimiter: fc.constantFrom<Delimiter>(',', '\t', ';', '|'),
        lineBreak: fc.constantFrom('\r\n', '\n', '\r'),
        trailingBreak: fc.boolean(),
        pieceSize: fc.integer({ min: 1, max: 64 }),
      }),
    );
    fc.assert(
      fc.property(table, ({ header, rows, delimiter, lineBreak, trailingBreak, pieceSize }) => {
        const text = writeCsv([header, ...rows], delimiter, lineBreak) + (trailingBreak ? lineBreak : '');
        const bytes = utf8(text);
        for (const result of [readTable(bytes, { delimiter }), readInPieces(bytes, pieceSize, { delimiter })]) {
          expect(result.table.names).toEqual(header);
          expect(result.table.rowCount).toBe(rows.length);
          expect(rowsOf(result.table)).toEqual(rows);
          expect(result.table.rowIssues).toEqual([]);
        }
      }),
      { numRuns: 400 },
    );
  });
});
