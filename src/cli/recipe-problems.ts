/**
 * A recipe that cannot be used, said in full: every problem core found (up to LISTED_PROBLEMS, one
 * per line, then how many more), and what to do said once — core's problems often carry their own
 * remedy ("…, or make the recipe again"); the command line adds its hint only when one lacks it.
 */
import { count, plural } from './common.ts';
import { CliFailure, EXIT } from './failure.ts';

export const LISTED_PROBLEMS = 20;

/**
 * A problem that already says what to do: an instruction after a sentence break or ", or", or
 * core's question about the file. Kept narrow; a false "no" only adds the general hint once.
 */
const REMEDY = /(?:^|[.?!;:]\s+|,\s+or\s+)(?:open|make|choose|group|use|fix|remove|save|give|unpack)\b|is this the right file\?/i;

const GENERAL_HINT = 'Fix the recipe, or make a new one with "levelwise draft".';

/** `unlisted`: problems core found beyond those it listed (see RecipeParse). */
export function recipeFailure(label: string, errors: readonly string[], unlisted = 0): CliFailure {
  const uncounted = unlisted;
  const problems = [...errors];
  if (problems.length === 0) problems.push('it is not a recipe.');
  const hint = problems.every((p) => REMEDY.test(p)) ? '' : GENERAL_HINT;
  const total = problems.length + uncounted;
  const headline = `the recipe "${label}" cannot be used:`;
  if (total === 1) return new CliFailure(`${headline} ${(problems[0] ?? '').replace(/\.$/, '')}.`, hint);
  const shown = problems.slice(0, LISTED_PROBLEMS);
  const rest = total - shown.length;
  const details = shown.map((p) => `  ${p}`);
  if (rest > 0) details.push(`  … and ${plural(rest, 'more problem')}.`);
  return new CliFailure(`${headline} ${count(total)} problems.`, hint, EXIT.usage, details);
}
