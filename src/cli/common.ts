/** Options and settings several verbs share. */
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

/** "1,234" */
export function count(n: number): string {
  return n.toLocaleString('en-US');
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${count(n)} ${n === 1 ? one : many}`;
}
