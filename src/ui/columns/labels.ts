/**
 * Words and number formats shared by the column panels, so the list, the editor and the width
 * meter call each level and each count the same thing.
 */
import type { CategoricalColumn, ColumnRecipe, MeasurementLevel } from '../../core/recipe.ts';

export const LEVEL_LABELS: Readonly<Record<MeasurementLevel, string>> = {
  continuous: 'continuous',
  nominal: 'nominal',
  ordinal: 'ordinal',
  binary: 'binary',
  identifier: 'identifier (kept as is)',
  excluded: 'left out',
};

export const LEVEL_HINTS: Readonly<Record<MeasurementLevel, string>> = {
  continuous: 'amounts and measurements, used as numbers',
  nominal: 'categories with no order',
  ordinal: 'categories in a meaningful order',
  binary: 'two categories, one of them coded 1',
  identifier: 'copied to the output unchanged, not encoded',
  excluded: 'not part of the output',
};

const counts = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
const shares = new Intl.NumberFormat('en-GB', { style: 'percent', maximumFractionDigits: 1 });
const values = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: 5 });

/** 1240 → "1,240". */
export function formatCount(n: number): string {
  return counts.format(n);
}

/** 0.1234 → "12.3%". */
export function formatShare(share: number): string {
  return shares.format(share);
}

/** A fitted statistic, short enough for a table cell: 4630.512 → "4,630.5". */
export function formatValue(x: number): string {
  return Number.isFinite(x) ? values.format(x) : String(x);
}

/** "1 output column" / "6 output columns". */
export function countOf(n: number, one: string, many: string): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

export function isCategorical(column: ColumnRecipe): column is CategoricalColumn {
  return column.level === 'nominal' || column.level === 'ordinal' || column.level === 'binary';
}
