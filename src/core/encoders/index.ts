/** Maps each recipe column to the encoder that turns its values into numbers. */
import { MAX_CATEGORICAL_LEVELS, tooManyLevelsError } from '../level-limit.ts';
import type { CategoricalColumn, ContinuousColumn } from '../recipe.ts';
import { binary } from './binary.ts';
import { cumulative } from './cumulative.ts';
import { dummy } from './dummy.ts';
import { effect } from './effect.ts';
import { frequency } from './frequency.ts';
import type { LevelCodes } from './level-codes.ts';
import { oneHot } from './one-hot.ts';
import { rank } from './rank.ts';
import { scores } from './scores.ts';

export type { LevelCodes } from './level-codes.ts';
export { codesOf } from './level-codes.ts';

/**
 * The level-by-output code table of a categorical column, as its recipe says. A column over the
 * level limit is refused before its table is laid out (one-hot holds levels² numbers).
 */
export function codesForColumn(column: CategoricalColumn): LevelCodes {
  if (column.levels.length > MAX_CATEGORICAL_LEVELS) throw tooManyLevelsError(column.name, column.levels.length);
  const levels = column.levels.map((l) => l.value);
  switch (column.level) {
    case 'binary':
      return binary(levels, Math.max(0, levels.indexOf(column.positive)));
    case 'ordinal':
      if (column.coding === 'rank') return rank(levels, column.start);
      if (column.coding === 'scores') return scores(levels, column.scores ?? levels.map((_, i) => i + column.start));
      return cumulative(levels);
    case 'nominal': {
      const reference = Math.max(0, column.reference === null ? 0 : levels.indexOf(column.reference));
      if (column.coding === 'one-hot') return oneHot(levels);
      if (column.coding === 'dummy') return dummy(levels, reference);
      if (column.coding === 'effect') return effect(levels, reference);
      return frequency(levels, column.levels.map((l) => l.count), column.fittedRows);
    }
  }
}

/** A continuous column's output is (x − center) / scale; missing cells take `fill` before scaling. */
export interface LinearTransform {
  readonly center: number;
  readonly scale: number;
  /** Value used for a missing cell (before centering), or null when missing is an error. */
  readonly fill: number | null;
}

export function transformForColumn(column: ContinuousColumn): LinearTransform {
  const { mean, sd, min, max, median } = column.fitted;
  const fill =
    column.missing.policy === 'mean' ? mean : column.missing.policy === 'median' ? median : column.missing.policy === 'zero' ? 0 : null;
  // A constant column cannot be scaled; dividing by 1 keeps the output finite (all 0 after centering).
  if (column.scaling === 'z-score') return { center: mean, scale: sd > 0 ? sd : 1, fill };
  if (column.scaling === 'min-max') return { center: min, scale: max > min ? max - min : 1, fill };
  return { center: 0, scale: 1, fill };
}
