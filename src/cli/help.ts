/** The --help text of the command and of each verb. docs/cli.md says the same at more length. */
import packageFile from '../../package.json' with { type: 'json' };
import { DEFAULT_MISSING_TOKENS } from '../core/missing.ts';
import { RECIPE_VERSION } from '../core/recipe.ts';

/** The program's version and the recipe format it reads and writes: what a scheduled job's log should record. */
export const VERSION_TEXT = `levelwise ${packageFile.version} (recipe format ${RECIPE_VERSION})\n`;

const READING = `Reading files:
  FILE is a CSV or other delimited text file (also gzip-compressed, .gz), an .xlsx workbook,
  or - for standard input.
  --delimiter comma|semicolon|tab|pipe   instead of detecting it
  --encoding utf-8|utf-16le|utf-16be|windows-1252   instead of detecting it
  --sheet NAME   the sheet of a workbook to read (default: the first)`;

const MISSING = `Missing values:
  An empty cell is missing, and so are cells spelled
  ${DEFAULT_MISSING_TOKENS.slice(0, -1).join('  ')}  or  ${DEFAULT_MISSING_TOKENS.at(-1)}
  (spaces around them do not count).
  --missing SPELLING       read SPELLING as missing too, e.g. --missing -999 --missing unknown
  --not-missing SPELLING   read SPELLING as a value, e.g. --not-missing None
  Both may be given several times.`;

const EXIT_CODES = `Exit codes: 0 done; 1 the data does not fit the recipe; 2 wrong command or unreadable input.`;

export const MAIN_HELP = `levelwise — turn every column of a table into numbers, with a recipe you can reuse.

Usage: levelwise VERB [options]

Verbs:
  profile FILE               what each column holds, and the level Levelwise proposes
  draft FILE                 propose a recipe for FILE, with your choices, as JSON
  apply RECIPE FILE          encode FILE with the recipe into a CSV of numbers
  check RECIPE FILE          does FILE fit the recipe? (missing columns, unseen levels, …)
  sql RECIPE --table NAME    the recipe as one SQL SELECT for DuckDB, PostgreSQL, SQLite or ANSI SQL

Run "levelwise VERB --help" for a verb's options, "levelwise --version" for the version. "-" stands
for standard input or output.
${EXIT_CODES}
`;

export const VERB_HELP: Readonly<Record<string, string>> = {
  profile: `Usage: levelwise profile FILE [--format text|json] [-o OUT]

Shows, per column: missing cells and how they are spelled, distinct values, the most frequent
levels or a summary of the numbers, and the level of measurement Levelwise proposes, with why.

  --format text|json   text for people (default), JSON for programs
  -o, --output OUT     write to OUT instead of standard output

${MISSING}

${READING}
${EXIT_CODES}
`,
  draft: `Usage: levelwise draft FILE [-o RECIPE] [choices]

Profiles FILE and writes the recipe Levelwise proposes, changed by your choices, as JSON.

  -o, --output RECIPE          write the recipe to RECIPE instead of standard output
  --set COLUMN=LEVEL[:CODING]  level: continuous, nominal, ordinal, binary, identifier, excluded;
                               coding: nominal one-hot|dummy|effect|frequency,
                               ordinal rank|scores|cumulative, continuous none|z-score|min-max
  --numbers COLUMN=EXAMPLE     how a continuous column writes its numbers, shown by writing 1234.5
                               that way: "1.234,5", "1 234.5", "€ 1.234,50", "1234.5 %", "≈1234.5";
                               "(1,234.5)" or "1.234,5-" also say how negatives are written
  --reference COLUMN=LEVEL     reference level of a nominal column (dummy and effect coding)
  --positive COLUMN=LEVEL      the level coded 1 in a binary column
  --order COLUMN=A,B,C         order of an ordinal column's levels, lowest first (\\, for a comma)
  --keep-top COLUMN=N          keep the N most frequent levels; the rest join the other level
  --naming readable|safe       output names like "heating=heat pump" or "heating__heat_pump"
Options that name a column may be given several times. They apply in this order:
--set, --numbers, --keep-top, --order, --reference, --positive, --naming.

${MISSING}
The recipe keeps the spellings: apply, check and sql read new files the same way.

${READING}
${EXIT_CODES}
`,
  apply: `Usage: levelwise apply RECIPE FILE [-o OUT] [--rejects FILE]

Encodes FILE with RECIPE into a CSV of numbers (RFC 4180), streaming: memory does not grow with
the file. The output is the same, byte for byte, as the workbench's download (but for rows with
more fields than the header or a quote never closed, which are rejected here).

  -o, --output OUT   write to OUT (default: standard output); OUT appears only when complete;
                     a name ending in .gz is written gzip-compressed (so is --rejects FILE.gz)
  --rejects FILE     write rejected rows to FILE: their line, column, reason and every cell.
                     Rejected rows are never in the output: rows a policy "error" rejects, and
                     rows whose fields do not line up with the header (too many fields, a quote
                     never closed). A row with too few fields is kept, its missing cells empty.

Exit 1 when any row was rejected or had too few fields, or a column of the recipe is missing
from FILE; notes on what did not fit (with line numbers) go to standard error. Nothing is
written, with exit 1, when FILE lacks most of the recipe's columns (a recipe for another
file); with exit 2 when the recipe makes no output columns.

${READING}
${EXIT_CODES}
`,
  check: `Usage: levelwise check RECIPE FILE [--format text|json]

Reads FILE against RECIPE without writing anything, and reports whether it fits: rows whose
fields do not line up with the header, missing columns, levels the recipe never saw (with counts
and lines), values that are not numbers, rows "levelwise apply" would reject, a header with no
data rows. Exit 0 when it fits, 1 when it does not.

  --format text|json   text for people (default), JSON for programs

${READING}
${EXIT_CODES}
`,
  sql: `Usage: levelwise sql RECIPE --table NAME [--dialect duckdb|postgres|sqlite|ansi] [--rejected flag|drop] [-o OUT]

Writes the recipe as one SQL SELECT that computes the same output columns from the raw table.
The table must hold the file's columns as text, exactly as read (DuckDB: read_csv(..., all_varchar = true)).

  --table NAME        the raw table; schema.table for a qualified name
  --dialect D         duckdb (default), postgres, sqlite or ansi
  --rejected flag     rows a policy "error" rejects stay, with NULLs and a reason in
                      __levelwise_rejected (default; only when the recipe has such a policy)
  --rejected drop     those rows are left out, as "levelwise apply" leaves them out
  -o, --output OUT    write to OUT instead of standard output

${EXIT_CODES}
`,
};
