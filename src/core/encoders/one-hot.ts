/** One-hot coding: k columns, 1 in the column of the row's level. */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function oneHot(levels: readonly string[]): LevelCodes {
  return levelCodes(levels, levels, (i, j) => (i === j ? 1 : 0));
}
