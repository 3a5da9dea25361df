/**
 * Fitting: turn a profile and a person's decisions into a complete recipe column — the levels
 * after cleaning and grouping with their counts, the reference level, fitted statistics.
 * Everything here is per level, computed from the profile alone: no pass over the rows.
 */
import { cleanLevels } from './cleaning.ts';
import { inferLevel, type Inference } from './infer.ts';
import { MAX_CATEGORICAL_LEVELS, WIDE_DRAFT_KEEP_TOP, tooManyLevelsError, wideDraftNote } from './level-limit.ts';
import { nameOutputs } from './names.ts';
import { sameNumberFormat } from './numbers.ts';
import { levelCount, numericSummaryIn, type ColumnProfile, type LevelCount, type NumericSummary } from './profile.ts';
import {
  DEFAULT_MISSING_TOKENS,
  RECIPE_KIND,
  RECIPE_VERSION,
  type BinaryColumn,
  type CategoricalColumn,
  type Cleaning,
  type ColumnRecipe,
  type ContinuousColumn,
  type FittedLevel,
  type MeasurementLevel,
  type NominalColumn,
  type NumberFormat,
  type OrdinalColumn,
  type Recipe,
} from './recipe.ts';

/** The level that missing cells become under the "level" missing policy. */
export const MISSING_LEVEL = '(missing)';
/** Default name of the level rare (and optionally unseen) values join. */
export const OTHER_LEVEL = '(other)';
export const SET_BY_HAND = 'set by hand';

export interface DraftOptions {
  readonly missingTokens?: readonly string[];
  readonly delimiter?: Recipe['reading']['delimiter'];
  readonly naming?: Recipe['naming'];
}

/** The recipe Levelwise proposes for a table: inferred levels, default encodings, fitted on it. */
export function draftRecipe(
  profiles: readonly ColumnProfile[],
  source: { readonly file: string | null; readonly rows: number },
  options: DraftOptions = {},
): Recipe {
  const recipe: Recipe = {
    kind: RECIPE_KIND,
    version: RECIPE_VERSION,
    source: { file: source.file, rows: source.rows, columns: profiles.map((p) => p.name) },
    reading: { delimiter: options.delimiter ?? null, missingTokens: [...(options.missingTokens ?? DEFAULT_MISSING_TOKENS)] },
    naming: options.naming ?? 'readable',
    columns: profiles.map((profile) => draftColumn(profile)),
  };
  return nameOutputs(recipe);
}

/** A recipe column for `profile` at the given level (default: the inferred one), fitted. */
export function draftColumn(profile: ColumnProfile, level?: MeasurementLevel, inference: Inference = inferLevel(profile)): ColumnRecipe {
  const chosen = level ?? inference.level;
  const reason = level === undefined || level === inference.level ? inference.reason : SET_BY_HAND;
  const base = { name: profile.name, reason, outputs: [] as string[] };
  const hasMissing = profile.missing > 0;
  switch (chosen) {
    case 'identifier':
    case 'excluded':
      return { ...base, level: chosen };
    case 'continuous':
      return refitColumn(
        {
          ...base,
          level: 'continuous',
          scaling: 'none',
          format: profile.numeric?.format ?? { decimal: '.', group: '' },
          invalid: 'missing',
          missing: { policy: 'mean', indicator: hasMissing },
          fitted: { count: 0, mean: 0, sd: 0, min: 0, max: 0, median: 0 },
        },
        profile,
      );
    case 'nominal': {
      const wide = levelsOverLimit(profile, inference.cleaning);
      return refitColumn(
        {
          ...base,
          ...categoricalDefaults(inference.cleaning, hasMissing),
          ...(wide === null ? {} : { reason: base.reason + wideDraftNote(wide) }),
          level: 'nominal',
          coding: 'one-hot',
          reference: null,
          rare: { minCount: null, minShare: null, keepTop: wide === null ? null : WIDE_DRAFT_KEEP_TOP },
        },
        profile,
      );
    }
    case 'ordinal':
      return refitColumn(
        {
          ...base,
          ...categoricalDefaults(inference.cleaning, hasMissing),
          missing: { policy: hasMissing ? 'most-frequent' : 'zeros', indicator: hasMissing },
          level: 'ordinal',
          coding: 'rank',
          start: 1,
          scores: null,
          levels: (inference.order ?? []).map((value) => ({ value, count: 0 })),
        },
        profile,
      );
    case 'binary':
      return refitColumn(
        {
          ...base,
          ...categoricalDefaults(inference.cleaning, hasMissing),
          missing: { policy: 'zeros', indicator: hasMissing },
          level: 'binary',
          positive: inference.positive ?? '',
        },
        profile,
      );
  }
}

/** The levels a nominal column would have: `levels` in all, one of them for missing values when `missingLevel`. */
export interface LevelTally {
  readonly levels: number;
  readonly missingLevel: boolean;
}

/**
 * The levels a nominal column of `profile` would have with `cleaning` and no grouping (missing
 * values a level of their own), when that is more than a column can encode; null when it fits.
 */
export function levelsOverLimit(profile: ColumnProfile, cleaning: Cleaning): LevelTally | null {
  const count = levelCount(profile);
  if (count === null || count + 1 <= MAX_CATEGORICAL_LEVELS) return null;
  const missingLevel = profile.missing > 0;
  const levels = cleanLevels(profile.levels ?? [], cleaning).length + (missingLevel ? 1 : 0);
  return levels > MAX_CATEGORICAL_LEVELS ? { levels, missingLevel } : null;
}

function categoricalDefaults(cleaning: Cleaning, hasMissing: boolean) {
  return {
    cleaning,
    missing: { policy: hasMissing ? ('level' as const) : ('zeros' as const), indicator: false },
    unseen: 'zeros' as const,
    otherLabel: OTHER_LEVEL,
    levels: [] as FittedLevel[],
    grouped: [] as string[],
    fittedRows: 0,
  };
}

/** Recomputes everything a column learns from data, keeping every decision it holds. */
export function refitColumn<C extends ColumnRecipe>(column: C, profile: ColumnProfile): C {
  switch (column.level) {
    case 'continuous':
      return refitContinuous(column, profile) as C;
    case 'nominal':
      return refitNominal(column, profile) as C;
    case 'ordinal':
      return refitOrdinal(column, profile) as C;
    case 'binary':
      return refitBinary(column, profile) as C;
    default:
      return column;
  }
}

function refitContinuous(column: ContinuousColumn, profile: ColumnProfile): ContinuousColumn {
  const n = numbersInFormat(profile, column.format);
  const fitted = n
    ? { count: n.count, mean: n.mean, sd: n.sd, min: n.min, max: n.max, median: n.median }
    : { count: 0, mean: 0, sd: 0, min: 0, max: 0, median: 0 };
  return { ...column, fitted };
}

/**
 * The profile as a column's decisions read it: a continuous column's numbers in the format the
 * person chose, for the page to show what the recipe will read.
 */
export function profileAsDecided(profile: ColumnProfile, column: ColumnRecipe): ColumnProfile {
  if (column.level !== 'continuous') return profile;
  const numeric = numbersInFormat(profile, column.format);
  return numeric === profile.numeric ? profile : { ...profile, numeric };
}

/**
 * The profile's numbers in the column's format: as profiled when the formats agree, read again
 * from the levels when the person chose another format (a column stored as numbers keeps no
 * levels; decisions.ts refuses another format for it).
 */
export function numbersInFormat(profile: ColumnProfile, format: NumberFormat): NumericSummary | null {
  const n = profile.numeric;
  if (profile.levels === null || (n !== null && sameNumberFormat(n.format, format))) return n;
  return numericSummaryIn(profile, format);
}


function refitNominal(column: NominalColumn, profile: ColumnProfile): NominalColumn {
  const all = cleanLevels(profile.levels ?? [], column.cleaning).filter((l) => l.value !== column.otherLabel);
  const { kept, grouped } = splitRare(all, column.rare, profile.count);
  const otherCount = grouped.reduce((sum, l) => sum + l.count, 0);
  const levels: FittedLevel[] = [...kept];
  if (grouped.length > 0 || column.unseen === 'other') levels.push({ value: column.otherLabel, count: otherCount });
  addMissingLevel(levels, column, profile);
  if (levels.length > MAX_CATEGORICAL_LEVELS) throw tooManyLevelsError(column.name, levels.length);
  const values = levels.map((l) => l.value);
  const reference = column.reference !== null && values.includes(column.reference) ? column.reference : (values[0] ?? null);
  return { ...column, levels, grouped: grouped.map((l) => l.value), reference, fittedRows: profile.count };
}

/** Applies the rare-level rules; a level is kept only when it passes every rule that is switched on. */
export function splitRare(levels: readonly LevelCount[], rare: NominalColumn['rare'], rows: number) {
  const kept: FittedLevel[] = [];
  const grouped: FittedLevel[] = [];
  levels.forEach((level, rankByCount) => {
    const tooFew = rare.minCount !== null && level.count < rare.minCount;
    const tooSmall = rare.minShare !== null && rows > 0 && level.count / rows < rare.minShare;
    const outsideTop = rare.keepTop !== null && rankByCount >= rare.keepTop;
    (tooFew || tooSmall || outsideTop ? grouped : kept).push({ value: level.value, count: level.count });
  });
  return { kept, grouped };
}

function addMissingLevel(levels: FittedLevel[], column: CategoricalColumn, profile: ColumnProfile): void {
  if (column.missing.policy !== 'level') return;
  const existing = levels.find((l) => l.value === MISSING_LEVEL);
  if (existing) levels[levels.indexOf(existing)] = { value: MISSING_LEVEL, count: existing.count + profile.missing };
  else levels.push({ value: MISSING_LEVEL, count: profile.missing });
}

/** Ordinal columns keep the person's order; levels that appeared since are appended, vanished ones dropped. */
function refitOrdinal(column: OrdinalColumn, profile: ColumnProfile): OrdinalColumn {
  const counted = new Map(cleanLevels(profile.levels ?? [], column.cleaning).map((l) => [l.value, l.count]));
  if (column.missing.policy === 'level') counted.set(MISSING_LEVEL, (counted.get(MISSING_LEVEL) ?? 0) + profile.missing);
  if (column.unseen === 'other' && !counted.has(column.otherLabel)) counted.set(column.otherLabel, 0);
  if (counted.size > MAX_CATEGORICAL_LEVELS) throw tooManyLevelsError(column.name, counted.size);
  const previousOrder = column.levels.map((l) => l.value).filter((v) => counted.has(v));
  const order = [...new Set(previousOrder)];
  for (const value of counted.keys()) if (!order.includes(value)) order.push(value);
  const previousScores = new Map(column.levels.map((l, i) => [l.value, column.scores?.[i]]));
  const scores = column.scores === null ? null : order.map((v, i) => previousScores.get(v) ?? i + column.start);
  return {
    ...column,
    levels: order.map((value) => ({ value, count: counted.get(value) ?? 0 })),
    scores,
    grouped: [],
    fittedRows: profile.count,
  };
}

function refitBinary(column: BinaryColumn, profile: ColumnProfile): BinaryColumn {
  const levels: FittedLevel[] = cleanLevels(profile.levels ?? [], column.cleaning);
  addMissingLevel(levels, column, profile);
  if (levels.length > MAX_CATEGORICAL_LEVELS) throw tooManyLevelsError(column.name, levels.length);
  const values = levels.map((l) => l.value);
  // Without a stated positive class, the less frequent of the first two levels is the event coded 1.
  const positive = values.includes(column.positive) ? column.positive : (values[1] ?? values[0] ?? '');
  return { ...column, levels, positive, grouped: [], fittedRows: profile.count };
}
