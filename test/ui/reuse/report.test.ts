/**
 * The re-use report as the page tells it. Reports come from core applying a real recipe to a
 * second invented file; the expected counts and line numbers are read off the files by hand.
 * The component is rendered to static markup in Node (react-dom/server), so what a person reads is
 * checked without a browser; nothing the report holds may be missing from the page.
 */
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { decide, type Decision } from '../../../src/core/decisions.ts';
import { encodeToCsv } from '../../../src/core/encode-csv.ts';
import { draftRecipe } from '../../../src/core/fit.ts';
import { profileTable } from '../../../src/core/profile.ts';
import { readTable } from '../../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../../src/core/recipe.ts';
import { describeRowIssue, reportView } from '../../../src/ui/reuse/report-model.ts';
import { ReuseReport, VALUES_LISTED } from '../../../src/ui/reuse/ReuseReport.tsx';

const FIT_CSV = 'ticket,colour,amount\nT-01,red,10\nT-02,blue,20.5\nT-03,red,\nT-04,green,40\nT-05,red,50\nT-06,blue,12\n';

function table(text: string) {
  return readTable(new TextEncoder().encode(text)).table;
}

function fittedRecipe(decisions: Decision[] = []): Recipe {
  const fit = table(FIT_CSV);
  const profiles = profileTable(fit, { missingTokens: DEFAULT_MISSING_TOKENS });
  const base = [
    { type: 'set-level', column: 'ticket', level: 'identifier' },
    { type: 'set-level', column: 'colour', level: 'nominal' },
    { type: 'set-level', column: 'amount', level: 'continuous' },
    ...decisions,
  ] satisfies Decision[];
  return base.reduce((r, d) => decide(r, d, profiles), draftRecipe(profiles, { file: 'fit.csv', rows: fit.rowCount }));
}

const NO_ROW_ISSUES = { rowIssues: [], rowIssueCount: 0 };

describe('report view', () => {
  it('says plainly when a file fits the recipe', () => {
    const { report } = encodeToCsv(fittedRecipe(), table('ticket,colour,amount\nX-1,blue,3\nX-2,red,4\n'));
    const view = reportView(report, NO_ROW_ISSUES);
    expect(view.fits).toBe(true);
    expect(view.headline).toBe('The file fits the recipe: every column is there and every value was expected.');
    expect(view.facts).toEqual([
      { label: 'rows read', value: 2 },
      { label: 'rows written', value: 2 },
      { label: 'rows left out', value: 0 },
    ]);
    expect(view.columns).toEqual([]);
  });

  it('lists missing and extra columns, unseen levels with counts and lines, and unreadable numbers', () => {
    // Line 1 is the header. purple: lines 3, 4; teal: line 5. "x" on line 4 is not a number; line 5 has no amount.
    const second = 'ticket,colour,amount,region\nU-01,red,5,north\nU-02,purple,7,south\nU-03,purple,x,north\nU-04,teal,,east\n';
    const recipe = fittedRecipe();
    const withoutColour = second.replace(/,colour/, '').replace(/,(red|purple|teal)/g, '');
    const { report } = encodeToCsv(recipe, table(second));
    const view = reportView(report, NO_ROW_ISSUES);
    expect(view.fits).toBe(false);
    expect(view.extraColumns).toEqual(['region']);
    expect(view.missingColumns).toEqual([]);
    const colour = view.columns.find((c) => c.name === 'colour');
    expect(colour?.unseen).toEqual({
      total: 3,
      values: [
        { value: 'purple', count: 2, lines: [3, 4] },
        { value: 'teal', count: 1, lines: [5] },
      ],
      action: 'all output columns 0',
    });
    const amount = view.columns.find((c) => c.name === 'amount');
    // Mean of 10, 20.5, 40, 50, 12 = 26.5 (the fitted mean, by hand).
    expect(amount?.invalid?.values).toEqual([{ value: 'x', count: 1, lines: [4] }]);
    expect(amount?.invalid?.action).toBe('treated as missing (filled with the fitted mean 26.5)');
    expect(amount?.missing).toEqual({ count: 1, action: 'filled with the fitted mean 26.5' });
    // Two surprises: colour's unseen levels and amount's unreadable value.
    expect(view.headline).toMatch(/^The recipe met 2 things it did not expect\./);

    const lacking = reportView(encodeToCsv(recipe, table(withoutColour)).report, NO_ROW_ISSUES);
    expect(lacking.missingColumns).toEqual([{ name: 'colour', effect: 'every cell counts as missing: all output columns 0' }]);
  });

  it('lists every row an error policy left out, with its line and reason', () => {
    const recipe = fittedRecipe([{ type: 'set-unseen', column: 'colour', unseen: 'error' }]);
    const { report } = encodeToCsv(recipe, table('ticket,colour,amount\nV-1,red,1\nV-2,pink,2\nV-3,blue,3\nV-4,pink,4\n'));
    const view = reportView(report, NO_ROW_ISSUES);
    expect(view.facts).toEqual([
      { label: 'rows read', value: 4 },
      { label: 'rows written', value: 2 },
      { label: 'rows left out', value: 2 },
    ]);
    expect(view.rejected.map((r) => [r.line, r.column, r.reason])).toEqual([
      [3, 'colour', 'unseen level "pink" (unseen policy: error)'],
      [5, 'colour', 'unseen level "pink" (unseen policy: error)'],
    ]);
    expect(view.rejectedMore).toBe(0);
  });

  it('describes rows with the wrong number of fields, keeping extra cells visible', () => {
    const read = table('a,b\n1,2\n3\n4,5,6\n');
    expect(read.rowIssues.map(describeRowIssue)).toEqual([
      'Line 3: 1 of 2 fields; the missing cells count as empty.',
      'Line 4: 3 fields instead of 2; the extra cell was kept aside, not encoded (“6”).',
    ]);
  });
});

describe('the report on the page', () => {
  it('shows every count, value and line the report holds', () => {
    const second = 'ticket,colour,amount,region\nU-01,red,5,north\nU-02,purple,7,south\nU-03,purple,x,north\nU-04,teal,,east\n';
    const { report } = encodeToCsv(fittedRecipe(), table(second));
    const html = renderToStaticMarkup(createElement(ReuseReport, { report, reading: NO_ROW_ISSUES, fileName: 'second.csv' }));
    expect(html).toContain('What the recipe did to “second.csv”');
    expect(html).toContain('Left out of the output: “region”.');
    expect(html).toContain('<code>purple</code></td><td class="num">2</td><td>lines 3, 4</td>');
    expect(html).toContain('<code>teal</code></td><td class="num">1</td><td>line 5</td>');
    expect(html).toContain('<code>x</code></td><td class="num">1</td><td>line 4</td>');
    expect(html).toContain('Levels the recipe has not seen: 3 cells — all output columns 0.');
  });

  it('counts the values beyond the listed ones instead of dropping them', () => {
    const rows = Array.from({ length: VALUES_LISTED + 7 }, (_, i) => `W-${i},shade-${i},1`).join('\n');
    const { report } = encodeToCsv(fittedRecipe(), table(`ticket,colour,amount\n${rows}\n`));
    const html = renderToStaticMarkup(createElement(ReuseReport, { report, reading: NO_ROW_ISSUES, fileName: 'many.csv' }));
    expect(html).toContain('Levels the recipe has not seen: 57 cells');
    expect(html).toContain('… and 7 more values (7 cells), each treated the same way.');
  });

  it('lists reading problems before the columns', () => {
    const read = readTable(new TextEncoder().encode('ticket,colour,amount\nZ-1,red\nZ-2,blue,2\n'));
    const { report } = encodeToCsv(fittedRecipe(), read.table);
    const html = renderToStaticMarkup(
      createElement(ReuseReport, { report, reading: { rowIssues: read.table.rowIssues, rowIssueCount: read.table.rowIssues.length }, fileName: 'short.csv' }),
    );
    expect(html).toContain('Rows with the wrong number of fields');
    expect(html).toContain('Line 2: 2 of 3 fields; the missing cells count as empty.');
    expect(html).toContain('The recipe met 1 thing it did not expect.');
  });
});
