/**
 * The missing-value test: empty after trimming, or a token after trimming, case-sensitive. Its fast
 * path (texts with printable edges are not trimmed) must agree with that definition for every text,
 * white space of every kind included (ECMAScript's WhiteSpace and LineTerminator, ECMA-262 §12.2–12.3,
 * which String.prototype.trim removes).
 */
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { missingSpellingCells, missingTest, sameMissingTokens, spellingsOutnumberingValues } from '../../src/core/missing.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable, tableFromRows } from '../../src/core/read-table.ts';
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

describe('spellingsOutnumberingValues: missing spellings that may be values', () => {
  const profilesOf = (rows: string[][], tokens = DEFAULT_MISSING_TOKENS) => profileTable(tableFromRows(rows).table, { missingTokens: tokens });

  it('names a spelling met in more cells than all of the column\'s values together, with both counts', () => {
    const rows = [['damage', 'note', 'size']];
    // damage: "None" 5 against 3 values; note: "NA" 3 against 5 values; size: "-" 4 against 4 values (not more).
    const damage = ['None', 'None', 'Minor', 'None', '', 'Severe', 'None', 'Minor', 'None'];
    const note = ['NA', 'a', 'b', 'NA', 'c', 'd', 'NA', 'e', ''];
    const size = ['-', 'S', '-', 'M', '-', 'L', '-', 'S', ''];
    damage.forEach((d, i) => rows.push([d, note[i]!, size[i]!]));
    expect(spellingsOutnumberingValues(profilesOf(rows))).toEqual([{ column: 'damage', spelling: 'None', cells: 5, valueCells: 3 }]);
  });

  it('never names the empty cell, nor a column with no value at all, nor a spelling taken off the list', () => {
    const rows = [['a', 'b', 'c'], ['', 'NA', 'None'], ['', 'NA', 'None'], ['x', 'NA', 'y']];
    // a: 2 empty against 1 value (empty is never named); b: nothing but "NA"; c: "None" read as a value.
    expect(spellingsOutnumberingValues(profilesOf(rows, DEFAULT_MISSING_TOKENS.filter((t) => t !== 'None')))).toEqual([]);
    expect(spellingsOutnumberingValues(profilesOf(rows))).toEqual([{ column: 'c', spelling: 'None', cells: 2, valueCells: 1 }]);
  });

  it('counts "-999" in a column kept as numbers', () => {
    const cells = Array.from({ length: 300 }, (_, i) => (i % 3 === 0 ? String(i) : '-999'));
    const profiles = profileTable(readTable(new TextEncoder().encode(`t\n${cells.join('\n')}\n`), { dictionaryCap: 16 }).table, {
      missingTokens: [...DEFAULT_MISSING_TOKENS, '-999'],
    });
    expect(spellingsOutnumberingValues(profiles)).toEqual([{ column: 't', spelling: '-999', cells: 200, valueCells: 100 }]);
  });

  // Published dataset: vega-datasets birdstrikes.csv (a sample of the FAA wildlife strike records),
  // whose damage column spells "no damage" as "None". The counts are taken with papaparse, an
  // independent reader, not typed in.
  it('birdstrikes (vega-datasets): "None" in "Effect Amount of damage" outnumbers the other values', () => {
    const path = join(import.meta.dirname, '../../node_modules/vega-datasets/data/birdstrikes.csv');
    const text = readFileSync(path, 'utf8');
    const records = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
    const damage = records.map((r) => r['Effect Amount of damage'] ?? '');
    const none = damage.filter((d) => d.trim() === 'None').length;
    const values = damage.filter((d) => !missingTest(DEFAULT_MISSING_TOKENS)(d)).length;
    expect(records.length).toBe(10000);
    expect(none).toBeGreaterThan(values);
    const found = spellingsOutnumberingValues(profileTable(readTable(new TextEncoder().encode(text)).table, { missingTokens: DEFAULT_MISSING_TOKENS }));
    expect(found).toContainEqual({ column: 'Effect Amount of damage', spelling: 'None', cells: none, valueCells: values });
  });
});

describe('missingSpellingCells and sameMissingTokens', () => {
  it('adds up each spelling over the columns, naming them in file order, most cells first', () => {
    const rows = [['a', 'b', 'c'], ['NA', '', '?'], ['NA', 'NA', '?'], ['1', '?', '?'], ['2', '3', '4']];
    const profiles = profileTable(tableFromRows(rows).table, { missingTokens: DEFAULT_MISSING_TOKENS });
    // "?" 1 in b + 3 in c; "NA" 2 in a + 1 in b; the empty cell once in b.
    expect(missingSpellingCells(profiles)).toEqual([
      { spelling: '?', cells: 4, columns: ['b', 'c'] },
      { spelling: 'NA', cells: 3, columns: ['a', 'b'] },
      { spelling: '', cells: 1, columns: ['b'] },
    ]);
  });

  it('compares lists as the cells they read as missing: order, repeats and spaces aside', () => {
    expect(sameMissingTokens(['NA', '-999'], [' -999', 'NA', 'NA'])).toBe(true);
    expect(sameMissingTokens(['NA'], ['NA', 'na'])).toBe(false);
  });
});
