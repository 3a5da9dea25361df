/** Binary coding: one 0/1 column, 1 for the positive class. */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function binary(levels: readonly string[], positive: number): LevelCodes {
  return levelCodes(levels, [levels[positive] ?? ''], (i) => (i === positive ? 1 : 0));
}
