/** Custom scores: one number per level, chosen by the person (e.g. a Likert scale −2 … 2). */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function scores(levels: readonly string[], values: readonly number[]): LevelCodes {
  return levelCodes(levels, ['score'], (i) => values[i] ?? 0);
}
