/**
 * Effect (deviation) coding: k − 1 columns like dummy coding, but the reference level is −1 in all
 * of them, so each coefficient reads as a deviation from the unweighted mean of the levels.
 */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function effect(levels: readonly string[], reference: number): LevelCodes {
  const kept = levels.map((_, i) => i).filter((i) => i !== reference);
  return levelCodes(levels, kept.map((i) => levels[i] ?? ''), (i, j) => (i === reference ? -1 : kept[j] === i ? 1 : 0));
}
