/**
 * Finding where a file stops being UTF-8 (core bad-utf8.ts), and the readers' messages that name
 * the place. The reference for what is bad, and where a bad sequence starts and ends, is the
 * platform's TextDecoder, which implements the UTF-8 decoder of the WHATWG Encoding Standard
 * (§4.1, "UTF-8 decoder"): the locator must agree with it on every input.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { badUtf8Error, findBadUtf8, locateBadUtf8, showBytes, Utf8Locator, type BadUtf8Place } from '../../src/core/bad-utf8.ts';
import { isLevelwiseError, type LevelwiseError } from '../../src/core/errors.ts';
import { readInSegments } from '../../src/core/read-in-segments.ts';
import { readTable, readTableFromSource } from '../../src/core/read-table.ts';
import { concat } from '../robustness/helpers.ts';

const encode = (text: string): Uint8Array => new TextEncoder().encode(text);
const latin1 = (text: string): Uint8Array => Uint8Array.from(text, (c) => c.charCodeAt(0));

function inChunks(bytes: Uint8Array, cuts: readonly number[]): BadUtf8Place | null {
  const locator = new Utf8Locator();
  let at = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    const place = locator.push(bytes.subarray(at, Math.max(at, cut)));
    if (place !== null) return place;
    at = Math.max(at, cut);
  }
  return locator.push(bytes.subarray(at)) ?? locator.finish();
}

function thrown(read: () => unknown): LevelwiseError {
  try {
    read();
  } catch (error) {
    if (isLevelwiseError(error)) return error;
    throw error;
  }
  throw new Error('nothing was thrown');
}

async function rejected(read: () => Promise<unknown>): Promise<LevelwiseError> {
  try {
    await read();
  } catch (error) {
    if (isLevelwiseError(error)) return error;
    throw error;
  }
  throw new Error('nothing was thrown');
}

describe('the first bad UTF-8 sequence', () => {
  // Bytes drawn so that valid characters of every length, line breaks and bad bytes all occur.
  const piece = fc.oneof(
    fc.constantFrom('a', ',', '\n', '\r', '\r\n', 'é', '€', '😀', 'Zürich').map(encode),
    fc.constantFrom([0x80], [0xc0, 0xaf], [0xc3], [0xe2, 0x82], [0xe0, 0x80], [0xed, 0xa0, 0x80], [0xf4, 0x90], [0xf5], [0xff], [0xfc], [0xf0, 0x9f, 0x98]).map((b) => Uint8Array.from(b)),
  );
  const sources = fc.array(piece, { maxLength: 40 }).map((parts) => concat(...parts));

  it('agrees with TextDecoder (WHATWG Encoding Standard §4.1) on whether, where and which bytes, however the source is cut', () => {
    fc.assert(
      fc.property(sources, fc.array(fc.nat(200), { maxLength: 6 }), (bytes, cuts) => {
        const place = inChunks(bytes, cuts);
        let valid = true;
        try {
          new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
        } catch {
          valid = false;
        }
        expect(place === null).toBe(valid);
        if (place === null) return;
        const lenient = (b: Uint8Array): string => new TextDecoder('utf-8', { ignoreBOM: true }).decode(b);
        const before = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes.subarray(0, place.byte));
        // The decoder's first replacement character stands for exactly the sequence found.
        expect(lenient(bytes.subarray(0, place.byte + place.bytes.length))).toBe(`${before}\uFFFD`);
        expect(lenient(bytes).indexOf('\uFFFD')).toBe(before.length);
        expect(place.bytes).toEqual([...bytes.subarray(place.byte, place.byte + place.bytes.length)]);
        // Lines as an editor counts them: LF, CRLF or a lone CR.
        expect(place.line).toBe(before.split(/\r\n|\r|\n/).length);
        expect(place).toEqual(findBadUtf8(bytes));
      }),
      { numRuns: 2000 },
    );
  });

  it('names the offset, the line and the line around the bytes, bad bytes written \\xHH', () => {
    const bytes = concat(encode('id,town\n1,Lyon\n2,'), latin1('Z\xfcrich'), encode('\n3,Köln\n'));
    expect(findBadUtf8(bytes)).toEqual({ byte: 18, line: 3, bytes: [0xfc], excerpt: '2,Z\\xFCrich' });
    expect(badUtf8Error(findBadUtf8(bytes)!).message).toBe(
      'The file is not valid UTF-8: byte \\xFC (offset 18) is not part of any UTF-8 character, in "2,Z\\xFCrich".',
    );
    expect(badUtf8Error(findBadUtf8(bytes)!).line).toBe(3);
  });

  it('a sequence cut short is bad where it starts; the byte that cut it is shown after it', () => {
    // E2 82 AC is "€"; E2 82 followed by "5" is not.
    expect(findBadUtf8(encode('price 5 €\n'))).toBeNull();
    expect(findBadUtf8(concat(encode('price '), Uint8Array.from([0xe2, 0x82]), encode('5\n')))).toEqual({ byte: 6, line: 1, bytes: [0xe2, 0x82], excerpt: 'price \\xE2\\x825' });
    // At the very end of the file.
    expect(findBadUtf8(concat(encode('a\nb'), Uint8Array.from([0xf0, 0x9f, 0x98])))).toEqual({ byte: 3, line: 2, bytes: [0xf0, 0x9f, 0x98], excerpt: 'b\\xF0\\x9F\\x98' });
  });

  it('long lines are cut around the place, with "…", on whole characters', () => {
    const bytes = concat(encode('x,' + 'é'.repeat(40)), Uint8Array.from([0x92]), encode('y'.repeat(50) + '\n'));
    const place = findBadUtf8(bytes)!;
    expect(place.line).toBe(1);
    expect(place.byte).toBe(82);
    expect(place.excerpt).toBe(`…${'é'.repeat(16)}\\x92${'y'.repeat(32)}…`);
  });

  it('a UTF-8 byte order mark is skipped but counted in the offset; a UTF-16 file is not judged as UTF-8', () => {
    expect(findBadUtf8(concat(Uint8Array.from([0xef, 0xbb, 0xbf]), encode('a,b\n'), Uint8Array.from([0xe9])))).toEqual({ byte: 7, line: 2, bytes: [0xe9], excerpt: '\\xE9' });
    expect(findBadUtf8(Uint8Array.from([0xff, 0xfe, 0x61, 0x00, 0x00, 0xd8]))).toBeNull();
  });

  it('control characters in the excerpt are written \\xHH too', () => {
    expect(showBytes([0x61, 0x09, 0x62, 0xff, 0x7f])).toBe('a\\x09b\\xFF\\x7F');
  });

  it('stops reading the source at the place (and the excerpt after it)', async () => {
    let chunksRead = 0;
    async function* chunks(): AsyncGenerator<Uint8Array> {
      for (let i = 0; i < 100; i++) {
        chunksRead++;
        yield i === 3 ? concat(encode('a,'), latin1('\xe9'), encode('\nb\n')) : encode('a,b\n'.repeat(10));
      }
    }
    expect(await locateBadUtf8(chunks())).toEqual({ byte: 122, line: 31, bytes: [0xe9], excerpt: 'a,\\xE9' });
    expect(chunksRead).toBe(4);
  });
});

describe('readers name the place of bytes that are not UTF-8', () => {
  // An invented sheet declared UTF-8 by its byte order mark, with one Windows-1252 "ü" on line 4,002.
  const rows = Array.from({ length: 4000 }, (_, i) => `${i + 1},Lyon,${i % 10}`);
  const bytes = concat(
    Uint8Array.from([0xef, 0xbb, 0xbf]),
    encode(`id,town,score\n${rows.join('\n')}\n`),
    latin1('4001,Z\xfcrich,1\n'),
    encode('4002,Lyon,2\n'),
  );
  const expected = { line: 4002, excerpt: '"4001,Z\\xFCrich,1"' };

  it('reading bytes in memory', () => {
    const error = thrown(() => readTable(bytes));
    expect(error.code).toBe('bad-encoding');
    expect(error.line).toBe(expected.line);
    expect(error.message).toContain(expected.excerpt);
  });

  it('reading a source chunk by chunk (the page reads a File so)', async () => {
    const open = async function* (): AsyncGenerator<Uint8Array> {
      for (let at = 0; at < bytes.length; at += 1000) yield bytes.subarray(at, at + 1000);
    };
    const error = await rejected(() => readTableFromSource(open));
    expect(error.line).toBe(expected.line);
    expect(error.message).toContain(expected.excerpt);
  });

  it('reading in segments (the page\'s segment workers)', async () => {
    const error = await rejected(() => readInSegments(bytes, 10_000));
    expect(error.line).toBe(expected.line);
    expect(error.message).toContain(expected.excerpt);
  });

  it('a file read as UTF-16 keeps its own message: its bytes are not judged as UTF-8', () => {
    // "a,b\n1," then a lone high surrogate D800, which UTF-16 cannot end on (WHATWG Encoding Standard §14.3).
    const utf16 = Uint8Array.from([0x61, 0, 0x2c, 0, 0x62, 0, 0x0a, 0, 0x31, 0, 0x2c, 0, 0x00, 0xd8]);
    const error = thrown(() => readTable(utf16, { encoding: 'utf-16le' }));
    expect(error.code).toBe('bad-encoding');
    expect(error.message).toMatch(/^The file is not valid utf-16le/);
    expect(error.line).toBeUndefined();
  });

  it('a guessed UTF-8 file is still read again as Windows-1252, without an error', () => {
    const { table, encoding } = readTable(bytes.subarray(3));
    expect(encoding).toBe('windows-1252');
    expect(table.rowCount).toBe(4002);
  });
});
