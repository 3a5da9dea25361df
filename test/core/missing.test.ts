/**
 * The missing-value test: empty after trimming, or a token after trimming, case-sensitive. Its fast
 * path (texts with printable edges are not trimmed) must agree with that definition for every text,
 * white space of every kind included (ECMAScript's WhiteSpace and LineTerminator, ECMA-262 §12.2–12.3,
 * which String.prototype.trim removes).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { missingTest } from '../../src/core/missing.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';

/** The definition, written the plain way. */
function reference(tokens: readonly string[]): (raw: string) => boolean {
  const set = new Set(tokens);
  return (raw) => raw.trim() === '' || set.has(raw.trim());
}

// ECMA-262 white space and line terminators: tab, VT, FF, space, NBSP, ZWNBSP, the Zs category, LF, CR, LS, PS.
const BLANKS = ['\t', '\v', '\f', ' ', '\u00a0', '\ufeff', '\u1680', '\u2000', '\u200a', '\u202f', '\u205f', '\u3000', '\n', '\r', '\u2028', '\u2029'];

describe('missingTest', () => {
  const isMissing = missingTest(DEFAULT_MISSING_TOKENS);

  it('takes empty cells, blank cells and the tokens, trimmed, case-sensitive', () => {
    expect(['', ' ', '\t', '\u00a0', 'NA', ' NA', 'NA\u3000', '\ufeffnull', 'None ', '.', '?', '-'].map(isMissing)).toEqual(Array(12).fill(true));
    expect(['Na', 'na', 'NAN', 'N A', 'x', '0', 'HH-0000001', '--', 'NA.', '\u200bNA'].map(isMissing)).toEqual(Array(10).fill(false));
  });

  it('knows the spreadsheet spellings "n/a" and "#N/A" (the not-available error value spreadsheet programs write; from memory)', () => {
    expect(['n/a', ' n/a ', '#N/A', 'N/A'].map(isMissing)).toEqual([true, true, true, true]);
    expect(['N/a', '#n/a', '#N/A!', 'n/a.'].map(isMissing)).toEqual([false, false, false, false]);
  });

  it('agrees with the plain definition on any text', () => {
    const piece = fc.oneof(fc.constantFrom(...BLANKS, ...DEFAULT_MISSING_TOKENS, 'x', 'Na', '\u200b'), fc.string({ maxLength: 3 }), fc.string({ unit: 'grapheme', maxLength: 2 }));
    const tokens = fc.array(fc.oneof(fc.constantFrom(...DEFAULT_MISSING_TOKENS), fc.string({ maxLength: 6 })), { maxLength: 5 });
    fc.assert(
      fc.property(tokens, fc.array(piece, { maxLength: 5 }), (list, parts) => {
        const raw = parts.join('');
        expect(missingTest(list)(raw)).toBe(reference(list)(raw));
      }),
      { numRuns: 3000 },
    );
  });
});
