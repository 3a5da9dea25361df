/** Ordinal ranks: the level's position in the person's order, starting at 0 or 1. */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function rank(levels: readonly string[], start: 0 | 1): LevelCodes {
  return levelCodes(levels, ['rank'], (i) => i + start);
}
