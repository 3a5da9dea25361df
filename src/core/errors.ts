/**
 * The one error type for problems a person can cause or fix: a file that is not text, a recipe
 * that does not fit, a value the rules reject. Each carries a stable `code` for programs, a
 * message saying what is wrong and where, and a `hint` saying what to do about it. Errors that
 * mean a bug in Levelwise stay plain `Error`s.
 */

export interface LevelwiseErrorDetails {
  /** What the person can do about it, in a sentence. */
  readonly hint: string;
  /** 1-based line in the file, when the problem has one. */
  readonly line?: number;
  /** 1-based column position, when the problem has one. */
  readonly column?: number;
}

export class LevelwiseError extends Error {
  /** Stable identifier, e.g. 'empty-file', 'not-text', 'encoding-restart'. */
  readonly code: string;
  readonly line?: number;
  readonly column?: number;
  readonly hint: string;

  constructor(code: string, message: string, details: LevelwiseErrorDetails) {
    super(message);
    this.name = 'LevelwiseError';
    this.code = code;
    this.hint = details.hint;
    if (details.line !== undefined) this.line = details.line;
    if (details.column !== undefined) this.column = details.column;
  }
}

/** True when `error` is a LevelwiseError, and of `code` when one is given. */
export function isLevelwiseError(error: unknown, code?: string): error is LevelwiseError {
  return error instanceof LevelwiseError && (code === undefined || error.code === code);
}
