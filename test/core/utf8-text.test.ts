import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InvalidUtf8Error, encodeUtf8, utf8Bytes, utf8Text } from '../../src/core/utf8-text.ts';

describe('utf8Text', () => {
  it('decodes ASCII, multi-byte characters and a range inside a larger buffer', () => {
    const bytes = encodeUtf8('x,café,😀,y');
    expect(utf8Text(bytes, 2, 7)).toBe('café');
    expect(utf8Text(bytes, 8, 12)).toBe('😀');
    expect(utf8Text(bytes, 0, 0)).toBe('');
  });

  it('stops at bytes that are not UTF-8 instead of writing U+FFFD (Windows-1252 "é" is E9)', () => {
    expect(() => utf8Text(Uint8Array.of(0x63, 0x61, 0x66, 0xe9), 0, 4)).toThrow(InvalidUtf8Error);
    // Half of a two-byte character, as when a range is cut in the middle of one.
    expect(() => utf8Text(encodeUtf8('é'), 0, 1)).toThrow(InvalidUtf8Error);
  });

  it('gives back any well-formed text from its UTF-8 bytes', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 80 }), (text) => {
        const bytes = encodeUtf8(text);
        expect(utf8Text(bytes, 0, bytes.length)).toBe(text);
      }),
    );
  });
});

describe('utf8Bytes', () => {
  it('is the UTF-8 of well-formed text', () => {
    expect(Array.from(utf8Bytes('aé'))).toEqual([0x61, 0xc3, 0xa9]);
  });

  it('is what TextEncoder makes of well-formed text, ASCII first or not (WHATWG Encoding Standard, UTF-8 encoder)', () => {
    const encoder = new TextEncoder();
    fc.assert(
      fc.property(fc.string({ unit: 'binary-ascii', maxLength: 8 }), fc.string({ unit: 'grapheme', maxLength: 8 }), (ascii, any) => {
        for (const text of [ascii, any, ascii + any, any + ascii]) expect(Array.from(utf8Bytes(text))).toEqual(Array.from(encoder.encode(text)));
      }),
      { numRuns: 2000 },
    );
    expect(Array.from(utf8Bytes('ab\uD800'))).toEqual([0x61, 0x62, 0xed, 0xa0, 0x80]);
  });

  it('keeps texts apart that TextEncoder would merge: a lone surrogate is not U+FFFD', () => {
    const lone = Array.from(utf8Bytes('\uD800'));
    const replacement = Array.from(utf8Bytes('\uFFFD'));
    expect(lone).toEqual([0xed, 0xa0, 0x80]);
    expect(replacement).toEqual([0xef, 0xbf, 0xbd]);
  });

  it('is one-to-one on any UTF-16 text, lone surrogates included', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 12 }), fc.string({ unit: 'binary', maxLength: 12 }), (a, b) => {
        const same = Buffer.from(utf8Bytes(a)).equals(Buffer.from(utf8Bytes(b)));
        expect(same).toBe(a === b);
      }),
      { numRuns: 2000 },
    );
  });
});
