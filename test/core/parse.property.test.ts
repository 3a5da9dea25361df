/**
 * Our scanner (src/core/parse.ts) against papaparse 5.7.1, an independent parser, on random text:
 *
 * - RFC 4180 text (RFC 4180 §2: fields quoted when they hold the delimiter, a quote, CR or LF;
 *   quotes doubled inside) must give exactly the records papaparse gives, and the lines the
 *   writer put them on.
 * - Any text at all, malformed quoting included, must give the same records, lines, empty lines
 *   and unclosed quotes as the papaparse-based reader Levelwise used before
 *   (helpers/papaparse-record-parser.ts), however the text is cut into chunks.
 */
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { hashBytes, parseRecords, plainFields, RecordParser, type Delimiter, type RecordParserOptions, type RecordSink } from '../../src/core/parse.ts';
import { encodeUtf8 } from '../../src/core/utf8-text.ts';
import { PapaparseRecordParser } from './helpers/papaparse-record-parser.ts';

interface Parsed {
  records: string[][];
  lines: number[];
  unclosed: number[];
  empty: number[];
  delimiter: Delimiter | null;
}

/** Collects records; with `plain`, takes quote-free records through the fast path. */
function collector(plain: boolean): { sink: RecordSink; parsed: Parsed } {
  const parsed: Parsed = { records: [], lines: [], unclosed: [], empty: [], delimiter: null };
  const sink: RecordSink = {
    record(fields, line, unclosed) {
      parsed.records.push([...fields]);
      parsed.lines.push(line);
      if (unclosed) parsed.unclosed.push(line);
    },
    emptyLine: (line) => parsed.empty.push(line),
  };
  if (plain) {
    sink.plainRecords = (block) => {
      for (let r = 0; r < block.count; r++) {
        parsed.records.push(plainFields(block, r));
        parsed.lines.push(block.lines[r]!);
        // Each field's hash is the one hashBytes gives its bytes (the dictionaries look cells up by it).
        for (let f = 0, i = r * (block.width + 1); f < block.width; f++, i++) {
          expect(block.hashes[i]).toBe(hashBytes(block.bytes, block.bounds[i]!, block.bounds[i + 1]! - 1));
        }
      }
    };
  }
  return { sink, parsed };
}

type Reader = typeof RecordParser | typeof PapaparseRecordParser;

/**
 * Feeds the pieces to a reader: as text to the papaparse-based one, as UTF-8 bytes to ours, cut at
 * the bytes where the pieces meet (inside a character when a piece ends between the two halves of
 * a surrogate pair).
 */
function readPieces(Parser: Reader, pieces: readonly string[], options: RecordParserOptions, plain = false): Parsed {
  const { sink, parsed } = collector(plain);
  if (Parser === PapaparseRecordParser) {
    const parser = new PapaparseRecordParser(sink, options);
    for (const piece of pieces) parser.push(piece);
    parser.finish();
    parsed.delimiter = parser.delimiter;
    return parsed;
  }
  const parser = new RecordParser(sink, options);
  const bytes = encodeUtf8(pieces.join(''));
  let from = 0;
  let prefix = '';
  for (const piece of pieces) {
    prefix += piece;
    const to = Math.min(bytes.length, encodeUtf8(prefix).length);
    parser.push(bytes.subarray(from, to));
    from = to;
  }
  parser.push(bytes.subarray(from));
  parser.finish();
  parsed.delimiter = parser.delimiter;
  return parsed;
}

// ---------------------------------------------------------------------------------------------
// RFC 4180 text against Papa.parse

const cell = fc.string({ unit: fc.constantFrom('a', 'Z', '7', ' ', '"', ',', ';', '\t', '|', '\r', '\n', 'é', '😀'), maxLength: 6 });

/** Quotes a field when RFC 4180 §2.6 requires it, and sometimes when it does not (§2.5 allows it). */
function writeField(text: string, delimiter: Delimiter, quoteAnyway: boolean): string {
  const needs = /["\r\n]/.test(text) || text.includes(delimiter);
  return needs || quoteAnyway ? `"${text.replace(/"/g, '""')}"` : text;
}

const rfc4180 = fc
  .record({
    rows: fc.array(fc.array(fc.tuple(cell, fc.boolean()), { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 15 }),
    delimiter: fc.constantFrom<Delimiter>(',', '\t', ';', '|'),
    lineBreak: fc.constantFrom('\r\n', '\n'),
    trailingBreak: fc.boolean(),
    pieceSize: fc.integer({ min: 1, max: 50 }),
  })
  .map(({ rows, delimiter, lineBreak, trailingBreak, pieceSize }) => {
    const written = rows.map((row) =>
      // One empty field alone would be an empty line; RFC 4180 lets it be written as "".
      row.length === 1 && row[0]![0] === '' ? '""' : row.map(([text, quote]) => writeField(text, delimiter, quote)).join(delimiter),
    );
    const text = written.join(lineBreak) + (trailingBreak ? lineBreak : '');
    // Each record starts one line below the previous record's last line (LF counts lines).
    const lines: number[] = [];
    let line = 1;
    for (const record of written) {
      lines.push(line);
      line += 1 + (record.match(/\n/g)?.length ?? 0);
    }
    return { rows: rows.map((row) => row.map(([text]) => text)), delimiter, lineBreak, text, lines, pieceSize };
  });

function pieces(text: string, size: number): string[] {
  const out: string[] = [];
  for (let at = 0; at < text.length; at += size) out.push(text.slice(at, at + size));
  return out;
}

describe('RFC 4180 text: the same records as papaparse', () => {
  it('records, fields and lines, whole or in pieces, with and without the fast path', () => {
    fc.assert(
      fc.property(rfc4180, ({ rows, delimiter, lineBreak, text, lines, pieceSize }) => {
        const papa = Papa.parse<string[]>(text, { delimiter, newline: lineBreak as '\r\n' | '\n' });
        const expected = papa.data.length > rows.length ? papa.data.slice(0, rows.length) : papa.data;
        expect(expected).toEqual(rows);
        for (const plain of [false, true]) {
          for (const parsed of [readPieces(RecordParser, [text], { delimiter }, plain), readPieces(RecordParser, pieces(text, pieceSize), { delimiter }, plain)]) {
            expect(parsed.records).toEqual(expected);
            expect(parsed.lines).toEqual(lines);
            expect(parsed.unclosed).toEqual([]);
            expect(parsed.empty).toEqual([]);
          }
        }
      }),
      { numRuns: 500 },
    );
  });

  it('parseRecords gives papaparse’s records for the csv-spectrum-like case of quoted commas and quotes', () => {
    const text = 'a,b\r\n"x, y","say ""hi"""\r\n';
    expect(parseRecords(text).records).toEqual(Papa.parse<string[]>(text, { newline: '\r\n' }).data.slice(0, 2));
  });
});

// ---------------------------------------------------------------------------------------------
// Any text against the papaparse-based reader

const messy = fc.string({ unit: fc.constantFrom('a', 'b', ',', ';', '"', '"', ' ', '\r', '\n', '\n', 'é', '\t'), maxLength: 80 });

describe('any text: the same as the papaparse-based reader', () => {
  it('whole text, delimiter chosen or given', () => {
    fc.assert(
      fc.property(messy, fc.constantFrom<Delimiter | null>(null, ',', ';', '\t'), (text, delimiter) => {
        const reference = readPieces(PapaparseRecordParser, [text], { delimiter });
        expect(readPieces(RecordParser, [text], { delimiter })).toEqual(reference);
        expect(readPieces(RecordParser, [text], { delimiter }, true)).toEqual(reference);
      }),
      { numRuns: 3000 },
    );
  });

  it('with a chunk boundary anywhere in the text after the first 64K characters', () => {
    // Plain records fill the text up to the point where both readers parse their first chunk, so
    // the random text is cut at a random place by a real parse. (The line break is chosen from
    // that first chunk, so the whole text is not read in one piece here: its LFs could change it.)
    const record = (lineBreak: string) => `${'x'.repeat(500)},y${lineBreak}`;
    const filler = (lineBreak: string, length: number) => `h1,h2${lineBreak}${record(lineBreak).repeat(Math.ceil(length / 500))}`.slice(0, length);
    fc.assert(
      fc.property(
        messy,
        fc.constantFrom('\n', '\r\n', '\r'),
        fc.nat(),
        (text, lineBreak, cut) => {
          const head = filler(lineBreak, 64 * 1024);
          const at = cut % (text.length + 1);
          const chunks = [head + text.slice(0, at), text.slice(at)];
          const reference = readPieces(PapaparseRecordParser, chunks, { delimiter: ',' });
          expect(readPieces(RecordParser, chunks, { delimiter: ',' })).toEqual(reference);
          expect(readPieces(RecordParser, chunks, { delimiter: ',' }, true)).toEqual(reference);
        },
      ),
      { numRuns: 500 },
    );
  });
});
