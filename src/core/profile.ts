/**
 * Profile: what each column holds. Computed per distinct value wherever the storage allows, so a
 * million-row column with a few levels costs a pass over its dictionary, not over its cells.
 */
import { cellText, valueText, type Column, type NumberColumn, type PackedTexts, type Table, type TextColumn } from './columns.ts';
import { looksLikeDate } from './dates.ts';
import { DEFAULT_MISSING_TOKENS, missingNumbers, missingTest, type MissingTest } from './missing.ts';
import { grow } from './columns-builder.ts';
import { knownSymbolOf } from './number-symbols.ts';
import { detectNumberFormat, hasLeadingZero, mayStartNumber, numberReader, type NumberReader } from './numbers.ts';
import { plainValues } from './plain-values.ts';
import type { NumberFormat } from './recipe.ts';
import { countNumberCells, exceptionRows, type NumberCells, type TextCells } from './number-cells.ts';
import { mergeRuns, runsFromPairs, wholeRuns, type NumberRuns } from './number-runs.ts';

export interface LevelCount {
  /** Raw cell text exactly as written (not trimmed). */
  readonly value: string;
  readonly count: number;
}

export interface NumericSummary {
  /** Cells (non-missing) that read as numbers in `format`. */
  readonly count: number;
  /** count / non-missing cells. */
  readonly share: number;
  readonly format: NumberFormat;
  readonly min: number;
  readonly max: number;
  readonly mean: number;
  /** Sample standard deviation (n − 1); 0 when count < 2. */
  readonly sd: number;
  readonly median: number;
  /** Non-missing cells that did not read as numbers. */
  readonly invalidCount: number;
  /**
   * The first of them (at most 100): 0-based data row and raw text; `line` is the 1-based line of
   * the file the row starts on, filled in by profileTable (a lone column does not know its lines).
   * No row when the summary was read again from the levels in another format (numericSummaryIn).
   */
  readonly invalidExamples: readonly { readonly row?: number; readonly text: string; readonly line?: number }[];
  /**
   * Equal-width histogram over [min, max]: HISTOGRAM_BINS bins (edges has one more entry), the
   * last bin closed on the right. When min = max there is a single bin holding every number.
   */
  readonly histogram: { readonly edges: readonly number[]; readonly counts: readonly number[] };
  // The three fields below are always filled by profileColumn; optional only so that hand-written
  // summaries (test fixtures) predating them stay valid. Readers treat them as unknown when absent.
  /** Distinct numbers read ("1.5" and "1.50" are one number). */
  readonly distinct?: number;
  /** Every number read is a whole number. */
  readonly integer?: boolean;
  /** Cells read as numbers whose text starts with a zero before more digits ("007"): codes, not quantities. */
  readonly leadingZeros?: number;
}

export interface ColumnFlags {
  /**
   * Nearly every non-missing value is distinct, and the values are not measurements: text
   * codes, or whole numbers that count rows, carry leading zeros or all have the same width.
   * Never set together with `freeText`.
   */
  readonly identifier: boolean;
  /** Most values read as calendar dates or timestamps. */
  readonly date: boolean;
  /** Long, mostly distinct text with spaces (comments, addresses). */
  readonly freeText: boolean;
  /** At most one distinct non-missing value. */
  readonly constant: boolean;
}

/** The shape of a text column's non-missing cells, weighted by how many cells hold each value. */
export interface TextShape {
  /** Cells that look like a date or a timestamp. */
  readonly dates: number;
  /** Mean length of the cells' text after trimming. */
  readonly meanLength: number;
  /** Cells with white space inside the trimmed text. */
  readonly withSpaces: number;
}

export interface ColumnProfile {
  readonly name: string;
  /** 0-based position in the file. */
  readonly index: number;
  /** Rows. */
  readonly count: number;
  /** Cells that are empty or a missing-value token (after trimming). */
  readonly missing: number;
  /** Missing spellings met, with counts ('' for empty cells), most frequent first. */
  readonly missingSpellings: readonly LevelCount[];
  /** Distinct non-missing raw values. */
  readonly distinct: number;
  /**
   * Every distinct non-missing raw value with its count, most frequent first (ties: first seen
   * first). null for number-stored columns with many distinct values, where levels make no sense.
   */
  readonly levels: readonly LevelCount[] | null;
  /** Present when at least one non-missing value reads as a number. */
  readonly numeric: NumericSummary | null;
  readonly flags: ColumnFlags;
  /**
   * Text shape of the non-missing cells; null for number-stored columns. Always filled by
   * profileColumn; optional only so that hand-written profiles predating it stay valid.
   */
  readonly text?: TextShape | null;
}

export interface ProfileOptions {
  /** Cell texts (after trimming) that mean missing; the empty cell always does. */
  readonly missingTokens: readonly string[];
  /** Read numbers in this format instead of detecting it (e.g. when a recipe fixes it). */
  readonly format?: NumberFormat;
}

export const DEFAULT_PROFILE_OPTIONS: ProfileOptions = { missingTokens: DEFAULT_MISSING_TOKENS };

export const HISTOGRAM_BINS = 20;
export const MAX_INVALID_EXAMPLES = 100;

/** Where the flags draw their lines. Shares are of non-missing cells. */
export const PROFILE_THRESHOLDS = {
  /** Share of cells that must be numbers for a column to count as numeric. */
  numericShare: 0.95,
  /** Identifier: distinct values / non-missing cells at least this… */
  identifierDistinctShare: 0.95,
  /** …with at least this many non-missing cells (in a handful of rows everything is distinct). */
  identifierMinValues: 10,
  /** Identifier numbers of one width need at least this many digits ("10432"; years are 4). */
  identifierMinWidth: 4,
  /** Date: share of cells that look like dates. */
  dateShare: 0.9,
  /** Free text: distinct values / non-missing cells at least this… */
  freeTextDistinctShare: 0.5,
  /** …mean trimmed length at least this… */
  freeTextMeanLength: 15,
  /** …share of cells with inner spaces at least this… */
  freeTextSpaceShare: 0.5,
  /** …and at least this many non-missing cells. */
  freeTextMinValues: 5,
  /** Sentences are free text even when repeated (canned comments): mean length at least this… */
  sentenceMeanLength: 25,
  /** …with inner spaces in at least this share of cells. */
  sentenceSpaceShare: 0.9,
} as const;

export function profileColumn(
  column: Column,
  index: number,
  options: ProfileOptions = DEFAULT_PROFILE_OPTIONS,
): ColumnProfile {
  return column.kind === 'text' ? profileTextColumn(column, index, options) : profileNumberColumn(column, index, options);
}

export function profileTable(table: Table, options: ProfileOptions = DEFAULT_PROFILE_OPTIONS): ColumnProfile[] {
  return table.columns.map((column, index) => withInvalidLines(profileColumn(column, index, options), table.lineOfRow));
}

/**
 * A number column's profile from elsewhere (another thread): what profileColumn gives for it; or
 * null when no other thread has the column or is free to take it now, and this thread profiles it.
 */
export type ColumnProfiler = (column: NumberColumn, index: number, options: ProfileOptions) => Promise<ColumnProfile> | null;

/** Told the text columns' profiles (null for the number columns) as soon as they are made. */
export type TextProfilesListener = (profiles: readonly (ColumnProfile | null)[]) => void;

/**
 * profileTable, with columns in number storage profiled elsewhere (other threads) where they can
 * be. Those are the costly ones per cell (a million numbers counted and sorted), cheap to send
 * (typed arrays) and their profiles small to send back (no levels); text columns cost per distinct
 * value and are profiled here first. Then each number column goes to `elsewhere`, or is profiled
 * here when no other thread has it or is free: the threads share them as they come free. Between
 * two number columns this thread lets messages in, so that a thread that has finished one may
 * take the next. `onHereDone` sees the text columns' profiles (null for the number columns) as soon
 * as they are made, for work that need not wait for the others. The result is profileTable's.
 */
export async function profileTableSharing(
  table: Table,
  options: ProfileOptions,
  elsewhere: ColumnProfiler,
  onHereDone: TextProfilesListener = () => undefined,
): Promise<ColumnProfile[]> {
  const here = table.columns.map((column, index) => (column.kind === 'number' ? null : profileColumn(column, index, options)));
  onHereDone(here);
  const profiles: (ColumnProfile | Promise<ColumnProfile>)[] = [];
  for (const [index, column] of table.columns.entries()) {
    const profiled = here[index];
    if (profiled !== null && profiled !== undefined) profiles.push(profiled);
    else if (column.kind === 'number') {
      await messagesIn();
      const pending = elsewhere(column, index, options);
      pending?.catch(() => undefined); // awaited below, once this thread has done its share
      profiles.push(pending ?? profileColumn(column, index, options));
    }
  }
  return (await Promise.all(profiles)).map((profile) => withInvalidLines(profile, table.lineOfRow));
}

/** A turn of the event loop: messages from other threads that came meanwhile are handled. */
function messagesIn(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/** Invalid cells are told by the file line a person finds them on, not only by row index. */
function withInvalidLines(profile: ColumnProfile, lineOfRow: Uint32Array): ColumnProfile {
  const numeric = profile.numeric;
  if (numeric === null || numeric.invalidExamples.length === 0) return profile;
  const invalidExamples = numeric.invalidExamples.map((e) => {
    const line = e.row === undefined ? undefined : lineOfRow[e.row];
    return line === undefined ? e : { ...e, line };
  });
  return withNumeric(profile, { ...numeric, invalidExamples });
}

// ---------------------------------------------------------------------------------------------
// Text columns: everything from the dictionary; cells are visited only to find invalid rows.

function profileTextColumn(column: TextColumn, index: number, options: ProfileOptions): ColumnProfile {
  const isMissing = missingTest(options.missingTokens);
  const { counts } = column;
  // Values kept as bytes that tell the profile all it needs without their text (plain-values.ts).
  const plain = column.packed === undefined ? null : plainValues(column.packed, options.missingTokens);
  const textOf = textsOf(column, plain);
  const isMissingCode = (code: number): boolean => isMissing(textOf(code));
  const split = splitLevels(column, plain, isMissingCode, textOf);
  const byCount = split.inOrder ? split.levelCodes : sortCodesByCount(split.levelCodes, counts);
  const missingSpellings = levelCountsOf(sortCodesByCount(split.missingCodes, counts), textOf, counts);
  const nonMissing = split.nonMissing;
  // Every level, most frequent first: made when first read where plain values stand for most of them.
  const everyLevel = (): LookedAtLevels => {
    const values = plain === null ? null : column.values;
    const levels = levelCountsOf(byCount, values === null ? textOf : (code) => values[code] ?? '', counts);
    return { codes: byCount, levels, plain: null, plainCells: 0, plainCharacters: 0 };
  };
  const looked = split.looked ?? everyLevel();
  const numeric = summarizeTextNumbers(column, looked, everyLevel, nonMissing, options.format);
  const text = textShape(looked, nonMissing);
  const distinct = byCount.length;
  const freeText = looksLikeFreeText(nonMissing, distinct, numeric, text);
  const profile: ColumnProfile = {
    name: column.name,
    index,
    count: column.length,
    missing: column.length - nonMissing,
    missingSpellings,
    distinct,
    levels: plain === null ? looked.levels : null,
    numeric,
    flags: {
      identifier: looksLikeIdentifier(nonMissing, distinct, numeric, freeText),
      date: nonMissing > 0 && text.dates >= PROFILE_THRESHOLDS.dateShare * nonMissing,
      freeText,
      constant: distinct <= 1,
    },
    text,
  };
  // Every level counted once (an identifier): the counts never rise, so byCount is in dictionary order.
  const onceEach = byCount.length === nonMissing;
  return plain === null ? profile : withLazyLevels(profile, () => everyLevel().levels, { codes: byCount, counts, packed: column.packed!, onceEach });
}

/**
 * Where the levels of a profile made only when read come from: their codes, most frequent first,
 * in a column whose values are kept as bytes. What sends them elsewhere packed (the page's worker)
 * reads them from there without making a string per level.
 */
export interface LevelSource {
  readonly codes: Int32Array;
  readonly counts: readonly number[];
  readonly packed: PackedTexts;
  /** Every level is counted once, and `codes` ascend (dictionary order). */
  readonly onceEach: boolean;
}

const levelSources = new WeakMap<ColumnProfile, LevelSource>();

/** The source of `profile`'s levels when they are made only when read (withLazyLevels), else null. */
export function levelSourceOf(profile: ColumnProfile): LevelSource | null {
  return levelSources.get(profile) ?? null;
}

/**
 * Codes of the levels and of the missing spellings, in dictionary (first appearance) order; codes
 * of no cell are neither; the cells of the levels; whether the levels' counts never rise in that
 * order (then it is the most-frequent-first order already).
 */
interface SplitLevels {
  readonly levelCodes: Int32Array;
  readonly missingCodes: Int32Array;
  readonly nonMissing: number;
  readonly inOrder: boolean;
  /** For a column kept as bytes: the levels whose text the profile reads, and what the plain ones add up to. */
  readonly looked: LookedAtLevels | null;
}

/**
 * The levels and missing spellings of a dictionary, in one pass over its (maybe a million) values.
 * In a column kept as bytes (`plain` given), plain values (plain-values.ts) are levels without
 * being asked, and only add up their cells and characters; the others are looked at as every value
 * of an unpacked column is. Their order is the levels' most frequent first, restricted to them:
 * sorted among themselves by the same rule, without a pass over the levels. A loop over a million
 * codes lives in a small function: run once in a command line, it is optimised sooner.
 */
function splitLevels(column: TextColumn, plain: Uint8Array | null, isMissingCode: (code: number) => boolean, textOf: (code: number) => string): SplitLevels {
  const { counts } = column;
  const starts = column.packed?.starts ?? null;
  const levelCodes = new Int32Array(counts.length);
  const missingCodes: number[] = [];
  const lookedAt: number[] = [];
  let levelCount = 0;
  let nonMissing = 0;
  let plainCells = 0;
  let plainCharacters = 0;
  let previous = Infinity;
  let inOrder = true;
  for (let code = 0; code < counts.length; code++) {
    const count = counts[code] ?? 0;
    if (!(count > 0)) continue;
    if (plain !== null && plain[code] === 1) {
      plainCells += count;
      plainCharacters += (starts![code + 1]! - starts![code]!) * count;
    } else if (isMissingCode(code)) {
      missingCodes.push(code);
      continue;
    } else if (plain !== null) lookedAt.push(code);
    levelCodes[levelCount++] = code;
    nonMissing += count;
    if (count > previous) inOrder = false;
    previous = count;
  }
  const split = { levelCodes: levelCodes.subarray(0, levelCount), missingCodes: Int32Array.from(missingCodes), nonMissing, inOrder };
  if (plain === null) return { ...split, looked: null };
  const codes = sortCodesByCount(Int32Array.from(lookedAt), counts);
  return { ...split, looked: { codes, levels: levelCountsOf(codes, textOf, counts), plain, plainCells, plainCharacters } };
}

/**
 * `profile` with its `levels` made by `make` the first time they are read, then kept: a million
 * identifiers' levels cost more than the rest of the profile, and drafting a recipe never reads
 * them (levelCount). Any copy of the profile made by spreading it reads them.
 */
function withLazyLevels(profile: ColumnProfile, make: () => readonly LevelCount[], source: LevelSource): ColumnProfile {
  let levels: readonly LevelCount[] | null = null;
  // Redefined where it stands, so that the keys keep their order (a profile written as JSON).
  const lazy = Object.defineProperty(profile, 'levels', { enumerable: true, configurable: true, get: () => (levels ??= make()) });
  levelSources.set(lazy, source);
  return lazy;
}

/**
 * How many levels `profile` keeps (null: none, as for a column stored as numbers), without making
 * a list that is made only when read (withLazyLevels).
 */
export function levelCount(profile: ColumnProfile): number | null {
  if (Object.getOwnPropertyDescriptor(profile, 'levels')?.get !== undefined) return profile.distinct;
  return profile.levels?.length ?? null;
}

/** `profile` with `numeric` replaced; levels made only when read stay so. */
function withNumeric(profile: ColumnProfile, numeric: NumericSummary): ColumnProfile {
  return withField(profile, 'numeric', numeric);
}

/**
 * `profile` with one field replaced, copied without reading its other fields: levels made only
 * when read stay so, and keep their source (levelSourceOf).
 */
export function withField<K extends keyof ColumnProfile>(profile: ColumnProfile, key: K, value: ColumnProfile[K]): ColumnProfile {
  const copy = Object.defineProperties({}, {
    ...Object.getOwnPropertyDescriptors(profile),
    [key]: { value, enumerable: true, configurable: true, writable: true },
  }) as ColumnProfile;
  const source = levelSources.get(profile);
  if (source !== undefined && key !== 'levels') levelSources.set(copy, source);
  return copy;
}

/**
 * A code's text: from `values`, or made alone from the bytes when plain values (which need none)
 * are nearly all of a packed column, so that `values` (a string for every value) is not made.
 */
function textsOf(column: TextColumn, plain: Uint8Array | null): (code: number) => string {
  let notPlain = 0;
  if (plain !== null) for (let code = 0; code < plain.length; code++) notPlain += 1 - plain[code]!;
  if (plain !== null && notPlain * 8 <= plain.length) return (code) => valueText(column, code);
  const values = column.values;
  return (code) => values[code] ?? '';
}

/** The levels whose text the profile reads, and what the plain ones (plain-values.ts) add up to. */
interface LookedAtLevels {
  /** Their codes and their levels, in the same order: most frequent first. */
  readonly codes: Int32Array;
  readonly levels: readonly LevelCount[];
  /** Per code, 1 for the plain values left out of `levels`; null when none was left out. */
  readonly plain: Uint8Array | null;
  readonly plainCells: number;
  /** The plain values' characters, each times its count (ASCII: a byte is a character). */
  readonly plainCharacters: number;
}

/**
 * Most frequent first; ties in dictionary order, which is first-appearance order. Left as it is
 * when already in order (an identifier column: every count 1).
 */
function sortCodesByCount(codes: Int32Array, counts: readonly number[]): Int32Array {
  for (let i = 1; i < codes.length; i++) {
    if ((counts[codes[i] ?? 0] ?? 0) > (counts[codes[i - 1] ?? 0] ?? 0)) {
      return codes.sort((a, b) => (counts[b] ?? 0) - (counts[a] ?? 0) || a - b);
    }
  }
  return codes;
}

function levelCountsOf(codes: Int32Array, textOf: (code: number) => string, counts: readonly number[]): LevelCount[] {
  const levels: LevelCount[] = new Array<LevelCount>(codes.length);
  for (let i = 0; i < codes.length; i++) {
    const code = codes[i] ?? 0;
    levels[i] = { value: textOf(code), count: counts[code] ?? 0 };
  }
  return levels;
}

/** Stable sort, most frequent first; skipped when already in order (identifier columns: all 1). */
function sortByCountDescending<T extends LevelCount>(entries: T[]): void {
  for (let i = 1; i < entries.length; i++) {
    if ((entries[i]?.count ?? 0) > (entries[i - 1]?.count ?? 0)) {
      entries.sort((a, b) => b.count - a.count);
      return;
    }
  }
}

function sumCounts(entries: readonly LevelCount[]): number {
  let total = 0;
  for (const e of entries) total += e.count;
  return total;
}

/**
 * Every text a number format reads starts, once trimmed, with a sign, a digit, a decimal
 * separator or the parenthesis of a negative amount (numbers.ts), or with its format's symbol
 * (mayBeNumberIn); a text starting with any other printable ASCII character reads as no
 * number in any format, and is set aside without running the readers (an identifier column holds
 * a million such texts).
 */
function mayBeNumber(text: string): boolean {
  const c = text.charCodeAt(0);
  if (c <= 0x20 || c >= 0x7f) return true; // blanks (trimmed first by the readers) and non-ASCII: ask the reader
  return mayStartNumber(c);
}

/** mayBeNumber, widened for a symbol before the number ("$12", "CHF 5"): the known ones, or the format's own. */
function mayBeNumberIn(format: NumberFormat | undefined): (text: string) => boolean {
  const symbol = format?.symbol;
  if (symbol === undefined) return format === undefined ? (text) => mayBeNumber(text) || knownSymbolOf(text) !== null : mayBeNumber;
  return (text) => mayBeNumber(text) || text.includes(symbol.text);
}

/**
 * The numbers of a text column's levels: those looked at are read, plain ones (plain-values.ts)
 * read as none. With a sign or unit in the format (which may stand inside a plain value), every
 * level is read (`everyLevel`).
 */
function summarizeTextNumbers(
  column: TextColumn,
  looked: LookedAtLevels,
  everyLevel: () => LookedAtLevels,
  nonMissing: number,
  fixedFormat: NumberFormat | undefined,
): NumericSummary | null {
  // Only the levels that may be numbers in some format are asked which format they are in.
  const mayBeInAnyFormat = mayBeNumberIn(undefined);
  const format = fixedFormat ?? detectNumberFormat(looked.levels.filter((level) => mayBeInAnyFormat(level.value)));
  const { codes, levels, plain, plainCells } = format.symbol !== undefined && looked.plain !== null ? everyLevel() : looked;
  const read = readLevelNumbers(levels, format);
  if (read.found === 0) return null;
  const invalidCount = read.invalidCount + plainCells;
  let invalidRows: NumericSummary['invalidExamples'] = [];
  if (invalidCount > 0) {
    // Plain values never read as numbers: invalid, all of them.
    const invalid = plain === null ? new Uint8Array(column.counts.length) : plain.slice();
    for (let i = 0; i < levels.length; i++) if (read.isInvalid[i] === 1) invalid[codes[i] ?? 0] = 1;
    invalidRows = firstInvalidRows(column, invalid);
  }
  return summarizeLevelNumbers({ ...read, invalidCount }, format, nonMissing, invalidRows);
}

/**
 * The numeric summary of a text column's profile read in another format, from its levels alone
 * (pure: no table needed), as profileColumn with that format gives it, except for the examples of
 * cells that do not read: one per distinct text, most frequent first, naming no row (the levels
 * do not know their rows).
 * For a profile without levels (a column stored as numbers) there is nothing to read again: throws.
 */
export function numericSummaryIn(profile: ColumnProfile, format: NumberFormat): NumericSummary | null {
  const levels = profile.levels;
  if (levels === null) throw new Error(`numericSummaryIn: the profile of "${profile.name}" keeps no levels to read again`);
  const read = readLevelNumbers(levels, format);
  if (read.found === 0) return null;
  const examples: { row?: number; text: string }[] = [];
  for (let i = 0; i < levels.length && examples.length < MAX_INVALID_EXAMPLES; i++) {
    if (read.isInvalid[i] === 1) examples.push({ text: levels[i]!.value });
  }
  return summarizeLevelNumbers(read, format, profile.count - profile.missing, examples);
}

/** The numbers a column's levels hold in one format, weighted by their counts, and which levels hold none. */
interface LevelNumbers {
  readonly numbers: Float64Array;
  readonly weights: Float64Array;
  readonly found: number;
  readonly invalidCount: number;
  readonly leadingZeros: number;
  /** 1 for each level (by index) that does not read as a number. */
  readonly isInvalid: Uint8Array;
}

function readLevelNumbers(levels: readonly LevelCount[], format: NumberFormat): LevelNumbers {
  const read = numberReader(format);
  const mayRead = mayBeNumberIn(format);
  // Grown as numbers are found: an identifier column's million levels need no room.
  let numbers = new Float64Array(64);
  let weights = new Float64Array(64);
  const isInvalid = new Uint8Array(levels.length);
  let found = 0;
  let invalidCount = 0;
  let leadingZeros = 0;
  for (let i = 0; i < levels.length; i++) {
    const { value: text, count } = levels[i]!;
    const value = mayRead(text) ? read(text) : NaN;
    if (Number.isNaN(value)) {
      isInvalid[i] = 1;
      invalidCount += count;
    } else {
      if (found === numbers.length) {
        numbers = grow(numbers);
        weights = grow(weights);
      }
      numbers[found] = value;
      weights[found++] = count;
      if (hasLeadingZero(text)) leadingZeros += count;
    }
  }
  return { numbers, weights, found, invalidCount, leadingZeros, isInvalid };
}

function summarizeLevelNumbers(
  read: LevelNumbers, format: NumberFormat, nonMissing: number, invalidExamples: NumericSummary['invalidExamples'],
): NumericSummary {
  const { numbers, weights, found, invalidCount, leadingZeros } = read;
  return summarize(runsFromPairs(numbers.subarray(0, found), weights.subarray(0, found)), { format, nonMissing, invalidCount, invalidExamples, leadingZeros });
}

/** The first invalid cells in row order: one scan over the codes, stopping at the cap. */
function firstInvalidRows(column: TextColumn, isInvalid: Uint8Array): { row: number; text: string }[] {
  const examples: { row: number; text: string }[] = [];
  for (let row = 0; row < column.length && examples.length < MAX_INVALID_EXAMPLES; row++) {
    const code = column.codes[row] ?? 0;
    if (isInvalid[code] === 1) examples.push({ row, text: valueText(column, code) });
  }
  return examples;
}

function textShape(looked: LookedAtLevels, nonMissing: number): TextShape {
  let dates = 0;
  // Plain values are no dates and hold no spaces: only their lengths count.
  let length = looked.plainCharacters;
  let withSpaces = 0;
  for (const { value, count } of looked.levels) {
    // Most values (an identifier column's million) have no blank at all: no trimmed copy, no regex.
    const blanks = maybeBlank(value);
    const t = blanks ? value.trim() : value;
    if (looksLikeDate(t)) dates += count;
    length += t.length * count;
    if (blanks && /\s/.test(t)) withSpaces += count;
  }
  return { dates, meanLength: nonMissing > 0 ? length / nonMissing : 0, withSpaces };
}

/**
 * False only when `text` surely holds no white space as `\s` and trim() see it: every character is
 * printable ASCII other than the space. Anything else (a space, a control character, any non-ASCII
 * character, some of which are Unicode spaces) is left to trim() and the regex.
 */
function maybeBlank(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c <= 0x20 || c >= 0x7f) return true;
  }
  return false;
}

// ---------------------------------------------------------------------------------------------
// Number columns: one pass over the Float64Array, reading the texts of the cells that keep one.

function profileNumberColumn(column: NumberColumn, index: number, options: ProfileOptions): ColumnProfile {
  const cells = countNumberCells(column, missingNumbers(options.missingTokens));
  return withInvalidExamples(profileNumberCells(cells, { name: column.name, index, length: column.length }, options), [column], options);
}

/**
 * A number column's profile from its cells counted (number-cells.ts), whole or in parts joined,
 * without examples of its invalid cells: finding them takes the cells themselves (withInvalidExamples).
 */
export function profileNumberCells(cells: NumberCells, column: { readonly name: string; readonly index: number; readonly length: number }, options: ProfileOptions): ColumnProfile {
  const isMissing = missingTest(options.missingTokens);
  const { length } = column;
  const { plain, plainCount, plainFractions, emptyCells } = cells;

  const exceptionTexts = splitByMissing(inFirstRowOrder(cells.texts), isMissing);
  const format = options.format ?? detectNumberFormat([
    ...exceptionTexts.nonMissing,
    // Plain cells speak for point decimals when they have fractions; whole numbers read in any format.
    { value: '0.5', count: plainFractions },
    { value: '1', count: plainCount - plainFractions },
  ]);
  const read = numberReader(format);

  // Plain numbers with a fraction do not read in a comma-decimal format: they become invalid cells.
  const plainInvalid = format.decimal === ',' ? plainFractions : 0;
  const fromExceptions = readExceptionNumbers(exceptionTexts.nonMissing, read);
  const { runs, distinctPlain } = numberRuns(plain, format.decimal === ',', fromExceptions);
  const nonMissing = plainCount + sumCounts(exceptionTexts.nonMissing);
  const invalidCount = plainInvalid + fromExceptions.invalidCount;
  const missingSpellings = exceptionTexts.missing;
  if (emptyCells > 0) missingSpellings.push({ value: '', count: emptyCells });
  sortByCountDescending(missingSpellings);

  const numeric = runs.length === 0 ? null : summarize(runs, { format, nonMissing, invalidCount, invalidExamples: [], leadingZeros: fromExceptions.leadingZeros });
  const distinct = distinctPlain + exceptionTexts.nonMissing.length;
  return {
    name: column.name,
    index: column.index,
    count: length,
    missing: length - nonMissing,
    missingSpellings,
    distinct,
    levels: null,
    numeric,
    flags: {
      identifier: looksLikeIdentifier(nonMissing, distinct, numeric, false),
      date: false,
      freeText: false,
      constant: distinct <= 1,
    },
    text: null,
  };
}

/**
 * A number column's profile with examples of its invalid cells, in row order, when it has any: a
 * second look at the cells, stopped at the cap. `parts`: the column profiled, whole or in
 * consecutive parts (each with its rows numbered from 0).
 */
export function withInvalidExamples(profile: ColumnProfile, parts: readonly NumberColumn[], options: ProfileOptions): ColumnProfile {
  const numeric = profile.numeric;
  if (numeric === null || numeric.invalidCount === 0) return profile;
  const { format } = numeric;
  const look = { codedMissing: missingNumbers(options.missingTokens), read: numberReader(format), isMissing: missingTest(options.missingTokens), format };
  const invalidExamples: { row: number; text: string }[] = [];
  let firstRow = 0;
  for (const part of parts) {
    if (invalidExamples.length >= MAX_INVALID_EXAMPLES) break;
    numberColumnInvalidRows(part, look, firstRow, invalidExamples);
    firstRow += part.length;
  }
  return withNumeric(profile, { ...numeric, invalidExamples });
}

/** Texts with their cells, in the order of their first rows: the order they appear in the file. */
function inFirstRowOrder(texts: ReadonlyMap<string, TextCells>): Map<string, number> {
  const entries = [...texts].sort((a, b) => a[1].firstRow - b[1].firstRow);
  return new Map(entries.map(([text, cells]) => [text, cells.count]));
}

/** Texts with their counts, split into missing and non-missing, in first-seen order. */
function splitByMissing(counts: ReadonlyMap<string, number>, isMissing: MissingTest): { missing: LevelCount[]; nonMissing: LevelCount[] } {
  const missing: LevelCount[] = [];
  const nonMissing: LevelCount[] = [];
  for (const [value, count] of counts) (isMissing(value) ? missing : nonMissing).push({ value, count });
  return { missing, nonMissing };
}

/** The numbers of the texts counted apart (exceptions, fixed decimals), one entry per text. */
interface ExceptionNumbers {
  readonly values: Float64Array;
  readonly counts: Float64Array;
  readonly invalidCount: number;
  readonly leadingZeros: number;
}

function readExceptionNumbers(texts: readonly LevelCount[], read: NumberReader): ExceptionNumbers {
  const values = new Float64Array(texts.length);
  const counts = new Float64Array(texts.length);
  let found = 0;
  let invalidCount = 0;
  let leadingZeros = 0;
  for (const { value, count } of texts) {
    const v = read(value);
    if (Number.isNaN(v)) {
      invalidCount += count;
      continue;
    }
    values[found] = v;
    counts[found++] = count;
    if (hasLeadingZero(value)) leadingZeros += count;
  }
  return { values: values.subarray(0, found), counts: counts.subarray(0, found), invalidCount, leadingZeros };
}

/**
 * The runs of a number column's numbers (the plain ones and the exceptions' numbers with their
 * counts), and how many distinct numbers the plain ones are. In a comma-decimal format
 * (`decimalComma`) only the plain whole numbers count: "2.5" does not read.
 */
function numberRuns(plain: NumberRuns, decimalComma: boolean, exceptions: ExceptionNumbers): { runs: NumberRuns; distinctPlain: number } {
  const counted = decimalComma ? wholeRuns(plain) : plain;
  const others = exceptions.values.length === 0 ? null : runsFromPairs(exceptions.values, exceptions.counts);
  return { runs: others === null ? counted : mergeRuns(counted, others), distinctPlain: counted.length };
}

/** What tells a number column's invalid cells: the column's missing spellings and its number format. */
interface InvalidLook {
  readonly codedMissing: ReadonlySet<number>;
  readonly read: NumberReader;
  readonly isMissing: MissingTest;
  readonly format: NumberFormat;
}

/**
 * Adds the invalid cells of a number-stored column to `examples` in row order (rows numbered from
 * `firstRow`), until it holds MAX_INVALID_EXAMPLES. The cells counted by their text
 * (number-cells.ts) are read from it.
 */
function numberColumnInvalidRows(column: NumberColumn, look: InvalidLook, firstRow: number, examples: { row: number; text: string }[]): void {
  const { codedMissing, read, isMissing, format } = look;
  const isException = exceptionRows(column);
  const { values, fixedDigits } = column;
  for (let row = 0; row < column.length && examples.length < MAX_INVALID_EXAMPLES; row++) {
    const v = values[row] ?? NaN;
    const countedByText = isException[row] === 1 || (fixedDigits !== null && fixedDigits[row]! > 0 && !Number.isNaN(v)) || (codedMissing.size > 0 && codedMissing.has(v));
    if (countedByText) {
      const text = cellText(column, row);
      if (!isMissing(text) && Number.isNaN(read(text))) examples.push({ row: firstRow + row, text });
    } else if (format.decimal === ',' && !Number.isNaN(v) && !Number.isInteger(v)) examples.push({ row: firstRow + row, text: String(v) });
  }
}

interface SummaryContext {
  readonly format: NumberFormat;
  readonly nonMissing: number;
  readonly invalidCount: number;
  readonly invalidExamples: NumericSummary['invalidExamples'];
  readonly leadingZeros: number;
}

/**
 * Statistics of non-empty runs. Mean from a compensated sum, variance by the corrected two-pass
 * formula (Chan, Golub & LeVeque 1983): Σw·d² − (Σw·d)²/n, which cancels the mean's rounding error.
 */
function summarize(runs: NumberRuns, context: SummaryContext): NumericSummary {
  let count = 0;
  let sum = 0;
  let compensation = 0;
  let integer = true;
  for (let i = 0; i < runs.length; i++) {
    const x = runs.values[i] ?? 0;
    const w = runs.counts[i] ?? 0;
    count += w;
    // Neumaier's variant of Kahan summation.
    const term = x * w;
    const next = sum + term;
    compensation += Math.abs(sum) >= Math.abs(term) ? sum - next + term : term - next + sum;
    sum = next;
    if (!Number.isInteger(x)) integer = false;
  }
  const mean = (sum + compensation) / count;
  let squares = 0;
  let deviations = 0;
  for (let i = 0; i < runs.length; i++) {
    const d = (runs.values[i] ?? 0) - mean;
    const w = runs.counts[i] ?? 0;
    squares += w * d * d;
    deviations += w * d;
  }
  const m2 = squares - (deviations * deviations) / count;
  const min = runs.values[0] ?? NaN;
  const max = runs.values[runs.length - 1] ?? NaN;
  return {
    count,
    share: context.nonMissing > 0 ? count / context.nonMissing : 0,
    format: context.format,
    min,
    max,
    mean,
    sd: count >= 2 ? Math.sqrt(Math.max(0, m2) / (count - 1)) : 0,
    median: weightedMedian(runs, count),
    invalidCount: context.invalidCount,
    invalidExamples: context.invalidExamples,
    histogram: histogram(runs, min, max),
    distinct: runs.length,
    integer,
    leadingZeros: context.leadingZeros,
  };
}

/** The middle value (or the mean of the two middle values) of the runs taken as one sorted list. */
function weightedMedian(runs: NumberRuns, count: number): number {
  const lowerPosition = Math.floor((count - 1) / 2);
  const upperPosition = Math.ceil((count - 1) / 2);
  return (valueAtPosition(runs, lowerPosition) + valueAtPosition(runs, upperPosition)) / 2;
}

function valueAtPosition(runs: NumberRuns, position: number): number {
  let seen = 0;
  for (let i = 0; i < runs.length; i++) {
    seen += runs.counts[i] ?? 0;
    if (position < seen) return runs.values[i] ?? NaN;
  }
  return NaN;
}

function histogram(runs: NumberRuns, min: number, max: number): NumericSummary['histogram'] {
  if (!(max > min)) {
    let total = 0;
    for (let i = 0; i < runs.length; i++) total += runs.counts[i] ?? 0;
    return { edges: [min, max], counts: [total] };
  }
  const width = (max - min) / HISTOGRAM_BINS;
  const edges = Array.from({ length: HISTOGRAM_BINS + 1 }, (_, i) => (i === HISTOGRAM_BINS ? max : min + i * width));
  const counts = new Array<number>(HISTOGRAM_BINS).fill(0);
  for (let i = 0; i < runs.length; i++) {
    const x = runs.values[i] ?? min;
    const bin = Math.min(HISTOGRAM_BINS - 1, Math.floor(((x - min) / (max - min)) * HISTOGRAM_BINS));
    counts[bin] = (counts[bin] ?? 0) + (runs.counts[i] ?? 0);
  }
  return { edges, counts };
}

// ---------------------------------------------------------------------------------------------
// Flags.

function isMostlyNumeric(numeric: NumericSummary | null): numeric is NumericSummary {
  return numeric !== null && numeric.share >= PROFILE_THRESHOLDS.numericShare;
}

function looksLikeIdentifier(
  nonMissing: number,
  distinct: number,
  numeric: NumericSummary | null,
  freeText: boolean,
): boolean {
  const t = PROFILE_THRESHOLDS;
  if (freeText || nonMissing < t.identifierMinValues || distinct < t.identifierDistinctShare * nonMissing) return false;
  if (!isMostlyNumeric(numeric)) return true;
  return numeric.integer === true && (countsRows(numeric) || (numeric.leadingZeros ?? 0) > 0 || oneWidth(numeric));
}

/** Whole numbers, each once, with no gaps: 1, 2, 3, … (or any run of consecutive numbers). */
export function countsRows(numeric: NumericSummary): boolean {
  return numeric.integer === true && numeric.distinct === numeric.count && numeric.max - numeric.min + 1 === numeric.count;
}

/** Non-negative whole numbers that all have the same number of digits, at least the minimum width. */
export function oneWidth(numeric: NumericSummary): boolean {
  if (numeric.integer !== true || numeric.min < 0) return false;
  const digits = (x: number): number => String(x).length;
  return digits(numeric.min) === digits(numeric.max) && digits(numeric.min) >= PROFILE_THRESHOLDS.identifierMinWidth;
}

function looksLikeFreeText(
  nonMissing: number,
  distinct: number,
  numeric: NumericSummary | null,
  text: TextShape,
): boolean {
  const t = PROFILE_THRESHOLDS;
  if (nonMissing < t.freeTextMinValues || (numeric !== null && numeric.share >= 0.5)) return false;
  const mostlyDistinctProse =
    distinct >= t.freeTextDistinctShare * nonMissing && text.meanLength >= t.freeTextMeanLength && text.withSpaces >= t.freeTextSpaceShare * nonMissing;
  const sentences = text.meanLength >= t.sentenceMeanLength && text.withSpaces >= t.sentenceSpaceShare * nonMissing;
  return mostlyDistinctProse || sentences;
}
