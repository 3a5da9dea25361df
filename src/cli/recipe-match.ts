/**
 * Whether a file is the kind of file a recipe was made for. A file that lacks most of the columns
 * the recipe encodes would come out as columns of missing values: `apply` stops before writing and
 * `check` says so first, naming the file the recipe was made from and the columns on each side.
 */
import type { Recipe } from '../core/recipe.ts';
import { namesText } from './common.ts';

export interface ForeignFile {
  /** The recipe's columns that make output columns. */
  readonly encoded: readonly string[];
  /** Those the file lacks. */
  readonly lacking: readonly string[];
}

/** Not null when the file lacks more than half of the columns the recipe encodes. */
export function foreignFile(recipe: Recipe, header: readonly string[]): ForeignFile | null {
  const present = new Set(header);
  const encoded = recipe.columns.filter((c) => c.outputs.length > 0).map((c) => c.name);
  const lacking = encoded.filter((name) => !present.has(name));
  return encoded.length > 0 && lacking.length * 2 > encoded.length ? { encoded, lacking } : null;
}

/** One sentence: which recipe, made from which file, expects which columns, and what the file has. */
export function foreignFileText(fileLabel: string, recipeLabel: string, recipe: Recipe, header: readonly string[], mismatch: ForeignFile): string {
  const madeFrom = recipe.source.file === null ? '' : ` was made from "${recipe.source.file}" and`;
  const lacks =
    mismatch.lacking.length === mismatch.encoded.length
      ? `none of them is in "${fileLabel}"`
      : `"${fileLabel}" lacks ${mismatch.lacking.length} of the ${mismatch.encoded.length} (${namesText(mismatch.lacking)})`;
  const has = header.length === 0 ? 'it has no columns' : `its columns are ${namesText(header)}`;
  return `"${fileLabel}" is not the kind of file the recipe "${recipeLabel}" was made for: the recipe${madeFrom} encodes the columns ${namesText(mismatch.encoded)}; ${lacks}: ${has}.`;
}
