/**
 * levelwise check RECIPE FILE [--format text|json]
 *
 * The re-use report without writing anything: does FILE fit RECIPE? Exit 0 when it does; exit 1
 * with the list — a file of another kind, rows whose fields do not line up with the header, missing
 * columns, levels the recipe never saw (with counts and lines), values that are not numbers, rows
 * `apply` would reject, a header with no data rows — when it does not.
 */
import type { ApplyReport } from '../../core/apply-report.ts';
import type { Recipe } from '../../core/recipe.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import { count, plural, READ_OPTIONS, readSettings, tallyText } from '../common.ts';
import { EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { inputLabel, inputSource, readRecipe, type ReadSummary } from '../input.ts';
import { openOutput } from '../output.ts';
import { findingsLines } from '../reading-findings.ts';
import { foreignFile, foreignFileText } from '../recipe-match.ts';
import { runRecipe, type Rejection } from '../run-recipe.ts';

const VERB = 'check';
const LISTED_VALUES = 10;
const LISTED_REJECTIONS = 10;
/** Rows with the wrong number of fields listed in the report. */
const LISTED_ROW_ISSUES = 10;

export async function checkVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [{ name: 'format', choices: ['text', 'json'] }, ...READ_OPTIONS]);
  const [recipePath = '', filePath = ''] = positionals(VERB, args, ['RECIPE', 'FILE']);
  if (recipePath === '-' && filePath === '-') throw usageFailure(VERB, 'the recipe and the file cannot both come from standard input.');
  const recipe = await readRecipe(recipePath);
  const source = await inputSource(filePath);
  const rejections: Rejection[] = [];
  const { report, summary } = await runRecipe(recipe, source, readSettings(args, recipe.reading.delimiter), VERB, {
    start() {
      rejections.length = 0;
    },
    batch(_plan, _encoded, _table, batchRejections) {
      for (const r of batchRejections) if (rejections.length < LISTED_REJECTIONS) rejections.push(r);
    },
    async afterChunk() {},
    async restart() {
      return true;
    },
  });
  const output = openOutput(undefined);
  const text =
    optionValue(args, 'format') === 'json'
      ? `${JSON.stringify({ ...report, findings: summary.findings }, null, 2)}\n`
      : reportText(report, summary, { file: source.label, recipe: inputLabel(recipePath), recipeDocument: recipe }, rejections);
  output.write(text);
  await output.close();
  return report.fits ? EXIT.ok : EXIT.doesNotFit;
}

export interface CheckedPair {
  /** How the file and the recipe were named on the command line. */
  readonly file: string;
  readonly recipe: string;
  readonly recipeDocument: Recipe;
}

/** The report in lines a person reads top to bottom: the verdict, then what does not fit. */
export function reportText(report: ApplyReport, summary: ReadSummary, pair: CheckedPair, rejections: readonly Rejection[]): string {
  const { file, recipe } = pair;
  const lines: string[] = [];
  const columns = report.columns.length;
  if (report.fits) {
    lines.push(`"${file}" fits the recipe "${recipe}": ${plural(report.rows, 'row')}, ${plural(columns, 'encoded column')}.`);
  } else {
    lines.push(`"${file}" does not fit the recipe "${recipe}" (${plural(report.rows, 'row')} read).`);
  }
  const mismatch = foreignFile(pair.recipeDocument, summary.names);
  if (mismatch !== null) lines.push(`${foreignFileText(file, recipe, pair.recipeDocument, summary.names, mismatch)} Is it the right recipe for this file?`);
  if (report.rows === 0) lines.push(`"${file}" has a header but no data rows: there is nothing to check.`);
  lines.push(...findingsLines(file, summary.names, summary.findings, VERB, LISTED_ROW_ISSUES));
  if (report.missingColumns.length > 0) {
    lines.push(`Missing columns (their cells count as missing): ${report.missingColumns.join(', ')}`);
  }
  const unseen = report.columns.filter((c) => c.unseen.length > 0);
  if (unseen.length > 0) {
    lines.push('Levels the recipe never saw:');
    for (const c of unseen) lines.push(`  ${c.name} (${c.unseenAction}): ${tallyText(c.unseen, LISTED_VALUES)}`);
  }
  const invalid = report.columns.filter((c) => c.invalid.length > 0);
  if (invalid.length > 0) {
    lines.push('Values that are not numbers:');
    for (const c of invalid) lines.push(`  ${c.name} (${c.invalidAction}): ${tallyText(c.invalid, LISTED_VALUES)}`);
  }
  if (report.rowsRejected > 0) {
    lines.push(`Rows "levelwise apply" rejects: ${count(report.rowsRejected)}`);
    for (const r of rejections) lines.push(`  line ${r.line}${r.column === '' ? '' : `, ${r.column}`}: ${r.reason}`);
    if (report.rowsRejected > rejections.length) lines.push(`  … ${count(report.rowsRejected - rejections.length)} more`);
  }
  const missing = report.columns.filter((c) => c.missing > 0);
  if (missing.length > 0) {
    lines.push('Missing values (handled by the recipe):');
    for (const c of missing) lines.push(`  ${c.name}: ${count(c.missing)}, ${c.missingAction}`);
  }
  if (report.extraColumns.length > 0) lines.push(`Columns the recipe does not use (left out): ${report.extraColumns.join(', ')}`);
  return `${lines.join('\n')}\n`;
}
