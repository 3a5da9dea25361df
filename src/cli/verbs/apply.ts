/**
 * levelwise apply RECIPE FILE [-o OUT] [--rejects FILE]
 *
 * Streams FILE through the recipe into an encoded CSV (the same bytes the page writes for a file
 * whose rows line up with its header). Rows a policy rejects, and rows whose fields do not line up
 * with the header (too many fields, a quote never closed), are left out of the output and written,
 * with their line, reason and every cell, to the rejects file. Exit 1 when any row was rejected or
 * had too few fields, or a recipe column is missing from the file. A recipe that makes no output
 * columns, or a file that lacks most of the recipe's columns, is refused before anything is written.
 */
import type { ApplyReport } from '../../core/apply-report.ts';
import { cellText, type Table } from '../../core/columns.ts';
import { textCell } from '../../core/csv-cell.ts';
import { createCsvWriter, LINE_END, type CsvWriter } from '../../core/csv-write.ts';
import type { Recipe } from '../../core/recipe.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import { count, note, OUTPUT_OPTION, plural, READ_OPTIONS, readSettings, tallyText } from '../common.ts';
import { CliFailure, EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { inputLabel, inputSource, readRecipe, type ReadSummary } from '../input.ts';
import { openOutput, type Output } from '../output.ts';
import { findingsLines, hasRowProblems } from '../reading-findings.ts';
import { foreignFile, foreignFileText } from '../recipe-match.ts';
import { runRecipe, type Rejection } from '../run-recipe.ts';

const VERB = 'apply';
/** Rejected rows, and rows with the wrong number of fields, shown on standard error. */
const SHOWN_ROWS = 5;
/** Values listed per column in a note on unseen levels or stray text. */
const SHOWN_VALUES = 3;

export async function applyVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [OUTPUT_OPTION, { name: 'rejects' }, ...READ_OPTIONS]);
  const [recipePath = '', filePath = ''] = positionals(VERB, args, ['RECIPE', 'FILE']);
  if (recipePath === '-' && filePath === '-') throw usageFailure(VERB, 'the recipe and the file cannot both come from standard input.');
  const outputPath = optionValue(args, 'output');
  const rejectsPath = optionValue(args, 'rejects');
  const toStdout = outputPath === undefined || outputPath === '-';
  if (rejectsPath === '-' && toStdout) throw usageFailure(VERB, 'the output and the rejects cannot both go to standard output.', 'Give -o OUT or --rejects FILE a file name.');

  const recipe = await readRecipe(recipePath);
  refuseRecipeWithoutOutputs(recipe, inputLabel(recipePath));
  const source = await inputSource(filePath);
  const output = openOutput(outputPath);
  const rejects = rejectsPath === undefined ? null : openOutput(rejectsPath);
  const shown: Rejection[] = [];
  let writer: CsvWriter | null = null;

  let result: Awaited<ReturnType<typeof runRecipe>>;
  try {
    result = await runRecipe(recipe, source, readSettings(args, recipe.reading.delimiter), VERB, {
      start(plan) {
        const mismatch = foreignFile(recipe, plan.header);
        if (mismatch !== null) {
          throw new CliFailure(
            `${foreignFileText(source.label, inputLabel(recipePath), recipe, plan.header, mismatch)} Nothing was written.`,
            `Choose the recipe made for this kind of file, or make one with "levelwise draft ${filePath === '-' ? 'FILE' : filePath}".`,
            EXIT.doesNotFit,
          );
        }
        writer = createCsvWriter(plan, (bytes) => output.write(bytes));
        writer.writeHeader();
        rejects?.write(rejectsHeader(plan.header));
        shown.length = 0;
      },
      batch(_plan, encoded, table, rejections) {
        writer?.writeBatch(encoded);
        if (rejects !== null) for (const rejection of rejections) rejects.write(rejectsRow(table, rejection));
        for (const rejection of rejections) if (shown.length < SHOWN_ROWS) shown.push(rejection);
      },
      async afterChunk() {
        await output.drained();
        await rejects?.drained();
      },
      async restart() {
        return (await output.restart()) && (rejects === null || (await rejects.restart()));
      },
    });
    (writer as CsvWriter | null)?.finish();
    await output.close();
    await rejects?.close();
  } catch (error) {
    await output.discard();
    await rejects?.discard();
    throw error;
  }
  return reportOutcome(result.report, result.summary, source.label, shown, rejects);
}

/** A recipe whose every column is excluded would write lines with nothing on them. */
function refuseRecipeWithoutOutputs(recipe: Recipe, label: string): void {
  if (recipe.columns.some((c) => c.outputs.length > 0)) return;
  const why = recipe.columns.length === 0 ? 'it has no columns' : `all ${plural(recipe.columns.length, 'column')} in it are excluded`;
  throw new CliFailure(
    `the recipe "${label}" makes no output columns: ${why}, so the output would hold only empty lines. Nothing was written.`,
    'Give at least one column a level (levelwise draft FILE --set COLUMN=LEVEL), or choose another recipe.',
  );
}

function rejectsHeader(names: readonly string[]): string {
  return ['levelwise_line', 'levelwise_column', 'levelwise_reason', ...names].map(textCell).join(',') + LINE_END;
}

/** The rejected row as the file had it — every cell, those past the header's last column too — after its line, column at fault and reason. */
function rejectsRow(table: Table, rejection: Rejection): string {
  const cells = table.columns.map((column) => cellText(column, rejection.row));
  return [String(rejection.line), rejection.column, rejection.reason, ...cells, ...rejection.extra].map(textCell).join(',') + LINE_END;
}

/** Notes on standard error about what did not fit, reading problems first; the exit code. */
function reportOutcome(report: ApplyReport, summary: ReadSummary, label: string, shown: readonly Rejection[], rejects: Output | null): ExitCode {
  for (const line of findingsLines(label, summary.names, summary.findings, VERB, SHOWN_ROWS)) note(VERB, line);
  if (report.rows === 0) note(VERB, `"${label}" has a header but no data rows: the output holds only the header line.`);
  if (report.missingColumns.length > 0) {
    note(VERB, `the file lacks ${plural(report.missingColumns.length, 'recipe column')} (${report.missingColumns.join(', ')}); their cells were treated as missing.`);
  }
  for (const column of report.columns) {
    const unseen = column.unseen.reduce((n, t) => n + t.count, 0);
    if (unseen > 0) note(VERB, `${column.name}: ${plural(unseen, 'cell')} with levels the recipe never saw, ${column.unseenAction}: ${tallyText(column.unseen, SHOWN_VALUES)}.`);
    const invalid = column.invalid.reduce((n, t) => n + t.count, 0);
    if (invalid > 0) note(VERB, `${column.name}: ${plural(invalid, 'cell')} not a number, ${column.invalidAction}: ${tallyText(column.invalid, SHOWN_VALUES)}.`);
  }
  if (report.rowsRejected > 0) {
    const where = rejects === null ? '' : `; all are in ${rejects.label}, with every cell`;
    note(VERB, `${plural(report.rowsRejected, 'row')} rejected and left out of the output${where}.`);
    if (rejects === null) {
      for (const r of shown) note(VERB, `  line ${r.line}${r.column === '' ? '' : `, ${r.column}`}: ${r.reason}`);
      if (report.rowsRejected > shown.length) note(VERB, `  … ${count(report.rowsRejected - shown.length)} more; write them all with --rejects FILE.`);
    }
  }
  const fits = report.rowsRejected === 0 && report.missingColumns.length === 0 && !hasRowProblems(summary.findings);
  return fits ? EXIT.ok : EXIT.doesNotFit;
}
