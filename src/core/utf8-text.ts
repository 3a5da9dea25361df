/**
 * UTF-8 bytes ⇄ text for the byte-level reader (parse.ts, columns-builder.ts). The reader keeps a
 * file as bytes and makes a string only for a value met for the first time; these are the two
 * conversions it needs, both strict: bytes that are not UTF-8 stop the reading with
 * InvalidUtf8Error (the table reader turns it into a message or a restart as Windows-1252), never
 * a silent U+FFFD.
 */

/** Thrown by `utf8Text` for bytes that are not UTF-8. */
export class InvalidUtf8Error extends Error {
  constructor() {
    super('bytes that are not UTF-8');
    this.name = 'InvalidUtf8Error';
  }
}

const strict = new TextDecoder('utf-8', { fatal: true });
const encoder = new TextEncoder();

/** Up to this many ASCII bytes become a string with String.fromCharCode (cheaper than a decoder call). */
const SHORT_ASCII = 64;

/** bytes[start, end) as text. */
export function utf8Text(bytes: Uint8Array, start: number, end: number): string {
  const length = end - start;
  if (length === 0) return '';
  if (length <= SHORT_ASCII && isAscii(bytes, start, end)) {
    // apply takes any array-like, a typed array included, without copying it into an Array.
    return String.fromCharCode.apply(null, bytes.subarray(start, end) as unknown as number[]);
  }
  try {
    return strict.decode(bytes.subarray(start, end));
  } catch {
    throw new InvalidUtf8Error();
  }
}

function isAscii(bytes: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) if (bytes[i]! >= 0x80) return false;
  return true;
}

/** A reusable buffer for `utf8Bytes`, grown when a text needs more. */
let scratch = new Uint8Array(256);

const SURROGATE = /[\uD800-\uDFFF]/;

/**
 * `text` as UTF-8 bytes, in a shared buffer valid until the next call (copy what you keep). Used
 * as a dictionary key, so it must be one-to-one: a lone surrogate, which UTF-8 cannot hold (and
 * TextEncoder would turn into U+FFFD, the same bytes as a real U+FFFD), is written as its own
 * three-byte sequence ED A0 80–ED BF BF, which no valid UTF-8 file contains.
 */
export function utf8Bytes(text: string): Uint8Array {
  // Three bytes per UTF-16 unit is the most UTF-8 needs.
  if (scratch.length < 3 * text.length) scratch = new Uint8Array(Math.max(2 * scratch.length, 3 * text.length));
  // ASCII (most cells) is its own UTF-8: copied unit by unit, which for short texts costs less than
  // the surrogate check and a call into the encoder.
  let ascii = 0;
  while (ascii < text.length) {
    const unit = text.charCodeAt(ascii);
    if (unit >= 0x80) break;
    scratch[ascii++] = unit;
  }
  if (ascii === text.length) return scratch.subarray(0, ascii);
  if (SURROGATE.test(text)) return scratch.subarray(0, encodeWithSurrogates(text, scratch));
  const { written } = encoder.encodeInto(text, scratch);
  return scratch.subarray(0, written);
}

/** UTF-8 of `text`, lone surrogates each as three bytes; returns the bytes written. */
function encodeWithSurrogates(text: string, out: Uint8Array): number {
  let at = 0;
  for (let i = 0; i < text.length; i++) {
    let code = text.charCodeAt(i);
    const low = text.charCodeAt(i + 1);
    if (code >= 0xd800 && code <= 0xdbff && low >= 0xdc00 && low <= 0xdfff) {
      code = 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00);
      i++;
    }
    if (code < 0x80) out[at++] = code;
    else if (code < 0x800) {
      out[at++] = 0xc0 | (code >> 6);
      out[at++] = 0x80 | (code & 0x3f);
    } else if (code < 0x10000) {
      out[at++] = 0xe0 | (code >> 12);
      out[at++] = 0x80 | ((code >> 6) & 0x3f);
      out[at++] = 0x80 | (code & 0x3f);
    } else {
      out[at++] = 0xf0 | (code >> 18);
      out[at++] = 0x80 | ((code >> 12) & 0x3f);
      out[at++] = 0x80 | ((code >> 6) & 0x3f);
      out[at++] = 0x80 | (code & 0x3f);
    }
  }
  return at;
}

/** A whole text as its own UTF-8 bytes. */
export function encodeUtf8(text: string): Uint8Array {
  return encoder.encode(text);
}
