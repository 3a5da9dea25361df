/**
 * What differs between the SQL engines a recipe is compiled for: how a text literal carries control
 * characters, how white space is trimmed, how a number is recognised and read, how an exact double
 * is written. Everything else in sql.ts is plain SQL that every dialect accepts (its GLOB checks run
 * only for SQLite, the one engine here without regular expressions).
 *
 * Limits, stated once (docs/cli.md repeats them for users):
 * - Trimming: JavaScript's trim() removes 25 white-space characters (space, tab, LF, CR, VT, FF,
 *   no-break spaces, the Unicode space separators, U+2028/2029, U+FEFF). The duckdb, postgres and
 *   sqlite dialects trim exactly that set; the ansi dialect can only trim the plain space.
 * - Lower case: JavaScript lower-cases all of Unicode. DuckDB does too, with small differences
 *   (final sigma, dotted capital I); PostgreSQL follows the database's collation; SQLite's lower()
 *   folds ASCII letters only. Recipes with case-folding over non-ASCII levels can differ there.
 * - Reading numbers: the same shape as numbers.ts (groups of three, decimal point or comma, an
 *   optional exponent, a currency or percent symbol or unit, negatives in parentheses or with a
 *   trailing minus); values that overflow a double are not
 *   numbers, as in JavaScript. The ansi dialect takes only plain spaces between a number and its
 *   symbol.
 */

export type SqlDialectName = 'duckdb' | 'postgres' | 'sqlite' | 'ansi';
export const SQL_DIALECTS: readonly SqlDialectName[] = ['duckdb', 'postgres', 'sqlite', 'ansi'];

/** The characters JavaScript's String.prototype.trim() removes (ECMA-262 WhiteSpace and LineTerminator). */
export const JS_TRIM_CODE_POINTS: readonly number[] = [
  0x09, 0x0a, 0x0b, 0x0c, 0x0d, 0x20, 0xa0, 0x1680, 0x2000, 0x2001, 0x2002, 0x2003, 0x2004, 0x2005, 0x2006, 0x2007, 0x2008,
  0x2009, 0x200a, 0x2028, 0x2029, 0x202f, 0x205f, 0x3000, 0xfeff,
];

/** Space-like digit-group separators numbers.ts accepts for the group ' ': space, no-break space, narrow no-break space. */
export const SPACE_GROUP_CODE_POINTS: readonly number[] = [0x20, 0xa0, 0x202f];

/** Largest magnitude that still rounds to a finite double: 2^1024 − 2^970 and above become Infinity. */
const OVERFLOW_AT = (2n ** 1024n - 2n ** 970n).toString();
/** Half the smallest subnormal, 2^−1075: magnitudes at or below it round to zero. */
const UNDERFLOW_AT = `0.${(5n ** 1075n).toString().padStart(1075, '0')}`;

export interface SqlDialect {
  readonly name: SqlDialectName;
  /** A text literal; control characters are spelled with the engine's chr() so the SQL stays one line per literal. */
  text(value: string): string;
  /** Removes leading and trailing white space as JavaScript's trim() does (see the limits above). */
  trim(expr: string): string;
  lower(expr: string): string;
  /** A number literal the engine reads back as exactly `value`. */
  number(value: number): string;
  /** Characters `from` (1-based) on, or `count` of them: substr() or the standard SUBSTRING. */
  substring(expr: string, from: string, count?: string): string;
  /** Length in characters. */
  length(expr: string): string;
  /** Removes the spaces that may stand between a number and its symbol (space, no-break, narrow no-break) at one end. */
  trimSymbolSpaces(expr: string, end: 'leading' | 'trailing'): string;
  /** 1 when `expr` (already trimmed, not null) matches `pattern`, else 0 — where the engine has regular expressions. */
  readonly regex: ((expr: string, pattern: RegexPattern) => string) | null;
  /** The double `expr` (a well-formed number text with a point decimal) holds, or NULL when it overflows. */
  toDouble(expr: string): string;
  /** 1 when the double `expr` is finite. */
  isFinite(expr: string): string;
  /**
   * Constants the expressions above refer to, as (name, expression) pairs of a one-row CTE named
   * SETUP_CTE that the first step joins; its columns travel along with every later step.
   */
  readonly setup: readonly (readonly [string, string])[];
}

/** One regular expression, written for each flavour: RE2 (DuckDB), ARE (PostgreSQL), SQL SIMILAR TO (ansi). */
export interface RegexPattern {
  readonly re2: string;
  readonly are: string;
  readonly similar: string;
}

/** Name of the one-row CTE holding a dialect's constants (white-space set, double range limits). */
export const SETUP_CTE = '__levelwise_setup';
const BLANK = quoteIdentifier('lw_blank');
const OVERFLOW = quoteIdentifier('lw_overflow');
const UNDERFLOW = quoteIdentifier('lw_underflow');

export function dialect(name: SqlDialectName): SqlDialect {
  switch (name) {
    case 'duckdb':
      return duckdb;
    case 'postgres':
      return postgres;
    case 'sqlite':
      return sqlite;
    case 'ansi':
      return ansi;
  }
}

/** "…" with doubled quotes: any column name stays one identifier. */
export function quoteIdentifier(name: string): string {
  if (name.includes('\u0000')) throw new Error(`The name ${JSON.stringify(name)} holds a NUL character, which SQL identifiers cannot.`);
  return `"${name.replace(/"/g, '""')}"`;
}

/** Characters written with chr() instead of literally: C0 and C1 controls, DEL, line and paragraph separators, BOM. */
const UNPRINTABLE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\ufeff]/;

function textWith(chr: ((codePoint: number) => string) | null) {
  return (value: string): string => {
    const quote = (run: string) => `'${run.replace(/'/g, "''")}'`;
    if (chr === null || !UNPRINTABLE.test(value)) return quote(value);
    const parts: string[] = [];
    let run = '';
    for (const ch of value) {
      if (UNPRINTABLE.test(ch)) {
        if (run !== '') parts.push(quote(run));
        run = '';
        parts.push(chr(ch.codePointAt(0) ?? 0));
      } else run += ch;
    }
    if (run !== '') parts.push(quote(run));
    return `(${parts.join(' || ')})`;
  };
}

/** Shortest round-trip text of a finite double; safe integers stay integers. */
function numberText(value: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`SQL cannot hold the number ${value}; recipes hold finite numbers only.`);
  return Object.is(value, -0) ? '0' : String(value);
}

function castNumber(typeName: string) {
  return (value: number): string => {
    const text = numberText(value);
    // Integers are exact in every engine; other doubles go through the engine's correctly rounded
    // text-to-double conversion (DuckDB and PostgreSQL would read 0.1 as a DECIMAL/NUMERIC first).
    return Number.isSafeInteger(value) ? text : `CAST('${text}' AS ${typeName})`;
  };
}

const chrList = (codePoints: readonly number[]) => codePoints.map((c) => `chr(${c})`).join(' || ');

/** substr() and length(), which DuckDB, PostgreSQL and SQLite all have, counting characters. */
const substr = (expr: string, from: string, count?: string): string => `substr(${expr}, ${from}${count === undefined ? '' : `, ${count}`})`;
const length = (expr: string): string => `length(${expr})`;
/** ltrim/rtrim with a set of characters, as DuckDB, PostgreSQL and SQLite have them. */
const trimSet = (set: string) => (expr: string, end: 'leading' | 'trailing'): string => `${end === 'leading' ? 'ltrim' : 'rtrim'}(${expr}, ${set})`;

const duckdb: SqlDialect = {
  name: 'duckdb',
  substring: substr,
  length,
  trimSymbolSpaces: trimSet(chrList(SPACE_GROUP_CODE_POINTS)),
  text: textWith((c) => `chr(${c})`),
  trim: (expr) => `trim(${expr}, ${quoteIdentifier(SETUP_CTE)}.${BLANK})`,
  lower: (expr) => `lower(${expr})`,
  number: castNumber('DOUBLE'),
  regex: (expr, pattern) => `CASE WHEN regexp_full_match(${expr}, ${plainText(pattern.re2)}) THEN 1 ELSE 0 END`,
  toDouble: (expr) => `TRY_CAST(${expr} AS DOUBLE)`,
  isFinite: (expr) => `CASE WHEN isfinite(${expr}) THEN 1 ELSE 0 END`,
  setup: [['lw_blank', chrList(JS_TRIM_CODE_POINTS)]],
};

/** A literal written as is (regular expressions hold no control characters). */
function plainText(value: string): string {
  return `'${value.replace(/'/g, "''")}'`;
}

const postgres: SqlDialect = {
  name: 'postgres',
  substring: substr,
  length,
  trimSymbolSpaces: trimSet(chrList(SPACE_GROUP_CODE_POINTS)),
  text: (value) => {
    if (value.includes('\u0000')) throw new Error(`PostgreSQL text cannot hold the NUL character found in ${JSON.stringify(value)}.`);
    return textWith((c) => `chr(${c})`)(value);
  },
  trim: (expr) => `btrim(${expr}, ${quoteIdentifier(SETUP_CTE)}.${BLANK})`,
  lower: (expr) => `lower(${expr})`,
  number: castNumber('DOUBLE PRECISION'),
  regex: (expr, pattern) => `CASE WHEN ${expr} ~ ${plainText(pattern.are)} THEN 1 ELSE 0 END`,
  // Short plain decimals are read directly. Anything that could overflow or underflow a double goes
  // through NUMERIC first: PostgreSQL raises an error (stopping the whole query) where JavaScript
  // gives Infinity (not a number for us) or 0.
  toDouble: (expr) =>
    `CASE WHEN length(${expr}) < 300 AND strpos(lower(${expr}), 'e') = 0 THEN CAST(${expr} AS DOUBLE PRECISION) ` +
    `WHEN abs(CAST(${expr} AS NUMERIC)) >= ${OVERFLOW} THEN NULL ` +
    `WHEN abs(CAST(${expr} AS NUMERIC)) <= ${UNDERFLOW} THEN CAST(0 AS DOUBLE PRECISION) ` +
    `ELSE CAST(${expr} AS DOUBLE PRECISION) END`,
  isFinite: (expr) => `CASE WHEN ${expr} IS NOT NULL THEN 1 ELSE 0 END`,
  setup: [
    ['lw_blank', chrList(JS_TRIM_CODE_POINTS)],
    ['lw_overflow', `CAST('${OVERFLOW_AT}' AS NUMERIC)`],
    ['lw_underflow', `CAST('${UNDERFLOW_AT}' AS NUMERIC)`],
  ],
};

const sqlite: SqlDialect = {
  name: 'sqlite',
  substring: substr,
  length,
  trimSymbolSpaces: trimSet(`char(${SPACE_GROUP_CODE_POINTS.join(', ')})`),
  text: textWith((c) => `char(${c})`),
  trim: (expr) => `trim(${expr}, char(${JS_TRIM_CODE_POINTS.join(', ')}))`,
  lower: (expr) => `lower(${expr})`,
  // SQLite reads a literal with a point or an exponent as a REAL. Integers stay INTEGER, which is
  // safe: every constant meets a REAL operand (a parsed number) or is an output code on its own.
  number: (value) => numberText(value),
  regex: null,
  toDouble: (expr) => `CAST(${expr} AS REAL)`,
  isFinite: (expr) => `CASE WHEN abs(${expr}) <= 1.7976931348623157e308 THEN 1 ELSE 0 END`,
  setup: [],
};

const ansi: SqlDialect = {
  name: 'ansi',
  substring: (expr, from, count) => `SUBSTRING(${expr} FROM ${from}${count === undefined ? '' : ` FOR ${count}`})`,
  length: (expr) => `CHAR_LENGTH(${expr})`,
  // Standard TRIM takes one character: the plain space only (as for trimming, see the limits above).
  trimSymbolSpaces: (expr, end) => `TRIM(${end === 'leading' ? 'LEADING' : 'TRAILING'} ' ' FROM ${expr})`,
  // Standard SQL has no chr(): control characters stay literal inside the quotes.
  text: textWith(null),
  trim: (expr) => `TRIM(BOTH ' ' FROM ${expr})`,
  lower: (expr) => `LOWER(${expr})`,
  number: castNumber('DOUBLE PRECISION'),
  regex: (expr, pattern) => `CASE WHEN ${expr} SIMILAR TO ${plainText(pattern.similar)} THEN 1 ELSE 0 END`,
  toDouble: (expr) => `CAST(${expr} AS DOUBLE PRECISION)`,
  isFinite: (expr) => `CASE WHEN ${expr} IS NOT NULL THEN 1 ELSE 0 END`,
  setup: [],
};
