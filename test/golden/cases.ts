/** Loads the golden cases: test/golden/<case>/{input.csv, recipe.json, expected.csv}. */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';

export interface GoldenCase {
  readonly name: string;
  readonly input: Uint8Array;
  readonly recipeText: string;
  readonly expected: Uint8Array;
}

export const GOLDEN_DIR = import.meta.dirname;

export function goldenCases(): GoldenCase[] {
  return readdirSync(GOLDEN_DIR)
    .filter((name) => statSync(join(GOLDEN_DIR, name)).isDirectory())
    .sort()
    .map((name) => ({
      name,
      input: new Uint8Array(readFileSync(join(GOLDEN_DIR, name, 'input.csv'))),
      recipeText: readFileSync(join(GOLDEN_DIR, name, 'recipe.json'), 'utf8'),
      expected: new Uint8Array(readFileSync(join(GOLDEN_DIR, name, 'expected.csv'))),
    }));
}
