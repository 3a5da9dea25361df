import { thrownLevelwiseError } from './helpers/tables.ts';
import { describe, expect, it } from 'vitest';
import { ChunkDecoder, SNIFF_BYTES, decodeBytes, retryAsWindows1252, type EncodingName } from '../../src/core/decode.ts';

const utf8 = (text: string) => new TextEncoder().encode(text);

/** UTF-16 code units written out by hand, so the test does not lean on the decoder under test. */
function utf16(text: string, order: 'le' | 'be', withMark = true): Uint8Array {
  const units = withMark ? [0xfeff] : [];
  for (let i = 0; i < text.length; i++) units.push(text.charCodeAt(i));
  const bytes = new Uint8Array(units.length * 2);
  units.forEach((unit, i) => {
    const [hi, lo] = [unit >> 8, unit & 0xff];
    bytes[2 * i] = order === 'le' ? lo : hi;
    bytes[2 * i + 1] = order === 'le' ? hi : lo;
  });
  return bytes;
}

function decodeInPieces(bytes: Uint8Array, size: number, forced: EncodingName | null = null): { text: string; encoding: EncodingName | null } {
  const decoder = new ChunkDecoder(forced);
  let text = '';
  for (let at = 0; at < bytes.length; at += size) text += decoder.decode(bytes.subarray(at, at + size));
  text += decoder.finish();
  return { text, encoding: decoder.encoding };
}


describe('choosing the encoding', () => {
  it('reads plain UTF-8', () => {
    expect(decodeBytes(utf8('name,city\nZoë,Zürich\n'))).toEqual({ text: 'name,city\nZoë,Zürich\n', encoding: 'utf-8' });
  });

  it('drops a UTF-8 byte order mark (EF BB BF, Unicode standard §23.8)', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8('a,b\n')]);
    expect(decodeBytes(bytes)).toEqual({ text: 'a,b\n', encoding: 'utf-8' });
  });

  it.each(['le', 'be'] as const)('reads UTF-16 %s with a byte order mark', (order) => {
    const text = 'größe;€\n1;2\n';
    expect(decodeBytes(utf16(text, order))).toEqual({ text, encoding: `utf-16${order}` });
  });

  it('reads Windows-1252 when the bytes are not UTF-8: "café" as 63 61 66 E9', () => {
    expect(decodeBytes(new Uint8Array([0x63, 0x61, 0x66, 0xe9]))).toEqual({ text: 'café', encoding: 'windows-1252' });
  });

  it('maps the Windows-1252 range 80–9F as the WHATWG Encoding Standard does (80 → €, 93/94 → curly quotes)', () => {
    expect(decodeBytes(new Uint8Array([0x80, 0x20, 0x93, 0x78, 0x94, 0xe9])).text).toBe('€ \u201cx\u201dé');
  });
});

describe('chunk boundaries', () => {
  // 2-, 3- and 4-byte UTF-8 sequences, long enough to pass the sniffing window.
  const text = 'é€😀,ü\n'.repeat(3000);

  it('decodes multi-byte characters split across chunks, one byte at a time', () => {
    expect(decodeInPieces(utf8(text), 1)).toEqual({ text, encoding: 'utf-8' });
  });

  it.each([2, 3, 5, 7, 4096])('decodes the same in chunks of %i bytes', (size) => {
    expect(decodeInPieces(utf8(text), size).text).toBe(text);
  });

  it('decodes UTF-16 split inside code units and surrogate pairs', () => {
    expect(decodeInPieces(utf16(text, 'le'), 1)).toEqual({ text, encoding: 'utf-16le' });
    expect(decodeInPieces(utf16(text, 'be'), 3).text).toBe(text);
  });

  it('copies chunks it holds while sniffing, so a reused read buffer does not change them', () => {
    const decoder = new ChunkDecoder();
    const buffer = utf8('ab');
    decoder.decode(buffer);
    buffer.set(utf8('zz'));
    expect(decoder.finish()).toBe('ab');
  });
});

describe('Windows-1252 bytes met after text was handed on', () => {
  const ascii = 'x'.repeat(SNIFF_BYTES * 2);
  const late = new Uint8Array([...utf8(ascii), 0x63, 0x61, 0x66, 0xe9, 0x0a]);

  it('stops with encoding-restart instead of switching silently', () => {
    const error = thrownLevelwiseError(() => decodeInPieces(late, SNIFF_BYTES));
    expect(error.code).toBe('encoding-restart');
    expect(error.hint).toMatch(/Windows-1252/);
  });

  it('a whole buffer is judged as a whole and needs no restart', () => {
    expect(decodeBytes(late)).toEqual({ text: `${ascii}café\n`, encoding: 'windows-1252' });
  });

  it('retryAsWindows1252 reads a re-readable source again', async () => {
    let opened = 0;
    async function* open(): AsyncIterable<Uint8Array> {
      opened++;
      for (let at = 0; at < late.length; at += 1000) yield late.subarray(at, at + 1000);
    }
    const result = await retryAsWindows1252(open, async (chunks, encoding) => {
      const decoder = new ChunkDecoder(encoding);
      let text = '';
      for await (const chunk of chunks) text += decoder.decode(chunk);
      return { text: text + decoder.finish(), encoding: decoder.encoding };
    });
    expect(result).toEqual({ text: `${ascii}café\n`, encoding: 'windows-1252' });
    expect(opened).toBe(2);
  });

  it('a file declared UTF-8 by its byte order mark is not re-read: its bad bytes are an error', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(ascii), 0xe9, 0x0a]);
    expect(thrownLevelwiseError(() => decodeInPieces(bytes, 4096)).code).toBe('bad-encoding');
  });
});

describe('files that are not text', () => {
  it.each([
    ['PNG', [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], /PNG image/],
    ['ZIP (.xlsx)', [0x50, 0x4b, 0x03, 0x04, 0x14, 0x00], /ZIP archive/],
    ['gzip', [0x1f, 0x8b, 0x08, 0x00], /gzip/],
  ])('rejects %s by its signature', (_name, signature, message) => {
    const error = thrownLevelwiseError(() => decodeBytes(new Uint8Array([...signature, ...utf8('rest of the file')])));
    expect(error.code).toBe('not-text');
    expect(error.message).toMatch(message);
    expect(error.hint.length).toBeGreaterThan(10);
  });

  it('rejects NUL bytes in the first 8 KB, naming the byte', () => {
    const error = thrownLevelwiseError(() => decodeBytes(new Uint8Array([...utf8('a,b\n'), 0x00, ...utf8('c\n')])));
    expect(error.code).toBe('not-text');
    expect(error.message).toMatch(/byte 5/);
  });

  it('suggests UTF-16 without a byte order mark when every other byte is NUL', () => {
    const error = thrownLevelwiseError(() => decodeBytes(utf16('name,age\nAda,36\n', 'le', false)));
    expect(error.code).toBe('not-text');
    expect(error.hint).toMatch(/UTF-16/);
  });

  it('reports UTF-16 that ends in the middle of a code unit', () => {
    const bytes = utf16('ab', 'le');
    expect(thrownLevelwiseError(() => decodeBytes(bytes.subarray(0, bytes.length - 1))).code).toBe('bad-encoding');
  });
});
