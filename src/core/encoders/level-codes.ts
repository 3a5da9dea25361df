/**
 * Every categorical encoding is a table of numbers: one row per level, one column per output.
 * One-hot is the identity, dummy coding drops the reference column, effect coding gives the
 * reference row −1s, and so on. Apply, preview, CSV writing and the SQL compiler all read this one
 * table, so the page, the command line and SQL cannot disagree about what a level becomes.
 */
export interface LevelCodes {
  /** Output columns produced (without the missing-indicator column). */
  readonly width: number;
  /** The levels, in the order of the rows of `matrix`. */
  readonly levels: readonly string[];
  /** Row-major: the codes of level i are matrix[i * width .. i * width + width). */
  readonly matrix: Float64Array;
  /** The label each output column stands for (a level, or ">= level" for cumulative), for naming. */
  readonly columnLabels: readonly string[];
}

export function levelCodes(levels: readonly string[], columnLabels: readonly string[], code: (level: number, out: number) => number): LevelCodes {
  const width = columnLabels.length;
  const matrix = new Float64Array(levels.length * width);
  for (let i = 0; i < levels.length; i++) for (let j = 0; j < width; j++) matrix[i * width + j] = code(i, j);
  return { width, levels, matrix, columnLabels };
}

/** The codes of one level as a plain array (tests, codebook, SQL). */
export function codesOf(codes: LevelCodes, level: number): number[] {
  return Array.from(codes.matrix.subarray(level * codes.width, (level + 1) * codes.width));
}
