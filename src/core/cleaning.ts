/** How raw cell text becomes a level: trim, then case-fold, then explicit merges. */
import type { LevelCount } from './profile.ts';
import type { Cleaning } from './recipe.ts';

export const NO_CLEANING: Cleaning = { trim: false, caseFold: false, merges: [] };

/** Returns a function raw text → cleaned level. Build once per column, call once per distinct value. */
export function cleaner(cleaning: Cleaning): (raw: string) => string {
  const merged = new Map<string, string>();
  for (const merge of cleaning.merges) for (const from of merge.from) merged.set(from, merge.into);
  return (raw) => {
    let v = cleaning.trim ? raw.trim() : raw;
    if (cleaning.caseFold) v = v.toLowerCase();
    return merged.get(v) ?? v;
  };
}

/**
 * Distinct cleaned values with their summed counts, most frequent first (ties keep the order of
 * first appearance). Each raw level is cleaned once, never each cell.
 */
export function cleanLevels(levels: readonly LevelCount[], cleaning: Cleaning): LevelCount[] {
  const clean = cleaner(cleaning);
  const counts = new Map<string, number>();
  for (const { value, count } of levels) {
    const c = clean(value);
    counts.set(c, (counts.get(c) ?? 0) + count);
  }
  return [...counts].map(([value, count]) => ({ value, count })).sort((a, b) => b.count - a.count);
}
