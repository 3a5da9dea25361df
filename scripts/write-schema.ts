/**
 * Writes public/recipe.schema.json from the zod definition in src/core/recipe.ts, so the JSON
 * Schema can never drift from the types. Run by `npm run schema`; a test checks the file is current.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { recipeJsonSchemaText } from '../src/core/recipe-schema.ts';

const target = join(import.meta.dirname, '..', 'public', 'recipe.schema.json');
writeFileSync(target, recipeJsonSchemaText());
console.log(`wrote ${target}`);
