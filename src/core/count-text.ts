/**
 * Counts in sentences a person reads (reasons in a recipe, messages): digits grouped by threes with
 * commas, "4,000,000" rather than "4000000". Written by hand, not with toLocaleString: the first
 * call of that loads the engine's locale data, a cost a short command would pay for a few commas.
 */

/** 4000000 → "4,000,000"; numbers that are not safe integers are written as toLocaleString writes them. */
export function countText(n: number): string {
  if (!Number.isSafeInteger(n)) return n.toLocaleString('en-US');
  const digits = String(Math.abs(n)).replace(/\B(?=(\d{3})+$)/g, ',');
  return n < 0 ? `-${digits}` : digits;
}

/** A share as a person reads it: 0.5 → "50%", 0.9967 → "99.7%". */
export function percentText(share: number): string {
  const p = share * 100;
  return `${Number.isInteger(p) ? p : p.toFixed(1)}%`;
}
