/**
 * levelwise check RECIPE FILE [--format text|json]
 *
 * The re-use report without writing anything: does FILE fit RECIPE? Exit 0 when it does; exit 1
 * with the list — missing columns, levels the recipe never saw (with counts and lines), values
 * that are not numbers, rows a policy would reject — when it does not.
 */
import type { ApplyReport, ValueTally } from '../../core/apply-report.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import { count, plural, READ_OPTIONS, readSettings } from '../common.ts';
import { EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { inputSource, readRecipe } from '../input.ts';
import { openOutput } from '../output.ts';
import { runRecipe, type Rejection } from '../run-recipe.ts';

const VERB = 'check';
const LISTED_VALUES = 10;
const LISTED_REJECTIONS = 10;

export async function checkVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [{ name: 'format', choices: ['text', 'json'] }, ...READ_OPTIONS]);
  const [recipePath = '', filePath = ''] = positionals(VERB, args, ['RECIPE', 'FILE']);
  if (recipePath === '-' && filePath === '-') throw usageFailure(VERB, 'the recipe and the file cannot both come from standard input.');
  const recipe = await readRecipe(recipePath);
  const source = await inputSource(filePath);
  const rejections: Rejection[] = [];
  const { report } = await runRecipe(recipe, source, readSettings(args, recipe.reading.delimiter), VERB, {
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
  const text = optionValue(args, 'format') === 'json' ? `${JSON.stringify(report, null, 2)}\n` : reportText(report, source.label, recipePath, rejections);
  output.write(text);
  await output.close();
  return report.fits ? EXIT.ok : EXIT.doesNotFit;
}

/** The report in lines a person reads top to bottom: the verdict, then what does not fit. */
export function reportText(report: ApplyReport, file: string, recipe: string, rejections: readonly Rejection[]): string {
  const lines: string[] = [];
  const columns = report.columns.length;
  if (report.fits) {
    lines.push(`"${file}" fits the recipe "${recipe}": ${plural(report.rows, 'row')}, ${plural(columns, 'encoded column')}.`);
  } else {
    lines.push(`"${file}" does not fit the recipe "${recipe}" (${plural(report.rows, 'row')} read).`);
  }
  if (report.missingColumns.length > 0) {
    lines.push(`Missing columns (their cells count as missing): ${report.missingColumns.join(', ')}`);
  }
  const unseen = report.columns.filter((c) => c.unseen.length > 0);
  if (unseen.length > 0) {
    lines.push('Levels the recipe never saw:');
    for (const c of unseen) lines.push(`  ${c.name} (${c.unseenAction}): ${tallyText(c.unseen)}`);
  }
  const invalid = report.columns.filter((c) => c.invalid.length > 0);
  if (invalid.length > 0) {
    lines.push('Values that are not numbers:');
    for (const c of invalid) lines.push(`  ${c.name} (${c.invalidAction}): ${tallyText(c.invalid)}`);
  }
  if (report.rowsRejected > 0) {
    lines.push(`Rows a policy "error" rejects: ${count(report.rowsRejected)}`);
    for (const r of rejections) lines.push(`  line ${r.line}, ${r.column}: ${r.reason}`);
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

function tallyText(tallies: readonly ValueTally[]): string {
  const shown = tallies.slice(0, LISTED_VALUES).map((t) => `"${t.value}" ×${count(t.count)} (line${t.lines.length > 1 ? 's' : ''} ${t.lines.join(', ')}${t.count > t.lines.length ? ', …' : ''})`);
  const more = tallies.length > LISTED_VALUES ? `, and ${plural(tallies.length - LISTED_VALUES, 'more value')}` : '';
  return shown.join(', ') + more;
}
