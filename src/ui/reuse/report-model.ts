/**
 * The re-use report as the page tells it: a verdict, the counts, and one entry for everything the
 * recipe met that it did not expect — missing and extra columns, unseen levels, values that did
 * not read as numbers, missing cells, rows with the wrong number of fields, rows left out. Pure, so
 * the wording is tested without a browser.
 */
import type { ApplyReport, ColumnReport, RejectedRow, ValueTally } from '../../core/apply-report.ts';
import type { HeaderIssue, RowIssue } from '../../core/columns.ts';
import type { Recipe } from '../../core/recipe.ts';

export interface ReadingFacts {
  readonly rowIssues: readonly RowIssue[];
  readonly rowIssueCount: number;
  /** Header cells renamed while reading (blank or repeated names). */
  readonly headerIssues?: readonly HeaderIssue[];
}

export interface TallyView {
  readonly total: number;
  readonly values: readonly ValueTally[];
  /** What the recipe's policy did with them, in words. */
  readonly action: string;
}

export interface ColumnView {
  readonly name: string;
  readonly level: string;
  readonly present: boolean;
  readonly missing: { readonly count: number; readonly action: string } | null;
  readonly unseen: TallyView | null;
  readonly invalid: TallyView | null;
}

export interface ReportView {
  readonly fits: boolean;
  readonly headline: string;
  readonly facts: readonly { readonly label: string; readonly value: number }[];
  readonly missingColumns: readonly { readonly name: string; readonly effect: string }[];
  readonly extraColumns: readonly string[];
  readonly reading: readonly string[];
  readonly readingMore: number;
  /** Column names the file's header had to change, in words. */
  readonly renamed: readonly string[];
  readonly columns: readonly ColumnView[];
  readonly rejected: readonly RejectedRow[];
  /** Rejected rows counted but not listed. */
  readonly rejectedMore: number;
}

/** Row problems listed by line; the rest are counted. */
export const READING_LISTED = 20;

export function reportView(report: ApplyReport, reading: ReadingFacts): ReportView {
  const byName = new Map(report.columns.map((c) => [c.name, c]));
  const columns = report.columns.map(columnView).filter((c) => c.missing !== null || c.unseen !== null || c.invalid !== null);
  const fits = report.fits && reading.rowIssueCount === 0;
  const surprises =
    report.missingColumns.length +
    columns.filter((c) => c.unseen !== null).length +
    columns.filter((c) => c.invalid !== null).length +
    (reading.rowIssueCount > 0 ? 1 : 0) +
    (report.rowsRejected > 0 ? 1 : 0);
  return {
    fits,
    headline: fits
      ? 'The file fits the recipe: every column is there and every value was expected.'
      : `The recipe met ${surprises} ${surprises === 1 ? 'thing' : 'things'} it did not expect. Each is listed below with what was done about it.`,
    facts: [
      { label: 'rows read', value: report.rows },
      { label: 'rows written', value: report.rowsWritten },
      { label: 'rows left out', value: report.rowsRejected },
    ],
    missingColumns: report.missingColumns.map((name) => ({
      name,
      effect: `every cell counts as missing: ${byName.get(name)?.missingAction || 'its output cells are left empty'}`,
    })),
    extraColumns: report.extraColumns,
    reading: reading.rowIssues.slice(0, READING_LISTED).map(describeRowIssue),
    readingMore: Math.max(0, reading.rowIssueCount - Math.min(READING_LISTED, reading.rowIssues.length)),
    renamed: (reading.headerIssues ?? []).map(describeHeaderIssue),
    columns,
    rejected: report.rejected,
    rejectedMore: Math.max(0, report.rowsRejected - report.rejected.length),
  };
}

function columnView(c: ColumnReport): ColumnView {
  return {
    name: c.name,
    level: c.level,
    present: c.present,
    missing: c.missing > 0 && c.present ? { count: c.missing, action: c.missingAction } : null,
    unseen: tally(c.unseen, c.unseenAction),
    invalid: tally(c.invalid, c.invalidAction),
  };
}

function tally(values: readonly ValueTally[], action: string): TallyView | null {
  if (values.length === 0) return null;
  return { total: values.reduce((n, v) => n + v.count, 0), values, action };
}

export function describeRowIssue(issue: RowIssue): string {
  switch (issue.kind) {
    case 'too-few-fields':
      return `Line ${issue.line}: ${issue.found} of ${issue.expected} fields; the missing cells count as empty.`;
    case 'too-many-fields':
      return `Line ${issue.line}: ${issue.found} fields instead of ${issue.expected}; the extra ${issue.found - issue.expected === 1 ? 'cell was' : 'cells were'} kept aside, not encoded${issue.extra && issue.extra.length > 0 ? ` (${issue.extra.map((e) => `“${e}”`).join(', ')})` : ''}.`;
    case 'unclosed-quote':
      return `Line ${issue.line}: a quote opened here is never closed; the rest of the file was read as this one cell.`;
  }
}

export function describeHeaderIssue(issue: HeaderIssue): string {
  return issue.kind === 'blank'
    ? `Column ${issue.column + 1} has no name on line 1; it is called “${issue.renamedTo}”.`
    : `Column ${issue.column + 1} repeats the name “${issue.original}” on line 1; it is called “${issue.renamedTo}”.`;
}

/** "lines 3, 4, 9 …" for the first example lines of a value. */
export function linesText(tally: ValueTally): string {
  const list = tally.lines.join(', ');
  const more = tally.count > tally.lines.length ? ' …' : '';
  return `${tally.lines.length === 1 ? 'line' : 'lines'} ${list}${more}`;
}

/** Names listed in a sentence; the rest are counted. */
const NAMES_LISTED = 6;

function nameList(names: readonly string[]): string {
  const shown = names.slice(0, NAMES_LISTED).map((n) => `“${n}”`).join(', ');
  return names.length > NAMES_LISTED ? `${shown} and ${names.length - NAMES_LISTED} more` : shown;
}

/**
 * When a file has none of the columns a recipe reads, the recipe was made for another file:
 * applying it would only give columns of missing values. Says so, with both sets of names; null
 * when at least one column is shared (the re-use report covers the rest).
 */
export function otherFileProblem(recipe: Recipe, names: readonly string[], fileName: string): string | null {
  const inFile = new Set(names);
  if (recipe.columns.length === 0 || recipe.columns.some((c) => inFile.has(c.name))) return null;
  const madeFor = recipe.source.file === null ? '' : ` It was made for “${recipe.source.file}”.`;
  return (
    `None of the recipe’s ${recipe.columns.length} columns (${nameList(recipe.columns.map((c) => c.name))}) is in “${fileName}”, ` +
    `whose columns are ${nameList(names)}.${madeFor} Choose the file the recipe was made for, or open this file on the workbench and make a recipe for it.`
  );
}
