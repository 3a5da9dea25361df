/**
 * Plain values: those of a column kept as bytes (an identifier, columns.ts PackedTexts) whose
 * bytes alone prove what the profile would find in their text: not missing, no number in any
 * format, no date, no white space. The profile counts them without making a string each; a
 * million identifiers are then a pass over one array of bytes instead of a million strings, each
 * looked at five times over.
 *
 * A value is plain when all of these hold (each one a check the profile makes on the text):
 * - it is longer than every missing-value token (missing.ts compares the trimmed text with them,
 *   and trimming takes nothing off a value without white space);
 * - every byte is printable ASCII other than the space: no white space to trim, to count as
 *   inner space, or to stand between a date's parts;
 * - its first byte cannot start a number (numbers.ts mayStartNumber: a digit, a sign, a point, a
 *   comma or the parenthesis of a negative amount);
 * - no known currency or percent sign starts or ends it (number-symbols.ts mayHaveKnownSymbol);
 * - so it is no date either (dates.ts mayBeDate: without white space, a date starts with a digit).
 * Anything else gets its text made and is looked at as every value of an unpacked column is.
 * test/core/plain-values.property.test.ts holds each plain value to those checks on its text.
 */
import type { PackedTexts } from './columns.ts';
import { mayBeDate } from './dates.ts';
import { mayHaveKnownSymbol } from './number-symbols.ts';
import { mayStartNumber } from './numbers.ts';

/**
 * By byte: 1 when a value may start with it and be plain, that is printable ASCII other than the
 * space that starts no number (and so, without white space after it, no date either).
 */
const PLAIN_FIRST = Uint8Array.from({ length: 256 }, (_, b) => (printable(b) && !mayStartNumber(b) && !mayBeDate(b, false) ? 1 : 0));

/** Per code of `packed`: 1 when the value is plain (above), 0 when its text must be looked at. */
export function plainValues(packed: PackedTexts, missingTokens: readonly string[]): Uint8Array {
  const { bytes, starts } = packed;
  const count = starts.length - 1;
  let longestToken = 0;
  for (const token of missingTokens) longestToken = Math.max(longestToken, token.length);
  const plain = new Uint8Array(count);
  // Values ending before the first byte that is not printable need no look at their bytes one
  // by one: an identifier column's million values are then one scan, four bytes at a time.
  const printableUpTo = firstNotPrintable(bytes, starts[0] ?? 0, starts[count] ?? 0);
  let end = starts[0] ?? 0;
  for (let code = 0; code < count; code++) {
    const start = end;
    end = starts[code + 1]!;
    if (end - start <= longestToken || PLAIN_FIRST[bytes[start]!] === 0) continue;
    if ((end <= printableUpTo || allPrintable(bytes, start + 1, end)) && !mayHaveKnownSymbol(bytes, start, end)) plain[code] = 1;
  }
  return plain;
}

/** Printable ASCII other than the space (0x21–0x7e). */
function printable(b: number): boolean {
  return b > 0x20 && b < 0x7f;
}

function allPrintable(bytes: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) {
    const b = bytes[i]!;
    if (b <= 0x20 || b >= 0x7f) return false;
  }
  return true;
}

/**
 * The first index in [from, to) whose byte is not printable (above), or `to`. Aligned words are
 * tested four bytes at once: a byte below 0x21 or above 0x7e sets a high bit in one of the two
 * sums (the "has a byte less than / more than n" tests of bit-twiddling lore, exact for n < 128).
 */
export function firstNotPrintable(bytes: Uint8Array, from: number, to: number): number {
  let i = from;
  while (i < to && (bytes.byteOffset + i) % 4 !== 0) {
    if (!printable(bytes[i]!)) return i;
    i++;
  }
  const wordCount = (to - i) >> 2;
  if (wordCount > 0) {
    const words = new Uint32Array(bytes.buffer, bytes.byteOffset + i, wordCount);
    const w = firstOddWord(words);
    i += 4 * w;
  }
  for (; i < to; i++) if (!printable(bytes[i]!)) return i;
  return to;
}

/** The index of the first word holding a byte that is not printable, or words.length. */
function firstOddWord(words: Uint32Array): number {
  for (let w = 0; w < words.length; w++) {
    const x = words[w]!;
    if ((((x - 0x21212121) & ~x) | (x + 0x01010101) | x) & 0x80808080) return w;
  }
  return words.length;
}
