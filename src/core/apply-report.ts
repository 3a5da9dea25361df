/**
 * The re-use report: what happened when a recipe met a file. Missing and extra columns, unseen
 * levels with counts and example lines, values that did not read as numbers, what each missing
 * policy did, and every rejected row. Nothing is dropped without appearing here.
 */
import type { ColumnPlan, LevelResolution, NumberResolution, Plan } from './plan.ts';
import { MISSING_LEVEL } from './fit.ts';
import type { MisshapenRow } from './row-shape.ts';

/** A value met in the file, how often, and the first lines it was on. */
export interface ValueTally {
  readonly value: string;
  readonly count: number;
  /** 1-based file lines of the first few occurrences. */
  readonly lines: readonly number[];
}

export interface ColumnReport {
  readonly name: string;
  readonly level: string;
  /** False when the file lacks the column (all its cells counted as missing). */
  readonly present: boolean;
  readonly missing: number;
  /** What the missing policy did, in words. */
  readonly missingAction: string;
  readonly unseen: readonly ValueTally[];
  readonly unseenAction: string;
  readonly invalid: readonly ValueTally[];
  readonly invalidAction: string;
}

export interface RejectedRow {
  readonly row: number;
  readonly line: number;
  readonly column: string;
  readonly reason: string;
}

export interface ApplyReport {
  readonly rows: number;
  readonly rowsWritten: number;
  readonly rowsRejected: number;
  readonly missingColumns: readonly string[];
  readonly extraColumns: readonly string[];
  readonly columns: readonly ColumnReport[];
  /** The first MAX_REJECTED_LISTED rejected rows; `rowsRejected` counts them all. */
  readonly rejected: readonly RejectedRow[];
  /** True when the file fits the recipe: no missing column, no unseen level, no invalid number, no rejected row. */
  readonly fits: boolean;
}

export const EXAMPLE_LINES = 5;
export const MAX_REJECTED_LISTED = 1000;

interface Tally {
  count: number;
  lines: number[];
}

export interface ApplyReportBuilder {
  cell(plan: ColumnPlan, row: number, line: number, text: string, outcome: LevelResolution | NumberResolution): void;
  /** A row rejected for its shape; called even when a policy rejected it already. */
  misshapen(row: MisshapenRow): void;
  rowsDone(rows: number, rejected: number): void;
  finish(): ApplyReport;
}

export function createApplyReport(plan: Plan): ApplyReportBuilder {
  const missing = new Map<string, number>();
  const unseen = new Map<string, Map<string, Tally>>();
  const invalid = new Map<string, Map<string, Tally>>();
  const rejected: RejectedRow[] = [];
  const rejectedRows = new Set<number>();
  /**
   * The current batch's rejected rows. A batch is encoded column by column, so they arrive in
   * column order; they join the list in row order once the batch is done.
   */
  let batchRejected: RejectedRow[] = [];
  let rows = 0;
  let rowsRejected = 0;

  const listBatchRejected = (): void => {
    batchRejected.sort((a, b) => a.row - b.row);
    for (const row of batchRejected) if (rejected.length < MAX_REJECTED_LISTED) rejected.push(row);
    batchRejected = [];
  };

  const tally = (byColumn: Map<string, Map<string, Tally>>, column: string, value: string, line: number): void => {
    let values = byColumn.get(column);
    if (!values) byColumn.set(column, (values = new Map()));
    let t = values.get(value);
    if (!t) values.set(value, (t = { count: 0, lines: [] }));
    t.count++;
    if (t.lines.length < EXAMPLE_LINES) t.lines.push(line);
  };

  return {
    cell(columnPlan, row, line, text, outcome) {
      const name = columnPlan.recipe.name;
      if (outcome.missing && !('invalid' in outcome && outcome.invalid)) missing.set(name, (missing.get(name) ?? 0) + 1);
      if ('unseen' in outcome && outcome.unseen) tally(unseen, name, text, line);
      if ('invalid' in outcome && outcome.invalid) tally(invalid, name, text, line);
      if (outcome.reject !== null && !rejectedRows.has(row)) {
        rejectedRows.add(row);
        if (rejected.length < MAX_REJECTED_LISTED) batchRejected.push({ row, line, column: name, reason: outcome.reject });
      }
    },
    misshapen({ row, line, column, reason }) {
      if (rejectedRows.has(row)) return;
      rejectedRows.add(row);
      if (rejected.length < MAX_REJECTED_LISTED) batchRejected.push({ row, line, column, reason });
    },
    rowsDone(count, rejectedCount) {
      rows += count;
      rowsRejected += rejectedCount;
      rejectedRows.clear();
      listBatchRejected();
    },
    finish() {
      listBatchRejected();
      const columns = plan.columns
        .filter((c) => c.kind === 'categorical' || c.kind === 'continuous')
        .map((c): ColumnReport => ({
          name: c.recipe.name,
          level: c.recipe.level,
          present: c.source !== -1,
          missing: missing.get(c.recipe.name) ?? 0,
          missingAction: missingAction(c),
          unseen: tallies(unseen.get(c.recipe.name)),
          unseenAction: c.kind === 'categorical' ? unseenAction(c) : '',
          invalid: tallies(invalid.get(c.recipe.name)),
          invalidAction: c.kind === 'continuous' ? (c.column.invalid === 'error' ? 'rows rejected' : `treated as missing (${missingAction(c)})`) : '',
        }));
      const fits =
        plan.missingColumns.length === 0 && rowsRejected === 0 && columns.every((c) => c.unseen.length === 0 && c.invalid.length === 0);
      return {
        rows,
        rowsWritten: rows - rowsRejected,
        rowsRejected,
        missingColumns: plan.missingColumns,
        extraColumns: plan.extraColumns,
        columns,
        rejected,
        fits,
      };
    },
  };
}

function tallies(values: Map<string, Tally> | undefined): ValueTally[] {
  if (!values) return [];
  return [...values].map(([value, t]) => ({ value, count: t.count, lines: t.lines })).sort((a, b) => b.count - a.count);
}

function missingAction(plan: ColumnPlan): string {
  if (plan.kind === 'continuous') {
    const { policy } = plan.column.missing;
    const fitted = plan.column.fitted;
    if (policy === 'mean') return `filled with the fitted mean ${fitted.mean}`;
    if (policy === 'median') return `filled with the fitted median ${fitted.median}`;
    if (policy === 'zero') return 'filled with 0';
    return 'rows rejected';
  }
  if (plan.kind !== 'categorical') return '';
  switch (plan.column.missing.policy) {
    case 'level':
      return `encoded as the level "${MISSING_LEVEL}"`;
    case 'most-frequent':
      return 'encoded as the most frequent level';
    case 'zeros':
      return 'all output columns 0';
    case 'error':
      return 'rows rejected';
  }
}

function unseenAction(plan: ColumnPlan): string {
  if (plan.kind !== 'categorical') return '';
  switch (plan.column.unseen) {
    case 'zeros':
      return 'all output columns 0';
    case 'other':
      return `encoded as "${plan.column.otherLabel}"`;
    case 'error':
      return 'rows rejected';
  }
}
