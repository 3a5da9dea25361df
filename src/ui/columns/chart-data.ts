/**
 * What the small chart beside a column shows. Categorical columns show their levels as the recipe
 * now has them (so a merge shows up at once); numbers show the profile's histogram. Identifiers
 * and left-out columns get no chart: their shape says nothing about how they will be encoded.
 */
import type { ColumnProfile } from '../../core/profile.ts';
import type { ColumnRecipe } from '../../core/recipe.ts';
import { formatCount, formatValue, isCategorical } from './labels.ts';

export interface ChartData {
  readonly kind: 'levels' | 'histogram';
  readonly values: readonly number[];
  /** One label per value: the level, or the bin's range. */
  readonly labels: readonly string[];
  /** The whole chart in words (tooltip and tests). */
  readonly summary: string;
}

/** Bars beyond this many would be thinner than a pixel or two in the list. */
export const MAX_LEVEL_BARS = 8;

export function chartFor(profile: ColumnProfile, column: ColumnRecipe): ChartData | null {
  if (isCategorical(column)) {
    // An ordinal column's order is the point, so its bars keep it; others show the most frequent.
    const shown =
      column.level === 'ordinal'
        ? column.levels.slice(0, MAX_LEVEL_BARS * 2)
        : [...column.levels].sort((a, b) => b.count - a.count).slice(0, MAX_LEVEL_BARS);
    return levelChart(shown, column.levels.length);
  }
  if (column.level === 'continuous') {
    if (profile.numeric) return histogramChart(profile.numeric.histogram);
    if (profile.levels) return levelChart(profile.levels.slice(0, MAX_LEVEL_BARS), profile.levels.length);
  }
  return null;
}

function levelChart(levels: readonly { value: string; count: number }[], total: number): ChartData {
  const parts = levels.map((l) => `${l.value}: ${formatCount(l.count)}`);
  const more = total > levels.length ? `; ${formatCount(total - levels.length)} more` : '';
  return {
    kind: 'levels',
    values: levels.map((l) => l.count),
    labels: levels.map((l) => l.value),
    summary: `${parts.join('; ')}${more}`,
  };
}

function histogramChart(histogram: { edges: readonly number[]; counts: readonly number[] }): ChartData {
  const labels = histogram.counts.map(
    (_, i) => `${formatValue(histogram.edges[i] ?? 0)} to ${formatValue(histogram.edges[i + 1] ?? 0)}`,
  );
  const first = histogram.edges[0];
  const last = histogram.edges[histogram.edges.length - 1];
  return {
    kind: 'histogram',
    values: histogram.counts,
    labels,
    summary:
      first === undefined || last === undefined
        ? 'no numbers'
        : `${histogram.counts.length} bins from ${formatValue(first)} to ${formatValue(last)}`,
  };
}
