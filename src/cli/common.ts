/** Options and settings several verbs share. */
import { countText } from '../core/count-text.ts';
import { ENCODE_BATCH_ROWS } from '../core/encode-csv.ts';
import type { Delimiter } from '../core/read-table.ts';
import type { EncodingName } from '../core/decode.ts';
import { optionValue, type OptionSpec, type ParsedArgs } from './args.ts';
import type { ReadSettings } from './input.ts';

const DELIMITER_NAMES: Record<string, Delimiter> = { comma: ',', semicolon: ';', tab: '\t', pipe: '|', ',': ',', ';': ';', '\t': '\t', '|': '|' };

/** How to read a text file or workbook: --delimiter, --encoding, --sheet. */
export const READ_OPTIONS: readonly OptionSpec[] = [
  { name: 'delimiter', choices: Object.keys(DELIMITER_NAMES) },
  { name: 'encoding', choices: ['utf-8', 'utf-16le', 'utf-16be', 'windows-1252'] },
  { name: 'sheet' },
];

export const OUTPUT_OPTION: OptionSpec = { name: 'output', short: 'o' };

/** The read options given, falling back to the recipe's delimiter (null: detect). */
export function readSettings(args: ParsedArgs, recipeDelimiter: Delimiter | null = null): ReadSettings {
  const delimiter = optionValue(args, 'delimiter');
  return {
    delimiter: delimiter === undefined ? recipeDelimiter : (DELIMITER_NAMES[delimiter] ?? null),
    encoding: (optionValue(args, 'encoding') as EncodingName | undefined) ?? null,
    sheet: optionValue(args, 'sheet') ?? null,
  };
}

/**
 * Rows per batch when streaming. LEVELWISE_BATCH_ROWS (undocumented) makes it small, so tests
 * can run batch boundaries through small files.
 */
export function batchRows(): number {
  const wanted = Number(process.env['LEVELWISE_BATCH_ROWS']);
  return Number.isSafeInteger(wanted) && wanted >= 1 ? wanted : ENCODE_BATCH_ROWS;
}

/** A note on standard error, prefixed like every message of the verb. */
export function note(verb: string, text: string): void {
  process.stderr.write(`levelwise ${verb}: ${text}\n`);
}

/** "1,234": grouped by hand, since a first toLocaleString call loads locale data (~13 ms of every run). */
export function count(n: number): string {
  return countText(n);
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${count(n)} ${n === 1 ? one : many}`;
}

/** Longest cell text shown in a message; a quote never closed can put the rest of a file in one cell. */
const SHOWN_TEXT = 60;

/**
 * A cell's text in double quotes, on one line: line breaks, tabs, quotes and control characters
 * escaped as in JSON (also those JSON leaves alone: DEL, the C1 controls a terminal may obey, and
 * the Unicode line and paragraph separators), cut to SHOWN_TEXT characters with "…" so a message
 * stays readable whatever the cell holds.
 */
export function quoted(text: string): string {
  const cut = text.length > SHOWN_TEXT ? `${text.slice(0, SHOWN_TEXT)}…` : text;
  return JSON.stringify(cut).replace(/[\u007f-\u009f\u2028\u2029]/g, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/**
 * "line 4" or "lines 4, 9, 12, …" (the dots when `total` exceeds the lines known). Line numbers get
 * no thousands separator: in a comma-separated list "1,018" would read as two lines.
 */
export function linesText(lines: readonly number[], total = lines.length): string {
  const more = total > lines.length ? ', …' : '';
  return `${lines.length === 1 && total <= 1 ? 'line' : 'lines'} ${lines.join(', ')}${more}`;
}

/** A value met in the file: how often, and its first lines (the core's ValueTally). */
export interface Tally {
  readonly value: string;
  readonly count: number;
  readonly lines: readonly number[];
}

/** '"green" ×12 (lines 4, 9, …), "teal" ×1 (line 7)', the first `shown` values, then how many more. */
export function tallyText(tallies: readonly Tally[], shown: number): string {
  const first = tallies.slice(0, shown).map((t) => `${quoted(t.value)} ×${count(t.count)} (${linesText(t.lines, t.count)})`);
  const more = tallies.length > shown ? `, and ${plural(tallies.length - shown, 'more value')}` : '';
  return first.join(', ') + more;
}

/** "a, b, c" with at most `shown` names, then how many more. */
export function namesText(names: readonly string[], shown = 12): string {
  const more = names.length > shown ? `, and ${count(names.length - shown)} more` : '';
  return names.slice(0, shown).join(', ') + more;
}
