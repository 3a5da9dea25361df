/**
 * Does a cell look like a calendar date or a timestamp? Used to flag date columns, which are left
 * out of the encoding for now. Only the shape and the calendar are checked (month 1–12, a day that
 * exists in that month); nothing is converted, so no time zone is assumed.
 *
 * Shapes recognised (common practice in spreadsheet exports):
 *   2024-03-01, 2024/03/01, 2024-03-01T10:00:00Z, 2024-03-01 10:00:00.123+01:00
 *   01/03/2024, 3/1/24, 01.03.2024, 01-03-2024 (day or month first; both readings are tried)
 *   3 Mar 2024, 03-Mar-2024, 3rd March 2024, Mar 3, 2024, Sun, 03 Mar 2024 10:00:00 +0000
 * A bare number ("2024", "20240301") is never a date here: it reads as a number.
 */

export type DateShape = 'date' | 'timestamp';

const TIME = String.raw`(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,]\d{1,9})?)?(?:\s*([ap]\.?m\.?))?(?:\s*(?:z|utc|gmt|[+-]\d{2}(?::?\d{2})?))?`;

const ISO = new RegExp(String.raw`^(\d{4})([-/])(\d{2})\2(\d{2})(?:(?:t|\s+)${TIME})?$`);
const NUMERIC = new RegExp(String.raw`^(\d{1,2})([/.-])(\d{1,2})\2(\d{4}|\d{2})(?:(?:t|\s+|,\s*)${TIME})?$`);
const WEEKDAY = String.raw`(?:(?:mon|tue|tues|wed|thu|thur|thurs|fri|sat|sun)[a-z]*\.?,?\s+)?`;
const DAY_MONTH_YEAR = new RegExp(
  String.raw`^${WEEKDAY}(\d{1,2})(?:st|nd|rd|th)?[\s-]+([a-z]+)\.?,?[\s-]+(\d{4}|\d{2})(?:(?:\s+|,\s*)${TIME})?$`,
);
const MONTH_DAY_YEAR = new RegExp(
  String.raw`^${WEEKDAY}([a-z]+)\.?\s+(\d{1,2})(?:st|nd|rd|th)?,?\s+(\d{4})(?:(?:\s+|,\s*)${TIME})?$`,
);

const MONTH_NAMES = [
  'january', 'february', 'march', 'april', 'may', 'june',
  'july', 'august', 'september', 'october', 'november', 'december',
];

/** 1–12 for a month name or its usual abbreviation ("Mar", "Sept"), else 0. */
function monthNumber(word: string): number {
  if (word === 'sept') return 9;
  for (let i = 0; i < MONTH_NAMES.length; i++) {
    const name = MONTH_NAMES[i] ?? '';
    if (word === name || word === name.slice(0, 3)) return i + 1;
  }
  return 0;
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0) ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/** Two-digit years: the leap-year test only needs a plausible century. */
function fullYear(text: string): number {
  const y = Number(text);
  return text.length === 2 ? 2000 + y : y;
}

function validDay(year: number, month: number, day: number): boolean {
  return month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
}

/** Hour, minute, second (captured as strings or undefined), with an am/pm marker if any. */
function validTime(hour?: string, minute?: string, second?: string, meridiem?: string): boolean {
  if (hour === undefined || minute === undefined) return true;
  const h = Number(hour);
  const hourOk = meridiem === undefined ? h <= 23 : h >= 1 && h <= 12;
  return hourOk && Number(minute) <= 59 && (second === undefined || Number(second) <= 60);
}

/**
 * False only when a text surely looks like no date: it has no white space, and does not start with
 * a digit. Every shape above starts with a digit, unless a weekday or a month name comes first, and
 * those are followed by white space (\s+ in WEEKDAY and MONTH_DAY_YEAR). profile.ts relies on this to
 * count a million identifiers kept as bytes without making their texts: keep it true of every shape.
 */
export function mayBeDate(firstCharacter: number, hasWhiteSpace: boolean): boolean {
  return hasWhiteSpace || (firstCharacter >= 0x30 && firstCharacter <= 0x39);
}

/** 'date', 'timestamp' (a date with a time of day), or null when `text` is neither. */
export function dateShape(text: string): DateShape | null {
  const trimmed = text.trim();
  // Cheap checks first: profiling calls this once per distinct value, identifiers included.
  if (trimmed.length < 6 || trimmed.length > 48 || digitRuns(trimmed) < 2) return null;
  const t = trimmed.toLowerCase();
  return isoShape(t) ?? numericShape(t) ?? namedMonthShape(t);
}

/**
 * Runs of digits in `t`, counted up to 2: every date shape has at least two (a day and a year, or
 * more), so text with fewer ("HH-0000001", "Flat 3") is no date, without running the patterns.
 */
function digitRuns(t: string): number {
  let runs = 0;
  let inRun = false;
  for (let i = 0; i < t.length; i++) {
    const c = t.charCodeAt(i);
    const digit = c >= 0x30 && c <= 0x39;
    if (digit && !inRun && ++runs === 2) return runs;
    inRun = digit;
  }
  return runs;
}

/** True when `text` looks like a calendar date or a timestamp. */
export function looksLikeDate(text: string): boolean {
  return dateShape(text) !== null;
}

function shapeOf(hour: string | undefined): DateShape {
  return hour === undefined ? 'date' : 'timestamp';
}

function isoShape(t: string): DateShape | null {
  const m = ISO.exec(t);
  if (m === null) return null;
  const [, y = '', , mo = '', d = '', h, mi, s, ap] = m;
  if (!validDay(Number(y), Number(mo), Number(d)) || !validTime(h, mi, s, ap)) return null;
  return shapeOf(h);
}

function numericShape(t: string): DateShape | null {
  const m = NUMERIC.exec(t);
  if (m === null) return null;
  const [, a = '', separator, b = '', y = '', h, mi, s, ap] = m;
  // "1.2.24" or "1-2-24" is more often a version or a code than a date: only "/" may have a short year.
  if (y.length === 2 && separator !== '/') return null;
  const year = fullYear(y);
  const dayFirst = validDay(year, Number(b), Number(a));
  const monthFirst = validDay(year, Number(a), Number(b));
  if (!(dayFirst || monthFirst) || !validTime(h, mi, s, ap)) return null;
  return shapeOf(h);
}

function namedMonthShape(t: string): DateShape | null {
  const dmy = DAY_MONTH_YEAR.exec(t);
  if (dmy !== null) {
    const [, d = '', month = '', y = '', h, mi, s, ap] = dmy;
    return checkNamed(y, month, d, h, mi, s, ap);
  }
  const mdy = MONTH_DAY_YEAR.exec(t);
  if (mdy !== null) {
    const [, month = '', d = '', y = '', h, mi, s, ap] = mdy;
    return checkNamed(y, month, d, h, mi, s, ap);
  }
  return null;
}

function checkNamed(
  y: string,
  monthWord: string,
  d: string,
  h: string | undefined,
  mi: string | undefined,
  s: string | undefined,
  ap: string | undefined,
): DateShape | null {
  const month = monthNumber(monthWord);
  if (month === 0 || !validDay(fullYear(y), month, Number(d)) || !validTime(h, mi, s, ap)) return null;
  return shapeOf(h);
}
