/** Dummy (treatment) coding: k − 1 columns; the reference level is 0 in all of them. */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function dummy(levels: readonly string[], reference: number): LevelCodes {
  const kept = levels.map((_, i) => i).filter((i) => i !== reference);
  return levelCodes(levels, kept.map((i) => levels[i] ?? ''), (i, j) => (kept[j] === i ? 1 : 0));
}
