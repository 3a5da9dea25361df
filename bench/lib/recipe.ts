/**
 * The recipe the apply measurement uses: the page's draft, with the decisions a person would make
 * for a model on this file. Categorical columns stay one-hot (nominal) or ranked (ordinal), binary
 * columns 0/1, the many-level column keeps its most frequent levels and groups the rest, and every
 * continuous column is z-scored. Built through `decide`, as the page and the command line do.
 */
import { decide, draftRecipe, profileTable, type ColumnProfile, type Recipe, type Table } from '../../src/core/index.ts';

/** The benchmark files' column with ~5,000 levels (bench/generate.ts). */
export const MANY_LEVELS_COLUMN = 'supplier';
export const KEEP_TOP_LEVELS = 20;

export function benchRecipe(profiles: readonly ColumnProfile[], source: { file: string; rows: number }): Recipe {
  let recipe = draftRecipe(profiles, source);
  for (const column of recipe.columns) {
    if (column.level === 'nominal' && column.coding !== 'one-hot') {
      recipe = decide(recipe, { type: 'set-nominal-coding', column: column.name, coding: 'one-hot' }, profiles);
    }
    if (column.level === 'continuous') {
      recipe = decide(recipe, { type: 'set-scaling', column: column.name, scaling: 'z-score' }, profiles);
    }
  }
  const many = recipe.columns.find((c) => c.name === MANY_LEVELS_COLUMN);
  if (many !== undefined && many.level === 'nominal') {
    const rare = { minCount: null, minShare: null, keepTop: KEEP_TOP_LEVELS };
    recipe = decide(recipe, { type: 'set-rare', column: MANY_LEVELS_COLUMN, rare }, profiles);
  }
  return recipe;
}

export function benchRecipeForTable(table: Table, file: string): Recipe {
  return benchRecipe(profileTable(table), { file, rows: table.rowCount });
}

/** A line for the report: what the recipe does, by level and coding. */
export function describeRecipe(recipe: Recipe): string {
  const counts = new Map<string, number>();
  for (const column of recipe.columns) {
    const how =
      column.level === 'nominal' ? `nominal ${column.coding}`
      : column.level === 'ordinal' ? `ordinal ${column.coding}`
      : column.level === 'continuous' ? `continuous ${column.scaling}`
      : column.level;
    counts.set(how, (counts.get(how) ?? 0) + 1);
  }
  const parts = [...counts].map(([how, n]) => `${n} ${how}`);
  const outputs = recipe.columns.reduce((n, c) => n + c.outputs.length, 0);
  return `${parts.join(', ')}; ${MANY_LEVELS_COLUMN} keeps its top ${KEEP_TOP_LEVELS} levels; ${outputs} output columns`;
}
