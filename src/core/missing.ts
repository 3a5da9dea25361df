/** Which cell texts mean "no value". */
import { numberValue } from './columns-builder.ts';
import type { ColumnProfile } from './profile.ts';

/** The spellings of a missing value a new recipe starts with (besides the empty cell). */
export const DEFAULT_MISSING_TOKENS: readonly string[] = ['NA', 'N/A', 'n/a', '#N/A', 'NaN', 'null', 'NULL', 'None', '.', '?', '-'];

/** A fast membership test for one recipe's or profile's missing-value tokens. */
export type MissingTest = (raw: string) => boolean;

/**
 * Missing means: empty after trimming, or equal (after trimming, case-sensitive) to one of the
 * tokens. Case matters on purpose: "NA" is a missing marker, "Na" may be sodium.
 */
export function missingTest(tokens: readonly string[]): MissingTest {
  const set = new Set(tokens);
  let longest = 0;
  for (const token of set) longest = Math.max(longest, token.length);
  return (raw) => {
    // Most texts (an identifier column's million) start and end with a printable ASCII character
    // other than the space: trimming leaves them as they are, and one longer than every token is
    // none of them. No trimmed copy, no hashing of the text.
    if (raw.length > 0 && printableEdge(raw.charCodeAt(0)) && printableEdge(raw.charCodeAt(raw.length - 1))) {
      return raw.length <= longest && set.has(raw);
    }
    const t = raw.trim();
    return t === '' || set.has(t);
  };
}

/** Printable ASCII other than the space: never removed by trim(), whose white space is all below 0x21 or above 0x7e. */
function printableEdge(code: number): boolean {
  return code > 0x20 && code < 0x7f;
}

/**
 * The numbers some missing-value token spells ("-999", "0", "0.00"), read with number storage's own
 * grammar (columns-builder.ts). Number storage keeps most cells as numbers without their text, so
 * whatever reads it by value must look at the text of a cell holding one of these (cellText) and
 * test that, or a coded missing value would be read as a number.
 */
export function missingNumbers(tokens: readonly string[]): ReadonlySet<number> {
  const numbers = new Set<number>();
  for (const token of tokens) {
    const value = numberValue(token.trim());
    if (!Number.isNaN(value)) numbers.add(value);
  }
  return numbers;
}

/** A missing spelling met in more cells of a column than all of the column's values together. */
export interface OutnumberingSpelling {
  readonly column: string;
  readonly spelling: string;
  /** Cells spelled so. */
  readonly cells: number;
  /** Cells holding a value (not missing). */
  readonly valueCells: number;
}

/**
 * Missing spellings that may be values in disguise: one that outnumbers all of a column's values
 * together ("None" in 89 % of a damage column, where it says there was no damage) is worth a
 * second look before a model learns from the column without it. The empty cell is always missing
 * and never named; a column with no value at all is left alone (there is nothing to mistake).
 */
export function spellingsOutnumberingValues(profiles: readonly ColumnProfile[]): OutnumberingSpelling[] {
  const found: OutnumberingSpelling[] = [];
  for (const profile of profiles) {
    const valueCells = profile.count - profile.missing;
    if (valueCells <= 0) continue;
    for (const { value, count } of profile.missingSpellings) {
      if (value !== '' && count > valueCells) found.push({ column: profile.name, spelling: value, cells: count, valueCells });
    }
  }
  return found;
}

/** A missing spelling met in a file: its cells over every column, and the columns it is in (file order). */
export interface SpellingCells {
  /** '' for the empty cell. */
  readonly spelling: string;
  readonly cells: number;
  readonly columns: readonly string[];
}

/** Every missing spelling met in the profiled columns, most cells first. */
export function missingSpellingCells(profiles: readonly ColumnProfile[]): SpellingCells[] {
  const met = new Map<string, { cells: number; columns: string[] }>();
  for (const profile of profiles) {
    for (const { value, count } of profile.missingSpellings) {
      let entry = met.get(value);
      if (entry === undefined) met.set(value, (entry = { cells: 0, columns: [] }));
      entry.cells += count;
      entry.columns.push(profile.name);
    }
  }
  return [...met].map(([spelling, { cells, columns }]) => ({ spelling, cells, columns })).sort((a, b) => b.cells - a.cells);
}

/** Whether two lists of missing spellings read the same cells as missing (order and repeats aside). */
export function sameMissingTokens(a: readonly string[], b: readonly string[]): boolean {
  const left = new Set(a.map((t) => t.trim()));
  const right = new Set(b.map((t) => t.trim()));
  return left.size === right.size && [...left].every((t) => right.has(t));
}
