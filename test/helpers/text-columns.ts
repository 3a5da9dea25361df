/** Text columns built by hand from their cells, for tests of what reads dictionaries and packed values. */
import { withPackedValues, type PackedTexts, type TextColumn } from '../../src/core/columns.ts';

/** ASCII `values` end to end, as a column built with packValues keeps them. */
export function packedTexts(values: readonly string[]): PackedTexts {
  const bytes = new TextEncoder().encode(values.join(''));
  const starts = new Int32Array(values.length + 1);
  values.forEach((v, i) => (starts[i + 1] = starts[i]! + v.length));
  return { bytes, starts, ascending: values.every((v, i) => i === 0 || v > values[i - 1]!) };
}

/**
 * A text column of `cells` (ASCII; codes in order of first appearance), with its values as strings
 * and the same column with them kept as bytes.
 */
export function textColumnsOf(cells: readonly string[], name = 'id'): { strings: TextColumn; bytes: TextColumn } {
  const values: string[] = [];
  const counts: number[] = [];
  const codeOf = new Map<string, number>();
  const codes = new Uint32Array(cells.length);
  cells.forEach((cell, row) => {
    let code = codeOf.get(cell);
    if (code === undefined) {
      code = values.push(cell) - 1;
      counts.push(0);
      codeOf.set(cell, code);
    }
    counts[code]!++;
    codes[row] = code;
  });
  const strings: TextColumn = { kind: 'text', name, length: cells.length, codes, values, counts };
  return { strings, bytes: withPackedValues({ kind: 'text', name, length: cells.length, codes, counts }, packedTexts(values)) };
}
