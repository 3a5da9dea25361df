/** How raw cell text becomes a level: trim, then case-fold, then explicit merges. */
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
