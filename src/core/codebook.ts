/**
 * The codebook: a readable table of every output column — its source column, level, encoding,
 * and what each value means ("1 = heating is heat pump; reference level: gas").
 */
import { countText } from './count-text.ts';
import { codesForColumn, codesOf } from './encoders/index.ts';
import { transformForColumn } from './encoders/index.ts';
import { numberFormatExample } from './numbers.ts';
import type { ColumnRecipe, NumberFormat, Recipe } from './recipe.ts';

export interface CodebookEntry {
  readonly output: string;
  readonly source: string;
  readonly level: string;
  readonly encoding: string;
  readonly meaning: string;
}

export function codebookEntries(recipe: Recipe): CodebookEntry[] {
  return recipe.columns.flatMap((column) => entriesOf(column));
}

function entriesOf(column: ColumnRecipe): CodebookEntry[] {
  const at = (i: number, encoding: string, meaning: string): CodebookEntry => ({
    output: column.outputs[i] ?? '',
    source: column.name,
    level: column.level,
    encoding,
    meaning,
  });
  const withIndicator = (entries: CodebookEntry[], encoding: string): CodebookEntry[] =>
    'missing' in column && column.missing.indicator
      ? [...entries, at(entries.length, encoding, `1 = ${column.name} was missing; 0 = it was present`)]
      : entries;
  switch (column.level) {
    case 'excluded':
      return [];
    case 'identifier':
      return [at(0, 'passed through', 'the original text, unchanged (text that looks like a formula gets a leading apostrophe)')];
    case 'continuous': {
      const t = transformForColumn(column);
      const scaling =
        column.scaling === 'z-score' ? `z-score: (x − ${t.center}) / ${t.scale}` : column.scaling === 'min-max' ? `min–max: (x − ${t.center}) / ${t.scale}` : 'as is';
      const fill = t.fill === null ? 'missing rows are rejected' : `missing filled with ${t.fill} (${column.missing.policy}) before scaling`;
      return withIndicator([at(0, scaling, `${column.name} as a number${writtenLike(column.format)}; ${fill}`)], 'missing indicator');
    }
    default:
      return withIndicator(categoricalEntries(column, at), 'missing indicator');
  }
}

function categoricalEntries(
  column: Extract<ColumnRecipe, { level: 'nominal' | 'ordinal' | 'binary' }>,
  at: (i: number, encoding: string, meaning: string) => CodebookEntry,
): CodebookEntry[] {
  const codes = codesForColumn(column);
  const encoding = column.level === 'binary' ? 'binary 0/1' : column.coding;
  const policy = `unseen values: ${column.unseen}; missing: ${column.missing.policy}`;
  if (codes.width === 1 && column.level !== 'binary') {
    const pairs = codes.levels.map((level, i) => `${numberText(codesOf(codes, i)[0] ?? 0)} = ${level}`).join('; ');
    return [at(0, encoding, `${pairs}. ${policy}`)];
  }
  return codes.columnLabels.map((label, j) => {
    const ones = codes.levels.filter((_, i) => (codesOf(codes, i)[j] ?? 0) === 1);
    const minus = codes.levels.filter((_, i) => (codesOf(codes, i)[j] ?? 0) === -1);
    let meaning = column.level === 'ordinal' ? `1 = ${column.name} is ${ones.join(' or ')}` : `1 = ${column.name} is ${label}`;
    if (minus.length > 0) meaning += `; −1 = ${minus.join(', ')}`;
    if (column.level === 'nominal' && (column.coding === 'dummy' || column.coding === 'effect')) meaning += `; reference level: ${column.reference}`;
    if (column.level === 'binary') meaning += `; 0 = ${codes.levels.filter((l) => l !== label).join(', ') || 'anything else'}`;
    return at(j, encoding, `${meaning}. ${policy}`);
  });
}

/** How the source writes its numbers, when not plainly ("1234.5"): the reader of the codebook must know "12 %" became 12. */
function writtenLike(format: NumberFormat): string {
  const example = numberFormatExample(format);
  if (example === null) return '';
  return `, read from text written like ${example}${format.symbol === undefined ? '' : ` (the number as written, without “${format.symbol.text}”)`}`;
}

/** Which cells were read as missing: the reader of the codebook must know that "None" or "-999" meant no value. */
export function missingSentence(recipe: Recipe): string {
  const tokens = recipe.reading.missingTokens;
  if (tokens.length === 0) return 'A cell counts as missing when it is empty.';
  const quoted = tokens.map((t) => `“${t}”`);
  const list = quoted.length === 1 ? quoted[0] : `${quoted.slice(0, -1).join(', ')} or ${quoted.at(-1)}`;
  return `A cell counts as missing when it is empty or, spaces around it aside, spelled ${list}.`;
}

function numberText(n: number): string {
  return Object.is(n, -0) ? '0' : String(n);
}

function escapeMarkdown(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\r?\n/g, ' ');
}

export function codebookMarkdown(recipe: Recipe): string {
  const lines = [
    `# Codebook${recipe.source.file ? ` for ${escapeMarkdown(recipe.source.file)}` : ''}`,
    '',
    `Made by Levelwise from a recipe fitted on ${countText(recipe.source.rows)} rows. ${escapeMarkdown(missingSentence(recipe))}`,
    '',
    '| output column | source column | level | encoding | meaning |',
    '|---|---|---|---|---|',
    ...codebookEntries(recipe).map((e) => `| ${[e.output, e.source, e.level, e.encoding, e.meaning].map(escapeMarkdown).join(' | ')} |`),
  ];
  return `${lines.join('\n')}\n`;
}

function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export function codebookHtml(recipe: Recipe): string {
  const rows = codebookEntries(recipe)
    .map((e) => `<tr>${[e.output, e.source, e.level, e.encoding, e.meaning].map((t) => `<td>${escapeHtml(t)}</td>`).join('')}</tr>`)
    .join('\n');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Codebook</title>
<style>body{font:14px system-ui,sans-serif;margin:2rem}table{border-collapse:collapse}td,th{border:1px solid #999;padding:4px 8px;text-align:left;vertical-align:top}</style>
</head><body>
<h1>Codebook${recipe.source.file ? ` for ${escapeHtml(recipe.source.file)}` : ''}</h1>
<p>Made by Levelwise from a recipe fitted on ${countText(recipe.source.rows)} rows. ${escapeHtml(missingSentence(recipe))}</p>
<table><thead><tr><th>output column</th><th>source column</th><th>level</th><th>encoding</th><th>meaning</th></tr></thead>
<tbody>
${rows}
</tbody></table></body></html>
`;
}
