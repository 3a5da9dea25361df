/**
 * Reading numbers the way a column writes them: "1,234.5", "12,5" (decimal comma), "1 234".
 *
 * Deliberately strict. A cell reads as a number only when all of it is a number in the column's
 * format: "$12", "45%", "12 kg", "n/a", "0x1F", "Infinity" and anything that overflows to
 * ±Infinity ("1e309") do not. Such cells are reported, never guessed at.
 */
import type { NumberFormat } from './recipe.ts';

/** Numbers as JavaScript writes them: point for decimals, no digit grouping. */
export const PLAIN_NUMBER_FORMAT: NumberFormat = { decimal: '.', group: '' };

/**
 * The formats detection chooses between, in order of preference when several read the same
 * number of cells: point-decimal before comma-decimal (so "1,234" alone means one thousand two
 * hundred thirty-four), no grouping before grouping.
 */
export const CANDIDATE_NUMBER_FORMATS: readonly NumberFormat[] = [
  { decimal: '.', group: '' },
  { decimal: '.', group: ',' },
  { decimal: '.', group: ' ' },
  { decimal: ',', group: '' },
  { decimal: ',', group: '.' },
  { decimal: ',', group: ' ' },
];

/** A distinct cell text and how many cells hold it. */
export interface TextCount {
  readonly value: string;
  readonly count: number;
}

export type NumberReader = (text: string) => number;

const readers = new Map<string, NumberReader>();

/**
 * The number `text` holds in `format`, or NaN when it holds none. Surrounding white space is
 * ignored; digit groups must be well formed (1–3 digits, then groups of exactly 3), so with
 * group "," the text "1,5" is not fifteen.
 */
export function parseNumber(text: string, format: NumberFormat): number {
  return numberReader(format)(text);
}

/** A parser for one format, compiled once; call it once per distinct value. */
export function numberReader(format: NumberFormat): NumberReader {
  const key = format.decimal + format.group;
  let reader = readers.get(key);
  if (reader === undefined) {
    reader = compileReader(format);
    readers.set(key, reader);
  }
  return reader;
}

/** Spaces used as digit groups: the plain space, and the no-break spaces locales write. */
const SPACE_GROUP_CLASS = '[ \\u00A0\\u202F]';

function compileReader(format: NumberFormat): NumberReader {
  const decimal = format.decimal === '.' ? '\\.' : ',';
  // A group equal to the decimal separator cannot be told apart from it: read as ungrouped.
  const grouped = format.group !== '' && format.group !== format.decimal;
  const group = format.group === ' ' ? SPACE_GROUP_CLASS : format.group === '.' ? '\\.' : ',';
  const integer = grouped ? `(?:\\d{1,3}(?:${group}\\d{3})+|\\d+)` : '\\d+';
  const shape = new RegExp(`^[+-]?(?:${integer}(?:${decimal}\\d+)?|${decimal}\\d+)(?:[eE][+-]?\\d+)?$`);
  const groupGlobal = grouped ? new RegExp(group, 'g') : null;
  return (text) => {
    const t = text.trim();
    if (!shape.test(t)) return NaN;
    let js = groupGlobal === null ? t : t.replace(groupGlobal, '');
    if (format.decimal === ',') js = js.replace(',', '.');
    const value = Number(js);
    return Number.isFinite(value) ? value : NaN;
  };
}

/** Every text any candidate format reads passes this; most words and codes fail at the first character. */
const MIGHT_BE_NUMBER = /^\s*[+-]?[\d.,][\d.,eE+\- \u00A0\u202F]*\s*$/;

/**
 * The format most of `values` are written in: the candidate that reads the most cells (weighted
 * by count), preferring earlier candidates on ties. A comma decimal is chosen only when it reads
 * strictly more cells than every point-decimal format, i.e. when the column is written that way.
 * Missing cells should be left out by the caller; empty texts are ignored.
 */
export function detectNumberFormat(values: readonly TextCount[]): NumberFormat {
  // Texts no format can read are set aside once, instead of being tried six times.
  const candidates = values.filter(({ value, count }) => count > 0 && MIGHT_BE_NUMBER.test(value));
  let best = PLAIN_NUMBER_FORMAT;
  let bestScore = 0;
  for (const format of CANDIDATE_NUMBER_FORMATS) {
    const read = numberReader(format);
    let score = 0;
    for (const { value, count } of candidates) if (!Number.isNaN(read(value))) score += count;
    if (score > bestScore) {
      best = format;
      bestScore = score;
    }
  }
  return best;
}

/**
 * Writes `value` in `format` so that `parseNumber` reads back exactly the same number
 * (including −0). Digit groups are written only when there is no exponent. Not for NaN or ±Infinity.
 */
export function formatNumber(value: number, format: NumberFormat): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatNumber: ${value} is not a finite number`);
  const plain = Object.is(value, -0) ? '-0' : String(value);
  const match = /^(-?)(\d+)(?:\.(\d+))?(e[+-]\d+)?$/.exec(plain);
  if (match === null) return plain; // unreachable for finite numbers; kept as a safe fallback
  const [, sign = '', integer = '', fraction, exponent] = match;
  const groupChar = format.group === format.decimal ? '' : format.group;
  const grouped = exponent === undefined && groupChar !== '' ? groupDigits(integer, groupChar) : integer;
  return sign + grouped + (fraction === undefined ? '' : format.decimal + fraction) + (exponent ?? '');
}

function groupDigits(digits: string, separator: string): string {
  let out = '';
  for (let end = digits.length; end > 0; end -= 3) {
    const part = digits.slice(Math.max(0, end - 3), end);
    out = out === '' ? part : part + separator + out;
  }
  return out;
}

/** True when a number's text starts with a zero followed by more digits ("007", "-01"): a code, not a quantity. */
export function hasLeadingZero(text: string): boolean {
  return /^[+-]?0\d/.test(text.trim());
}
