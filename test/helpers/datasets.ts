/** Published datasets shipped by the npm package vega-datasets, as CSV bytes for our reader. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

const DATA = join(import.meta.dirname, '../../node_modules/vega-datasets/data');

function csvCell(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A JSON array of flat records → RFC 4180 CSV text (null becomes an empty cell). */
export function recordsToCsv(records: readonly Record<string, unknown>[]): string {
  const header = Object.keys(records[0] ?? {});
  const lines = [header.map(csvCell).join(','), ...records.map((r) => header.map((h) => csvCell(r[h])).join(','))];
  return `${lines.join('\n')}\n`;
}

export function vegaDatasetCsv(name: 'penguins' | 'cars'): Uint8Array {
  const records = JSON.parse(readFileSync(join(DATA, `${name}.json`), 'utf8')) as Record<string, unknown>[];
  return new TextEncoder().encode(recordsToCsv(records));
}
