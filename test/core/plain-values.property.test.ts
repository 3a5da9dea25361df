/**
 * Values kept as bytes (an identifier column, columns.ts PackedTexts) are profiled from their bytes
 * where that is enough (plain-values.ts). Two checks: every value called plain passes, as text,
 * each check the profile would make on it; and a column's profile is the same whether its values
 * are strings or bytes, levels made only when read included.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { TextColumn } from '../../src/core/columns.ts';
import { looksLikeDate } from '../../src/core/dates.ts';
import { draftColumn } from '../../src/core/fit.ts';
import { inferLevel } from '../../src/core/infer.ts';
import { DEFAULT_MISSING_TOKENS, missingTest } from '../../src/core/missing.ts';
import { knownSymbolOf } from '../../src/core/number-symbols.ts';
import { parseNumber } from '../../src/core/numbers.ts';
import { firstNotPrintable, plainValues } from '../../src/core/plain-values.ts';
import { levelCount, profileColumn } from '../../src/core/profile.ts';
import type { NumberFormat } from '../../src/core/recipe.ts';
import { packedTexts, textColumnsOf } from '../helpers/text-columns.ts';

/** Characters that make values look like ids, numbers, dates, signs, missing spellings or prose. */
const PIECES = ['HH-', 'A', 'x', 'K', 'HK$', 'US$', 'CHF', '$', '%', 'kg', '-', '+', '.', ',', '(', ')', '/', ' ', '\t', '0', '1', '7', '12', '2024', 'Mar', 'N/A', 'NA', '#', 'null', 'é'];
const asciiPiece = fc.constantFrom(...PIECES.filter((p) => /^[\x00-\x7f]*$/.test(p)));
const asciiValue = fc.array(asciiPiece, { minLength: 0, maxLength: 5 }).map((pieces) => pieces.join(''));

/** Formats without a sign or unit: a plain value reads as no number in any of them. */
const FORMATS: readonly NumberFormat[] = [
  { decimal: '.', group: '' },
  { decimal: '.', group: ',' },
  { decimal: ',', group: '.' },
  { decimal: ',', group: ' ' },
  { decimal: '.', group: '', negative: 'parentheses' },
  { decimal: ',', group: '', negative: 'trailing' },
];

describe('plain values', () => {
  it('pass every check the profile makes on their text', () => {
    const isMissing = missingTest(DEFAULT_MISSING_TOKENS);
    fc.assert(
      fc.property(fc.uniqueArray(asciiValue, { maxLength: 60 }), (values) => {
        const plain = plainValues(packedTexts(values), DEFAULT_MISSING_TOKENS);
        values.forEach((text, code) => {
          if (plain[code] !== 1) return;
          expect(isMissing(text)).toBe(false);
          expect(text.trim()).toBe(text);
          expect(/\s/.test(text)).toBe(false);
          expect(looksLikeDate(text)).toBe(false);
          expect(knownSymbolOf(text)).toBeNull();
          for (const format of FORMATS) expect(parseNumber(text, format)).toBeNaN();
        });
      }),
      { numRuns: 500 },
    );
  });

  it('are what identifiers written as codes are', () => {
    const values = ['HH-000001', 'HH-000002', 'ORD/2024/17', 'n/a', '12345', 'HK$ 12', 'Flat 3', '2024-03-01'];
    expect(Array.from(plainValues(packedTexts(values), DEFAULT_MISSING_TOKENS))).toEqual([1, 1, 1, 0, 0, 0, 0, 0]);
  });
});

describe('firstNotPrintable', () => {
  it('finds the first byte outside 0x21–0x7e as a byte-by-byte scan does, at any alignment', () => {
    // Mostly printable bytes with a few of each kind around the edges (0x20, 0x21, 0x7e, 0x7f, 0x80, 0xff, 0x00).
    const byte = fc.oneof({ weight: 20, arbitrary: fc.integer({ min: 0x21, max: 0x7e }) }, { weight: 1, arbitrary: fc.constantFrom(0x00, 0x09, 0x20, 0x7f, 0x80, 0xc3, 0xff) });
    fc.assert(
      fc.property(fc.array(byte, { maxLength: 200 }), fc.nat(7), fc.nat(200), fc.nat(200), (values, offset, a, b) => {
        const buffer = new Uint8Array(values.length + offset);
        buffer.set(values, offset);
        const bytes = buffer.subarray(offset);
        const from = Math.min(a, b, values.length);
        const to = Math.min(Math.max(a, b), values.length);
        let expected = to;
        for (let i = from; i < to; i++) {
          if (bytes[i]! < 0x21 || bytes[i]! > 0x7e) {
            expected = i;
            break;
          }
        }
        expect(firstNotPrintable(bytes, from, to)).toBe(expected);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('a column profiled from its bytes', () => {
  it('has the profile of the same column profiled from its strings', () => {
    // Cells drawn from a few values (repeats, missing spellings, numbers, dates, signs) and many new ones.
    const cell = fc.oneof(asciiValue, fc.constantFrom('', 'NA', ' 12 ', '1.5', '2024-03-01', 'US$5', '12%', 'x y', 'kg1234'), fc.integer({ min: 0, max: 999 }).map((n) => `HH-${n}`));
    const format = fc.constantFrom<NumberFormat | undefined>(
      undefined,
      { decimal: '.', group: '' }, { decimal: '.', group: '', symbol: { text: 'kg', side: 'after' } },
      // A format's own sign may stand inside a plain value ("kg1234"): then every level is read.
      { decimal: '.', group: '', symbol: { text: 'kg', side: 'before' } },
      { decimal: ',', group: '', symbol: { text: 'HK$', side: 'before' } },
    );
    fc.assert(
      fc.property(fc.array(cell, { maxLength: 80 }), format, fc.constantFrom(DEFAULT_MISSING_TOKENS, ['null', '-']), (cells, fixed, missingTokens) => {
        const { strings, bytes } = textColumnsOf(cells);
        const options = { missingTokens, ...(fixed === undefined ? {} : { format: fixed }) };
        expect(profileColumn(bytes, 0, options)).toEqual(profileColumn(strings, 0, options));
      }),
      { numRuns: 400 },
    );
  });

  it('makes the levels of a million-row identifier only when they are read, and drafting never reads them', () => {
    const cells = Array.from({ length: 200_000 }, (_, i) => `HH-${String(i).padStart(7, '0')}`);
    const { bytes } = textColumnsOf(cells);
    let made = 0;
    const counted = Object.defineProperty({ ...bytes }, 'values', { get: () => (made++, cells) }) as TextColumn;
    const profile = profileColumn(counted, 0);
    expect(levelCount(profile)).toBe(200_000);
    expect(inferLevel(profile).rule).toBe('identifier');
    expect(draftColumn(profile)).toMatchObject({ level: 'identifier', reason: '200,000 of 200,000 values distinct: looks like an identifier' });
    expect(made).toBe(0);
    expect(profile.levels?.[199_999]).toEqual({ value: 'HH-0199999', count: 1 });
    expect(made).toBe(1);
  });
});
