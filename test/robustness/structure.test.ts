/**
 * Files whose structure is off: rows with too few or too many fields, a quote never closed, line
 * endings of several kinds, a byte order mark, Windows-1252 accents, UTF-16. Every row is kept
 * (padded, or its extra cells set aside), every change is reported by line and column, and the
 * page's notice says it in words. Quoting rules from RFC 4180 §2; byte order marks from the
 * Unicode Standard §23.8; Windows-1252 from the WHATWG Encoding Standard.
 */
import { describe, expect, it } from 'vitest';
import { cellText } from '../../src/core/columns.ts';
import { isLevelwiseError, type LevelwiseError } from '../../src/core/errors.ts';
import { readTable } from '../../src/core/read-table.ts';
import { readingNotices } from '../../src/ui/files/reading-notices.ts';
import { concat, pipeline, thrownBy, utf16be, utf16le, utf8, windows1252 } from './helpers.ts';

function cells(bytes: Uint8Array): string[][] {
  const { table } = readTable(bytes);
  return Array.from({ length: table.rowCount }, (_, row) => table.columns.map((c) => cellText(c, row)));
}

function noticesOf(text: string, fileName = 'input.csv') {
  const { table } = readTable(utf8(text));
  return readingNotices({
    fileName,
    rowCount: table.rowCount,
    names: table.names,
    rowIssues: table.rowIssues,
    rowIssueCount: table.rowIssues.length,
    headerIssues: table.headerIssues,
  });
}

describe('rows with too few or too many fields', () => {
  const text = 'id,colour,size\na1,red,S\na2,blue\na3,green,M,extra,more\na4\na5,red,L\n';
  const { table } = readTable(utf8(text));

  it('keeps every row: short rows padded with empty cells, extra cells set aside with their text', () => {
    expect(table.rowCount).toBe(5);
    expect(cells(utf8(text))).toEqual([
      ['a1', 'red', 'S'],
      ['a2', 'blue', ''],
      ['a3', 'green', 'M'],
      ['a4', '', ''],
      ['a5', 'red', 'L'],
    ]);
    expect(table.rowIssues).toEqual([
      { line: 3, row: 1, kind: 'too-few-fields', expected: 3, found: 2 },
      { line: 4, row: 2, kind: 'too-many-fields', expected: 3, found: 5, extra: ['extra', 'more'] },
      { line: 5, row: 3, kind: 'too-few-fields', expected: 3, found: 1 },
    ]);
  });

  it('the page says which lines and columns, and what was done', () => {
    expect(noticesOf(text)).toEqual([
      {
        tone: 'warning',
        title: '3 rows have the wrong number of fields',
        detail:
          'Line 3 has 2 of 3 fields: column 3 (“size”) is empty (missing). ' +
          'Line 4 has 5 fields instead of 3: the extra cells from column 4 (“extra”, “more”) are kept aside, not encoded. ' +
          'Line 5 has 1 of 3 fields: columns 2 to 3 are empty (missing).',
        hint: 'Check the delimiters and quotes around those lines if the columns look shifted.',
      },
    ]);
  });

  it('counts the rows beyond the three it lists', () => {
    const many = 'a,b\n' + Array.from({ length: 10 }, (_, i) => `${i}`).join('\n') + '\n';
    const [notice] = noticesOf(many);
    expect(notice?.title).toBe('10 rows have the wrong number of fields');
    expect(notice?.detail.endsWith(' And 7 more.')).toBe(true);
  });
});

describe('a quote that is never closed', () => {
  const text = 'id,comment\na1,"fine"\na2,"starts here\na3,never closed\na4,last\n';
  const { table } = readTable(utf8(text));

  it('keeps the rest of the file in the one cell and reports the line it opened on', () => {
    expect(table.rowCount).toBe(2);
    expect(cellText(table.columns[1]!, 1)).toBe('starts here\na3,never closed\na4,last\n');
    expect(table.rowIssues).toEqual([{ line: 3, row: 1, kind: 'unclosed-quote', expected: 2, found: 2 }]);
  });

  it('the page names the line and column and says how to fix it', () => {
    expect(noticesOf(text)).toEqual([
      {
        tone: 'error',
        title: 'A quote opened on line 3 is never closed',
        detail:
          'Everything from line 3, column 2 (“comment”) to the end of the file was read as that one cell, so the rows after it are not in the table. ' +
          'Nothing was thrown away: the text is in that cell.',
        hint: 'Look at the quotes on line 3: a quote inside a quoted field is written twice (""). Fix the file and open it again.',
      },
    ]);
  });
});

describe('line endings', () => {
  it('CRLF (RFC 4180 §2.1), LF and a mix of both read the same, with no CR left in any cell', () => {
    const expected = [['1', 'x'], ['2', 'y'], ['3', 'z']];
    for (const text of ['a,b\r\n1,x\r\n2,y\r\n3,z\r\n', 'a,b\n1,x\n2,y\n3,z\n', 'a,b\r\n1,x\n2,y\r\n3,z', 'a,b\n1,x\r\n2,y\n3,z\r\n']) {
      expect(cells(utf8(text))).toEqual(expected);
      expect(Array.from(readTable(utf8(text)).table.lineOfRow)).toEqual([2, 3, 4]);
    }
  });

  it('a file of lone CRs (old Mac files) reads by CR', () => {
    expect(cells(utf8('a,b\r1,x\r2,y\r'))).toEqual([['1', 'x'], ['2', 'y']]);
  });

  it('a quoted CRLF stays inside its cell; the lines after it are counted as an editor shows them', () => {
    const { table } = readTable(utf8('a,b\r\n1,"two\r\nlines"\r\n2,y\r\n'));
    expect(cellText(table.columns[1]!, 0)).toBe('two\r\nlines');
    expect(Array.from(table.lineOfRow)).toEqual([2, 4]);
  });

  it('a stray CR inside a line of an LF file is not taken for a line break: the row it splits is reported', () => {
    const { table } = readTable(utf8('a,b\n1,x\n2,y\r3,z\n'));
    expect(table.rowCount).toBe(2);
    expect(table.rowIssues).toEqual([{ line: 3, row: 1, kind: 'too-many-fields', expected: 2, found: 3, extra: ['z'] }]);
  });
});

describe('byte order marks and encodings', () => {
  it('a UTF-8 byte order mark is not part of the first column’s name', () => {
    const result = readTable(concat(new Uint8Array([0xef, 0xbb, 0xbf]), utf8('city,n\r\nLyon,1\r\n')));
    expect(result.table.names).toEqual(['city', 'n']);
    expect(result.encoding).toBe('utf-8');
  });

  it('Windows-1252 accents and symbols are read as the letters they are, and the encoding is reported', () => {
    const result = readTable(windows1252('town,price\nZürich,€12\nCafé–Bar,5\nO’Brien,7\n'));
    expect(result.encoding).toBe('windows-1252');
    expect(cells(windows1252('town,price\nZürich,€12\nCafé–Bar,5\nO’Brien,7\n'))).toEqual([
      ['Zürich', '€12'],
      ['Café–Bar', '5'],
      ['O’Brien', '7'],
    ]);
  });

  it('UTF-16 with a byte order mark, little or big endian, reads like UTF-8', () => {
    const text = 'name,n\nÉlodie,1\n東京,2\n';
    for (const [bytes, encoding] of [[utf16le(text), 'utf-16le'], [utf16be(text), 'utf-16be']] as const) {
      const result = readTable(bytes);
      expect(result.encoding).toBe(encoding);
      expect(cells(bytes)).toEqual([['Élodie', '1'], ['東京', '2']]);
    }
  });

  it('UTF-16 without a byte order mark is refused with a hint to save it as UTF-8', () => {
    const error = thrownBy(() => readTable(utf16le('name,n\nAda,1\n', false))) as LevelwiseError;
    expect(isLevelwiseError(error, 'not-text')).toBe(true);
    expect(error.message).toBe('This is not a text table: byte 2 is a NUL byte, which text files do not contain.');
    expect(error.hint).toBe('It may be UTF-16 text without a byte order mark: save it again as UTF-8 CSV.');
  });

  it('the whole path encodes a Windows-1252 file with its accents intact in the output', () => {
    // town: 3 levels by count (Zürich 2, Café 1, München 1), one-hot; n: 4 whole numbers, ranked from 1.
    const run = pipeline(windows1252('town,n\nZürich,1\nCafé,2\nZürich,3\nMünchen,4\n'));
    expect(run.csv).toBe('town=Zürich,town=Café,town=München,n\r\n' + '1,0,0,1\r\n' + '0,1,0,2\r\n' + '1,0,0,3\r\n' + '0,0,1,4\r\n');
  });
});
