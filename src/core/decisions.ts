/**
 * Decisions: every change a person can make to a recipe, as data. `decide` is a pure function
 * (recipe, decision, profiles) → new recipe; the page's undo history, the worker and the command
 * line's options all go through it, so a decision means the same thing everywhere.
 */
import { countText, percentText } from './count-text.ts';
import { draftColumn, levelsOverLimit, numbersInFormat, refitColumn, SET_BY_HAND } from './fit.ts';
import { inferLevel } from './infer.ts';
import { wideDraftNote } from './level-limit.ts';
import { nameOutputs } from './names.ts';
import { LevelwiseError } from './errors.ts';
import { numberFormatExample, sameNumberFormat } from './numbers.ts';
import type { ColumnProfile } from './profile.ts';
import { NumberFormat } from './recipe.ts';
import type {
  CategoricalMissing,
  ContinuousMissing,
  MeasurementLevel,
  NominalColumn,
  OrdinalColumn,
  ColumnRecipe,
  ContinuousColumn,
  RareGrouping,
  Recipe,
  UnseenPolicy,
} from './recipe.ts';

export type Decision =
  | { readonly type: 'set-level'; readonly column: string; readonly level: MeasurementLevel }
  | { readonly type: 'set-nominal-coding'; readonly column: string; readonly coding: NominalColumn['coding'] }
  | { readonly type: 'set-ordinal-coding'; readonly column: string; readonly coding: OrdinalColumn['coding'] }
  | { readonly type: 'set-scaling'; readonly column: string; readonly scaling: ContinuousColumn['scaling'] }
  | { readonly type: 'set-reference'; readonly column: string; readonly reference: string }
  | { readonly type: 'set-positive'; readonly column: string; readonly positive: string }
  | { readonly type: 'set-start'; readonly column: string; readonly start: 0 | 1 }
  | { readonly type: 'set-scores'; readonly column: string; readonly scores: readonly number[] }
  | { readonly type: 'set-order'; readonly column: string; readonly order: readonly string[] }
  | { readonly type: 'reverse-order'; readonly column: string }
  | { readonly type: 'set-cleaning'; readonly column: string; readonly trim?: boolean; readonly caseFold?: boolean }
  | { readonly type: 'merge-levels'; readonly column: string; readonly from: readonly string[]; readonly into: string }
  | { readonly type: 'undo-merge'; readonly column: string; readonly into: string }
  | { readonly type: 'set-rare'; readonly column: string; readonly rare: RareGrouping }
  | { readonly type: 'set-categorical-missing'; readonly column: string; readonly missing: CategoricalMissing }
  | { readonly type: 'set-continuous-missing'; readonly column: string; readonly missing: ContinuousMissing }
  | { readonly type: 'set-unseen'; readonly column: string; readonly unseen: UnseenPolicy }
  | { readonly type: 'set-invalid'; readonly column: string; readonly invalid: 'missing' | 'error' }
  | { readonly type: 'set-number-format'; readonly column: string; readonly format: NumberFormat }
  | { readonly type: 'set-other-label'; readonly column: string; readonly label: string }
  | { readonly type: 'set-naming'; readonly naming: Recipe['naming'] };

/** Applies one decision and refits the column it touches; returns a new recipe. Unknown columns are an error. */
export function decide(recipe: Recipe, decision: Decision, profiles: readonly ColumnProfile[]): Recipe {
  if (decision.type === 'set-naming') return nameOutputs({ ...recipe, naming: decision.naming });
  const index = recipe.columns.findIndex((c) => c.name === decision.column);
  const column = recipe.columns[index];
  const profile = profiles.find((p) => p.name === decision.column);
  if (!column || !profile) throw new Error(`No column named "${decision.column}" in this recipe and profile.`);
  const changed = refitColumn(changeColumn(column, decision, profile), profile);
  const columns = recipe.columns.map((c, i) => (i === index ? changed : c));
  return nameOutputs({ ...recipe, columns });
}

/** The column after one decision, before refitting. Decisions that do not fit the column's level leave it as is. */
function changeColumn(column: ColumnRecipe, d: Exclude<Decision, { type: 'set-naming' }>, profile: ColumnProfile): ColumnRecipe {
  switch (d.type) {
    case 'set-level':
      return changeLevel(column, d.level, profile);
    case 'set-nominal-coding':
      return column.level === 'nominal' ? { ...column, coding: d.coding, reason: column.reason } : column;
    case 'set-ordinal-coding':
      if (column.level !== 'ordinal') return column;
      return { ...column, coding: d.coding, scores: d.coding === 'scores' ? (column.scores ?? column.levels.map((_, i) => i + column.start)) : column.scores };
    case 'set-scaling':
      return column.level === 'continuous' ? { ...column, scaling: d.scaling } : column;
    case 'set-reference':
      return column.level === 'nominal' ? { ...column, reference: d.reference } : column;
    case 'set-positive':
      return column.level === 'binary' ? { ...column, positive: d.positive } : column;
    case 'set-start':
      return column.level === 'ordinal' ? { ...column, start: d.start } : column;
    case 'set-scores':
      return column.level === 'ordinal' ? { ...column, coding: 'scores', scores: [...d.scores] } : column;
    case 'set-order':
      return column.level === 'ordinal' ? reorder(column, d.order) : column;
    case 'reverse-order':
      return column.level === 'ordinal' ? reorder(column, column.levels.map((l) => l.value).reverse()) : column;
    case 'set-cleaning':
      if (!isCategorical(column)) return column;
      return { ...column, cleaning: { ...column.cleaning, trim: d.trim ?? column.cleaning.trim, caseFold: d.caseFold ?? column.cleaning.caseFold } };
    case 'merge-levels':
      return isCategorical(column) ? mergeLevels(column, d.from, d.into) : column;
    case 'undo-merge':
      if (!isCategorical(column)) return column;
      return { ...column, cleaning: { ...column.cleaning, merges: column.cleaning.merges.filter((m) => m.into !== d.into) } };
    case 'set-rare':
      return column.level === 'nominal' ? { ...column, rare: d.rare } : column;
    case 'set-categorical-missing':
      return isCategorical(column) ? { ...column, missing: d.missing } : column;
    case 'set-continuous-missing':
      return column.level === 'continuous' ? { ...column, missing: d.missing } : column;
    case 'set-unseen':
      if (!isCategorical(column)) return column;
      // A binary column has no "other" level to send unseen values to.
      return column.level === 'binary' && d.unseen === 'other' ? column : { ...column, unseen: d.unseen };
    case 'set-invalid':
      return column.level === 'continuous' ? { ...column, invalid: d.invalid } : column;
    case 'set-number-format': {
      if (column.level !== 'continuous') return column;
      const format = numberFormatFor(d.format, profile);
      return sameNumberFormat(format, column.format) ? column : { ...column, format, reason: numberFormatReason(profile, format) };
    }
    case 'set-other-label':
      return isCategorical(column) && d.label.trim() !== '' ? { ...column, otherLabel: d.label } : column;
  }
}

/**
 * A format the column's profile can be read again in: a text column's levels can be, in any
 * format; a column stored as numbers (every cell plain decimal text) keeps no levels, so only the
 * format it was profiled in fits it.
 */
function numberFormatFor(format: NumberFormat, profile: ColumnProfile): NumberFormat {
  const parsed = NumberFormat.safeParse(format);
  if (!parsed.success) {
    const symbol = format.symbol?.text ?? '';
    throw new LevelwiseError('bad-number-format', `“${symbol}” cannot be the symbol of “${profile.name}”'s numbers: ${parsed.error.issues[0]?.message ?? 'not a number format'}.`, {
      hint: 'Give the sign or unit as it is written beside the numbers, without the number or spaces: “€”, “%”, “kg”.',
    });
  }
  const profiled = profile.numeric?.format;
  if (profile.levels === null && (profiled === undefined || !sameNumberFormat(profiled, format))) {
    throw new LevelwiseError('number-format-fixed', `The numbers of “${profile.name}” are all plain decimal numbers; they cannot be read in another format.`, {
      hint: 'Only a column with text among its numbers (“1.234,5”, “12 %”, “€ 5”) has a format to choose.',
    });
  }
  return parsed.data;
}

/**
 * The reason a column gets when its number format is chosen by hand: the draft's reason counted
 * the numbers read in the detected format, which no longer holds.
 */
function numberFormatReason(profile: ColumnProfile, format: NumberFormat): string {
  const written = `numbers written like "${numberFormatExample(format) ?? '1234.5'}"`;
  const nonMissing = countText(profile.count - profile.missing);
  const read = numbersInFormat(profile, format);
  if (read === null) return `${SET_BY_HAND}: ${written}; none of the ${nonMissing} values read so`;
  return `${SET_BY_HAND}: ${written}; ${countText(read.count)} of ${nonMissing} values read so (${percentText(read.share)})`;
}

function isCategorical(column: ColumnRecipe): column is Extract<ColumnRecipe, { level: 'nominal' | 'ordinal' | 'binary' }> {
  return column.level === 'nominal' || column.level === 'ordinal' || column.level === 'binary';
}

/** A new level keeps the cleaning the person already did on the column. */
function changeLevel(column: ColumnRecipe, level: MeasurementLevel, profile: ColumnProfile): ColumnRecipe {
  if (column.level === level) return column;
  const inference = inferLevel(profile);
  const cleaning = isCategorical(column) ? column.cleaning : inference.cleaning;
  const drafted = draftColumn(profile, level, { ...inference, cleaning });
  // A nominal column too wide to encode whole is drafted with its rare levels grouped: say so.
  const wide = level === 'nominal' ? levelsOverLimit(profile, cleaning) : null;
  return { ...drafted, reason: wide === null ? SET_BY_HAND : SET_BY_HAND + wideDraftNote(wide) };
}

/** Levels named in `order` move to the front in that order; any others keep their relative order after them. */
function reorder(column: OrdinalColumn, order: readonly string[]): OrdinalColumn {
  const byValue = new Map(column.levels.map((l, i) => [l.value, { level: l, score: column.scores?.[i] }]));
  const front = order.filter((v) => byValue.has(v));
  const rest = column.levels.map((l) => l.value).filter((v) => !front.includes(v));
  const values = [...new Set([...front, ...rest])];
  return {
    ...column,
    levels: values.map((v) => byValue.get(v)!.level),
    scores: column.scores === null ? null : values.map((v) => byValue.get(v)?.score ?? 0),
  };
}

/**
 * Merging records, for each cleaned value in `from`, that it becomes `into`. Values that were
 * themselves merged earlier keep pointing at the new target, so merges never chain.
 */
function mergeLevels<C extends Extract<ColumnRecipe, { level: 'nominal' | 'ordinal' | 'binary' }>>(column: C, from: readonly string[], into: string): C {
  const sources = new Set<string>();
  for (const value of from) {
    const earlier = column.cleaning.merges.find((m) => m.into === value);
    if (earlier) earlier.from.forEach((f) => sources.add(f));
    if (value !== into) sources.add(value);
  }
  const merges = column.cleaning.merges
    .filter((m) => !from.includes(m.into) || m.into === into)
    .map((m) => ({ ...m, from: m.from.filter((f) => !sources.has(f)) }))
    .filter((m) => m.from.length > 0 && m.into !== into);
  const previous = column.cleaning.merges.find((m) => m.into === into)?.from ?? [];
  const all = [...new Set([...previous, ...sources])].filter((f) => f !== into);
  return { ...column, cleaning: { ...column.cleaning, merges: all.length > 0 ? [...merges, { into, from: all }] : merges } };
}
