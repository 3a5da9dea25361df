/**
 * A recipe over a file, batch by batch: the loop `apply` and `check` share. The plan is made when
 * the header is read; each batch is encoded with core's encodeBatch and handed on with the rows it
 * rejects (line, column, reason) in row order: the rows a policy "error" rejects, and the rows whose
 * fields do not line up with the header (too many fields, a quote never closed). Such a row cannot
 * be encoded without guessing which cell belongs to which column, so it is rejected whole, its
 * cells kept for the rejects file; a row with too few fields is kept, its missing cells empty.
 */
import { createApplyReport, type ApplyReport, type ApplyReportBuilder } from '../core/apply-report.ts';
import { encodeBatch, type EncodedBatch } from '../core/apply.ts';
import { BatchArrays } from '../core/batch-arrays.ts';
import type { Table } from '../core/columns.ts';
import { compilePlan, type Plan } from '../core/plan.ts';
import type { Recipe } from '../core/recipe.ts';
import { batchRows } from './common.ts';
import { readBatches, type InputSource, type ReadSettings, type ReadSummary } from './input.ts';
import { createProgress } from './progress.ts';
import { hasRowProblems } from './reading-findings.ts';

/** One rejected row of a batch: its row in the batch's table, file line, the column at fault and why. */
export interface Rejection {
  /** Row of the batch's table (for its cells). */
  readonly row: number;
  readonly line: number;
  /** The first column at fault; empty when the row as a whole is (too many fields). */
  readonly column: string;
  readonly reason: string;
  /** Cells after the header's last column (a row with too many fields), kept for the rejects file. */
  readonly extra: readonly string[];
}

export interface RecipeRunHooks {
  /** The header is known (again, after a restart); may throw to stop before anything is written. */
  start(plan: Plan): void;
  batch(plan: Plan, encoded: EncodedBatch, table: Table, rejections: readonly Rejection[]): void;
  /** After each chunk of input (e.g. wait for the output to drain). */
  afterChunk(): Promise<void>;
  /** May the run start over from row 0 (see BatchHandlers.restart)? */
  restart(): Promise<boolean>;
}

export interface RecipeRun {
  /**
   * Core's re-use report, with the rows rejected for their shape counted in (`rowsRejected`,
   * `rowsWritten`, `rejected`, after the policies' rejections) and `fits` false when any row did
   * not line up with the header or the file has no data rows.
   */
  readonly report: ApplyReport;
  readonly summary: ReadSummary;
}

export async function runRecipe(recipe: Recipe, source: InputSource, settings: ReadSettings, verb: string, hooks: RecipeRunHooks): Promise<RecipeRun> {
  let plan: Plan | null = null;
  // Each batch is written (or tallied) before the next is encoded: its arrays serve the next.
  const arrays = new BatchArrays();
  let report: ReturnType<typeof rejectionTee> | null = null;
  const progress = createProgress(`levelwise ${verb}`, source.size);
  try {
    const summary = await readBatches(source, settings, batchRows(), {
      onBatch(table, start, end, firstRow) {
        if (plan === null || report === null) {
          plan = compilePlan(recipe, table.names);
          report = rejectionTee(createApplyReport(plan));
          hooks.start(plan);
        }
        report.startBatch(firstRow);
        // Core rejects rows a policy refuses and rows whose fields do not line up with the header.
        const encoded = encodeBatch(plan, table, start, end, report, arrays);
        hooks.batch(plan, encoded, table, report.take());
      },
      async afterChunk(bytes, rows) {
        await hooks.afterChunk();
        progress.update(bytes, rows);
      },
      async restart() {
        plan = null;
        report = null;
        return hooks.restart();
      },
    });
    if (report === null) throw new Error('the reader handed over no batch');
    const core = (report as ReturnType<typeof rejectionTee>).finish();
    return {
      report: { ...core, fits: core.fits && !hasRowProblems(summary.findings) && core.rows > 0 },
      summary,
    };
  } finally {
    progress.done();
  }
}

/**
 * Passes every cell outcome on to the report, numbering rows from the start of the file (a batch's
 * table numbers them from its own start), and keeps the rejected rows of the current batch: the
 * report lists only the first MAX_REJECTED_LISTED, the rejects file needs them all.
 */
function rejectionTee(inner: ApplyReportBuilder): ApplyReportBuilder & { startBatch(firstRow: number): void; take(): Rejection[] } {
  let pending = new Map<number, Rejection>();
  let firstRowOfBatch = 0;
  return {
    startBatch(firstRow) {
      firstRowOfBatch = firstRow;
    },
    cell(columnPlan, row, line, text, outcome) {
      inner.cell(columnPlan, firstRowOfBatch + row, line, text, outcome);
      if (outcome.reject !== null && !pending.has(row)) pending.set(row, { row, line, column: columnPlan.recipe.name, reason: outcome.reject, extra: [] });
    },
    misshapen(row) {
      inner.misshapen({ ...row, row: firstRowOfBatch + row.row });
      const earlier = pending.get(row.row);
      pending.set(row.row, earlier ? { ...earlier, extra: row.extra } : { ...row });
    },
    rowsDone(rows, rejected) {
      inner.rowsDone(rows, rejected);
    },
    finish: () => inner.finish(),
    take() {
      const rows = [...pending.values()].sort((a, b) => a.row - b.row);
      pending = new Map();
      return rows;
    },
  };
}
