/**
 * levelwise apply RECIPE FILE [-o OUT] [--rejects FILE]
 *
 * Streams FILE through the recipe into an encoded CSV (the same bytes the page writes). Rows a
 * policy rejects are left out of the output and written, with their line and reason, to the
 * rejects file. Exit 1 when any row was rejected or a recipe column is missing from the file.
 */
import type { ApplyReport } from '../../core/apply-report.ts';
import { cellText, type Table } from '../../core/columns.ts';
import { textCell } from '../../core/csv-cell.ts';
import { createCsvWriter, LINE_END, type CsvWriter } from '../../core/csv-write.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import { count, note, OUTPUT_OPTION, plural, READ_OPTIONS, readSettings } from '../common.ts';
import { EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { inputSource, readRecipe } from '../input.ts';
import { openOutput, type Output } from '../output.ts';
import { runRecipe, type Rejection } from '../run-recipe.ts';

const VERB = 'apply';
/** Rejected rows shown on standard error when no rejects file was asked for. */
const SHOWN_REJECTIONS = 5;

export async function applyVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [OUTPUT_OPTION, { name: 'rejects' }, ...READ_OPTIONS]);
  const [recipePath = '', filePath = ''] = positionals(VERB, args, ['RECIPE', 'FILE']);
  if (recipePath === '-' && filePath === '-') throw usageFailure(VERB, 'the recipe and the file cannot both come from standard input.');
  const outputPath = optionValue(args, 'output');
  const rejectsPath = optionValue(args, 'rejects');
  const toStdout = outputPath === undefined || outputPath === '-';
  if (rejectsPath === '-' && toStdout) throw usageFailure(VERB, 'the output and the rejects cannot both go to standard output.', 'Give -o OUT or --rejects FILE a file name.');

  const recipe = await readRecipe(recipePath);
  const source = await inputSource(filePath);
  const output = openOutput(outputPath);
  const rejects = rejectsPath === undefined ? null : openOutput(rejectsPath);
  const shown: Rejection[] = [];
  let writer: CsvWriter | null = null;

  let result: Awaited<ReturnType<typeof runRecipe>>;
  try {
    result = await runRecipe(recipe, source, readSettings(args, recipe.reading.delimiter), VERB, {
      start(plan) {
        writer = createCsvWriter(plan, (bytes) => output.write(bytes));
        writer.writeHeader();
        rejects?.write(rejectsHeader(plan.header));
        shown.length = 0;
      },
      batch(_plan, encoded, table, rejections) {
        writer?.writeBatch(encoded);
        if (rejects !== null) for (const rejection of rejections) rejects.write(rejectsRow(table, rejection));
        for (const rejection of rejections) if (shown.length < SHOWN_REJECTIONS) shown.push(rejection);
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
  return reportOutcome(result.report, shown, rejects);
}

function rejectsHeader(names: readonly string[]): string {
  return ['levelwise_line', 'levelwise_column', 'levelwise_reason', ...names].map(textCell).join(',') + LINE_END;
}

/** The rejected row as the file had it, after its line, column at fault and reason. */
function rejectsRow(table: Table, rejection: Rejection): string {
  const cells = table.columns.map((column) => cellText(column, rejection.row));
  return [String(rejection.line), rejection.column, rejection.reason, ...cells].map(textCell).join(',') + LINE_END;
}

/** Notes on standard error about what did not fit; the exit code. */
function reportOutcome(report: ApplyReport, shown: readonly Rejection[], rejects: Output | null): ExitCode {
  if (report.missingColumns.length > 0) {
    note(VERB, `the file lacks ${plural(report.missingColumns.length, 'recipe column')} (${report.missingColumns.join(', ')}); their cells were treated as missing.`);
  }
  for (const column of report.columns) {
    const unseen = column.unseen.reduce((n, t) => n + t.count, 0);
    if (unseen > 0) note(VERB, `${column.name}: ${plural(unseen, 'cell')} with levels the recipe never saw (${listValues(column.unseen)}): ${column.unseenAction}.`);
    const invalid = column.invalid.reduce((n, t) => n + t.count, 0);
    if (invalid > 0) note(VERB, `${column.name}: ${plural(invalid, 'cell')} not a number (${listValues(column.invalid)}): ${column.invalidAction}.`);
  }
  if (report.rowsRejected > 0) {
    const where = rejects === null ? '' : `; all are in ${rejects.label}`;
    note(VERB, `${plural(report.rowsRejected, 'row')} rejected and left out of the output${where}.`);
    if (rejects === null) {
      for (const r of shown) note(VERB, `  line ${r.line}, ${r.column}: ${r.reason}`);
      if (report.rowsRejected > shown.length) note(VERB, `  … ${count(report.rowsRejected - shown.length)} more; write them all with --rejects FILE.`);
    }
  }
  return report.rowsRejected > 0 || report.missingColumns.length > 0 ? EXIT.doesNotFit : EXIT.ok;
}

function listValues(tallies: readonly { value: string; count: number }[]): string {
  const first = tallies.slice(0, 3).map((t) => `"${t.value}" ×${count(t.count)}`);
  return tallies.length > 3 ? `${first.join(', ')}, …` : first.join(', ');
}
