/**
 * The `levelwise` command line: arguments → core → files. Each verb lives in verbs/; this file
 * only picks the verb, shows help, and turns any failure into one line and an exit code.
 */
import { describeFailure, EXIT, usageFailure, type ExitCode } from './failure.ts';
import { MAIN_HELP, VERB_HELP, VERSION_TEXT } from './help.ts';
import { OutputClosed } from './output.ts';
import { applyVerb } from './verbs/apply.ts';
import { checkVerb } from './verbs/check.ts';
import { draftVerb } from './verbs/draft.ts';
import { profileVerb } from './verbs/profile.ts';
import { sqlVerb } from './verbs/sql.ts';
import { useWebAssembly } from '../core/webassembly.ts';

const VERBS: Readonly<Record<string, (argv: readonly string[]) => Promise<ExitCode>>> = {
  profile: profileVerb,
  draft: draftVerb,
  apply: applyVerb,
  check: checkVerb,
  sql: sqlVerb,
};

const wantsHelp = (argv: readonly string[]) => argv.some((a) => a === '--help' || a === '-h');

export async function main(argv: readonly string[]): Promise<ExitCode> {
  // For measuring the WebAssembly modules against their JavaScript twins (DEVELOPERS.md); the reading threads do the same.
  if (process.env['LEVELWISE_NO_WASM'] === '1') useWebAssembly(false);
  const [verb, ...rest] = argv;
  if (verb === undefined || verb === '--help' || verb === '-h' || verb === 'help') {
    const topic = verb === 'help' ? rest[0] : undefined;
    // Without a verb the command was incomplete: the help goes to standard error, with exit 2.
    (verb === undefined ? process.stderr : process.stdout).write((topic !== undefined ? VERB_HELP[topic] : undefined) ?? MAIN_HELP);
    return verb === undefined ? EXIT.usage : EXIT.ok;
  }
  if (verb === '--version' || verb === '-V') {
    process.stdout.write(VERSION_TEXT);
    return EXIT.ok;
  }
  const run = VERBS[verb];
  try {
    if (run === undefined) {
      throw usageFailure(null, `"${verb}" is not a verb.`, `Use one of ${Object.keys(VERBS).join(', ')}; "levelwise --help" explains them.`);
    }
    if (wantsHelp(rest)) {
      process.stdout.write(VERB_HELP[verb] ?? MAIN_HELP);
      return EXIT.ok;
    }
    return await run(rest);
  } catch (error) {
    if (error instanceof OutputClosed) return EXIT.ok;
    if (process.env['LEVELWISE_DEBUG'] === '1') console.error(error);
    const { lines, exitCode } = describeFailure(error, run === undefined ? null : verb);
    process.stderr.write(`${lines.join('\n')}\n`);
    return exitCode;
  }
}
