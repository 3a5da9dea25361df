/**
 * What the preview grid shows, as plain data: output columns grouped under their source column,
 * each leaf knowing where its values sit in a preview window. Pure, so it is easy to test and the
 * grid component only lays it out.
 */
import type { Recipe } from '../../core/recipe.ts';
import type { PreviewWindow } from '../../worker/protocol.ts';

export type LeafKind =
  /** A number the recipe produces. */
  | 'number'
  /** An identifier copied through as text. */
  | 'text'
  /** The source cell as the file wrote it, shown beside the outputs on demand. */
  | 'original';

export interface PreviewLeaf {
  /** Unique across the grid. */
  readonly id: string;
  /** The full output name (as in the CSV header). */
  readonly label: string;
  /** What the header shows under its group: the part after the source name ("=gas"), or the full name. */
  readonly short: string;
  readonly kind: LeafKind;
  /** Index into the window's row of numbers (plan output order); -1 for text and original leaves. */
  readonly output: number;
  /** Index of the source column in the file's header; -1 when the file lacks it. */
  readonly source: number;
}

export interface PreviewGroup {
  readonly id: string;
  /** The source column's name. */
  readonly name: string;
  readonly level: Recipe['columns'][number]['level'];
  readonly leaves: readonly PreviewLeaf[];
}

/**
 * One group per recipe column, in file order. Excluded columns produce no outputs; they appear
 * (with their original only) when originals are shown, so the person can still see what was left out.
 */
export function previewGroups(recipe: Recipe, names: readonly string[], showOriginals: boolean): PreviewGroup[] {
  const position = new Map<string, number>();
  names.forEach((name, i) => position.has(name) || position.set(name, i));
  const groups: PreviewGroup[] = [];
  let output = 0;
  recipe.columns.forEach((column, c) => {
    const source = position.get(column.name) ?? -1;
    const leaves: PreviewLeaf[] = [];
    if (showOriginals) leaves.push({ id: `g${c}:original`, label: `${column.name} (original)`, short: 'original', kind: 'original', output: -1, source });
    column.outputs.forEach((name, j) => {
      const kind: LeafKind = column.level === 'identifier' ? 'text' : 'number';
      leaves.push({ id: `g${c}:o${j}`, label: name, short: shortLabel(name, column.name), kind, output: output + j, source });
    });
    output += column.outputs.length;
    if (leaves.length > 0) groups.push({ id: `g${c}`, name: column.name, level: column.level, leaves });
  });
  return groups;
}

/** "heating=gas" under "heating" reads "=gas"; a name that is the source name stays whole. */
export function shortLabel(output: string, source: string): string {
  return output.startsWith(source) && output.length > source.length ? output.slice(source.length).trim() : output;
}

/** The text a cell shows, or null when the row is outside the window (not fetched yet). */
export function cellDisplay(window: PreviewWindow | null, columnCount: number, row: number, leaf: PreviewLeaf): string | null {
  if (window === null || row < window.start || row >= window.end) return null;
  const r = row - window.start;
  if (leaf.kind === 'number') return formatPreviewNumber(window.values[r * window.width + leaf.output] ?? NaN);
  if (leaf.source < 0) return '';
  return window.cells[r * columnCount + leaf.source] ?? '';
}

/** Whole numbers as they are; others to at most 4 decimals; a value that is not a number as "—". */
export function formatPreviewNumber(value: number): string {
  if (Number.isNaN(value)) return '—';
  if (Number.isInteger(value)) return String(value);
  const fixed = value.toFixed(4).replace(/\.?0+$/, '');
  return fixed === '-0' ? '0' : fixed;
}

/** Pixel width for a leaf, from its label length: wide enough to read, never huge. */
export function leafWidth(leaf: PreviewLeaf): number {
  const chars = leaf.kind === 'original' ? 14 : Math.max(8, Math.min(26, leaf.short.length + 2));
  return Math.round(chars * 7.4 + 16);
}
