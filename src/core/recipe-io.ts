/**
 * Reading and writing recipe documents. Loading validates against the schema and answers with
 * messages a person understands: which field, what was expected, what was found.
 */
import type * as z from 'zod/mini';
import { jsonErrorPosition } from './json-position.ts';
import { MAX_CATEGORICAL_LEVELS } from './level-limit.ts';
import { nameOutputs } from './names.ts';
import { LEVELS, Recipe, RECIPE_KIND, RECIPE_VERSION, type MeasurementLevel } from './recipe.ts';

/**
 * A recipe, or what is wrong with it: the first MAX_LISTED_ERRORS problems, each a sentence, and how
 * many more there were (`unlisted`), for the presenter to say ("… and 5 more problems").
 */
export type RecipeParse =
  | { readonly ok: true; readonly recipe: Recipe }
  | { readonly ok: false; readonly errors: readonly string[]; readonly unlisted: number };

/** Larger documents are refused before parsing: a recipe of this size is not a recipe. */
export const MAX_RECIPE_BYTES = 64 * 1024 * 1024;
const MAX_LISTED_ERRORS = 20;

export function parseRecipe(text: string): RecipeParse {
  if (text.length > MAX_RECIPE_BYTES) return { ok: false, errors: [recipeTooLargeMessage(text.length)], unlisted: 0 };
  // A byte order mark some editors write is not part of the JSON.
  const json = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let data: unknown;
  try {
    data = JSON.parse(json);
  } catch (error) {
    return { ok: false, errors: [invalidJsonMessage(json, error)], unlisted: 0 };
  }
  const header = checkHeader(data);
  if (header) return { ok: false, errors: [header], unlisted: 0 };
  const result = Recipe.safeParse(data);
  if (result.success) {
    const problems = consistencyProblems(result.data);
    return problems.length === 0 ? { ok: true, recipe: result.data } : { ok: false, errors: problems, unlisted: 0 };
  }
  const errors = result.error.issues.slice(0, MAX_LISTED_ERRORS).map((issue) => describeIssue(issue, data));
  return { ok: false, errors, unlisted: result.error.issues.length - errors.length };
}

/** Whole megabytes of 2^20 bytes, as the limit is stated. */
function megabytes(bytes: number): string {
  return `${Math.ceil(bytes / 2 ** 20).toLocaleString('en-US')} MB`;
}

/** Also for callers that know a file's size before reading it (the page checks File.size). */
export function recipeTooLargeMessage(bytes: number): string {
  return `The recipe file is ${megabytes(bytes)}; a recipe is at most ${megabytes(MAX_RECIPE_BYTES)}. Is this the right file? A recipe is the .json file Levelwise saved.`;
}

/** What JSON.parse said, without its engine-specific position, and where the text stops being JSON. */
function invalidJsonMessage(text: string, error: unknown): string {
  if (text.trim() === '') return 'The recipe file is empty. Choose the .json file Levelwise saved, or make the recipe again.';
  const what = (error instanceof Error ? error.message : String(error)).replace(/,? (?:in JSON )?at position \d+.*$/s, '');
  const position = jsonErrorPosition(text);
  const where = position === null ? '' : ` at line ${position.line}, column ${position.column}`;
  return `The recipe is not valid JSON${where}: ${what.replace(/\.$/, '')}. Open it in a text editor and fix it there, or make the recipe again.`;
}

/** Says early, in one line, when the document is not a recipe at all or is of another version. */
function checkHeader(data: unknown): string | null {
  if (typeof data !== 'object' || data === null || Array.isArray(data)) return 'A recipe is a JSON object; this file holds something else.';
  const kind = (data as Record<string, unknown>)['kind'];
  const version = (data as Record<string, unknown>)['version'];
  if (kind !== RECIPE_KIND) return `This is not a Levelwise recipe: "kind" should be "${RECIPE_KIND}", found ${JSON.stringify(kind) ?? 'nothing'}.`;
  if (version === undefined) return `This recipe has no "version" field; this Levelwise reads version ${RECIPE_VERSION}. Make the recipe again with this version.`;
  if (version !== RECIPE_VERSION) {
    const newer = typeof version === 'number' && version > RECIPE_VERSION ? ' It was made by a newer Levelwise: use that one, or' : '';
    return `This recipe has format version ${JSON.stringify(version) ?? String(version)} ("version"); this Levelwise reads version ${RECIPE_VERSION}.${newer || ''}${newer ? ' make' : ' Make'} the recipe again with this version.`;
  }
  return null;
}

function describeIssue(issue: z.core.$ZodIssue, data: unknown): string {
  const where = pathText(issue.path, data);
  const found = valueAt(data, issue.path);
  switch (issue.code) {
    case 'unrecognized_keys':
      return `${where}: unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; remove ${issue.keys.length > 1 ? 'them' : 'it'}.`;
    case 'invalid_type':
      return found === undefined
        ? `${where}: missing; expected ${issue.expected}.`
        : `${where}: expected ${issue.expected}, found ${describeValue(found)}.`;
    case 'invalid_value':
      if (found === undefined) return `${where}: missing; expected one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}.`;
      return `${where}: expected one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}, found ${describeValue(found)}.`;
    case 'invalid_union':
      // A column whose "level" is none of the six: say which six, rather than that no entry shape fits.
      if (issue.path.at(-1) === 'level' && !LEVELS.includes(found as MeasurementLevel)) {
        const levels = LEVELS.map((l) => JSON.stringify(l)).join(', ');
        return found === undefined ? `${where}: missing; expected one of ${levels}.` : `${where}: expected one of ${levels}, found ${describeValue(found)}.`;
      }
      return `${where}: not a valid column entry (check "level" and the fields that belong to it).`;
    default:
      return `${where}: ${issue.message}.`;
  }
}

/** "columns[2] (heating).coding" — array positions plus the column's name where there is one. */
function pathText(path: readonly PropertyKey[], data: unknown): string {
  if (path.length === 0) return 'The recipe';
  let text = '';
  let node: unknown = data;
  for (const key of path) {
    if (typeof key === 'number') {
      text += `[${key}]`;
      node = Array.isArray(node) ? node[key] : undefined;
      const name = typeof node === 'object' && node !== null ? (node as Record<string, unknown>)['name'] : undefined;
      if (typeof name === 'string') text += ` ("${name}")`;
    } else {
      text += text === '' ? String(key) : `.${String(key)}`;
      node = typeof node === 'object' && node !== null && Object.hasOwn(node, key) ? (node as Record<PropertyKey, unknown>)[key] : undefined;
    }
  }
  return text;
}

function valueAt(data: unknown, path: readonly PropertyKey[]): unknown {
  let node = data;
  for (const key of path) {
    if (typeof node !== 'object' || node === null || !Object.hasOwn(node, key)) return undefined;
    node = (node as Record<PropertyKey, unknown>)[key];
  }
  return node;
}

function describeValue(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'an object';
  const text = JSON.stringify(value) ?? String(value);
  return text.length > 60 ? `${text.slice(0, 57)}…` : text;
}

/** Stable, pretty JSON (field order as in the schema), ending with a newline. */
export function stringifyRecipe(recipe: Recipe): string {
  return `${JSON.stringify(Recipe.parse(recipe), null, 2)}\n`;
}

/**
 * Rules the schema alone cannot state: output counts that match the encodings, unique output
 * names, a reference or positive level that exists, one score per level.
 */
export function consistencyProblems(recipe: Recipe): string[] {
  // Naming lays out each column's code table, which a column over the level limit must not reach.
  const overLimit = levelLimitProblems(recipe);
  if (overLimit.length > 0) return overLimit;
  const problems: string[] = [];
  const expected = nameOutputs(recipe);
  const seen = new Set<string>();
  recipe.columns.forEach((column, i) => {
    const where = `columns[${i}] ("${column.name}")`;
    const want = expected.columns[i]?.outputs.length ?? 0;
    if (column.outputs.length !== want) {
      problems.push(`${where}.outputs: this encoding makes ${want} output column(s), the recipe names ${column.outputs.length}.`);
    }
    for (const name of column.outputs) {
      if (seen.has(name)) problems.push(`${where}.outputs: the output name "${name}" is used twice; output names must be unique.`);
      seen.add(name);
    }
    const values = 'levels' in column ? column.levels.map((l) => l.value) : [];
    if (column.level === 'nominal' && column.reference !== null && !values.includes(column.reference)) {
      problems.push(`${where}.reference: "${column.reference}" is not one of the column's levels.`);
    }
    if (column.level === 'binary' && values.length > 0 && !values.includes(column.positive)) {
      problems.push(`${where}.positive: "${column.positive}" is not one of the column's levels.`);
    }
    if (column.level === 'ordinal' && column.scores !== null && column.scores.length !== column.levels.length) {
      problems.push(`${where}.scores: ${column.scores.length} scores for ${column.levels.length} levels; give one score per level.`);
    }
    if ('unseen' in column && column.unseen === 'other' && !values.includes(column.otherLabel)) {
      problems.push(`${where}.unseen: "other" needs the level "${column.otherLabel}" in levels.`);
    }
  });
  return problems;
}

function levelLimitProblems(recipe: Recipe): string[] {
  return recipe.columns.flatMap((column, i) =>
    'levels' in column && column.levels.length > MAX_CATEGORICAL_LEVELS
      ? [
          `columns[${i}] ("${column.name}").levels: ${column.levels.length.toLocaleString('en-US')} levels; a column can be encoded ` +
            `with at most ${MAX_CATEGORICAL_LEVELS.toLocaleString('en-US')}. Group its rare levels (keep the most frequent) in the workbench, or with "levelwise draft --keep-top".`,
        ]
      : [],
  );
}
