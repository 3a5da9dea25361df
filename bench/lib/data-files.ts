/** The benchmark's input files (written by bench/generate.ts, git-ignored). */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const DATA_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'data');
/** The size that also gets a copy with every field quoted. */
export const QUOTED_ROWS = 1_000_000;

/** Where the benchmark finds the file of `rows` rows; `quoted`: the copy with every field quoted. */
export function benchDataFile(rows: number, quoted = false): string {
  return join(DATA_DIR, `household-${rows}${quoted ? '-quoted' : ''}.csv`);
}

const COMMA = 44;
const LF = 10;
const CR = 13;
const QUOTE = 34;

/**
 * Whole records of CSV text (RFC 4180, LF or CRLF line ends) with every field put in quotes, inner
 * quotes doubled (§2.7); line ends are written LF, as the generator writes them.
 */
export function quoteEveryField(records: string): string {
  const out: string[] = [];
  let at = 0;
  let quote = records.indexOf('"');
  while (at < records.length) {
    let lineEnd = records.indexOf('\n', at);
    if (lineEnd < 0) lineEnd = records.length;
    if (quote < 0 || quote > lineEnd) {
      // A record without quotes: its commas become "," (the most common case, kept fast).
      const end = lineEnd > at && records.charCodeAt(lineEnd - 1) === CR ? lineEnd - 1 : lineEnd;
      out.push(`"${records.slice(at, end).replaceAll(',', '","')}"\n`);
      at = lineEnd + 1;
      continue;
    }
    at = quoteRecord(records, at, out);
    if (quote < at) quote = records.indexOf('"', at);
  }
  return out.join('');
}

/** Pushes the record at `at` (with quoted fields) with every field quoted; returns where the next record starts. */
function quoteRecord(records: string, at: number, out: string[]): number {
  for (;;) {
    let field = '';
    if (records.charCodeAt(at) === QUOTE) {
      // A quoted field: up to the quote that is not doubled.
      let close = records.indexOf('"', at + 1);
      while (close >= 0 && records.charCodeAt(close + 1) === QUOTE) close = records.indexOf('"', close + 2);
      if (close < 0) close = records.length;
      field = records.slice(at + 1, close).replaceAll('""', '"');
      at = close + 1;
    }
    let stop = at;
    for (let c = records.charCodeAt(stop); stop < records.length && c !== COMMA && c !== LF; c = records.charCodeAt(++stop));
    const lineEnd = records.charCodeAt(stop) !== COMMA;
    field += records.slice(at, lineEnd && stop > at && records.charCodeAt(stop - 1) === CR ? stop - 1 : stop);
    out.push(`"${field.replaceAll('"', '""')}"`, lineEnd ? '\n' : ',');
    at = stop + 1;
    if (lineEnd) return at;
  }
}
