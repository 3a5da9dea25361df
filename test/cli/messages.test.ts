/**
 * The command line's wording, tested without spawning it: what reading a file found, a recipe's
 * problems, a recipe made for another file, and how cell texts are shown in a message.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { RowIssue } from '../../src/core/columns.ts';
import { readTable } from '../../src/core/read-table.ts';
import { parseRecipe } from '../../src/core/recipe-io.ts';
import type { Recipe } from '../../src/core/recipe.ts';
import { count, linesText, quoted, tallyText } from '../../src/cli/common.ts';
import { describeFailure } from '../../src/cli/failure.ts';
import { createFindingsLog, describeRowShape, findingsLines, issuesByRow, shapeRejectionReason } from '../../src/cli/reading-findings.ts';
import { recipeFailure } from '../../src/cli/recipe-problems.ts';
import { foreignFile } from '../../src/cli/recipe-match.ts';

const NAMES = ['ticket', 'colour', 'amount', 'note'];
const bytes = (text: string) => new TextEncoder().encode(text);

describe('what reading a file found', () => {
  it('a row short of two fields: both columns named, the row kept', () => {
    const issue: RowIssue = { line: 7, row: 5, kind: 'too-few-fields', expected: 4, found: 2 };
    expect(describeRowShape(issue, NAMES, 'apply')).toBe('line 7: 2 of 4 fields: kept, with columns 3 ("amount") to 4 ("note") empty (missing)');
  });

  it('a row with more than three extra cells: the first three shown, the rest counted', () => {
    const issue: RowIssue = { line: 9, row: 7, kind: 'too-many-fields', expected: 4, found: 9, extra: ['a', 'b', 'c', 'd', 'e'] };
    expect(shapeRejectionReason(issue, NAMES)).toBe('9 fields instead of 4: the extra cells from column 5 ("a", "b", "c", and 2 more) belong to no column');
    expect(describeRowShape(issue, NAMES, 'check')).toBe('line 9: 9 fields instead of 4: the extra cells from column 5 ("a", "b", "c", and 2 more); "levelwise apply" rejects the row');
  });

  it('core reports a quote never closed with the row it also cuts short: told once, as the quote', () => {
    const { table } = readTable(bytes('ticket,colour,amount,note\nT-1,red,1,ok\nT-2,"blue\nT-3,red,2,ok\n'));
    expect(table.rowIssues.map((i) => i.kind)).toEqual(['too-few-fields', 'unclosed-quote']);
    expect(issuesByRow(table.rowIssues)).toEqual([{ line: 3, row: 1, kind: 'unclosed-quote', expected: 4, found: 2 }]);
    const log = createFindingsLog();
    log.add(table.rowIssues, table.headerIssues);
    const findings = log.findings();
    expect([findings.tooFewFields, findings.tooManyFields, findings.unclosedQuote?.line]).toEqual([0, 0, 3]);
    expect(findingsLines('f.csv', table.names, findings, 'profile', 5)).toEqual([
      '"f.csv" line 3: a quote opened in column 2 ("colour") is never closed: everything from there to the end of the file was read as that one cell, ' +
        'so the lines after it are not rows. Look at the quotes on line 3: a quote inside a quoted cell is written twice ("").',
    ]);
  });

  it('blank and repeated column names: said on line 1, with the names they were given', () => {
    const { table } = readTable(bytes('ticket,,ticket\nT-1,a,b\n'));
    const log = createFindingsLog();
    log.add(table.rowIssues, table.headerIssues);
    const [line] = findingsLines('f.csv', table.names, log.findings(), 'apply', 5);
    const renamed = table.headerIssues.map((i) => i.renamedTo);
    expect(line).toBe(
      `"f.csv" line 1: 2 column names were changed so that every column has a name of its own: column 2 has no name and is called "${renamed[0]}"; ` +
        `column 3 repeats the name "ticket" and is called "${renamed[1]}". A recipe uses the new names; rename the columns in the file if you want others.`,
    );
  });

  it('batches: every row counted once, the first twenty kept, in file order', () => {
    const log = createFindingsLog();
    for (let batch = 0; batch < 5; batch++) {
      const issues: RowIssue[] = Array.from({ length: 10 }, (_, i) => ({ line: batch * 10 + i + 2, row: batch * 10 + i, kind: i % 2 === 0 ? 'too-few-fields' : 'too-many-fields', expected: 3, found: i % 2 === 0 ? 2 : 4, extra: i % 2 === 0 ? undefined : ['x'] }) as RowIssue);
      log.add(issues, []);
    }
    const findings = log.findings();
    expect([findings.tooFewFields, findings.tooManyFields, findings.rowIssues.length]).toEqual([25, 25, 20]);
    expect(findings.rowIssues.map((i) => i.line)).toEqual(Array.from({ length: 20 }, (_, i) => i + 2));
    const lines = findingsLines('f.csv', ['a', 'b', 'c'], findings, 'apply', 5);
    expect(lines.at(-1)).toBe('  … and 45 more (22 with too few fields, 23 with too many)');
  });
});

describe('a recipe that cannot be used', () => {
  it('the problems core counted but did not list are in the count, said with the right number', () => {
    const errors = Array.from({ length: 20 }, (_, i) => `columns[${i}].level: expected one of "nominal", found "x".`);
    const failure = recipeFailure('r.json', errors, 1);
    expect(failure.message).toBe('the recipe "r.json" cannot be used: 21 problems.');
    expect(failure.details.at(-1)).toBe('  … and 1 more problem.');
    expect(failure.details).toHaveLength(21);
  });

  it('what core finds wrong in a real recipe is listed whole, one line each', () => {
    const parsed = parseRecipe(JSON.stringify({ kind: 'levelwise.recipe', version: 1, source: { file: null, rows: 'x', columns: [] }, reading: {}, naming: 'odd', columns: [] }));
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    const { lines } = describeFailure(recipeFailure('r.json', parsed.errors, parsed.unlisted), 'check');
    expect(lines).toHaveLength(parsed.errors.length + 2);
    expect(lines[0]).toBe(`levelwise check: the recipe "r.json" cannot be used: ${parsed.errors.length} problems.`);
    expect(lines.slice(1, -1)).toEqual(parsed.errors.map((e) => `levelwise check:   ${e}`));
    expect(lines.at(-1)).toBe('levelwise check: Fix the recipe, or make a new one with "levelwise draft".');
  });

  it('no hint of its own when every problem says what to do', () => {
    expect(recipeFailure('r.json', ['The recipe: unknown field "x"; remove it.']).hint).toBe('');
    expect(recipeFailure('r.json', ['The recipe is not valid JSON at line 1, column 2: oops. Open it in a text editor and fix it there, or make the recipe again.']).hint).toBe('');
    expect(recipeFailure('r.json', ['A recipe is a JSON object; this file holds something else.']).hint).toBe('Fix the recipe, or make a new one with "levelwise draft".');
  });
});

describe('a recipe made for another file', () => {
  const recipeWith = (names: readonly string[], excluded: readonly string[] = []): Recipe =>
    ({
      source: { file: 'a.csv', rows: 1, columns: names },
      columns: names.map((name) => ({ name, outputs: excluded.includes(name) ? [] : [name] })),
    }) as unknown as Recipe;

  it('is caught when the file lacks more than half of the columns the recipe encodes', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.string({ minLength: 1, maxLength: 4 }), { minLength: 1, maxLength: 8 }), fc.array(fc.boolean(), { minLength: 8, maxLength: 8 }), (names, kept) => {
        const header = names.filter((_, i) => kept[i]);
        const lacking = names.length - header.length;
        expect(foreignFile(recipeWith(names), header) !== null).toBe(lacking * 2 > names.length);
      }),
    );
  });

  it('excluded columns do not count: they make no output', () => {
    expect(foreignFile(recipeWith(['a', 'b', 'c'], ['b', 'c']), ['a'])).toBeNull();
    expect(foreignFile(recipeWith(['a', 'b', 'c'], ['a']), ['a'])).toEqual({ encoded: ['b', 'c'], lacking: ['b', 'c'] });
  });
});

describe('cell texts in messages', () => {
  it('on one line, escaped as in JSON, cut at 60 characters', () => {
    expect(quoted('blue,20\nT-3,"red"\t')).toBe('"blue,20\\nT-3,\\"red\\"\\t"');
    expect(quoted('x'.repeat(61))).toBe(`"${'x'.repeat(60)}…"`);
    expect(quoted('a\u2028b\u009bc\u001bd')).toBe('"a\\u2028b\\u009bc\\u001bd"');
    fc.assert(
      fc.property(fc.string({ unit: 'binary' }), (text) => {
        expect(quoted(text)).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/);
      }),
    );
  });

  it('line numbers without thousands separators, with dots when there are more', () => {
    expect(linesText([1018])).toBe('line 1018');
    expect(linesText([4, 1018], 9)).toBe('lines 4, 1018, …');
    expect(tallyText([{ value: 'n/a', count: 6, lines: [3, 5, 8, 13, 21] }, { value: 'x', count: 1, lines: [2] }, { value: 'y', count: 1, lines: [4] }], 2)).toBe(
      '"n/a" ×6 (lines 3, 5, 8, 13, 21, …), "x" ×1 (line 2), and 1 more value',
    );
  });
});

describe('count', () => {
  it('groups digits in threes with commas, as en-US does', () => {
    for (const n of [0, 7, 999, 1000, 12_345, 999_999, 1_000_000, 1_234_567_890, -1, -1000, -1_234_567, Number.MAX_SAFE_INTEGER]) {
      expect(count(n)).toBe(n.toLocaleString('en-US'));
    }
    expect(count(1_000_000)).toBe('1,000,000');
    expect(count(2.5)).toBe('2.5');
  });
});
