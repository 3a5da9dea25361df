/**
 * Rows whose fields do not line up with the header: too many fields (usually a delimiter inside an
 * unquoted cell, so every later value has shifted a column) or a quote never closed (the rest of
 * the file became one cell). Such a row cannot be encoded without guessing which cell belongs to
 * which column, so applying a recipe rejects it whole — in the page and on the command line alike —
 * and keeps its extra cells for the report. A row with too few fields is kept, its missing cells
 * empty (they count as missing values, and the reading notes say so).
 */
import type { RowIssue, Table } from './columns.ts';

export interface MisshapenRow {
  /** Row of the table (0-based). */
  readonly row: number;
  readonly line: number;
  /** The column where a quote opened and never closed; '' when the row as a whole is at fault. */
  readonly column: string;
  readonly reason: string;
  /** Cells after the header's last column, kept so nothing is lost. */
  readonly extra: readonly string[];
}

const SHOWN_EXTRA_CELLS = 3;

/** Rows [start, end) of `table` that must be rejected for their shape, in row order. */
export function misshapenRows(table: Table, start: number, end: number): MisshapenRow[] {
  const found = new Map<number, MisshapenRow>();
  for (const issue of table.rowIssues) {
    const reason = shapeReason(issue, table.names);
    if (reason === null) continue;
    const row = rowOfLine(table, issue.line);
    if (row < start || row >= end) continue;
    // An unclosed quote on a row that also had too many fields says more about what went wrong.
    if (found.has(row) && issue.kind !== 'unclosed-quote') continue;
    const column = issue.kind === 'unclosed-quote' ? (table.names[issue.found - 1] ?? '') : '';
    found.set(row, { row, line: issue.line, column, reason, extra: issue.extra ?? found.get(row)?.extra ?? [] });
  }
  return [...found.values()].sort((a, b) => a.row - b.row);
}

/** Why a row with this issue is rejected, or null when the issue does not reject it. */
export function shapeReason(issue: RowIssue, names: readonly string[]): string | null {
  if (issue.kind === 'too-many-fields') {
    const extra = issue.extra ?? [];
    const shown = extra.slice(0, SHOWN_EXTRA_CELLS).map(quoted).join(', ');
    const more = extra.length > SHOWN_EXTRA_CELLS ? `, and ${extra.length - SHOWN_EXTRA_CELLS} more` : '';
    const cells = `${extra.length === 1 ? 'cell' : 'cells'} from column ${issue.expected + 1} (${shown}${more})`;
    return `${issue.found} fields instead of ${issue.expected}: the extra ${cells} ${extra.length === 1 ? 'belongs' : 'belong'} to no column`;
  }
  if (issue.kind === 'unclosed-quote') {
    const name = names[issue.found - 1];
    const label = name === undefined ? String(issue.found) : `${issue.found} (${quoted(name)})`;
    return `a quote opened in column ${label} is never closed: that cell holds the rest of the file`;
  }
  return null;
}

/** The row that starts on `line` (lineOfRow is increasing), or -1. */
function rowOfLine(table: Table, line: number): number {
  let lo = 0;
  let hi = table.rowCount - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const at = table.lineOfRow[mid] ?? 0;
    if (at === line) return mid;
    if (at < line) lo = mid + 1;
    else hi = mid - 1;
  }
  return -1;
}

const SHOWN_TEXT = 60;

/** A cell on one line of a message: JSON-quoted, cut at 60 characters. */
function quoted(text: string): string {
  const cut = text.length > SHOWN_TEXT ? `${text.slice(0, SHOWN_TEXT)}…` : text;
  return JSON.stringify(cut).replace(/[\u007f-\u009f\u2028\u2029]/g, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
}
