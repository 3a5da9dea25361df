/**
 * The missing spellings `profile` and `draft` read a file with: the usual ones (core
 * DEFAULT_MISSING_TOKENS), with --missing adding spellings and --not-missing taking some away. The
 * draft's recipe keeps the list (`reading.missingTokens`), so `apply`, `check` and `sql` read new
 * files the same way.
 */
import { DEFAULT_MISSING_TOKENS, spellingsOutnumberingValues } from '../core/missing.ts';
import type { ColumnProfile } from '../core/profile.ts';
import type { OptionSpec, ParsedArgs } from './args.ts';
import { plural } from './common.ts';
import { usageFailure } from './failure.ts';

export const MISSING_OPTIONS: readonly OptionSpec[] = [
  { name: 'missing', repeatable: true },
  { name: 'not-missing', repeatable: true },
];

/** The list the options make, in the usual list's order, added spellings after it. */
export function missingSpellings(verb: string, args: ParsedArgs): string[] {
  const added = (args.options.get('missing') ?? []).map((s) => s.trim());
  const removed = (args.options.get('not-missing') ?? []).map((s) => s.trim());
  const listed = (list: readonly string[]): string => list.map((s) => `"${s}"`).join(', ');
  for (const spelling of removed) {
    if (spelling === '') throw usageFailure(verb, '--not-missing "": an empty cell is always read as missing.', 'Name a spelling, e.g. --not-missing None.');
    if (added.includes(spelling)) throw usageFailure(verb, `"${spelling}" was given to both --missing and --not-missing.`, 'Give it to one of them.');
    if (!DEFAULT_MISSING_TOKENS.includes(spelling)) {
      throw usageFailure(verb, `--not-missing ${spelling}: "${spelling}" is not read as missing to begin with.`, `The spellings read as missing are ${listed(DEFAULT_MISSING_TOKENS)} and the empty cell.`);
    }
  }
  for (const spelling of added) {
    if (spelling === '') throw usageFailure(verb, '--missing "": an empty cell is read as missing already.', 'Name a spelling, e.g. --missing -999.');
  }
  const kept = DEFAULT_MISSING_TOKENS.filter((s) => !removed.includes(s));
  return [...kept, ...added.filter((s, i) => !kept.includes(s) && added.indexOf(s) === i)];
}

/** Notes shown one by one; past them, one line counts the rest (a sheet of mostly empty "NA" columns would fill the screen). */
const SHOWN_NOTES = 5;

/** Notes on the spellings read as missing in more cells of a column than its values; see core spellingsOutnumberingValues. */
export function outnumberingNotes(profiles: readonly ColumnProfile[]): string[] {
  const found = spellingsOutnumberingValues(profiles);
  const notes = found.slice(0, SHOWN_NOTES).map(
    ({ column, spelling, cells, valueCells }) =>
      `${column}: "${spelling}" is read as missing in ${plural(cells, 'cell')}, more than all of its values together (${plural(valueCells, 'cell')}). ` +
      `If "${spelling}" is a value here, run again with --not-missing ${shellWord(spelling)}.`,
  );
  const rest = found.slice(SHOWN_NOTES);
  if (rest.length > 0) {
    const columns = [...new Set(rest.map((f) => f.column))];
    notes.push(`… and in ${plural(columns.length, 'more column')} (${columns.slice(0, SHOWN_NOTES).join(', ')}${columns.length > SHOWN_NOTES ? ', …' : ''}) a missing spelling fills more cells than the values do.`);
  }
  return notes;
}

/** A spelling as one shell word: quoted when it holds anything but letters, digits and . _ / - */
function shellWord(text: string): string {
  return /^[A-Za-z0-9._/-]+$/.test(text) ? text : `'${text.replaceAll("'", `'\\''`)}'`;
}
