/**
 * Planning: a recipe meets a header. Each recipe column finds its source column, and everything
 * that does not depend on the rows is computed once: code tables, transforms, and the resolution of
 * each distinct cell text (cached, so a level is cleaned and looked up once per file, not per cell).
 */
import { cleaner } from './cleaning.ts';
import { codesForColumn, transformForColumn, type LevelCodes, type LinearTransform } from './encoders/index.ts';
import { missingNumbers, missingTest, type MissingTest } from './missing.ts';
import { MISSING_LEVEL } from './fit.ts';
import { numberReader } from './numbers.ts';
import type { CategoricalColumn, ColumnRecipe, ContinuousColumn, Recipe } from './recipe.ts';

/** What one distinct cell text of a categorical column becomes. */
export interface LevelResolution {
  /** Row of the code table, or ALL_ZEROS. */
  readonly level: number;
  readonly missing: boolean;
  /** Not missing, yet not a level the recipe knows. */
  readonly unseen: boolean;
  /** Why the row must be rejected, or null. */
  readonly reject: string | null;
}

/** What one distinct cell text of a continuous column becomes (before scaling). */
export interface NumberResolution {
  /** The value to scale; NaN only when `reject` is set. */
  readonly value: number;
  readonly missing: boolean;
  /** Not missing, yet not a number in the column's format. */
  readonly invalid: boolean;
  readonly reject: string | null;
}

export const ALL_ZEROS = -1;

interface PlanBase {
  readonly recipe: ColumnRecipe;
  /** Position of the source column in the header, or -1 when the file lacks it. */
  readonly source: number;
  /** Index of this column's first output in the output row. */
  readonly offset: number;
  /** Output columns, missing indicator included. */
  readonly width: number;
}

export interface CategoricalPlan extends PlanBase {
  readonly kind: 'categorical';
  readonly column: CategoricalColumn;
  readonly codes: LevelCodes;
  readonly indicator: boolean;
  readonly resolve: (raw: string) => LevelResolution;
}

export interface ContinuousPlan extends PlanBase {
  readonly kind: 'continuous';
  readonly column: ContinuousColumn;
  readonly transform: LinearTransform;
  readonly indicator: boolean;
  readonly resolve: (raw: string) => NumberResolution;
  /** The number a text holds in the column's format, or NaN; not cached (for texts met once per batch). */
  readonly readNumber: (raw: string) => number;
  /** The recipe's missing-value test (the same as Plan.isMissing). */
  readonly isMissing: MissingTest;
  /** Numbers some missing token spells (see missingNumbers): number storage holds such cells without text. */
  readonly missingNumbers: ReadonlySet<number>;
}

export interface PassThroughPlan extends PlanBase {
  readonly kind: 'identifier' | 'excluded';
}

export type ColumnPlan = CategoricalPlan | ContinuousPlan | PassThroughPlan;

export interface Plan {
  readonly recipe: Recipe;
  readonly header: readonly string[];
  readonly outputs: readonly string[];
  readonly columns: readonly ColumnPlan[];
  /** Recipe columns the file lacks: their cells count as missing, and the report says so. */
  readonly missingColumns: readonly string[];
  /** File columns the recipe does not mention: left out of the output, and the report says so. */
  readonly extraColumns: readonly string[];
  readonly isMissing: MissingTest;
}

export function compilePlan(recipe: Recipe, header: readonly string[]): Plan {
  const isMissing = missingTest(recipe.reading.missingTokens);
  const codedMissing = missingNumbers(recipe.reading.missingTokens);
  const position = new Map<string, number>();
  header.forEach((name, i) => {
    if (!position.has(name)) position.set(name, i);
  });
  let offset = 0;
  const columns = recipe.columns.map((column): ColumnPlan => {
    const source = position.get(column.name) ?? -1;
    const plan = planColumn(column, source, offset, isMissing, codedMissing);
    offset += plan.width;
    return plan;
  });
  const known = new Set(recipe.columns.map((c) => c.name));
  return {
    recipe,
    header,
    outputs: recipe.columns.flatMap((c) => c.outputs),
    columns,
    missingColumns: recipe.columns.filter((c) => !position.has(c.name)).map((c) => c.name),
    extraColumns: header.filter((name) => !known.has(name)),
    isMissing,
  };
}

function planColumn(column: ColumnRecipe, source: number, offset: number, isMissing: MissingTest, codedMissing: ReadonlySet<number>): ColumnPlan {
  const width = column.outputs.length;
  switch (column.level) {
    case 'continuous':
      return {
        kind: 'continuous', recipe: column, column, source, offset, width,
        transform: transformForColumn(column),
        indicator: column.missing.indicator,
        resolve: cached(numberResolver(column, isMissing)),
        readNumber: numberReader(column.format),
        isMissing,
        missingNumbers: codedMissing,
      };
    case 'nominal':
    case 'ordinal':
    case 'binary':
      return {
        kind: 'categorical', recipe: column, column, source, offset, width,
        codes: codesForColumn(column),
        indicator: column.missing.indicator,
        resolve: cached(levelResolver(column, isMissing)),
      };
    default:
      return { kind: column.level, recipe: column, source, offset, width };
  }
}

/** Memoises a per-text function: distinct texts are few, cells are many. */
function cached<T>(resolve: (raw: string) => T): (raw: string) => T {
  const memo = new Map<string, T>();
  return (raw) => {
    let hit = memo.get(raw);
    if (hit === undefined) {
      hit = resolve(raw);
      memo.set(raw, hit);
    }
    return hit;
  };
}

function levelResolver(column: CategoricalColumn, isMissing: MissingTest): (raw: string) => LevelResolution {
  const clean = cleaner(column.cleaning);
  const index = new Map(column.levels.map((l, i) => [l.value, i]));
  const grouped = new Set(column.grouped);
  const other = index.get(column.otherLabel);
  const mostFrequent = mostFrequentLevel(column);
  const missingOutcome = ((): LevelResolution => {
    const base = { missing: true, unseen: false, reject: null };
    switch (column.missing.policy) {
      case 'level':
        return { ...base, level: index.get(MISSING_LEVEL) ?? ALL_ZEROS };
      case 'most-frequent':
        return { ...base, level: mostFrequent };
      case 'zeros':
        return { ...base, level: ALL_ZEROS };
      case 'error':
        return { ...base, level: ALL_ZEROS, reject: 'missing value (missing policy: error)' };
    }
  })();
  return (raw) => {
    if (isMissing(raw)) return missingOutcome;
    const value = clean(raw);
    const known = index.get(grouped.has(value) ? column.otherLabel : value);
    if (known !== undefined) return { level: known, missing: false, unseen: false, reject: null };
    if (column.unseen === 'other' && other !== undefined) return { level: other, missing: false, unseen: true, reject: null };
    const reject = column.unseen === 'error' ? `unseen level "${value}" (unseen policy: error)` : null;
    return { level: ALL_ZEROS, missing: false, unseen: true, reject };
  };
}

/** The most frequent real level: neither the missing level nor the other level. */
function mostFrequentLevel(column: CategoricalColumn): number {
  let best = ALL_ZEROS;
  let bestCount = -1;
  column.levels.forEach((l, i) => {
    if (l.value !== MISSING_LEVEL && l.value !== column.otherLabel && l.count > bestCount) {
      best = i;
      bestCount = l.count;
    }
  });
  return best;
}

function numberResolver(column: ContinuousColumn, isMissing: MissingTest): (raw: string) => NumberResolution {
  const fill = transformForColumn(column).fill;
  const missingOutcome: NumberResolution =
    fill === null
      ? { value: NaN, missing: true, invalid: false, reject: 'missing value (missing policy: error)' }
      : { value: fill, missing: true, invalid: false, reject: null };
  const readNumber = numberReader(column.format);
  return (raw) => {
    if (isMissing(raw)) return missingOutcome;
    const value = readNumber(raw);
    if (!Number.isNaN(value)) return { value, missing: false, invalid: false, reject: null };
    if (column.invalid === 'error') return { value: NaN, missing: false, invalid: true, reject: `"${raw}" is not a number` };
    return { ...missingOutcome, invalid: true };
  };
}
