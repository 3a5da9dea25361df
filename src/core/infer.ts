/**
 * Inference: propose a level of measurement for each column, with a reason a person can read.
 * Written as an ordered list of rules; the first rule that matches wins.
 *
 * The rules see the profile and a context holding the proposed cleaning (trim, case-fold,
 * yes/no spelling merges) and the levels it leaves. Every reason is one sentence carrying the
 * numbers it rests on, so a person can check it against the profile.
 */
import { NO_CLEANING, cleanLevels, cleaner } from './cleaning.ts';

export { cleanLevels } from './cleaning.ts';
import { countText, percentText as percent } from './count-text.ts';
import { looksLikeDate } from './dates.ts';
import { matchOrdinalScale, MAX_SCALE_LEVELS } from './ordinal-scales.ts';
import { countsRows, levelCount, oneWidth, PROFILE_THRESHOLDS, type ColumnProfile, type LevelCount, type NumericSummary } from './profile.ts';
import { numberReader } from './numbers.ts';
import type { Cleaning, Merge, MeasurementLevel, NumberFormat } from './recipe.ts';

export interface Inference {
  readonly level: MeasurementLevel;
  /** One sentence, e.g. "2 distinct values (yes, no) after cleaning". */
  readonly reason: string;
  /** Proposed cleaning (trim / case-fold / merges such as y → yes) for categorical columns. */
  readonly cleaning: Cleaning;
  /** For ordinal: the suggested order of the cleaned levels, lowest first. */
  readonly order?: readonly string[];
  /** For binary: the suggested positive class (cleaned). */
  readonly positive?: string;
  /** Name of the rule that decided, e.g. "binary". */
  readonly rule?: string;
  /** Set when the column's name suggests a sensitive attribute of people: a caution to show beside it. */
  readonly caution?: string;
}

/** What every rule may consult besides the profile; computed once per column. */
export interface InferContext {
  /** Proposed cleaning of the levels (NO_CLEANING when the profile has no levels). */
  readonly cleaning: Cleaning;
  /**
   * Levels after that cleaning with their counts, most frequent first; null when the profile has
   * none. For a column with very many levels it is made when first read: a rule that needs only
   * their number reads `cleanedLevelCount`.
   */
  readonly cleanedLevels: readonly LevelCount[] | null;
  /** How many cleanedLevels there are (null: none). */
  readonly cleanedLevelCount: number | null;
  /** Non-missing cells. */
  readonly nonMissing: number;
}

export interface InferenceRule {
  /** Short name, kept in the inference so a person can see which rule decided. */
  readonly name: string;
  /** Returns an inference when the rule applies, null to let the next rule try. */
  test(profile: ColumnProfile, ctx: InferContext): Inference | null;
}

/** Where the rules draw their lines (see also PROFILE_THRESHOLDS for the flags). */
export const INFERENCE_THRESHOLDS = {
  /** Continuous: share of non-missing cells that read as numbers… */
  numericShare: PROFILE_THRESHOLDS.numericShare,
  /** …and more distinct numbers than this; at most this many, all numbers, read as an ordered scale. */
  maxScaleNumbers: 10,
} as const;

/** Spellings read as "yes" and as "no" when a whole column is written with them (compared in lower case). */
export const YES_SPELLINGS: readonly string[] = [
  'yes', 'y', 'true', 't', '1',
  // Exports from other languages' office programs and survey tools (common practice):
  // German, Dutch and the Nordic languages, French, Spanish and Italian, Portuguese, Polish.
  'ja', 'j', 'oui', 'sí', 'si', 'sim', 'tak',
];
export const NO_SPELLINGS: readonly string[] = ['no', 'n', 'false', 'f', '0', 'nein', 'nee', 'nej', 'nei', 'non', 'não', 'nao', 'nie'];
/** Levels taken as the positive class of a binary column (compared in lower case). */
export const POSITIVE_SPELLINGS: readonly string[] = [...YES_SPELLINGS, 'positive', 'pos', 'present', '+'];
const NEGATIVE_SPELLINGS: readonly string[] = [...NO_SPELLINGS, 'negative', 'neg', 'absent', '-'];

// ---------------------------------------------------------------------------------------------
// The rules, in the order they are tried.

const allMissing: InferenceRule = {
  name: 'all missing',
  test: (p) => {
    if (p.count === 0) return excluded('the column has no rows');
    if (p.missing < p.count) return null;
    return excluded(`all ${countText(p.count)} values are missing (${spellingList(p.missingSpellings)})`);
  },
};

const constant: InferenceRule = {
  name: 'constant',
  test: (p, ctx) => {
    if (ctx.cleanedLevelCount !== 1) return null;
    const only = ctx.cleanedLevels?.[0];
    if (only === undefined) return null;
    const spellings = p.distinct > 1 ? ` after cleaning (${countText(p.distinct)} spellings)` : '';
    const missing = p.missing > 0 ? `, ${countText(p.missing)} missing` : '';
    return {
      level: 'excluded',
      reason: `only one value${spellings}: ${quote(only.value)} in ${countText(only.count)} of ${countText(p.count)} rows${missing}`,
      cleaning: ctx.cleaning,
    };
  },
};

const date: InferenceRule = {
  name: 'date',
  test: (p, ctx) => {
    if (!p.flags.date || !p.text) return null;
    const example = p.levels?.find((l) => looksLikeDate(l.value))?.value.trim() ?? '';
    return excluded(
      `${countText(p.text.dates)} of ${countText(ctx.nonMissing)} values look like dates (e.g. ${quote(example)}): dates are left out for now`,
    );
  },
};

const binary: InferenceRule = {
  name: 'binary',
  test: (p, ctx) => {
    if (ctx.cleanedLevelCount !== 2) return null;
    const levels = ctx.cleanedLevels;
    if (levels === null) return null;
    const [first, second] = levels as [LevelCount, LevelCount];
    const { positive, why } = choosePositive(first, second);
    const after = p.distinct > 2 ? ` after cleaning (${countText(p.distinct)} spellings)` : '';
    return {
      level: 'binary',
      reason:
        `2 values${after}: ${quote(first.value)} (${countText(first.count)}) and ${quote(second.value)} (${countText(second.count)}); ` +
        `${quote(positive)} is the positive class ${why}`,
      cleaning: ctx.cleaning,
      positive,
    };
  },
};

const ordinalScale: InferenceRule = {
  name: 'ordinal scale',
  test: (_p, ctx) => {
    if (ctx.cleanedLevelCount === null || ctx.cleanedLevelCount > MAX_SCALE_LEVELS) return null;
    const levels = ctx.cleanedLevels;
    if (levels === null) return null;
    const match = matchOrdinalScale(levels.map((l) => l.value));
    if (match === null) return null;
    return {
      level: 'ordinal',
      reason: `${levels.length} values fit the ${match.scale} scale: ${match.order.join(' < ')}`,
      cleaning: ctx.cleaning,
      order: match.order,
    };
  },
};

const identifier: InferenceRule = {
  name: 'identifier',
  test: (p, ctx) => {
    if (!p.flags.identifier) return null;
    return { level: 'identifier', reason: identifierReason(p, ctx.nonMissing), cleaning: NO_CLEANING };
  },
};

const continuous: InferenceRule = {
  name: 'continuous',
  test: (p, ctx) => {
    const n = p.numeric;
    if (!isMostlyNumeric(n) || distinctNumbers(p, n) <= INFERENCE_THRESHOLDS.maxScaleNumbers) return null;
    const invalid =
      n.invalidCount > 0
        ? `; ${countText(n.invalidCount)} do not (e.g. ${quote(n.invalidExamples[0]?.text ?? '')})`
        : '';
    return {
      level: 'continuous',
      reason: `${countText(n.count)} of ${countText(ctx.nonMissing)} values read as numbers${symbolNote(n.format)} (${percent(n.share)}), ${countText(distinctNumbers(p, n))} distinct${invalid}`,
      cleaning: NO_CLEANING,
    };
  },
};

const freeText: InferenceRule = {
  name: 'free text',
  test: (p, ctx) => {
    if (!p.flags.freeText || !p.text) return null;
    return excluded(
      `${countText(p.distinct)} distinct texts in ${countText(ctx.nonMissing)} values, ${Math.round(p.text.meanLength)} characters on average: ` +
        'free text is left out',
    );
  },
};

const numberedScale: InferenceRule = {
  name: 'numbered scale',
  test: (p, ctx) => {
    const n = p.numeric;
    if (n === null || ctx.cleanedLevelCount === null || n.invalidCount > 0) return null;
    const distinct = distinctNumbers(p, n);
    const levels = ctx.cleanedLevels;
    if (distinct > INFERENCE_THRESHOLDS.maxScaleNumbers || levels === null) return null;
    const { order, merges } = numericOrder(levels, n);
    const cleaning = merges.length === 0 ? ctx.cleaning : { ...ctx.cleaning, merges: [...ctx.cleaning.merges, ...merges] };
    const kind = n.integer === true ? 'whole numbers' : 'numbers';
    return {
      level: 'ordinal',
      reason: `${countText(distinct)} distinct ${kind} from ${show(n.min)} to ${show(n.max)}: read as an ordered scale`,
      cleaning,
      order,
    };
  },
};

const nominal: InferenceRule = {
  name: 'nominal',
  test: (p, ctx) => {
    const count = ctx.cleanedLevelCount;
    if (count === null) {
      const share = p.numeric === null ? '0%' : percent(p.numeric.share);
      return excluded(
        `only ${share} of ${countText(ctx.nonMissing)} values read as numbers and ${countText(p.distinct)} distinct values are too many for categories`,
      );
    }
    const after = count < p.distinct ? ` after cleaning (${countText(p.distinct)} spellings)` : '';
    return {
      level: 'nominal',
      reason: `${countText(count)} distinct values${after} with no order recognised${almostNumbersHint(p)}`,
      cleaning: ctx.cleaning,
    };
  },
};

/** The rules in the order they are tried. The last one always matches. */
export const INFERENCE_RULES: readonly InferenceRule[] = [
  allMissing,
  constant,
  date,
  binary,
  ordinalScale,
  identifier,
  continuous,
  freeText,
  numberedScale,
  nominal,
];

export function inferLevel(profile: ColumnProfile, rules: readonly InferenceRule[] = INFERENCE_RULES): Inference {
  const ctx = inferenceContext(profile);
  const caution = sensitiveAttributeCaution(profile.name);
  for (const rule of rules) {
    const found = rule.test(profile, ctx);
    if (found !== null) return { ...found, rule: rule.name, ...(caution === null ? {} : { caution }) };
  }
  // Only reachable with a custom rule list lacking a catch-all.
  return { level: 'excluded', reason: 'no rule matched this column', cleaning: NO_CLEANING };
}

/**
 * Above this many levels no cleaning is proposed: such a column is an identifier or free text,
 * whose inference carries no cleaning, and checking a million levels for case twins costs seconds.
 */
export const CLEANING_PROPOSAL_MAX_LEVELS = 100_000;

export function inferenceContext(profile: ColumnProfile): InferContext {
  const nonMissing = profile.count - profile.missing;
  const count = levelCount(profile);
  if (count === null) return { cleaning: NO_CLEANING, cleanedLevels: null, cleanedLevelCount: null, nonMissing };
  if (count > CLEANING_PROPOSAL_MAX_LEVELS) {
    // The profile's own levels, read only if a rule asks for them (an identifier's million are not).
    return Object.defineProperty({ cleaning: NO_CLEANING, cleanedLevelCount: count, nonMissing }, 'cleanedLevels', {
      enumerable: true,
      get: () => profile.levels,
    }) as InferContext;
  }
  const levels = profile.levels ?? [];
  const cleaning = proposeCleaning(levels);
  // Without cleaning the levels are already what cleanLevels would give: skip the copy.
  const cleanedLevels = isNoCleaning(cleaning) ? levels : cleanLevels(levels, cleaning);
  return { cleaning, cleanedLevels, cleanedLevelCount: cleanedLevels.length, nonMissing };
}

// ---------------------------------------------------------------------------------------------
// Cleaning proposals.

/**
 * Trim when any level has surrounding white space; case-fold when two levels differ only by
 * case; when every level is a yes/no spelling (y, true, 1 / n, false, 0 …), merge each side's
 * spellings into its most frequent one.
 */
export function proposeCleaning(levels: readonly LevelCount[]): Cleaning {
  const trim = levels.some((l) => l.value !== l.value.trim());
  const caseFold = differOnlyByCase(trim ? levels.map((l) => l.value.trim()) : levels.map((l) => l.value));
  const partial: Cleaning = { trim, caseFold, merges: [] };
  return { ...partial, merges: yesNoMerges(levels, partial) };
}

/** Levels after `cleaning`, counts added up, most frequent first (ties: first in `levels` first). */

function isNoCleaning(cleaning: Cleaning): boolean {
  return !cleaning.trim && !cleaning.caseFold && cleaning.merges.length === 0;
}

function differOnlyByCase(values: readonly string[]): boolean {
  const seen = new Map<string, string>();
  for (const v of values) {
    const lower = v.toLowerCase();
    // A text without cased letters (a number, "18-24") has no case twin: skip it.
    if (lower === v && v.toUpperCase() === v) continue;
    const other = seen.get(lower);
    if (other !== undefined && other !== v) return true;
    seen.set(lower, v);
  }
  return false;
}

/** Gives up at the first level that is no yes/no spelling, so long columns cost little. */
function yesNoMerges(levels: readonly LevelCount[], partial: Cleaning): Merge[] {
  const clean = cleaner(partial);
  for (const { value } of levels) if (sideOf(clean(value)) === null) return [];
  const yes: string[] = [];
  const no: string[] = [];
  // cleanLevels is most frequent first, so each side's first spelling is the one the others join.
  for (const { value } of cleanLevels(levels, partial)) (sideOf(value) === 'yes' ? yes : no).push(value);
  return [yes, no].flatMap(([into, ...from]) => (into !== undefined && from.length > 0 ? [{ into, from }] : []));
}

function sideOf(value: string): 'yes' | 'no' | null {
  const lower = value.toLowerCase();
  return YES_SPELLINGS.includes(lower) ? 'yes' : NO_SPELLINGS.includes(lower) ? 'no' : null;
}

function choosePositive(first: LevelCount, second: LevelCount): { positive: string; why: string } {
  const isPositive = (l: LevelCount): boolean => POSITIVE_SPELLINGS.includes(l.value.toLowerCase());
  const isNegative = (l: LevelCount): boolean => NEGATIVE_SPELLINGS.includes(l.value.toLowerCase());
  if (isPositive(first) && !isPositive(second)) return { positive: first.value, why: '(it reads as yes)' };
  if (isPositive(second) && !isPositive(first)) return { positive: second.value, why: '(it reads as yes)' };
  if (isNegative(first) && !isNegative(second)) return { positive: second.value, why: '(the other reads as no)' };
  if (isNegative(second) && !isNegative(first)) return { positive: first.value, why: '(the other reads as no)' };
  // Levels are most frequent first; on a tie the later seen one is taken.
  return { positive: second.value, why: first.count === second.count ? '(equal counts: the later seen)' : '(the less frequent)' };
}

/** Cleaned levels in numeric order; spellings of one number ("1", "1.0") merge into the most frequent. */
function numericOrder(levels: readonly LevelCount[], numeric: NumericSummary): { order: string[]; merges: Merge[] } {
  const read = numberReader(numeric.format);
  const byNumber = new Map<number, string[]>();
  for (const { value } of levels) {
    const n = read(value);
    byNumber.set(n, [...(byNumber.get(n) ?? []), value]);
  }
  const numbers = [...byNumber.keys()].sort((a, b) => a - b);
  const order: string[] = [];
  const merges: Merge[] = [];
  for (const n of numbers) {
    const [into, ...from] = byNumber.get(n) ?? [];
    if (into === undefined) continue;
    order.push(into);
    if (from.length > 0) merges.push({ into, from });
  }
  return { order, merges };
}

// ---------------------------------------------------------------------------------------------
// Sentences.

function identifierReason(p: ColumnProfile, nonMissing: number): string {
  const head = `${countText(p.distinct)} of ${countText(nonMissing)} values distinct`;
  const n = p.numeric;
  if (!isMostlyNumeric(n)) return `${head}: looks like an identifier`;
  if (countsRows(n)) return `${head}, whole numbers ${show(n.min)} to ${show(n.max)} without gaps: looks like a row number`;
  if ((n.leadingZeros ?? 0) > 0) return `${head}, ${countText(n.leadingZeros ?? 0)} written with leading zeros: looks like a code`;
  if (oneWidth(n)) return `${head}, all ${String(n.min).length}-digit whole numbers: looks like an identifier`;
  return `${head}: looks like an identifier`;
}

/** Distinct numbers; hand-written summaries without the count fall back to the distinct raw values. */
function distinctNumbers(p: ColumnProfile, n: NumericSummary): number {
  return n.distinct ?? p.distinct;
}

/** For a few numbers with a stray word ("1"…"5" and "n/a"): say what would make them a scale. */
function almostNumbersHint(p: ColumnProfile): string {
  const n = p.numeric;
  if (!isMostlyNumeric(n) || n.invalidCount === 0 || distinctNumbers(p, n) > INFERENCE_THRESHOLDS.maxScaleNumbers) return '';
  const stray = [...new Set(n.invalidExamples.map((e) => e.text))].slice(0, 3).map(quote).join(', ');
  return `; all but ${countText(n.invalidCount)} are numbers: marking ${stray} as missing would read them as an ordered scale`;
}

/** ' written with "€"' when the numbers carry a currency or percent sign, so that the reason explains why "€ 12" counts. */
function symbolNote(format: NumberFormat): string {
  return format.symbol === undefined ? '' : ` written with ${quote(format.symbol.text)}`;
}

function excluded(reason: string): Inference {
  return { level: 'excluded', reason, cleaning: NO_CLEANING };
}

function isMostlyNumeric(n: NumericSummary | null): n is NumericSummary {
  return n !== null && n.share >= INFERENCE_THRESHOLDS.numericShare;
}

function spellingList(spellings: readonly LevelCount[]): string {
  return spellings.map((s) => `${s.value.trim() === '' ? 'empty' : quote(s.value)} ${countText(s.count)}`).join(', ');
}

function quote(text: string): string {
  return `"${text}"`;
}


function show(x: number): string {
  return Number.isInteger(x) ? String(x) : String(Number(x.toPrecision(6)));
}

// ---------------------------------------------------------------------------------------------
// Caution for sensitive attributes of people.

/** Words in a column name that suggest a sensitive attribute of people (common practice, not a legal list). */
export const SENSITIVE_NAME_WORDS: readonly string[] = [
  'sex', 'gender', 'race', 'racial', 'ethnic', 'ethnicity', 'religion', 'religious', 'faith', 'disability',
  'disabled', 'health', 'diagnosis', 'pregnant', 'pregnancy', 'orientation', 'nationality', 'citizenship',
  'immigration', 'marital', 'age', 'birth', 'dob', 'political', 'union', 'criminal', 'caste',
];

/**
 * A caution when the column's name suggests a sensitive attribute, else null. Matching is by
 * whole word ("Age band" and "ageBand" match, "usage" does not).
 */
export function sensitiveAttributeCaution(name: string): string | null {
  const words = name
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase()
    .split(/[^a-z]+/);
  if (!words.some((w) => SENSITIVE_NAME_WORDS.includes(w))) return null;
  return (
    `${quote(name)} may describe a sensitive attribute of people: using it in a model that decides about people ` +
    'can be unlawful or unfair, so check local law and have the use reviewed'
  );
}
