/**
 * Compiling a recipe to one SQL SELECT, for the engine where the big tables live.
 *
 * The query reads the raw table (one text column per source column, as read from the file) and
 * computes exactly the recipe's output columns, same names, same order. It follows the same rules
 * as apply.ts, phase by phase, in a chain of CTEs:
 *
 *   __levelwise_setup   constants of the dialect (white-space set, double range) — when needed
 *   __levelwise_step0   raw and trimmed text of every source column the recipe reads
 *   __levelwise_step1…  missing test, cleaning (case-fold, merges), reading numbers
 *   …                   level index per categorical column, number and status per continuous one
 *   final SELECT        output codes, inlined from codesForColumn(): level i → matrix row i
 *
 * Level indices follow plan.ts: 0…k−1 a level, −1 all zeros (ALL_ZEROS), and two codes of our own
 * for rows a policy rejects: −2 missing under policy "error", −3 unseen under policy "error".
 *
 * Rows a policy rejects (policy "error" for missing, unseen or invalid values): by default they
 * stay in the result with NULL in the outputs of the column at fault and a reason in the extra
 * column __levelwise_rejected ("column: reason", the first column at fault in recipe order); that
 * column exists only when the recipe has an error policy. With `rejected: 'drop'` they are left out,
 * as the command line leaves them out of its output.
 */
import { countText } from './count-text.ts';
import { transformForColumn, type LevelCodes } from './encoders/index.ts';
import { ALL_ZEROS, compilePlan, type CategoricalPlan, type ColumnPlan } from './plan.ts';
import type { CategoricalColumn, ColumnRecipe, ContinuousColumn, NumberFormat, NumberSymbol, Recipe } from './recipe.ts';
import {
  dialect as dialectNamed,
  quoteIdentifier,
  SETUP_CTE,
  SPACE_GROUP_CODE_POINTS,
  type RegexPattern,
  type SqlDialect,
  type SqlDialectName,
} from './sql-dialects.ts';

export { SQL_DIALECTS, type SqlDialectName } from './sql-dialects.ts';

export interface SqlOptions {
  /** The table or view holding the raw file; a qualified name as its parts, e.g. ['analytics', 'households']. */
  readonly table: string | readonly string[];
  readonly dialect: SqlDialectName;
  /** 'flag' (default): rejected rows stay, with a reason in REJECTED_COLUMN; 'drop': they are left out. */
  readonly rejected?: 'flag' | 'drop';
}

/** Extra output column holding why a row was rejected (NULL for rows that are fine). */
export const REJECTED_COLUMN = '__levelwise_rejected';

/** Level index of a row whose missing value the policy "error" rejects. */
export const REJECTED_MISSING = -2;
/** Level index of a row whose unseen level the policy "error" rejects. */
export const REJECTED_UNSEEN = -3;

/** PostgreSQL keeps at most this many bytes of a name (NAMEDATALEN − 1) and cuts longer ones with only a NOTICE. */
export const POSTGRES_NAME_BYTES = 63;

/**
 * What a person should know before running the query on this engine, in sentences; also written
 * as comments at the top of the SQL. Today: PostgreSQL cutting long output names.
 */
export function sqlNotes(recipe: Recipe, options: Pick<SqlOptions, 'dialect'>): string[] {
  if (options.dialect !== 'postgres') return [];
  const encoder = new TextEncoder();
  const long = recipe.columns.flatMap((c) => c.outputs).filter((name) => encoder.encode(name).length > POSTGRES_NAME_BYTES);
  if (long.length === 0) return [];
  return [
    `PostgreSQL cuts names to ${POSTGRES_NAME_BYTES} bytes, and ${long.length} output name(s) are longer, e.g. "${long[0]}"; ` +
      'use the naming style "safe" or shorter level names to keep them whole.',
  ];
}

/** True when some column of the recipe can reject a row (a policy set to "error"). */
export function recipeCanReject(recipe: Recipe): boolean {
  return recipe.columns.some(columnCanReject);
}

function columnCanReject(column: ColumnRecipe): boolean {
  if (column.level === 'continuous') return column.missing.policy === 'error' || column.invalid === 'error';
  if (column.level === 'identifier' || column.level === 'excluded') return false;
  return column.missing.policy === 'error' || column.unseen === 'error';
}

export function compileSql(recipe: Recipe, options: SqlOptions): string {
  const sql = dialectNamed(options.dialect);
  const tableParts = typeof options.table === 'string' ? [options.table] : [...options.table];
  checkTableName(tableParts);
  const plan = compilePlan(recipe, recipe.columns.map((c) => c.name));
  const steps = new Steps();
  const context: Context = { sql, steps, tokens: recipe.reading.missingTokens };
  const outputs: OutputLine[] = [];
  const rejections: Rejection[] = [];
  recipe.columns.forEach((column, i) => {
    const compiled = compileColumn(column, i, context, plan.columns[i]);
    if (compiled === null) return;
    if (compiled.outputs.length !== column.outputs.length) {
      throw new Error(
        `Column "${column.name}" names ${column.outputs.length} outputs but its encoding makes ${compiled.outputs.length}; ` +
          'check the recipe (parseRecipe reports this).',
      );
    }
    outputs.push({ comment: compiled.comment, exprs: compiled.outputs.map((expr, j) => [expr, column.outputs[j] ?? '']) });
    rejections.push(...compiled.rejections);
  });
  if (outputs.every((o) => o.exprs.length === 0)) {
    throw new Error('The recipe makes no output columns (every column is excluded); there is nothing to select.');
  }
  const mode = options.rejected ?? 'flag';
  return [
    ...headerComment(recipe, sql, rejections.length > 0, mode, sqlNotes(recipe, options)),
    ...withClause(steps, sql, tableParts),
    ...finalSelect(outputs, rejections, steps.lastStage(), mode),
  ].join('\n');
}

function checkTableName(parts: readonly string[]): void {
  if (parts.length === 0 || parts.some((p) => p === '')) throw new Error('Name the table to read, e.g. households or analytics.households.');
  // An unqualified name could be taken for one of the query's own steps; a qualified one cannot.
  const [only] = parts;
  if (parts.length === 1 && only !== undefined && only.toLowerCase().startsWith('__levelwise_')) {
    throw new Error(`The table name "${only}" clashes with the names the query uses for its steps (__levelwise_…); rename it or give its schema.`);
  }
}

// ---------------------------------------------------------------------------------------------------
// Steps: named expressions laid out in CTE stages. A step may use the source columns (stage 0) or
// any alias made in an earlier stage; each stage carries every earlier alias along.

class Steps {
  private readonly stages: [string, string][][] = [];
  usesSetup = false;

  add(stage: number, alias: string, expr: string): string {
    while (this.stages.length <= stage) this.stages.push([]);
    this.stages[stage]!.push([alias, expr]);
    return quoteIdentifier(alias);
  }

  all(): readonly (readonly [string, string])[][] {
    return this.stages;
  }

  lastStage(): string {
    return stageName(this.stages.length - 1);
  }
}

const stageName = (i: number) => `__levelwise_step${i}`;
const SOURCE_ALIAS = '__levelwise_source';

function withClause(steps: Steps, sql: SqlDialect, tableParts: readonly string[]): string[] {
  const ctes: string[] = [];
  const setup = steps.usesSetup && sql.setup.length > 0;
  if (setup) {
    const columns = sql.setup.map(([name, expr]) => `${expr} AS ${quoteIdentifier(name)}`).join(',\n    ');
    ctes.push(`${quoteIdentifier(SETUP_CTE)} AS (\n  SELECT\n    ${columns}\n)`);
  }
  steps.all().forEach((stage, i) => {
    const items = stage.map(([alias, expr]) => `${expr} AS ${quoteIdentifier(alias)}`);
    let from: string;
    if (i === 0) {
      if (setup) items.push(`${quoteIdentifier(SETUP_CTE)}.*`);
      from = `${tableParts.map(quoteIdentifier).join('.')} AS ${quoteIdentifier(SOURCE_ALIAS)}`;
      if (setup) from += ` CROSS JOIN ${quoteIdentifier(SETUP_CTE)}`;
    } else {
      items.unshift(`${quoteIdentifier(stageName(i - 1))}.*`);
      from = quoteIdentifier(stageName(i - 1));
    }
    ctes.push(`${quoteIdentifier(stageName(i))} AS (\n  SELECT\n    ${items.join(',\n    ')}\n  FROM ${from}\n)`);
  });
  return [`WITH ${ctes.join(',\n')}`];
}

interface OutputLine {
  readonly comment: string;
  readonly exprs: readonly (readonly [string, string])[];
}

interface Rejection {
  /** SQL condition true when the row is rejected because of this column. */
  readonly when: string;
  /** SQL text expression: "column: reason". */
  readonly reason: string;
}

function finalSelect(outputs: readonly OutputLine[], rejections: readonly Rejection[], last: string, mode: 'flag' | 'drop'): string[] {
  const lines: string[] = [];
  for (const output of outputs) {
    lines.push(`  -- ${output.comment}`);
    for (const [expr, name] of output.exprs) lines.push(`  ${expr} AS ${quoteIdentifier(name)},`);
  }
  if (rejections.length > 0 && mode === 'flag') {
    lines.push('  -- why a policy "error" rejected the row (first column at fault); NULL when the row is fine');
    const cases = rejections.map((r) => `WHEN ${r.when} THEN ${r.reason}`).join(' ');
    lines.push(`  CASE ${cases} END AS ${quoteIdentifier(REJECTED_COLUMN)},`);
  }
  const lastIndex = lines.length - 1;
  lines[lastIndex] = lines[lastIndex]!.replace(/,$/, '');
  const select = ['SELECT', ...lines, `FROM ${quoteIdentifier(last)}`];
  if (rejections.length > 0 && mode === 'drop') select.push(`WHERE NOT (${rejections.map((r) => r.when).join(' OR ')})`);
  return select;
}

function headerComment(recipe: Recipe, sql: SqlDialect, canReject: boolean, mode: 'flag' | 'drop', notes: readonly string[]): string[] {
  const source = recipe.source.file === null ? 'a file' : `"${recipe.source.file}"`;
  const lines = [
    `Levelwise recipe as SQL (dialect: ${sql.name}); fitted on ${source}, ${countText(recipe.source.rows)} rows.`,
    'Reads a table of text columns exactly as read from the file (DuckDB: read_csv(..., all_varchar = true)).',
  ];
  if (canReject && mode === 'flag') {
    lines.push(`Rows a policy "error" rejects have NULL outputs for that column and a reason in ${REJECTED_COLUMN};`);
    lines.push(`keep "WHERE ${REJECTED_COLUMN} IS NULL" to get the rows the command line writes.`);
  }
  lines.push(...notes.map((note) => `Note: ${note}`));
  return lines.map((line) => `-- ${commentText(line)}`);
}

/** Comment text stays on its line whatever a file or column name holds. */
function commentText(text: string): string {
  return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ');
}

// ---------------------------------------------------------------------------------------------------
// Columns

interface Context {
  readonly sql: SqlDialect;
  readonly steps: Steps;
  /** The recipe's missing tokens, compared after trimming, case-sensitive (missing.ts). */
  readonly tokens: readonly string[];
}

/** Names the steps of column i: "c3_trimmed", "c3_level", … (source names never reach the steps). */
type Alias = (part: string) => string;

interface CompiledColumn {
  readonly comment: string;
  readonly outputs: readonly string[];
  readonly rejections: readonly Rejection[];
}

function compileColumn(column: ColumnRecipe, i: number, context: Context, columnPlan: ColumnPlan | undefined): CompiledColumn | null {
  const source = `${quoteIdentifier(SOURCE_ALIAS)}.${quoteIdentifier(column.name)}`;
  const alias: Alias = (part) => `c${i}_${part}`;
  switch (column.level) {
    case 'excluded':
      return null;
    case 'identifier':
      return {
        comment: commentText(`${column.name}: identifier, passed through`),
        outputs: [context.steps.add(0, alias('raw'), source)],
        rejections: [],
      };
    case 'continuous':
      return continuousColumn(column, source, alias, context);
    default:
      if (columnPlan?.kind !== 'categorical') throw new Error(`Column "${column.name}" has no categorical plan.`);
      return categoricalColumn(column, columnPlan, source, alias, context);
  }
}

/** Step 0 and 1 of every encoded column: the trimmed text, and whether the cell is missing. */
function trimmedAndMissing(source: string, alias: Alias, { sql, steps, tokens }: Context): { trimmed: string; missing: string } {
  steps.usesSetup = true;
  const trimmed = steps.add(0, alias('trimmed'), sql.trim(source));
  // Missing: empty or NULL after trimming, or one of the recipe's tokens (case-sensitive).
  const listed = tokens.length > 0 ? ` OR ${trimmed} IN (${tokens.map((t) => sql.text(t)).join(', ')})` : '';
  const missing = steps.add(1, alias('missing'), `CASE WHEN ${trimmed} IS NULL OR ${trimmed} = ''${listed} THEN 1 ELSE 0 END`);
  return { trimmed, missing };
}

// --- categorical -------------------------------------------------------------------------------------

function categoricalColumn(column: CategoricalColumn, plan: CategoricalPlan, source: string, alias: Alias, context: Context): CompiledColumn {
  const { sql, steps } = context;
  const { trimmed, missing } = trimmedAndMissing(source, alias, context);
  const raw = column.cleaning.trim ? trimmed : steps.add(0, alias('raw'), source);
  const cleaned = steps.add(1, alias('cleaned'), cleanedExpr(raw, column, sql));
  const level = steps.add(2, alias('level'), levelIndexExpr(cleaned, missing, column, plan, sql));
  const codes = plan.codes;
  const rejecting = column.missing.policy === 'error' || column.unseen === 'error';
  const outputs: string[] = [];
  for (let j = 0; j < codes.width; j++) outputs.push(codeExpr(level, codes, j, rejecting, sql));
  if (plan.indicator) outputs.push(missing);
  const rejections: Rejection[] = [];
  const name = sql.text(`${column.name}: `);
  if (column.missing.policy === 'error') {
    rejections.push({ when: `${level} = ${REJECTED_MISSING}`, reason: `${name} || ${sql.text('missing value (missing policy: error)')}` });
  }
  if (column.unseen === 'error') {
    rejections.push({
      when: `${level} = ${REJECTED_UNSEEN}`,
      reason: `${name} || ${sql.text('unseen level "')} || ${cleaned} || ${sql.text('" (unseen policy: error)')}`,
    });
  }
  const coding = column.level === 'binary' ? `positive "${column.positive}"` : column.coding;
  return { comment: commentText(`${column.name}: ${column.level}, ${coding}, ${codes.levels.length} levels`), outputs, rejections };
}

/** raw → (lower case) → explicit merges, as cleaning.ts does (trimming happened in step 0). */
function cleanedExpr(text: string, column: CategoricalColumn, sql: SqlDialect): string {
  const folded = column.cleaning.caseFold ? sql.lower(text) : text;
  // cleaning.ts keeps the last merge naming a value, as a Map does.
  const merged = new Map<string, string>();
  for (const merge of column.cleaning.merges) for (const from of merge.from) merged.set(from, merge.into);
  const changes = [...merged].filter(([from, into]) => from !== into);
  if (changes.length === 0) return folded;
  const whens = changes.map(([from, into]) => `WHEN ${sql.text(from)} THEN ${sql.text(into)}`).join(' ');
  return `CASE ${folded} ${whens} ELSE ${folded} END`;
}

/**
 * The row of the code table each cleaned value becomes, as plan.ts resolves it: grouped values
 * become the other level, known levels their index, anything else follows the unseen policy.
 */
function levelIndexExpr(cleaned: string, missing: string, column: CategoricalColumn, plan: CategoricalPlan, sql: SqlDialect): string {
  const index = new Map(column.levels.map((l, i) => [l.value, i]));
  const grouped = new Set(column.grouped);
  const known = new Map<string, number>();
  for (const value of [...column.levels.map((l) => l.value), ...column.grouped]) {
    const level = index.get(grouped.has(value) ? column.otherLabel : value);
    if (level !== undefined) known.set(value, level);
  }
  const other = index.get(column.otherLabel);
  const unseen =
    column.unseen === 'other' && other !== undefined ? other : column.unseen === 'error' ? REJECTED_UNSEEN : ALL_ZEROS;
  // The missing outcome comes from the core's own resolver: an empty cell is always missing.
  const missingOutcome = plan.resolve('');
  const onMissing = missingOutcome.reject !== null ? REJECTED_MISSING : missingOutcome.level;
  const whens = [...known].map(([value, level]) => `WHEN ${sql.text(value)} THEN ${level}`);
  const lookup = whens.length > 0 ? `CASE ${cleaned} ${whens.join(' ')} ELSE ${unseen} END` : String(unseen);
  return `CASE WHEN ${missing} = 1 THEN ${onMissing} ELSE ${lookup} END`;
}

/** Output j of a categorical column: matrix[level][j], 0 for all-zero rows, NULL for rejected rows. */
function codeExpr(level: string, codes: LevelCodes, j: number, rejecting: boolean, sql: SqlDialect): string {
  const byValue = new Map<number, number[]>();
  for (let i = 0; i < codes.levels.length; i++) {
    const value = codes.matrix[i * codes.width + j] ?? 0;
    if (value === 0) continue;
    const list = byValue.get(value);
    if (list) list.push(i);
    else byValue.set(value, [i]);
  }
  const whens = [...byValue].map(([value, levels]) => `WHEN ${indexCondition(level, levels)} THEN ${sql.number(value)}`);
  if (rejecting) whens.unshift(`WHEN ${level} < ${ALL_ZEROS} THEN NULL`);
  return whens.length === 0 ? '0' : `CASE ${whens.join(' ')} ELSE 0 END`;
}

/** "level = 3", "level BETWEEN 2 AND 5", or both joined by OR: runs of consecutive indices stay short. */
function indexCondition(level: string, indices: readonly number[]): string {
  const parts: string[] = [];
  for (let a = 0; a < indices.length; ) {
    let b = a;
    while (b + 1 < indices.length && indices[b + 1] === (indices[b] ?? 0) + 1) b++;
    const from = indices[a] ?? 0;
    const to = indices[b] ?? 0;
    parts.push(from === to ? `${level} = ${from}` : `${level} BETWEEN ${from} AND ${to}`);
    a = b + 1;
  }
  return parts.length === 1 ? parts[0]! : `(${parts.join(' OR ')})`;
}

// --- continuous -------------------------------------------------------------------------------------

/** Status of a continuous cell: a number, missing, or not a number in the column's format. */
const NUMBER = 0;
const MISSING = 1;
const INVALID = 2;

function continuousColumn(column: ContinuousColumn, source: string, alias: Alias, context: Context): CompiledColumn {
  const { sql, steps } = context;
  const raw = steps.add(0, alias('raw'), source);
  const { trimmed, missing } = trimmedAndMissing(source, alias, context);
  const read = readNumber(trimmed, column.format, alias, context);
  const value = steps.add(read.stage, alias('value'), `CASE WHEN ${missing} = 0 AND ${read.ok} = 1 THEN ${sql.toDouble(read.text)} END`);
  const status = steps.add(
    read.stage + 1,
    alias('status'),
    `CASE WHEN ${missing} = 1 THEN ${MISSING} WHEN ${value} IS NOT NULL AND ${sql.isFinite(value)} = 1 THEN ${NUMBER} ELSE ${INVALID} END`,
  );

  const { center, scale, fill } = transformForColumn(column);
  // The filled value is scaled here exactly as apply.ts scales it: (fill − center) / scale in doubles.
  const filled = fill === null ? 'NULL' : sql.number((fill - center) / scale);
  const onInvalid = column.invalid === 'missing' ? filled : 'NULL';
  const scaled = center === 0 && scale === 1 ? value : `(${value} - ${sql.number(center)}) / ${sql.number(scale)}`;
  const outputs = [`CASE ${status} WHEN ${NUMBER} THEN ${scaled} WHEN ${MISSING} THEN ${filled} ELSE ${onInvalid} END`];
  if (column.missing.indicator) {
    outputs.push(column.invalid === 'missing' ? `CASE WHEN ${status} = ${NUMBER} THEN 0 ELSE 1 END` : `CASE WHEN ${status} = ${MISSING} THEN 1 ELSE 0 END`);
  }

  const rejections: Rejection[] = [];
  const name = sql.text(`${column.name}: `);
  const missingReason = `${name} || ${sql.text('missing value (missing policy: error)')}`;
  if (fill === null) rejections.push({ when: `${status} = ${MISSING}`, reason: missingReason });
  if (column.invalid === 'error') {
    rejections.push({ when: `${status} = ${INVALID}`, reason: `${name} || '"' || ${raw} || ${sql.text('" is not a number')}` });
  } else if (fill === null) {
    rejections.push({ when: `${status} = ${INVALID}`, reason: missingReason });
  }
  return { comment: commentText(`${column.name}: continuous, scaling ${column.scaling}`), outputs, rejections };
}

interface ReadNumber {
  /** Alias (0/1): the trimmed text has the shape of a number in the format. */
  readonly ok: string;
  /** Alias: the text with digit groups removed and a point for the decimal separator. */
  readonly text: string;
  /** First stage free for the steps that use them. */
  readonly stage: number;
}

/** Recognises and normalises a number as numbers.ts does: regular expressions where the engine has them. */
function readNumber(trimmed: string, format: NumberFormat, alias: Alias, { sql, steps }: Context): ReadNumber {
  // A negative in parentheses or with a trailing minus becomes a leading minus, then a symbol
  // ("€ 12", "12 %") comes off, each in a stage of its own; the number is read from what is left.
  let first = 1;
  let bare = trimmed;
  if (format.negative !== undefined) bare = steps.add(first++, alias('signed'), withLeadingMinus(bare, format.negative, sql));
  if (format.symbol !== undefined) bare = steps.add(first++, alias('amount'), withoutSymbol(bare, format.symbol, sql));
  const text = steps.add(first, alias('number_text'), normalisedNumber(bare, format, sql));
  if (sql.regex !== null) {
    const ok = steps.add(first, alias('number_shape'), sql.regex(bare, numberPattern(format)));
    return { ok, text, stage: first + 1 };
  }
  return { ok: shapeByParts(bare, format, alias, sql, steps, first), text, stage: first + 4 };
}

/** number-symbols.ts's withLeadingMinus: "(5)" or "5-" (trimmed) becomes "-5", spaces inside dropped. */
function withLeadingMinus(trimmed: string, negative: 'parentheses' | 'trailing', sql: SqlDialect): string {
  const length = sql.length(trimmed);
  const last = sql.substring(trimmed, length, '1');
  if (negative === 'parentheses') {
    const inner = sql.trimSymbolSpaces(sql.trimSymbolSpaces(sql.substring(trimmed, '2', `${length} - 2`), 'leading'), 'trailing');
    return `CASE WHEN ${length} >= 2 AND ${sql.substring(trimmed, '1', '1')} = '(' AND ${last} = ')' THEN '-' || ${inner} ELSE ${trimmed} END`;
  }
  const rest = sql.trimSymbolSpaces(sql.substring(trimmed, '1', `${length} - 1`), 'trailing');
  return `CASE WHEN ${length} >= 2 AND ${last} = '-' THEN '-' || ${rest} ELSE ${trimmed} END`;
}

/**
 * number-symbols.ts's withoutSymbol: the symbol taken off its side of the trimmed text (a sign may
 * stand before a leading symbol: "-€5"), and the spaces between it and the number.
 */
function withoutSymbol(trimmed: string, symbol: NumberSymbol, sql: SqlDialect): string {
  const s = sql.text(symbol.text);
  // SQL counts characters (code points), JavaScript UTF-16 units: "𝑥" is one character there, two here.
  const k = String([...symbol.text].length);
  if (symbol.side === 'after') {
    const length = sql.length(trimmed);
    const rest = sql.substring(trimmed, '1', `${length} - ${k}`);
    return `CASE WHEN ${length} >= ${k} AND ${sql.substring(trimmed, `${length} - ${k} + 1`, k)} = ${s} THEN ${sql.trimSymbolSpaces(rest, 'trailing')} ELSE ${trimmed} END`;
  }
  const sign = sql.substring(trimmed, '1', '1');
  return (
    `CASE WHEN ${sql.substring(trimmed, '1', k)} = ${s} THEN ${sql.trimSymbolSpaces(sql.substring(trimmed, `${k} + 1`), 'leading')} ` +
    `WHEN ${sign} IN ('+', '-') AND ${sql.substring(trimmed, '2', k)} = ${s} THEN ${sign} || ${sql.trimSymbolSpaces(sql.substring(trimmed, `${k} + 2`), 'leading')} ` +
    `ELSE ${trimmed} END`
  );
}

/** Whether digit groups are read at all: a group equal to the decimal separator cannot be told apart (numbers.ts). */
function isGrouped(format: NumberFormat): boolean {
  return format.group !== '' && format.group !== format.decimal;
}

function groupCharacters(format: NumberFormat): string[] {
  if (!isGrouped(format)) return [];
  return format.group === ' ' ? SPACE_GROUP_CODE_POINTS.map((c) => String.fromCodePoint(c)) : [format.group];
}

function normalisedNumber(trimmed: string, format: NumberFormat, sql: SqlDialect): string {
  let expr = trimmed;
  for (const ch of groupCharacters(format)) expr = `replace(${expr}, ${sql.text(ch)}, '')`;
  if (format.decimal === ',') expr = `replace(${expr}, ',', '.')`;
  return expr;
}

/** numbers.ts's shape, `[+-]?(INT(DEC d+)?|DEC d+)([eE][+-]?d+)?`, in each flavour of regular expression. */
export function numberPattern(format: NumberFormat): RegexPattern {
  const build = (flavour: 're2' | 'are' | 'similar'): string => {
    const open = flavour === 'similar' ? '(' : '(?:';
    const escapeDot = (ch: string) => (ch === '.' && flavour !== 'similar' ? '\\.' : ch);
    const decimal = escapeDot(format.decimal);
    let group = escapeDot(format.group);
    if (format.group === ' ') {
      group =
        flavour === 're2' ? '[ \\x{00A0}\\x{202F}]' : flavour === 'are' ? '[ \\u00A0\\u202F]' : `[ ${String.fromCodePoint(0xa0, 0x202f)}]`;
    }
    const integer = isGrouped(format) ? `${open}[0-9]{1,3}${open}${group}[0-9]{3})+|[0-9]+)` : '[0-9]+';
    const body = `[+-]?${open}${integer}${open}${decimal}[0-9]+)?|${decimal}[0-9]+)${open}[eE][+-]?[0-9]+)?`;
    return flavour === 'are' ? `^${body}$` : body;
  };
  return { re2: build('re2'), are: build('are'), similar: build('similar') };
}

/**
 * The same shape without regular expressions (SQLite has none built in), from string functions
 * and GLOB: split off the sign, the exponent and the decimal part, and check each part's characters.
 */
function shapeByParts(trimmed: string, format: NumberFormat, alias: Alias, sql: SqlDialect, steps: Steps, first: number): string {
  const grouped = isGrouped(format);
  // Space-like groups become plain spaces first, so one GLOB class covers them.
  let spaced = trimmed;
  if (grouped && format.group === ' ') {
    for (const ch of groupCharacters(format).slice(1)) spaced = `replace(${spaced}, ${sql.text(ch)}, ' ')`;
  }
  const unsigned = steps.add(
    first,
    alias('unsigned'),
    `CASE WHEN substr(${spaced}, 1, 1) IN ('+', '-') THEN substr(${spaced}, 2) ELSE ${spaced} END`,
  );
  const e = `instr(lower(${unsigned}), 'e')`;
  const mantissa = steps.add(first + 1, alias('mantissa'), `CASE WHEN ${e} > 0 THEN substr(${unsigned}, 1, ${e} - 1) ELSE ${unsigned} END`);
  const exponent = steps.add(first + 1, alias('exponent'), `CASE WHEN ${e} > 0 THEN substr(${unsigned}, ${e} + 1) END`);
  const d = `instr(${mantissa}, ${sql.text(format.decimal)})`;
  const integer = steps.add(first + 2, alias('integer'), `CASE WHEN ${d} > 0 THEN substr(${mantissa}, 1, ${d} - 1) ELSE ${mantissa} END`);
  const fraction = steps.add(first + 2, alias('fraction'), `CASE WHEN ${d} > 0 THEN substr(${mantissa}, ${d} + 1) END`);
  const digits = (x: string) => `(${x} GLOB '[0-9]*' AND ${x} NOT GLOB '*[^0-9]*')`;
  const exponentOk = steps.add(
    first + 2,
    alias('exponent_ok'),
    `CASE WHEN ${exponent} IS NULL OR ${digits(exponent)} OR (${exponent} GLOB '[+-][0-9]*' AND substr(${exponent}, 2) NOT GLOB '*[^0-9]*') THEN 1 ELSE 0 END`,
  );
  const integerForms = [digits(integer), `(${integer} = '' AND ${fraction} IS NOT NULL)`];
  if (grouped) integerForms.push(groupedDigits(integer, format.group));
  const condition = [`${exponentOk} = 1`, `(${fraction} IS NULL OR ${digits(fraction)})`, `(${integerForms.join(' OR ')})`];
  return steps.add(first + 3, alias('number_shape'), `CASE WHEN ${condition.join(' AND ')} THEN 1 ELSE 0 END`);
}

/** `d{1,3}(G d{3})+` in GLOB terms: starts with a digit, ends "G ddd", every G followed by exactly three digits. */
function groupedDigits(x: string, group: string): string {
  const g = group;
  const d = '[0-9]';
  const conditions = [
    `${x} GLOB '${d}*'`,
    `${x} NOT GLOB '*[^0-9${g}]*'`,
    `${x} GLOB '*${g}${d}${d}${d}'`,
    `${x} NOT GLOB '${d}${d}${d}${d}*'`,
    `${x} NOT GLOB '*${g}${d}${d}${d}${d}*'`,
    `${x} NOT GLOB '*${g}${d}${d}${g}*'`,
    `${x} NOT GLOB '*${g}${d}${g}*'`,
    `${x} NOT GLOB '*${g}${g}*'`,
  ];
  return `(${conditions.join(' AND ')})`;
}
