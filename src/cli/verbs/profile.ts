/**
 * levelwise profile FILE [--format text|json] [-o OUT] [--missing SPELLING]... [--not-missing SPELLING]...
 *
 * What each column holds — missing cells, distinct values, the most frequent levels or the
 * numbers' summary — and the level of measurement Levelwise would propose, with its reason.
 */
import { numberFormatExample } from '../../core/numbers.ts';
import type { NumberFormat } from '../../core/recipe.ts';
import { inferLevel, sensitiveAttributeCaution, type Inference } from '../../core/infer.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import type { Table } from '../../core/columns.ts';
import { count, linesText, note, OUTPUT_OPTION, plural, quoted, READ_OPTIONS, readSettings } from '../common.ts';
import { EXIT, type ExitCode } from '../failure.ts';
import { inputSource, readWholeTable, type ReadSummary } from '../input.ts';
import { openOutput } from '../output.ts';
import { findingsLines } from '../reading-findings.ts';
import { MISSING_OPTIONS, missingSpellings, outnumberingNotes } from '../missing-spellings.ts';

const VERB = 'profile';
const TOP_LEVELS = 5;
/** Rows with the wrong number of fields shown on standard error. */
const SHOWN_ROWS = 5;
/** Texts that are not numbers shown per column, each with its lines. */
const SHOWN_STRAY = 3;
/** Lines shown for one stray text (the core keeps up to 100 examples, often all of one text). */
const SHOWN_LINES = 5;

export async function profileVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [{ name: 'format', choices: ['text', 'json'] }, OUTPUT_OPTION, ...MISSING_OPTIONS, ...READ_OPTIONS]);
  const [filePath = ''] = positionals(VERB, args, ['FILE']);
  const missingTokens = missingSpellings(VERB, args);
  const source = await inputSource(filePath);
  const { table, summary, profiles } = await readWholeTable(source, readSettings(args), { missingTokens });
  for (const line of findingsLines(source.label, summary.names, summary.findings, VERB, SHOWN_ROWS)) note(VERB, line);
  for (const line of outnumberingNotes(profiles)) note(VERB, line);
  if (summary.rows === 0) note(VERB, `"${source.label}" has a header but no data rows: there is nothing to profile, only the columns' names.`);
  const suggestions = profiles.map((p) => inferLevel(p));
  const output = openOutput(optionValue(args, 'output'));
  if (optionValue(args, 'format') === 'json') {
    const columns = profiles.map((profile, i) => ({ ...profile, suggestion: suggestions[i], caution: sensitiveAttributeCaution(profile.name) }));
    output.write(`${JSON.stringify({ file: source.fileName, ...summary, missingTokens, columns }, null, 2)}\n`);
  } else {
    output.write(profileText(source.label, summary, table, profiles, suggestions));
  }
  await output.close();
  return EXIT.ok;
}

function profileText(label: string, summary: ReadSummary, table: Table, profiles: readonly ColumnProfile[], suggestions: readonly Inference[]): string {
  const how = summary.encoding === 'xlsx' ? `sheet "${summary.sheet}"` : `${summary.encoding}, ${delimiterName(summary.delimiter)}-separated`;
  const lines = [`${label}: ${plural(summary.rows, 'row')}, ${plural(profiles.length, 'column')} (${how})`, ''];
  profiles.forEach((p, i) => {
    const s = suggestions[i];
    lines.push(`${p.index + 1}. ${p.name} — ${s?.level ?? '?'}: ${s?.reason ?? ''}`);
    lines.push(`   ${count(p.missing)} missing${spellings(p)}, ${count(p.distinct)} distinct`);
    const detail = p.numeric !== null && p.numeric.share >= 0.5 ? numbersLine(p, table) : p.flags.identifier ? '' : levelsLine(p);
    if (detail !== '') lines.push(`   ${detail}`);
    const caution = sensitiveAttributeCaution(p.name);
    if (caution !== null) lines.push(`   Caution: ${caution}.`);
  });
  return `${lines.join('\n')}\n`;
}

function spellings(p: ColumnProfile): string {
  if (p.missingSpellings.length === 0) return '';
  return ` (${p.missingSpellings.map((s) => `${s.value.trim() === '' ? 'empty' : quoted(s.value)} ${count(s.count)}`).join(', ')})`;
}

function numbersLine(p: ColumnProfile, table: Table): string {
  const n = p.numeric;
  if (n === null) return '';
  const stray = n.invalidCount > 0 ? `; ${count(n.invalidCount)} not numbers: ${strayText(n.invalidExamples, n.invalidCount, table)}` : '';
  return `numbers${writtenLike(n.format)}: min ${show(n.min)}, max ${show(n.max)}, mean ${show(n.mean)}, sd ${show(n.sd)}, median ${show(n.median)}${stray}`;
}

/** " (written like €1.234,5)" when the numbers are not written plainly, so "12 %" read as 12 is no surprise. */
function writtenLike(format: NumberFormat): string {
  const example = numberFormatExample(format);
  return example === null ? '' : ` (written like ${example})`;
}

/**
 * '"n/a" (lines 5, 9), "x" (line 7), …': the first texts that are not numbers, each with the lines
 * it was seen on (core keeps the first few cells; the dots say there are more).
 */
function strayText(examples: readonly { row?: number; text: string; line?: number }[], total: number, table: Table): string {
  const byText = new Map<string, number[]>();
  for (const e of examples) {
    const line = e.line ?? (e.row === undefined ? undefined : table.lineOfRow[e.row]);
    const lines = byText.get(e.text) ?? [];
    if (line !== undefined) lines.push(line);
    byText.set(e.text, lines);
  }
  const shown = [...byText].slice(0, SHOWN_STRAY).map(([text, lines]) => (lines.length === 0 ? quoted(text) : `${quoted(text)} (${linesText(lines.slice(0, SHOWN_LINES), lines.length)})`));
  return shown.join(', ') + (total > examples.length || byText.size > SHOWN_STRAY ? ', …' : '');
}

function levelsLine(p: ColumnProfile): string {
  if (p.levels === null || p.levels.length === 0) return '';
  const top = p.levels.slice(0, TOP_LEVELS).map((l) => `${quoted(l.value)} ${count(l.count)}`);
  const more = p.levels.length > TOP_LEVELS ? `, and ${plural(p.levels.length - TOP_LEVELS, 'more level')}` : '';
  return `most frequent: ${top.join(', ')}${more}`;
}

function show(x: number): string {
  return Number.isInteger(x) ? String(x) : String(Number(x.toPrecision(6)));
}

function delimiterName(delimiter: string | null): string {
  return delimiter === '\t' ? 'tab' : delimiter === ';' ? 'semicolon' : delimiter === '|' ? 'pipe' : 'comma';
}
