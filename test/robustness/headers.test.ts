/**
 * Header rows that are off: repeated names, blank names, a name thousands of characters long,
 * names that a spreadsheet would run as formulas, names that are also JavaScript's own property
 * names. Names are changed only to make them unique and non-blank, and each change is reported;
 * formula-looking names are neutralised in the CSV written (OWASP "CSV Injection").
 */
import { describe, expect, it } from 'vitest';
import { compilePlan } from '../../src/core/plan.ts';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import { parseRecipe, stringifyRecipe } from '../../src/core/recipe-io.ts';
import { readingNotices } from '../../src/ui/files/reading-notices.ts';
import { describeHeaderIssue } from '../../src/ui/reuse/report-model.ts';
import { pipeline, utf8 } from './helpers.ts';

describe('repeated and blank names', () => {
  const { table } = readTable(utf8('site,site,, ,site\nA,B,C,D,E\n'));

  it('keeps first names, numbers repeats and names blanks by position, reporting each', () => {
    expect(table.names).toEqual(['site', 'site (2)', 'column 3', 'column 4', 'site (3)']);
    expect(table.headerIssues).toEqual([
      { column: 1, kind: 'duplicate', original: 'site', renamedTo: 'site (2)' },
      { column: 2, kind: 'blank', original: '', renamedTo: 'column 3' },
      { column: 3, kind: 'blank', original: ' ', renamedTo: 'column 4' },
      { column: 4, kind: 'duplicate', original: 'site', renamedTo: 'site (3)' },
    ]);
  });

  it('the page and the re-use report say which columns were renamed, and to what', () => {
    const [notice] = readingNotices({ fileName: 'x.csv', rowCount: 1, names: table.names, rowIssues: [], rowIssueCount: 0, headerIssues: table.headerIssues });
    expect(notice).toEqual({
      tone: 'warning',
      title: '4 column names were changed on line 1',
      detail:
        'Every column needs a name of its own: column 2 repeats the name “site” and is called “site (2)”; ' +
        'column 3 has no name and is called “column 3”; column 4 has no name and is called “column 4”; and 1 more.',
      hint: 'The recipe uses the new names. Rename the columns in the file if you want others.',
    });
    expect(table.headerIssues.map(describeHeaderIssue)).toEqual([
      'Column 2 repeats the name “site” on line 1; it is called “site (2)”.',
      'Column 3 has no name on line 1; it is called “column 3”.',
      'Column 4 has no name on line 1; it is called “column 4”.',
      'Column 5 repeats the name “site” on line 1; it is called “site (3)”.',
    ]);
  });

  it('a name already taken by a renaming is skipped: “a (2)” written in the file keeps its name', () => {
    expect(readTable(utf8('a,a (2),a\n1,2,3\n')).table.names).toEqual(['a', 'a (2)', 'a (3)']);
  });
});

describe('a very long name', () => {
  const long = `question ${'very '.repeat(2000)}long`;
  const run = pipeline(utf8(`${long},n\nyes,1\nno,2\nyes,3\n`));

  it('is kept whole, in the recipe, the output header and a recipe read back', () => {
    expect(run.read.table.names[0]).toBe(long);
    expect(run.recipe.columns[0]?.name).toBe(long);
    // Binary: yes 2, no 1; "yes" reads as yes and is coded 1.
    expect(run.csv.startsWith(`${long}=yes,n\r\n`)).toBe(true);
    const again = parseRecipe(stringifyRecipe(run.recipe));
    expect(again.ok && again.recipe.columns[0]?.outputs).toEqual([`${long}=yes`]);
  });
});

describe('names that look like formulas', () => {
  // OWASP "CSV Injection": a cell must not start with =, +, -, @, tab or CR (and LF here).
  const names = ['=HYPERLINK("http://example.invalid","x")', '+cmd', '-2+3', '@SUM(A1)', '\tindent', '\rcr', 'plain'];
  const header = names.map((n) => `"${n.replace(/"/g, '""')}"`).join(',');
  const { table } = readTable(utf8(`${header}\nr1,a,b,c,d,e,f\nr2,a,b,c,d,e,f\n`));

  it('are read as they are written', () => expect(table.names).toEqual(names));

  it('are neutralised with a leading apostrophe in the CSV header, quoted as RFC 4180 requires', () => {
    const run = pipeline(utf8(`${header}\nr1,a,b,c,d,e,f\nr2,a,b,c,d,e,f\n`));
    const recipe = run.recipe.columns.reduce((r, c) => decide(r, { type: 'set-level', column: c.name, level: 'identifier' }, run.profiles), run.recipe);
    const csv = new TextDecoder().decode(encodeToCsv(recipe, table).bytes);
    const [written] = csv.split('\r\n', 1);
    expect(written).toBe(`"'=HYPERLINK(""http://example.invalid"",""x"")",'+cmd,'-2+3,'@SUM(A1),'\tindent,"'\rcr",plain`);
  });
});

describe('names that are also JavaScript’s own property names', () => {
  const text = '__proto__,constructor,toString,hasOwnProperty\nx,1,a,p\ny,2,b,q\nx,3,a,p\n';
  const before = Object.getOwnPropertyNames(Object.prototype).sort();

  it('work like any other name, end to end, and change nothing global', () => {
    const run = pipeline(utf8(text));
    expect(run.read.table.names).toEqual(['__proto__', 'constructor', 'toString', 'hasOwnProperty']);
    expect(run.recipe.columns.map((c) => c.name)).toEqual(['__proto__', 'constructor', 'toString', 'hasOwnProperty']);
    // Binary columns (2 values), "constructor" holds 3 numbers (an ordered scale, ranked from 1).
    expect(run.csv).toBe('__proto__=y,constructor,toString=b,hasOwnProperty=q\r\n0,1,0,0\r\n1,2,1,1\r\n0,3,0,0\r\n');
    const again = parseRecipe(stringifyRecipe(run.recipe));
    expect(again.ok).toBe(true);
    if (again.ok) expect(compilePlan(again.recipe, run.read.table.names).missingColumns).toEqual([]);
    expect(({} as Record<string, unknown>)['polluted']).toBeUndefined();
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(before);
    expect(Object.getPrototypeOf({})).toBe(Object.prototype);
  });
});
