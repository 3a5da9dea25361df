/** The recipe's JSON Schema, generated from the zod definition (the single source of truth). */
import * as z from 'zod/mini';
import { Recipe, RECIPE_VERSION } from './recipe.ts';

export const RECIPE_SCHEMA_ID = `https://levelwise.invalid/recipe.v${RECIPE_VERSION}.schema.json`;

export function recipeJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(Recipe, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
  return {
    ...schema,
    $id: RECIPE_SCHEMA_ID,
    title: 'Levelwise recipe',
    description:
      'Every decision about a table and everything learned from the data it was fitted on; applying it to a new file needs nothing else. See docs/recipe.md.',
  };
}

export function recipeJsonSchemaText(): string {
  return `${JSON.stringify(recipeJsonSchema(), null, 2)}\n`;
}
