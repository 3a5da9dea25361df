/**
 * Output column names: readable ("heating=heat pump") or safe identifiers ("heating__heat_pump").
 * Names are unique across the whole recipe; a collision gets a numbered suffix, assigned in
 * column order, so the same recipe always names its outputs the same way.
 */
import { codesForColumn } from './encoders/index.ts';
import type { ColumnRecipe, Recipe } from './recipe.ts';

type Naming = Recipe['naming'];

/** One output label of a column: the source name joined to a level (or a comparison) by `joiner`. */
interface Label {
  readonly joiner: '' | '=' | '>=';
  readonly part: string;
}

function labelsOf(column: ColumnRecipe): Label[] {
  switch (column.level) {
    case 'excluded':
      return [];
    case 'identifier':
    case 'continuous':
      return withIndicator(column, [{ joiner: '', part: '' }]);
    case 'nominal':
    case 'ordinal':
    case 'binary': {
      const codes = codesForColumn(column);
      const single = codes.width === 1 && (column.level !== 'binary');
      const labels: Label[] = single
        ? [{ joiner: '', part: '' }]
        : codes.columnLabels.map((label) =>
            label.startsWith('>=') ? { joiner: '>=', part: label.slice(2) } : { joiner: '=', part: label },
          );
      return withIndicator(column, labels);
    }
  }
}

function withIndicator(column: ColumnRecipe, labels: Label[]): Label[] {
  const indicator = 'missing' in column && column.missing.indicator;
  return indicator ? [...labels, { joiner: '', part: ' (missing)' }] : labels;
}

/** A lower-case identifier of letters, digits and underscores that never starts with a digit. */
export function safeIdentifier(text: string): string {
  const cleaned = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '');
  const nonEmpty = cleaned === '' ? 'x' : cleaned;
  return /^[0-9]/.test(nonEmpty) ? `_${nonEmpty}` : nonEmpty;
}

function spell(name: string, label: Label, naming: Naming): string {
  if (naming === 'readable') return `${name}${label.joiner}${label.part}`;
  const base = safeIdentifier(name);
  if (label.part === ' (missing)') return `${base}__missing`;
  if (label.joiner === '') return base;
  return `${base}__${label.joiner === '>=' ? 'atleast_' : ''}${safeIdentifier(label.part)}`;
}

/** Fills every column's `outputs` with unique names in the recipe's naming style. */
export function nameOutputs(recipe: Recipe): Recipe {
  const used = new Set<string>();
  const unique = (wanted: string): string => {
    let name = wanted;
    for (let n = 2; used.has(name); n++) name = recipe.naming === 'readable' ? `${wanted} (${n})` : `${wanted}_${n}`;
    used.add(name);
    return name;
  };
  const columns = recipe.columns.map((column) => {
    const outputs = labelsOf(column).map((label) => unique(spell(column.name, label, recipe.naming)));
    // A column whose names did not change stays the same object: the page redraws only what changed.
    return sameNames(outputs, column.outputs) ? column : { ...column, outputs };
  });
  return { ...recipe, columns };
}

function sameNames(a: readonly string[], b: readonly string[] | undefined): boolean {
  return b !== undefined && a.length === b.length && a.every((name, i) => name === b[i]);
}
