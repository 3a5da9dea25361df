/**
 * What reading a file found besides its rows: column names changed to stay unique and non-blank,
 * rows with too few or too many fields, a quote never closed. Core records each one (RowIssue,
 * HeaderIssue) in the tables it hands over; this file gathers them across batches and says them in
 * lines a person reads — what is wrong, where (line and column), and what was done about it — so
 * that nothing is changed or left out without a word.
 */
import { shapeReason } from '../core/row-shape.ts';
import type { HeaderIssue, RowIssue } from '../core/columns.ts';
import { count, plural, quoted } from './common.ts';

/** Rows with the wrong number of fields kept for listing (JSON gets them all, text the first few). */
export const KEPT_ROW_ISSUES = 20;
/** Renamed columns listed in a note; the rest are counted. */
const LISTED_RENAMES = 3;
/** Extra cells of one row shown in a note or a reason; the rest are counted. */
const SHOWN_EXTRA_CELLS = 3;

export interface ReadingFindings {
  readonly headerIssues: readonly HeaderIssue[];
  /** Rows with fewer fields than the header: kept, the missing cells empty. */
  readonly tooFewFields: number;
  /** Rows with more fields than the header. */
  readonly tooManyFields: number;
  /** The row whose quote is never closed (its last cell runs to the end of the file), if any. */
  readonly unclosedQuote: RowIssue | null;
  /** The first KEPT_ROW_ISSUES rows with too few or too many fields, in file order. */
  readonly rowIssues: readonly RowIssue[];
}

export const NO_FINDINGS: ReadingFindings = { headerIssues: [], tooFewFields: 0, tooManyFields: 0, unclosedQuote: null, rowIssues: [] };

/** True when the file's rows do not line up with its header somewhere. */
export function hasRowProblems(findings: ReadingFindings): boolean {
  return findings.tooFewFields + findings.tooManyFields > 0 || findings.unclosedQuote !== null;
}

/**
 * One issue per row: a row whose quote is never closed also comes up short (or long) of fields;
 * the quote is the reason, so it is told once, as the quote. Core reports a row's issues one after
 * the other.
 */
export function issuesByRow(issues: readonly RowIssue[]): RowIssue[] {
  const rows: RowIssue[] = [];
  for (const issue of issues) {
    const last = rows.at(-1);
    if (last !== undefined && last.row === issue.row) {
      if (issue.kind === 'unclosed-quote') rows[rows.length - 1] = issue;
    } else {
      rows.push(issue);
    }
  }
  return rows;
}

/** Gathers the findings of each table handed over (a batch, or the whole file). */
export function createFindingsLog(): { add(rowIssues: readonly RowIssue[], headerIssues: readonly HeaderIssue[]): void; findings(): ReadingFindings } {
  const headerIssues: HeaderIssue[] = [];
  const rowIssues: RowIssue[] = [];
  let tooFewFields = 0;
  let tooManyFields = 0;
  let unclosedQuote: RowIssue | null = null;
  return {
    add(issues, header) {
      headerIssues.push(...header);
      for (const issue of issuesByRow(issues)) {
        if (issue.kind === 'unclosed-quote') {
          unclosedQuote = issue;
          continue;
        }
        if (issue.kind === 'too-few-fields') tooFewFields++;
        else tooManyFields++;
        if (rowIssues.length < KEPT_ROW_ISSUES) rowIssues.push(issue);
      }
    },
    findings: () => ({ headerIssues, tooFewFields, tooManyFields, unclosedQuote, rowIssues }),
  };
}

/** What the verb did with what it read; the notes say it in these terms. */
export type Treatment = 'profile' | 'draft' | 'apply' | 'check';

const EXTRA_CELLS_DONE: Record<Treatment, string> = {
  profile: 'they are not part of any column, so they are left out of the profile',
  draft: 'they are not part of any column, so the recipe does not learn from them',
  apply: 'the row is rejected and left out of the output',
  check: '"levelwise apply" rejects the row',
};

const UNCLOSED_DONE: Record<Treatment, string> = {
  profile: '',
  draft: '',
  apply: ' That row is rejected and left out of the output.',
  check: ' "levelwise apply" rejects that row.',
};

/**
 * The findings in lines, without the "levelwise VERB:" prefix: each problem's headline, then the
 * first `listed` rows indented by two spaces, then how many more.
 */
export function findingsLines(label: string, names: readonly string[], findings: ReadingFindings, treatment: Treatment, listed: number): string[] {
  const lines: string[] = [];
  if (findings.headerIssues.length > 0) lines.push(renamedColumnsLine(label, findings.headerIssues));
  const shapes = findings.tooFewFields + findings.tooManyFields;
  if (shapes > 0) {
    lines.push(
      `"${label}": ${shapes === 1 ? '1 row does' : `${count(shapes)} rows do`} not have the ${plural(names.length, 'field')} of the header line. ` +
        'Check the delimiter and the quotes on those lines.',
    );
    const shown = findings.rowIssues.slice(0, listed);
    for (const issue of shown) lines.push(`  ${describeRowShape(issue, names, treatment)}`);
    if (shapes > shown.length) {
      const few = findings.tooFewFields - shown.filter((i) => i.kind === 'too-few-fields').length;
      const many = findings.tooManyFields - shown.filter((i) => i.kind === 'too-many-fields').length;
      const kinds = [few > 0 ? `${count(few)} with too few fields` : '', many > 0 ? `${count(many)} with too many` : ''].filter((k) => k !== '');
      lines.push(`  … and ${count(shapes - shown.length)} more (${kinds.join(', ')})`);
    }
  }
  if (findings.unclosedQuote !== null) lines.push(unclosedQuoteLine(label, findings.unclosedQuote, names, treatment));
  return lines;
}

/** "line 2: 2 of 3 fields: kept, with column 3 ("amount") empty (missing)" */
export function describeRowShape(issue: RowIssue, names: readonly string[], treatment: Treatment): string {
  if (issue.kind === 'too-few-fields') {
    const first = issue.found + 1;
    const span = first === issue.expected ? `column ${columnLabel(names, first)}` : `columns ${columnLabel(names, first)} to ${columnLabel(names, issue.expected)}`;
    return `line ${issue.line}: ${issue.found} of ${issue.expected} fields: kept, with ${span} empty (missing)`;
  }
  return `line ${issue.line}: ${issue.found} fields instead of ${issue.expected}: the extra ${extraCellsText(issue)}; ${EXTRA_CELLS_DONE[treatment]}`;
}

/** Why `apply` rejects a row for its shape (the rejects file's reason), or null when it keeps it. */
export function shapeRejectionReason(issue: RowIssue, names: readonly string[]): string | null {
  return shapeReason(issue, names);
}

/** 'cells from column 4 ("x", "y")' */
function extraCellsText(issue: RowIssue): string {
  const extra = issue.extra ?? [];
  const shown = extra.slice(0, SHOWN_EXTRA_CELLS).map(quoted).join(', ');
  const more = extra.length > SHOWN_EXTRA_CELLS ? `, and ${count(extra.length - SHOWN_EXTRA_CELLS)} more` : '';
  return `${extra.length === 1 ? 'cell' : 'cells'} from column ${issue.expected + 1} (${shown}${more})`;
}

function unclosedQuoteLine(label: string, issue: RowIssue, names: readonly string[], treatment: Treatment): string {
  return (
    `"${label}" line ${issue.line}: a quote opened in column ${columnLabel(names, issue.found)} is never closed: everything from there to the end ` +
    `of the file was read as that one cell, so the lines after it are not rows.${UNCLOSED_DONE[treatment]} ` +
    `Look at the quotes on line ${issue.line}: a quote inside a quoted cell is written twice ("").`
  );
}

function renamedColumnsLine(label: string, issues: readonly HeaderIssue[]): string {
  const listed = issues.slice(0, LISTED_RENAMES).map((issue) =>
    issue.kind === 'blank'
      ? `column ${issue.column + 1} has no name and is called "${issue.renamedTo}"`
      : `column ${issue.column + 1} repeats the name "${issue.original}" and is called "${issue.renamedTo}"`,
  );
  const more = issues.length > LISTED_RENAMES ? `; and ${count(issues.length - LISTED_RENAMES)} more` : '';
  const n = issues.length;
  return (
    `"${label}" line 1: ${n === 1 ? '1 column name was' : `${count(n)} column names were`} changed so that every column has a name of its own: ` +
    `${listed.join('; ')}${more}. A recipe uses the new names; rename the columns in the file if you want others.`
  );
}

/** '3 ("amount")' for a 1-based column position, with the name when the header has one there. */
function columnLabel(names: readonly string[], position: number): string {
  const name = names[position - 1];
  return name === undefined ? String(position) : `${position} (${quoted(name)})`;
}
