/**
 * Currency and percent signs written beside numbers in exports: "€ 1.234,50", "12%", "US$5",
 * "99,90 €", "CHF 12.50". Finding which one a column uses, so that its format can carry it
 * (recipe.ts NumberSymbol) and numbers.ts can read past it.
 *
 * The signs listed here are found before or after a number; any other unit is found only after
 * it, by its shape ("12 kg", unitOf); a recipe may name any symbol, and numbers.ts reads it the
 * same way. The list is common practice (the ISO 4217 codes of the most traded currencies and the
 * signs shop and bank exports print), not a standard.
 */
import type { NumberSymbol } from './recipe.ts';

/**
 * What a symbol may be: no digit, and no white space, sign, point or comma at either end (they
 * would eat into the number beside it); at most SYMBOL_MAX_LENGTH characters. recipe.ts's schema
 * uses the same rule (kept here so the readers need not load the schema library).
 */
export const SYMBOL_TEXT = /^[^\s\d+\-.,](?:\D*[^\s\d+\-.,])?$/u;
export const SYMBOL_MAX_LENGTH = 8;

export function isSymbolText(text: string): boolean {
  return text.length <= SYMBOL_MAX_LENGTH && SYMBOL_TEXT.test(text);
}

/** Longest first, so "US$" is found before "$". */
const KNOWN_SYMBOLS: readonly string[] = [
  'US$', 'CA$', 'AU$', 'NZ$', 'HK$', 'R$', 'A$', 'C$',
  'CHF', 'EUR', 'USD', 'GBP', 'JPY', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK',
  'kr', 'zł', 'Kč', 'Ft',
  '$', '€', '£', '¥', '₹', '₩', '₽', '₺', '₪', '₫', '₴', '₦', '฿', '₱',
  '%', '‰',
];

/**
 * The known symbols by their first and by their last character (longest first within each): one
 * lookup rules most texts out. ASCII characters index an array, the others a map.
 */
const BY_FIRST = bySymbolCharacter((s) => s.charCodeAt(0));
const BY_LAST = bySymbolCharacter((s) => s.charCodeAt(s.length - 1));
const NONE: readonly string[] = [];

interface SymbolIndex {
  readonly ascii: readonly (readonly string[])[];
  readonly other: ReadonlyMap<number, readonly string[]>;
}

function bySymbolCharacter(characterOf: (symbol: string) => number): SymbolIndex {
  const ascii: string[][] = Array.from({ length: 128 }, () => []);
  const other = new Map<number, string[]>();
  for (const symbol of KNOWN_SYMBOLS) {
    const code = characterOf(symbol);
    if (code < 128) ascii[code]!.push(symbol);
    else other.set(code, [...(other.get(code) ?? []), symbol]);
  }
  return { ascii, other };
}

function symbolsAt(index: SymbolIndex, code: number): readonly string[] {
  return code < 128 ? index.ascii[code]! : (index.other.get(code) ?? NONE);
}

/** Spaces allowed between a symbol and its number: space, no-break space, narrow no-break space. */
export function isSymbolSpace(code: number): boolean {
  return code === 0x20 || code === 0xa0 || code === 0x202f;
}

/** What may stand right next to a symbol for it to be a number's: a digit, a sign or a separator. */
function isNumberEdge(code: number): boolean {
  return (code >= 0x30 && code <= 0x39) || code === 0x2b || code === 0x2d || code === 0x2e || code === 0x2c;
}

/**
 * The known symbol `text` is written with, and on which side of the number, or null. Looks at the
 * first and last characters before anything else, so that a column of a million identifiers costs
 * little. Only says where a symbol stands beside something number-like; whether the rest reads
 * as a number is for numbers.ts.
 */
export function knownSymbolOf(text: string): NumberSymbol | null {
  const first = text.charCodeAt(0);
  const last = text.charCodeAt(text.length - 1);
  const padded = !(first > 0x20 && first < 0x7f) || !(last > 0x20 && last < 0x7f);
  const t = padded ? text.trim() : text;
  if (t.length < 2) return null;
  const head = t.charCodeAt(0);
  const signed = head === 0x2b || head === 0x2d ? 1 : 0;
  for (const symbol of symbolsAt(BY_FIRST, t.charCodeAt(signed))) {
    if (t.startsWith(symbol, signed)) {
      let at = signed + symbol.length;
      while (at < t.length && isSymbolSpace(t.charCodeAt(at))) at++;
      if (at < t.length && isNumberEdge(t.charCodeAt(at))) return { text: symbol, side: 'before' };
    }
  }
  for (const symbol of symbolsAt(BY_LAST, t.charCodeAt(t.length - 1))) {
    if (t.endsWith(symbol)) {
      let at = t.length - symbol.length - 1;
      while (at >= 0 && isSymbolSpace(t.charCodeAt(at))) at--;
      if (at >= 0 && isNumberEdge(t.charCodeAt(at))) return { text: symbol, side: 'after' };
    }
  }
  return null;
}

/**
 * Whether a known symbol could be what the ASCII text bytes[start, end) is written with: one starts
 * or ends it. False proves knownSymbolOf gives null for the text of bytes without white space and
 * sign at the start, without making that text (profile.ts, for a million identifiers kept as bytes).
 */
export function mayHaveKnownSymbol(bytes: Uint8Array, start: number, end: number): boolean {
  if (end - start < 2) return false;
  // Two bytes at each end rule out an identifier starting with "H" (as "HK$" does) at one lookup.
  if (FIRST_PAIRS[(bytes[start]! << 8) | bytes[start + 1]!] === 0 && LAST_PAIRS[(bytes[end - 2]! << 8) | bytes[end - 1]!] === 0) return false;
  for (const symbol of symbolsAt(BY_FIRST, bytes[start]!)) if (bytesStartWith(bytes, start, end, symbol)) return true;
  for (const symbol of symbolsAt(BY_LAST, bytes[end - 1]!)) if (bytesStartWith(bytes, end - symbol.length, end, symbol)) return true;
  return false;
}

/**
 * By a text's first (last) two bytes, as `first << 8 | second`: 1 when a known ASCII symbol may
 * start (end) it: its own first (last) two characters, or its one character and any byte.
 */
const FIRST_PAIRS = asciiPairs((symbol, mark) => (symbol.length === 1 ? markAll(mark, (b) => (symbol.charCodeAt(0) << 8) | b) : mark((symbol.charCodeAt(0) << 8) | symbol.charCodeAt(1))));
const LAST_PAIRS = asciiPairs((symbol, mark) => {
  const n = symbol.length;
  if (n === 1) markAll(mark, (b) => (b << 8) | symbol.charCodeAt(0));
  else mark((symbol.charCodeAt(n - 2) << 8) | symbol.charCodeAt(n - 1));
});

function asciiPairs(markSymbol: (symbol: string, mark: (pair: number) => void) => void): Uint8Array {
  const pairs = new Uint8Array(1 << 16);
  for (const symbol of KNOWN_SYMBOLS) if (/^[\x00-\x7f]+$/.test(symbol)) markSymbol(symbol, (pair) => void (pairs[pair] = 1));
  return pairs;
}

function markAll(mark: (pair: number) => void, pairOf: (byte: number) => number): void {
  for (let b = 0; b < 256; b++) mark(pairOf(b));
}

/** Whether bytes[start, end) begin with `ascii` (false for a symbol that is not ASCII: such bytes never hold it). */
function bytesStartWith(bytes: Uint8Array, start: number, end: number, ascii: string): boolean {
  if (start < 0 || end - start < ascii.length) return false;
  for (let i = 0; i < ascii.length; i++) if (bytes[start + i] !== ascii.charCodeAt(i)) return false;
  return true;
}

/**
 * A unit written after a number ("12 kg", "30 min", "21 °C", "5 km/h", "3 m²"): letters (and
 * °, ², ³, /) after a digit and optional spaces; or null. Found by shape, not from a list, since
 * lab sheets and shop exports use any unit; a lone "e" or "E" is an exponent's start, not a unit.
 */
export function unitOf(text: string): NumberSymbol | null {
  const t = text.trim();
  let start = t.length;
  while (start > 0 && isUnitCharacter(t.charCodeAt(start - 1), t[start - 1]!)) start--;
  if (start === t.length || t.length - start > SYMBOL_MAX_LENGTH) return null;
  const unit = t.slice(start);
  if (unit === 'e' || unit === 'E' || !isSymbolText(unit)) return null;
  let at = start - 1;
  while (at >= 0 && isSymbolSpace(t.charCodeAt(at))) at--;
  const before = t.charCodeAt(at);
  return at >= 0 && before >= 0x30 && before <= 0x39 ? { text: unit, side: 'after' } : null;
}

/** ASCII letters at a glance; other characters by their Unicode category (letters, µ), and ° ² ³ /. */
function isUnitCharacter(code: number, character: string): boolean {
  const lower = code | 0x20;
  if (lower >= 0x61 && lower <= 0x7a) return true;
  if (code === 0x2f || code === 0xb0 || code === 0xb2 || code === 0xb3) return true;
  return code >= 0x80 && /\p{L}/u.test(character);
}

/** A known currency or percent sign (knownSymbolOf), or else a unit after the number (unitOf). */
export function symbolOf(text: string): NumberSymbol | null {
  return knownSymbolOf(text) ?? unitOf(text);
}

/**
 * The symbol most cells of `values` carry (weighted by count) and how many carry it, or null when
 * none carries one. A unit found by its shape alone (not a known sign) must be carried by more than
 * half of the cells: letters after digits are also codes ("1011 AB", a postcode), each its own.
 */
export function commonSymbol(values: readonly { readonly value: string; readonly count: number }[]): { symbol: NumberSymbol; count: number } | null {
  const tally = new Map<string, { symbol: NumberSymbol; count: number; known: boolean }>();
  let total = 0;
  for (const { value, count } of values) {
    total += count;
    const known = knownSymbolOf(value);
    const symbol = known ?? unitOf(value);
    if (symbol === null) continue;
    const key = `${symbol.side} ${symbol.text}`;
    const entry = tally.get(key);
    if (entry === undefined) tally.set(key, { symbol, count, known: known !== null });
    else entry.count += count;
  }
  let best: { symbol: NumberSymbol; count: number; known: boolean } | null = null;
  for (const entry of tally.values()) if (best === null || entry.count > best.count) best = entry;
  if (best === null || (!best.known && 2 * best.count <= total)) return null;
  return { symbol: best.symbol, count: best.count };
}

/** `text` (trimmed) without the format's symbol, when it carries it: what is left must read as a number. */
export function withoutSymbol(text: string, symbol: NumberSymbol): string {
  const s = symbol.text;
  // `text` is trimmed: only the spaces between the symbol and the number are left to take off.
  if (symbol.side === 'after') return text.endsWith(s) ? trimSymbolSpaces(text.slice(0, text.length - s.length)) : text;
  if (text.startsWith(s)) return trimSymbolSpaces(text.slice(s.length));
  const head = text.charCodeAt(0);
  const signed = (head === 0x2b || head === 0x2d) && text.startsWith(s, 1);
  return signed ? text[0] + trimSymbolSpaces(text.slice(1 + s.length)) : text;
}

/** How a number is shown with its symbol: "€1,234.5", "-€5", "12.5%", "12,50 EUR" (a letter symbol keeps a space). */
export function withSymbol(number: string, symbol: NumberSymbol | undefined): string {
  if (symbol === undefined) return number;
  const space = /\p{L}/u.test(symbol.text) ? ' ' : '';
  if (symbol.side === 'after') return number + space + symbol.text;
  const signed = number.startsWith('-') || number.startsWith('+');
  return signed ? number[0] + symbol.text + space + number.slice(1) : symbol.text + space + number;
}

/**
 * A negative number in the format's other notation, turned into a leading minus: "(1,234.5)" and
 * "1.234,5-" become "-1,234.5" and "-1.234,5" (spaces just inside the parentheses or before the
 * minus go too). `text` is trimmed; anything else is returned as it is. A sign already inside
 * ("(-5)", "-5-") gives two, and then no number.
 */
export function withLeadingMinus(text: string, negative: 'parentheses' | 'trailing'): string {
  const n = text.length;
  if (n < 2) return text;
  if (negative === 'parentheses') {
    if (text.charCodeAt(0) !== 0x28 || text.charCodeAt(n - 1) !== 0x29) return text;
    return '-' + trimSymbolSpaces(text.slice(1, n - 1));
  }
  if (text.charCodeAt(n - 1) !== 0x2d) return text;
  return '-' + trimSymbolSpaces(text.slice(0, n - 1));
}

/** `number` (with its symbol) negated in the format's notation: "-5" → "(5)" or "5-". */
export function inNegativeNotation(number: string, negative: 'parentheses' | 'trailing' | undefined): string {
  if (negative === undefined || !number.startsWith('-')) return number;
  const positive = number.slice(1);
  return negative === 'parentheses' ? `(${positive})` : `${positive}-`;
}

export function trimSymbolSpaces(text: string): string {
  let start = 0;
  let end = text.length;
  while (start < end && isSymbolSpace(text.charCodeAt(start))) start++;
  while (end > start && isSymbolSpace(text.charCodeAt(end - 1))) end--;
  return text.slice(start, end);
}
