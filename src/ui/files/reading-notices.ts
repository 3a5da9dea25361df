/**
 * What the page tells the person about how a file was read, right after opening it: a table with
 * no data rows, column names changed to stay unique and non-blank, a quote never closed, rows with
 * too few or too many fields. Each says what happened, where (line and column), and what was done
 * about it, so nothing changes silently. Pure, so the wording is tested without a browser.
 */
import type { HeaderIssue, RowIssue } from '../../core/columns.ts';
import { formatCount } from './format.ts';

export interface ReadingNotice {
  readonly tone: 'warning' | 'error';
  readonly title: string;
  readonly detail: string;
  readonly hint: string;
}

export interface ReadingFacts {
  readonly fileName: string;
  readonly rowCount: number;
  readonly names: readonly string[];
  /** The first row problems; `rowIssueCount` counts them all. */
  readonly rowIssues: readonly RowIssue[];
  readonly rowIssueCount: number;
  readonly headerIssues: readonly HeaderIssue[];
}

/** Rows and renamed columns listed in a notice; the rest are counted. */
export const LISTED = 3;

export function readingNotices(facts: ReadingFacts): ReadingNotice[] {
  const notices: ReadingNotice[] = [];
  if (facts.rowCount === 0) notices.push(noDataRows(facts));
  if (facts.headerIssues.length > 0) notices.push(renamedColumns(facts.headerIssues));
  const unclosed = facts.rowIssues.find((issue) => issue.kind === 'unclosed-quote');
  if (unclosed !== undefined) notices.push(unclosedQuote(unclosed, facts.names));
  // The row a quote never closed also comes up short of fields: its own notice says why, once.
  const ownRow = (issue: RowIssue) => unclosed !== undefined && issue.row === unclosed.row;
  const shapeIssues = facts.rowIssues.filter((issue) => issue.kind !== 'unclosed-quote' && !ownRow(issue));
  const shapeCount = facts.rowIssueCount - facts.rowIssues.filter((issue) => issue.kind === 'unclosed-quote' || ownRow(issue)).length;
  if (shapeCount > 0) notices.push(wrongFieldCounts(shapeIssues, shapeCount, facts.names));
  return notices;
}

function noDataRows(facts: ReadingFacts): ReadingNotice {
  return {
    tone: 'warning',
    title: `“${facts.fileName}” has a header row but no data rows`,
    detail: `Its ${formatCount(facts.names.length)} ${facts.names.length === 1 ? 'column is' : 'columns are'} listed, but there is nothing to look at or encode.`,
    hint: 'Check that the export included the rows, or open another file.',
  };
}

function renamedColumns(issues: readonly HeaderIssue[]): ReadingNotice {
  const listed = issues.slice(0, LISTED).map((issue) =>
    issue.kind === 'blank'
      ? `column ${issue.column + 1} has no name and is called “${issue.renamedTo}”`
      : `column ${issue.column + 1} repeats the name “${issue.original}” and is called “${issue.renamedTo}”`,
  );
  const more = issues.length > LISTED ? `; and ${formatCount(issues.length - LISTED)} more` : '';
  const n = issues.length;
  return {
    tone: 'warning',
    title: `${formatCount(n)} column ${n === 1 ? 'name was' : 'names were'} changed on line 1`,
    detail: `Every column needs a name of its own: ${listed.join('; ')}${more}.`,
    hint: 'The recipe uses the new names. Rename the columns in the file if you want others.',
  };
}

function unclosedQuote(issue: RowIssue, names: readonly string[]): ReadingNotice {
  return {
    tone: 'error',
    title: `A quote opened on line ${issue.line} is never closed`,
    detail:
      `Everything from line ${issue.line}, column ${issue.found}${columnName(names, issue.found)} to the end of the file was read as that one cell, ` +
      'so the rows after it are not in the table. Nothing was thrown away: the text is in that cell.',
    hint: `Look at the quotes on line ${issue.line}: a quote inside a quoted field is written twice (""). Fix the file and open it again.`,
  };
}

function wrongFieldCounts(issues: readonly RowIssue[], count: number, names: readonly string[]): ReadingNotice {
  const listed = issues.slice(0, LISTED).map((issue) => describeShape(issue, names));
  const more = count > listed.length ? ` And ${formatCount(count - listed.length)} more.` : '';
  return {
    tone: 'warning',
    title: `${formatCount(count)} ${count === 1 ? 'row has' : 'rows have'} the wrong number of fields`,
    detail: `${listed.join(' ')}${more}`,
    hint: 'Check the delimiters and quotes around those lines if the columns look shifted.',
  };
}

/** One row with too few or too many fields: where, and what was done. */
export function describeShape(issue: RowIssue, names: readonly string[]): string {
  if (issue.kind === 'too-few-fields') {
    const first = issue.found + 1;
    const span = first === issue.expected ? `column ${first}${columnName(names, first)} is` : `columns ${first} to ${issue.expected} are`;
    return `Line ${issue.line} has ${issue.found} of ${issue.expected} fields: ${span} empty (missing).`;
  }
  const extra = issue.extra ?? [];
  const shown = extra.slice(0, 3).map((cell) => `“${cell}”`).join(', ') + (extra.length > 3 ? ' …' : '');
  const cells = issue.found - issue.expected === 1 ? 'cell' : 'cells';
  return `Line ${issue.line} has ${issue.found} fields instead of ${issue.expected}: the extra ${cells} from column ${issue.expected + 1} (${shown}) ${cells === 'cell' ? 'is' : 'are'} kept aside, not encoded.`;
}

/** ` (“name”)` for a 1-based column position, when the table has a name there. */
function columnName(names: readonly string[], position: number): string {
  const name = names[position - 1];
  return name === undefined ? '' : ` (“${name}”)`;
}
