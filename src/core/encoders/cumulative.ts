/**
 * Cumulative ("at least level j") coding for ordinal data: k − 1 columns, column j is 1 when the
 * row's level is at or above level j + 1 in the order. The lowest level is 0 in all of them.
 */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function cumulative(levels: readonly string[]): LevelCodes {
  return levelCodes(levels, levels.slice(1).map((l) => `>=${l}`), (i, j) => (i >= j + 1 ? 1 : 0));
}
