/**
 * How many levels one categorical column may hold once cleaned and grouped. Every categorical
 * encoding is a table of levels × output columns (encoders/level-codes.ts), so one-hot coding of
 * k levels holds k² numbers: 1,000 levels make a million, 100,000 levels would make ten billion —
 * more than a browser tab or a process can hold, and far more output columns than a model learns
 * anything from. A column with more levels groups its rare ones first (keep the most frequent),
 * or is left out.
 */
import { countText } from './count-text.ts';
import { LevelwiseError } from './errors.ts';

export const MAX_CATEGORICAL_LEVELS = 1000;

/**
 * A nominal column drafted with more levels than the limit keeps this many of its most frequent
 * levels and groups the rest into the other level; the reason says so, and the width meter shows
 * the column as wide, with its remedies.
 */
export const WIDE_DRAFT_KEEP_TOP = 100;

export function tooManyLevelsError(column: string, levels: number): LevelwiseError {
  return new LevelwiseError(
    'too-many-levels',
    `“${column}” would have ${levels.toLocaleString('en-US')} levels; a column can be encoded with at most ` +
      `${MAX_CATEGORICAL_LEVELS.toLocaleString('en-US')}.`,
    {
      hint:
        'Group its rare levels first (keep only the most frequent ones), or leave the column out; ' +
        'a column whose values are all different is an identifier.',
    },
  );
}

/**
 * The clause a drafted column's reason gains when its rare levels were grouped to fit the limit.
 * Counts are grouped by threes, as in the rest of the reason (infer.ts).
 */
export function wideDraftNote({ levels, missingLevel }: { readonly levels: number; readonly missingLevel: boolean }): string {
  // The count differs by one from the distinct values the reason names before it: say why.
  const counted = missingLevel ? `${countText(levels)} levels (missing values one of them)` : `${countText(levels)} levels`;
  return (
    `; ${counted} are more than one column can encode (${countText(MAX_CATEGORICAL_LEVELS)}), ` +
    `so only the ${WIDE_DRAFT_KEEP_TOP} most frequent keep their own column and the rest are grouped`
  );
}
