/**
 * levelwise sql RECIPE --table NAME [--dialect duckdb|postgres|sqlite|ansi] [--rejected flag|drop] [-o OUT]
 *
 * The recipe as one SQL SELECT over the raw table (core's compileSql), ended with a semicolon.
 */
import { isLevelwiseError } from '../../core/errors.ts';
import { compileSql, SQL_DIALECTS, sqlNotes, type SqlDialectName } from '../../core/sql.ts';
import { optionValue, parseArgs, positionals } from '../args.ts';
import { note, OUTPUT_OPTION } from '../common.ts';
import { CliFailure, EXIT, usageFailure, type ExitCode } from '../failure.ts';
import { readRecipe } from '../input.ts';
import { openOutput } from '../output.ts';

const VERB = 'sql';
export const DEFAULT_DIALECT: SqlDialectName = 'duckdb';

export async function sqlVerb(argv: readonly string[]): Promise<ExitCode> {
  const args = parseArgs(VERB, argv, [
    { name: 'table' },
    { name: 'dialect', choices: SQL_DIALECTS },
    { name: 'rejected', choices: ['flag', 'drop'] },
    OUTPUT_OPTION,
  ]);
  const [recipePath = ''] = positionals(VERB, args, ['RECIPE']);
  const table = optionValue(args, 'table');
  if (table === undefined || table.trim() === '') {
    throw usageFailure(VERB, '--table is missing.', 'Name the table that holds the raw file, e.g. --table households or --table analytics.households.');
  }
  const recipe = await readRecipe(recipePath);
  const dialect = (optionValue(args, 'dialect') as SqlDialectName | undefined) ?? DEFAULT_DIALECT;
  const options = { table: table.split('.'), dialect, rejected: (optionValue(args, 'rejected') as 'flag' | 'drop' | undefined) ?? 'flag' };
  let sql: string;
  try {
    sql = compileSql(recipe, options);
  } catch (error) {
    // Core's own errors carry their hint; the compiler's plain ones are about the recipe or the table name.
    if (isLevelwiseError(error) || !(error instanceof Error)) throw error;
    throw new CliFailure(`${error.message.replace(/\.$/, '')}.`, 'Check the recipe and --table.');
  }
  for (const text of sqlNotes(recipe, options)) note(VERB, text);
  const output = openOutput(optionValue(args, 'output'));
  output.write(`${sql};\n`);
  await output.close();
  return EXIT.ok;
}
