/** Frequency coding: one column holding the level's share of rows in the fitting data. */
import { levelCodes, type LevelCodes } from './level-codes.ts';

export function frequency(levels: readonly string[], counts: readonly number[], fittedRows: number): LevelCodes {
  return levelCodes(levels, ['share'], (i) => (fittedRows > 0 ? (counts[i] ?? 0) / fittedRows : 0));
}
