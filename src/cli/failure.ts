/**
 * How the command line fails: one line on stderr saying what went wrong, where, and what to do,
 * and an exit code a scheduler can act on. Never a stack trace (LEVELWISE_DEBUG=1 shows one).
 */
import { isLevelwiseError, type LevelwiseError } from '../core/errors.ts';
import { isNotUtf8Error } from '../core/bad-utf8.ts';
import { count } from './common.ts';

/** 0: done; 1: the data does not fit the recipe; 2: the command was wrong or the input unreadable. */
export const EXIT = { ok: 0, doesNotFit: 1, usage: 2 } as const;
export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

/** A failure the person can fix; `hint` says how. */
export class CliFailure extends Error {
  readonly exitCode: ExitCode;
  readonly hint: string;
  /** Further lines, one per problem, when there is more than one to tell (a recipe's problems). */
  readonly details: readonly string[];

  constructor(message: string, hint: string, exitCode: ExitCode = EXIT.usage, details: readonly string[] = []) {
    super(message);
    this.name = 'CliFailure';
    this.hint = hint;
    this.exitCode = exitCode;
    this.details = details;
  }
}

/** The command line was wrong: an unknown option, a missing argument. */
export function usageFailure(verb: string | null, message: string, hint?: string): CliFailure {
  return new CliFailure(message, hint ?? `Run "levelwise ${verb === null ? '' : `${verb} `}--help" for how to use it.`);
}

/** A reading problem core reported (empty file, binary file, bad bytes), said of the file it is in. */
export function readingFailure(label: string, error: LevelwiseError): CliFailure {
  const message = error.message.charAt(0).toLowerCase() + error.message.slice(1);
  // Bytes that are not UTF-8 in a file read as UTF-8 (not a damaged UTF-16 file): say which option reads it.
  const hint = isNotUtf8Error(error) ? 'If an older office program saved it, run again with --encoding windows-1252; otherwise save it again as UTF-8 CSV.' : error.hint;
  return new CliFailure(`cannot read "${label}": ${withPlace(message, error)}`, hint);
}

function withPlace(message: string, error: LevelwiseError): string {
  const where = [error.line === undefined ? '' : `line ${count(error.line)}`, error.column === undefined ? '' : `column ${count(error.column)}`]
    .filter((p) => p !== '')
    .join(', ');
  return where === '' ? message : `${message.replace(/\.$/, '')} (${where}).`;
}

/**
 * The lines printed for any error, and the exit code that goes with it: one line saying what,
 * where and what to do; or, when a failure lists several problems, the headline, one line per
 * problem, and what to do last. Every line starts with "levelwise VERB:".
 */
export function describeFailure(error: unknown, verb: string | null): { lines: string[]; exitCode: ExitCode } {
  const prefix = `levelwise${verb === null ? '' : ` ${verb}`}:`;
  if (error instanceof CliFailure) {
    if (error.details.length === 0) return { lines: [oneLine(`${prefix} ${error.message} ${error.hint}`)], exitCode: error.exitCode };
    const lines = [oneLine(`${prefix} ${error.message}`), ...error.details.map((d) => `${prefix} ${d.replace(/\s*[\r\n]+\s*/g, ' ')}`)];
    if (error.hint !== '') lines.push(oneLine(`${prefix} ${error.hint}`));
    return { lines, exitCode: error.exitCode };
  }
  if (isLevelwiseError(error)) return { lines: [oneLine(`${prefix} ${withPlace(error.message, error)} ${error.hint}`)], exitCode: EXIT.usage };
  const message = error instanceof Error ? error.message : String(error);
  return {
    lines: [oneLine(`${prefix} unexpected problem: ${message.replace(/\.$/, '')}. This is a fault in Levelwise; please report it with the command you ran.`)],
    exitCode: EXIT.usage,
  };
}

function oneLine(text: string): string {
  return text.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}
