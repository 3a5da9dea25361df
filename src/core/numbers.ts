/**
 * Reading numbers the way a column writes them: "1,234.5", "12,5" (decimal comma), "1 234",
 * "€ 1.234,50", "12%".
 *
 * Deliberately strict. A cell reads as a number only when all of it is a number in the column's
 * format, with at most the format's symbol beside it (number-symbols.ts): with no symbol in the
 * format "$12", "45%" and "12 kg" do not read; "n/a", "0x1F", "Infinity" and anything that
 * overflows to ±Infinity ("1e309") never do. Such cells are reported, never guessed at.
 */
import { commonSymbol, inNegativeNotation, isSymbolText, symbolOf, trimSymbolSpaces, withLeadingMinus, withoutSymbol, withSymbol } from './number-symbols.ts';
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

/** Whether two formats read every text alike: same separators, same symbol on the same side. */
export function sameNumberFormat(a: NumberFormat, b: NumberFormat): boolean {
  return a.decimal === b.decimal && a.group === b.group && a.symbol?.text === b.symbol?.text && a.symbol?.side === b.symbol?.side && a.negative === b.negative;
}

/** A parser for one format, compiled once; call it once per distinct value. */
export function numberReader(format: NumberFormat): NumberReader {
  const key = [format.decimal, format.group, format.symbol?.side, format.symbol?.text, format.negative].join('\u0000');
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
  const { symbol, negative } = format;
  return (text) => {
    let t = text.trim();
    if (negative !== undefined) t = withLeadingMinus(t, negative);
    if (symbol !== undefined) t = withoutSymbol(t, symbol);
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
 * The candidates are the six formats, then the same six with the symbol most cells carry, if any
 * does, then all of these with negatives in parentheses or with a trailing minus, where some cell
 * is written so. A symbol is taken only when it makes more cells read and more than half of the
 * cells it reads carry it: the column is written that way. One "$12" among plain numbers stays a
 * stray cell, reported, not read (common practice: read what the column means, flag what it does
 * not). Missing cells should be left out by the caller; empty texts are ignored.
 */
export function detectNumberFormat(values: readonly TextCount[]): NumberFormat {
  // Texts no format can read are set aside once, instead of being tried by every candidate.
  const candidates = values.filter(({ value, count }) => count > 0 && (MIGHT_BE_NUMBER.test(value) || symbolOf(value) !== null || mayBeNegativeIn(value, 'parentheses')));
  const common = commonSymbol(candidates);
  const withSymbols = common === null ? CANDIDATE_NUMBER_FORMATS : [...CANDIDATE_NUMBER_FORMATS, ...CANDIDATE_NUMBER_FORMATS.map((f) => ({ ...f, symbol: common.symbol }))];
  // Then the other ways of writing negatives, where some cell is written so.
  const notations = NEGATIVE_NOTATIONS.filter((negative) => candidates.some(({ value }) => mayBeNegativeIn(value, negative)));
  const formats = [...withSymbols, ...notations.flatMap((negative) => withSymbols.map((f) => ({ ...f, negative })))];
  let best = PLAIN_NUMBER_FORMAT;
  let bestScore = 0;
  for (const format of formats) {
    const score = scoreOf(format, candidates);
    if (format.symbol !== undefined && common !== null && 2 * common.count <= score) continue;
    if (score > bestScore) {
      best = format;
      bestScore = score;
    }
  }
  return best;
}

const NEGATIVE_NOTATIONS = ['parentheses', 'trailing'] as const;

/**
 * Whether `value` may be a negative in `notation`: "(…)", or a digit then "-" at the end. Looks at
 * its ends only (a column can hold a million values to ask).
 */
function mayBeNegativeIn(value: string, notation: (typeof NEGATIVE_NOTATIONS)[number]): boolean {
  const t = isBlank(value.charCodeAt(0)) || isBlank(value.charCodeAt(value.length - 1)) ? value.trim() : value;
  const n = t.length;
  if (n < 2) return false;
  if (notation === 'parentheses') return t.charCodeAt(0) === 0x28 && t.charCodeAt(n - 1) === 0x29;
  if (t.charCodeAt(n - 1) !== 0x2d) return false;
  let at = n - 2;
  while (at > 0 && t.charCodeAt(at) === 0x20) at--;
  const c = t.charCodeAt(at);
  return c >= 0x30 && c <= 0x39;
}

/** Space, controls and anything beyond ASCII, where trim() may have work to do. */
function isBlank(code: number): boolean {
  return code <= 0x20 || code >= 0x7f;
}

/** How many cells (weighted) `format` reads. */
function scoreOf(format: NumberFormat, values: readonly TextCount[]): number {
  const read = numberReader(format);
  let score = 0;
  for (const { value, count } of values) if (!Number.isNaN(read(value))) score += count;
  return score;
}

/**
 * Writes `value` in `format` so that `parseNumber` reads back exactly the same number
 * (including −0), with the format's symbol. Digit groups are written only when there is no
 * exponent. Not for NaN or ±Infinity.
 */
export function formatNumber(value: number, format: NumberFormat): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatNumber: ${value} is not a finite number`);
  const plain = Object.is(value, -0) ? '-0' : String(value);
  const match = /^(-?)(\d+)(?:\.(\d+))?(e[+-]\d+)?$/.exec(plain);
  if (match === null) return plain; // unreachable for finite numbers; kept as a safe fallback
  const [, sign = '', integer = '', fraction, exponent] = match;
  const groupChar = format.group === format.decimal ? '' : format.group;
  const grouped = exponent === undefined && groupChar !== '' ? groupDigits(integer, groupChar) : integer;
  const written = withSymbol(sign + grouped + (fraction === undefined ? '' : format.decimal + fraction) + (exponent ?? ''), format.symbol);
  return inNegativeNotation(written, format.negative);
}

/**
 * How `format` writes numbers, for people: "€1.234,5", and its negative too when written other
 * than with a leading minus ("1,234.5 and (1,234.5)"); null for plain numbers ("1234.5").
 */
export function numberFormatExample(format: NumberFormat): string | null {
  if (format.decimal === '.' && format.group === '' && format.symbol === undefined && format.negative === undefined) return null;
  const positive = formatNumber(1234.5, format);
  return format.negative === undefined ? positive : `${positive} and ${formatNumber(-1234.5, format)}`;
}

function groupDigits(digits: string, separator: string): string {
  let out = '';
  for (let end = digits.length; end > 0; end -= 3) {
    const part = digits.slice(Math.max(0, end - 3), end);
    out = out === '' ? part : part + separator + out;
  }
  return out;
}

/**
 * Whether a printable character may start a number some format reads: a digit, a sign, a point, a
 * comma, or the parenthesis of a negative amount. Text starting with any other printable ASCII
 * character reads as no number unless a currency or percent sign comes first (number-symbols.ts).
 */
export function mayStartNumber(code: number): boolean {
  return (code >= 0x30 && code <= 0x39) || code === 0x2b || code === 0x2d || code === 0x2e || code === 0x2c || code === 0x28;
}

/** True when a number's text starts with a zero followed by more digits ("007", "-01"): a code, not a quantity. */
export function hasLeadingZero(text: string): boolean {
  return /^[+-]?0\d/.test(text.trim());
}

/** One thousand two hundred thirty-four and a half as a format writes it: 1, a group, 234, the decimal, 5 (or 50). */
const EXAMPLE_NUMBER = /^1([,. \u00a0\u202f]?)234([.,])50?$/u;

/**
 * The format in which `example` writes 1234.5, for a person to say how a column writes its
 * numbers by writing that one number: "1.234,5", "1 234.5", "€ 1.234,50", "1234.5 %". A sign or
 * unit may stand before or after it (not both). Null when `example` is not 1234.5 in any format,
 * or its symbol could not be one (number-symbols.ts isSymbolText).
 */
export function formatFromExample(example: string): NumberFormat | null {
  const trimmed = example.trim();
  // "(1234.5)" and "1234.5-" show how negative numbers are written as well.
  const negative = /^\(.*\)$/su.test(trimmed) ? 'parentheses' : /.-$/su.test(trimmed) ? 'trailing' : undefined;
  const t = negative === undefined ? trimmed : withLeadingMinus(trimmed, negative).slice(1);
  const format = positiveFormatFromExample(t);
  return format === null || negative === undefined ? format : { ...format, negative };
}

function positiveFormatFromExample(t: string): NumberFormat | null {
  const first = t.search(/\d/u);
  if (first === -1) return null;
  let last = t.length - 1;
  while (last > first && !/\d/u.test(t[last]!)) last--;
  const match = EXAMPLE_NUMBER.exec(t.slice(first, last + 1));
  if (match === null) return null;
  const [, groupMark = '', decimal = '.'] = match;
  const group = groupMark === '' ? '' : /\s/u.test(groupMark) ? ' ' : groupMark;
  if (group === decimal) return null;
  const before = trimSymbolSpaces(t.slice(0, first));
  const after = trimSymbolSpaces(t.slice(last + 1));
  if (before !== '' && after !== '') return null;
  const format = { decimal: decimal as NumberFormat['decimal'], group: group as NumberFormat['group'] };
  if (before === '' && after === '') return format;
  const text = before || after;
  return isSymbolText(text) ? { ...format, symbol: { text, side: before !== '' ? 'before' : 'after' } } : null;
}

