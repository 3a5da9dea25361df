/** Counts and sizes in words the top bar and messages share. */

/** The column panels' count format, so every count on the page reads the same. */
export { formatCount } from '../columns/labels.ts';

/** 1536 → "1.5 KB" (powers of 1024, one decimal under 10). */
export function formatBytes(bytes: number): string {
  const units = ['bytes', 'KB', 'MB', 'GB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  const digits = unit > 0 && value < 10 ? 1 : 0;
  return `${value.toFixed(digits)} ${units[unit]}`;
}

const DELIMITER_WORDS: Record<string, string> = { ',': 'comma-separated', '\t': 'tab-separated', ';': 'semicolon-separated', '|': 'pipe-separated' };

export function delimiterWords(delimiter: string): string {
  return DELIMITER_WORDS[delimiter] ?? `separated by “${delimiter}”`;
}
