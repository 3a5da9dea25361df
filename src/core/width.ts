/**
 * Width forecast: how many output columns each source column will produce, and how much of the
 * output will be zeros — from the recipe alone (its levels carry their fitted counts), without
 * encoding a single row. The page uses it to warn before a column blows up.
 */
import { codesForColumn } from './encoders/index.ts';
import type { ColumnRecipe, MeasurementLevel, Recipe } from './recipe.ts';

export interface ColumnWidth {
  readonly name: string;
  readonly level: MeasurementLevel;
  /** Columns in the source: always 1. */
  readonly before: number;
  /** Output columns under the current decisions. */
  readonly after: number;
  /** Expected share of zero cells among this column's outputs on the fitting data (0 when unknown). */
  readonly zeroShare: number;
}

export interface WidthForecast {
  readonly perColumn: readonly ColumnWidth[];
  readonly total: { readonly before: number; readonly after: number; readonly zeroShare: number };
}

export function forecastWidth(recipe: Recipe): WidthForecast {
  const perColumn = recipe.columns.map(
    (column): ColumnWidth => ({
      name: column.name,
      level: column.level,
      before: 1,
      after: column.outputs.length,
      zeroShare: zeroShare(column),
    }),
  );
  const after = perColumn.reduce((sum, c) => sum + c.after, 0);
  const zeroCells = perColumn.reduce((sum, c) => sum + c.zeroShare * c.after, 0);
  return { perColumn, total: { before: perColumn.length, after, zeroShare: after > 0 ? zeroCells / after : 0 } };
}

/** Weighted by fitted level counts: Σ count(level) · zeros(level's codes) / (rows · width). */
function zeroShare(column: ColumnRecipe): number {
  if (column.level !== 'nominal' && column.level !== 'ordinal' && column.level !== 'binary') return 0;
  const codes = codesForColumn(column);
  const rows = column.levels.reduce((sum, l) => sum + l.count, 0);
  if (rows === 0 || codes.width === 0) return 0;
  let zeros = 0;
  column.levels.forEach((level, i) => {
    for (let j = 0; j < codes.width; j++) if (codes.matrix[i * codes.width + j] === 0) zeros += level.count;
  });
  return zeros / (rows * codes.width);
}
