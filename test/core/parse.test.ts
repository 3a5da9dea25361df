import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cellText, type Table } from '../../src/core/columns.ts';
import { RecordParser, chooseDelimiter, parseRecords, uniqueColumnNames } from '../../src/core/parse.ts';
import { encodeUtf8 } from '../../src/core/utf8-text.ts';
import { readTable } from '../../src/core/read-table.ts';

const SPECTRUM = join(import.meta.dirname, '../../node_modules/csv-spectrum');

function rowsOf(table: Table): string[][] {
  return Array.from({ length: table.rowCount }, (_, row) => table.columns.map((c) => cellText(c, row)));
}

function objectsOf(table: Table): Record<string, string>[] {
  return rowsOf(table).map((cells) => Object.fromEntries(table.names.map((name, i) => [name, cells[i] ?? ''])));
}

describe('csv-spectrum (npm package csv-spectrum 2.0.0: RFC 4180 edge cases with expected JSON)', () => {
  const files = readdirSync(join(SPECTRUM, 'csvs')).filter((f) => f.endsWith('.csv'));

  it('ships the twelve cases this suite expects', () => expect(files).toHaveLength(12));

  for (const file of files) {
    it(`${file} reads as its expected JSON`, () => {
      const bytes = new Uint8Array(readFileSync(join(SPECTRUM, 'csvs', file)));
      const expectedJson: unknown = JSON.parse(readFileSync(join(SPECTRUM, 'json', file.replace('.csv', '.json')), 'utf8'));
      const expected = (Array.isArray(expectedJson) ? expectedJson : [expectedJson]) as Record<string, string>[];
      const { table } = readTable(bytes);
      const actual = objectsOf(table);
      if (file === 'location_coordinates.csv') {
        // The package's JSON gives "1234567890" for the phone number while its CSV says
        // "2095257564" (an inconsistency inside csv-spectrum itself); every other field must match.
        expect(actual[0]?.['Contact Phone Number']).toBe('2095257564');
        expected[0]!['Contact Phone Number'] = '2095257564';
      }
      expect(actual).toEqual(expected);
      expect(table.rowIssues).toEqual([]);
    });
  }
});

describe('RecordParser', () => {
  it('gives the physical line each record starts on, counting breaks inside quotes', () => {
    const text = 'a,b\n"one\ntwo",x\n\n"three\r\nfour\r\nfive",y\nlast,z';
    const { records, lines, emptyLines } = parseRecords(text);
    expect(records).toEqual([
      ['a', 'b'],
      ['one\ntwo', 'x'],
      ['three\r\nfour\r\nfive', 'y'],
      ['last', 'z'],
    ]);
    expect(lines).toEqual([1, 2, 5, 8]);
    expect(emptyLines).toEqual([4]);
  });

  it('reads LF, CRLF, CR and mixed CRLF/LF line breaks to the same records', () => {
    const expected = [['a', 'b'], ['1', '2'], ['3', '4']];
    for (const text of ['a,b\n1,2\n3,4\n', 'a,b\r\n1,2\r\n3,4\r\n', 'a,b\r1,2\r3,4\r', 'a,b\r\n1,2\n3,4\r\n']) {
      const { records, lines } = parseRecords(text);
      expect(records).toEqual(expected);
      expect(lines).toEqual([1, 2, 3]);
    }
  });

  it('keeps a CR written inside quotes at the end of a CRLF line', () => {
    expect(parseRecords('a,b\r\n1,"x\r"\r\n"\r"\r\n"2","\r"\r\n').records).toEqual([
      ['a', 'b'],
      ['1', 'x\r'],
      ['\r'],
      ['2', '\r'],
    ]);
  });

  it('keeps a quote in the middle of an unquoted field as text (12" pipe)', () => {
    expect(parseRecords('item,size\r\npipe,12"\r\n').records).toEqual([['item', 'size'], ['pipe', '12"']]);
  });

  it('makes no record of the trailing newline and tells empty lines apart', () => {
    const result = parseRecords('\na,b\n\n1,2\r\n\r\n\n');
    expect(result.records).toEqual([['a', 'b'], ['1', '2']]);
    expect(result.lines).toEqual([2, 4]);
    expect(result.emptyLines).toEqual([1, 3, 5, 6]);
  });

  it('keeps a line holding only "" (one empty field written on purpose)', () => {
    expect(parseRecords('name\n""\nx\n').records).toEqual([['name'], [''], ['x']]);
  });

  it('reports a quote left open at the end of the file, keeping the rest as the field', () => {
    const result = parseRecords('a,b\n1,2\n3,"open\nrest');
    expect(result.records).toEqual([['a', 'b'], ['1', '2'], ['3', 'open\nrest']]);
    expect(result.unclosedQuoteLines).toEqual([3]);
  });

  it('gives the same records and lines when fed one character at a time', () => {
    const text = 'h1;h2\r\n"a;\r\nb";c\r\n\r\nd;"e""f"\r\ng;h';
    const whole = parseRecords(text);
    const records: string[][] = [];
    const lines: number[] = [];
    const parser = new RecordParser({
      record(fields, line) {
        records.push([...fields]);
        lines.push(line);
      },
      emptyLine: () => undefined,
    });
    for (const ch of text) parser.push(encodeUtf8(ch));
    parser.finish();
    expect(whole.delimiter).toBe(';');
    expect(parser.delimiter).toBe(';');
    expect(records).toEqual(whole.records);
    expect(lines).toEqual(whole.lines);
    expect(lines).toEqual([1, 2, 5, 6]);
  });

  it('holds a record spanning many chunks and parses it once complete', () => {
    const long = 'x'.repeat(300_000);
    let seen: readonly string[] = [];
    const collecting = new RecordParser({ record: (fields) => (seen = [...fields]), emptyLine: () => undefined });
    const text = `a,b\n1,"${long}\n${long}"\n`;
    for (let at = 0; at < text.length; at += 10_000) collecting.push(encodeUtf8(text.slice(at, at + 10_000)));
    collecting.finish();
    expect(seen).toEqual(['1', `${long}\n${long}`]);
  });
});

describe('chooseDelimiter', () => {
  it.each([
    ['comma', 'a,b,c\n1,2,3\n', ','],
    ['tab', 'a\tb\tc\n1,5\t2\t3\n', '\t'],
    ['semicolon with decimal commas', 'price;qty\n1,50;2\n2,75;3\n', ';'],
    ['pipe', 'a|b\nx, y|z\n', '|'],
    ['one column', 'name\nAda\n', ','],
  ] as const)('%s', (_label, text, expected) => {
    expect(chooseDelimiter(text, '\n', true)).toBe(expected);
  });

  it('can be overridden', () => {
    expect(parseRecords('a;b,c\n1;2,3\n', { delimiter: ',' }).records).toEqual([['a;b', 'c'], ['1;2', '3']]);
  });
});

describe('uniqueColumnNames', () => {
  it('names blank cells by position and numbers repeats, reporting each change', () => {
    const { names, issues } = uniqueColumnNames(['price', '', 'price', ' ', 'price', 'price (2)']);
    expect(names).toEqual(['price', 'column 2', 'price (3)', 'column 4', 'price (4)', 'price (2)']);
    expect(issues).toEqual([
      { column: 1, kind: 'blank', original: '', renamedTo: 'column 2' },
      { column: 2, kind: 'duplicate', original: 'price', renamedTo: 'price (3)' },
      { column: 3, kind: 'blank', original: ' ', renamedTo: 'column 4' },
      { column: 4, kind: 'duplicate', original: 'price', renamedTo: 'price (4)' },
    ]);
  });

  it('does not give a blank cell a name already in the header', () => {
    expect(uniqueColumnNames(['column 2', '']).names).toEqual(['column 2', 'column 2 (2)']);
  });
});
