/**
 * levelwise draft FILE [-o RECIPE] [--set column=level[:coding]]... [--numbers column=example]...
 *   [--reference column=level]... [--positive column=level]... [--order column=a,b,c]...
 *   [--keep-top column=N]... [--naming readable|safe] [--missing spelling]... [--not-missing spelling]...
 *
 * Profiles FILE, proposes a recipe (core's draftRecipe) and applies the person's choices as core
 * decisions (decide), the same decisions the page makes. The options are applied in a fixed order:
 * --set, --numbers, --keep-top, --order, --reference, --positive, --naming. A file with a header but no data
 * rows is refused: there is nothing to learn from.
 */
import type { Decision } from '../../core/decisions.ts';
import { decide } from '../../core/decisions.ts';
import { isLevelwiseError } from '../../core/errors.ts';
import { draftRecipe, numbersInFormat } from '../../core/fit.ts';
import { formatFromExample } from '../../core/numbers.ts';
import { sensitiveAttributeCaution } from '../../core/infer.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { stringifyRecipe } from '../../core/recipe-io.ts';
import { LEVELS, type ColumnRecipe, type ContinuousColumn, type MeasurementLevel, type NumberFormat, type Recipe } from '../../core/recipe.ts';
import { optionValue, parseArgs, positionals, type ParsedArgs } from '../args.ts';
import { count, note, OUTPUT_OPTION, plural, READ_OPTIONS, readSettings } from '../common.ts';
import { CliFailure, EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { inputSource, readWholeTable } from '../input.ts';
import { openOutput } from '../output.ts';
import { findingsLines } from '../reading-findings.ts';
import { MISSING_OPTIONS, missingSpellings, outnumberingNotes } from '../missing-spellings.ts';

const VERB = 'draft';
/** Rows with the wrong number of fields shown on standard error. */
const SHOWN_ROWS = 5;

/** The codings --set accepts after the level, per level (continuous: its scaling). */
export const CODINGS: Partial<Record<MeasurementLevel, readonly string[]>> = {
  nominal: ['one-hot', 'dummy', 'effect', 'frequency'],
  ordinal: ['rank', 'scores', 'cumulative'],
  continuous: ['none', 'z-score', 'min-max'],
};

export async function draftVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [
    OUTPUT_OPTION,
    { name: 'set', repeatable: true },
    { name: 'numbers', repeatable: true },
    { name: 'reference', repeatable: true },
    { name: 'positive', repeatable: true },
    { name: 'order', repeatable: true },
    { name: 'keep-top', repeatable: true },
    { name: 'naming', choices: ['readable', 'safe'] },
    ...MISSING_OPTIONS,
    ...READ_OPTIONS,
  ]);
  const [filePath = ''] = positionals(VERB, args, ['FILE']);
  const missingTokens = missingSpellings(VERB, args);
  const source = await inputSource(filePath);
  const settings = readSettings(args);
  const { table, summary, profiles } = await readWholeTable(source, settings, { missingTokens });
  if (summary.rows === 0) {
    throw new CliFailure(
      `cannot draft a recipe from "${source.label}": it has a header but no data rows, so there is nothing to learn levels or numbers from. Nothing was written.`,
      'Check that the export included the rows, or choose a file with data rows.',
    );
  }
  for (const line of findingsLines(source.label, summary.names, summary.findings, VERB, SHOWN_ROWS)) note(VERB, line);
  for (const line of outnumberingNotes(profiles)) note(VERB, line);
  const drafted = draftRecipe(profiles, { file: source.fileName, rows: table.rowCount }, { delimiter: settings.delimiter, missingTokens });
  const recipe = applyChoices(drafted, args, profiles);

  for (const column of recipe.columns) {
    const caution = column.level === 'excluded' ? null : sensitiveAttributeCaution(column.name);
    if (caution !== null) note(VERB, `caution: ${caution}.`);
  }
  if (recipe.columns.every((c) => c.outputs.length === 0)) {
    note(
      VERB,
      'the recipe makes no output columns: every column is excluded ("levelwise profile" says why, column by column). ' +
        '"levelwise apply" refuses such a recipe; give columns a level with --set COLUMN=LEVEL.',
    );
  }
  const output = openOutput(optionValue(args, 'output'));
  output.write(stringifyRecipe(recipe));
  await output.close();
  if (process.stderr.isTTY && output.label !== 'standard output') {
    const outputs = recipe.columns.reduce((n, c) => n + c.outputs.length, 0);
    note(VERB, `wrote ${output.label}: ${plural(recipe.columns.length, 'column')} → ${plural(outputs, 'output column')}.`);
  }
  return EXIT.ok;
}

/** Every option turned into decisions, each checked against the recipe so far. */
export function applyChoices(start: Recipe, args: ParsedArgs, profiles: readonly ColumnProfile[]): Recipe {
  let recipe = start;
  const names = start.columns.map((c) => c.name);
  const apply = (decision: Decision) => {
    recipe = decide(recipe, decision, profiles);
  };
  const each = (option: string, visit: (column: string, value: string, given: string) => void) => {
    for (const given of args.options.get(option) ?? []) {
      const { column, value } = splitColumnValue(option, given, names);
      visit(column, value, given);
    }
  };

  // The number formats first: a column whose numbers only read in its own format ("12 kg") may be made continuous.
  const formats = new Map<string, { format: NumberFormat; given: string }>();
  each('numbers', (column, value, given) => {
    const format = formatFromExample(value);
    if (format === null) {
      throw usageFailure(
        VERB,
        `--numbers ${given}: "${value}" is not the number 1234.5 written in some format.`,
        `Write one thousand two hundred thirty-four and a half the way the column writes its numbers, e.g. --numbers ${column}="1.234,5" or --numbers ${column}="€ 1,234.50" or --numbers ${column}="1234.5 %".`,
      );
    }
    formats.set(column, { format, given });
  });

  each('set', (column, value, given) => {
    const [level = '', coding, ...rest] = value.split(':');
    if (!(LEVELS as readonly string[]).includes(level) || rest.length > 0) {
      throw usageFailure(VERB, `--set ${given}: "${level}" is not a level of measurement.`, `Use one of ${LEVELS.join(', ')}, e.g. --set region=nominal:dummy.`);
    }
    // As in the page, which offers continuous only for a column with numbers in it.
    const profile = profiles.find((p) => p.name === column);
    const chosen = formats.get(column)?.format;
    const numbers = profile === undefined ? null : chosen === undefined ? profile.numeric : numbersInFormat(profile, chosen);
    if (level === 'continuous' && numbers === null) {
      throw usageFailure(
        VERB,
        `--set ${given}: no value of "${column}" reads as a number${chosen === undefined ? '' : ' in the format --numbers gives'}, so it cannot be continuous.`,
        `See its values with "levelwise profile FILE"; for numbers written with a sign the draft does not find ("≈12"), show it with --numbers ${column}="≈1234.5".`,
      );
    }
    apply({ type: 'set-level', column, level: level as MeasurementLevel });
    if (coding !== undefined) apply(codingDecision(column, level as MeasurementLevel, coding, given));
  });
  for (const [column, { format, given }] of formats) {
    const current = columnNamed(recipe, column);
    if (current.level !== 'continuous') throw notLevel('--numbers', given, current, 'continuous');
    try {
      apply({ type: 'set-number-format', column, format });
    } catch (error) {
      if (isLevelwiseError(error)) throw usageFailure(VERB, `--numbers ${given}: ${error.message}`, error.hint);
      throw error;
    }
    const read = (columnNamed(recipe, column) as ContinuousColumn).fitted.count;
    const detected = profiles.find((p) => p.name === column)?.numeric?.count ?? 0;
    if (read < detected) note(VERB, `--numbers ${given}: only ${count(read)} values read as numbers in this format, against ${count(detected)} in the format detected.`);
  }
  each('keep-top', (column, value, given) => {
    const current = columnNamed(recipe, column);
    const n = Number(value);
    if (current.level !== 'nominal') throw notLevel('--keep-top', given, current, 'nominal');
    if (!Number.isSafeInteger(n) || n < 1) throw usageFailure(VERB, `--keep-top ${given}: "${value}" is not a whole number of at least 1.`);
    apply({ type: 'set-rare', column, rare: { ...current.rare, keepTop: n } });
  });
  each('order', (column, value, given) => {
    const current = columnNamed(recipe, column);
    if (current.level !== 'ordinal') throw notLevel('--order', given, current, 'ordinal');
    const order = splitList(value);
    requireLevels('--order', given, current, order);
    apply({ type: 'set-order', column, order });
  });
  each('reference', (column, value, given) => {
    const current = columnNamed(recipe, column);
    if (current.level !== 'nominal') throw notLevel('--reference', given, current, 'nominal');
    requireLevels('--reference', given, current, [value]);
    apply({ type: 'set-reference', column, reference: value });
  });
  each('positive', (column, value, given) => {
    const current = columnNamed(recipe, column);
    if (current.level !== 'binary') throw notLevel('--positive', given, current, 'binary');
    requireLevels('--positive', given, current, [value]);
    apply({ type: 'set-positive', column, positive: value });
  });
  const naming = optionValue(args, 'naming');
  if (naming === 'readable' || naming === 'safe') apply({ type: 'set-naming', naming });
  return recipe;
}

function codingDecision(column: string, level: MeasurementLevel, coding: string, given: string): Decision {
  const allowed = CODINGS[level];
  if (allowed === undefined || !allowed.includes(coding)) {
    const hint = allowed === undefined ? `A ${level} column has no coding to choose; write --set ${column}=${level}.` : `For ${level} use one of ${allowed.join(', ')}.`;
    throw usageFailure(VERB, `--set ${given}: "${coding}" is not a coding of a ${level} column.`, hint);
  }
  if (level === 'nominal') return { type: 'set-nominal-coding', column, coding: coding as 'one-hot' };
  if (level === 'ordinal') return { type: 'set-ordinal-coding', column, coding: coding as 'rank' };
  return { type: 'set-scaling', column, scaling: coding as 'none' };
}

/**
 * "column=value" where the column name may itself hold "=": the first split whose left side is a
 * column of the file wins.
 */
export function splitColumnValue(option: string, given: string, names: readonly string[]): { column: string; value: string } {
  for (let at = given.indexOf('='); at !== -1; at = given.indexOf('=', at + 1)) {
    const column = given.slice(0, at);
    if (names.includes(column)) return { column, value: given.slice(at + 1) };
  }
  const column = given.includes('=') ? given.slice(0, given.indexOf('=')) : given;
  throw usageFailure(
    VERB,
    given.includes('=') ? `--${option} ${given}: the file has no column "${column}".` : `--${option} ${given}: write it as column=value.`,
    `Columns: ${names.slice(0, 12).join(', ')}${names.length > 12 ? ', …' : ''}.`,
  );
}

/** "a,b,c" with "\," for a comma inside a level. */
export function splitList(text: string): string[] {
  return text.split(/(?<!\\),/).map((part) => part.replace(/\\,/g, ','));
}

function columnNamed(recipe: Recipe, name: string): ColumnRecipe {
  const column = recipe.columns.find((c) => c.name === name);
  if (column === undefined) throw new Error(`no column ${name}`);
  return column;
}

function notLevel(option: string, given: string, column: ColumnRecipe, level: MeasurementLevel) {
  return usageFailure(
    VERB,
    `${option} ${given}: "${column.name}" is ${column.level}, and ${option} applies to ${level} columns.`,
    `Make it ${level} first with --set ${column.name}=${level}.`,
  );
}

function requireLevels(option: string, given: string, column: ColumnRecipe, wanted: readonly string[]): void {
  const levels = 'levels' in column ? column.levels.map((l) => l.value) : [];
  const unknown = wanted.filter((w) => !levels.includes(w));
  if (unknown.length === 0) return;
  const shown = levels.slice(0, 12).map((l) => `"${l}"`).join(', ');
  throw usageFailure(
    VERB,
    `${option} ${given}: "${column.name}" has no level ${unknown.map((u) => `"${u}"`).join(', ')}.`,
    `Its levels after cleaning: ${shown}${levels.length > 12 ? ', …' : ''}.`,
  );
}
