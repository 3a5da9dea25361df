/**
 * Writing encoded rows as CSV bytes (RFC 4180: comma-separated, CRLF line ends, §2.1–2.7).
 * Output is often several times larger than the input and can exceed the longest string a
 * JavaScript engine allows, so it is written into large reusable byte buffers and handed to a
 * sink in parts. Each level's codes are turned into bytes once (",0,1,0"), not once per cell.
 */
import { cellText } from './columns.ts';
import { numberCell, textCell } from './csv-cell.ts';
import type { EncodedBatch } from './apply.ts';
import { ALL_ZEROS, type CategoricalPlan, type Plan } from './plan.ts';

export const LINE_END = '\r\n';
const DEFAULT_BUFFER_BYTES = 1 << 22;
const ZERO = 48;
const ONE = 49;

export interface CsvWriter {
  writeHeader(): void;
  writeBatch(batch: EncodedBatch): void;
  /** Flushes what is buffered to the sink. */
  finish(): void;
  readonly bytesWritten: number;
}

/**
 * `sink` receives filled parts; it must copy or consume them before returning, because the buffer
 * is reused (the CLI writes them, the page copies them into Blob parts).
 */
export function createCsvWriter(plan: Plan, sink: (bytes: Uint8Array) => void, bufferBytes = DEFAULT_BUFFER_BYTES): CsvWriter {
  const encoder = new TextEncoder();
  const buffer = new Uint8Array(bufferBytes);
  let used = 0;
  let total = 0;
  const patterns = plan.columns.map((c) => (c.kind === 'categorical' ? levelPatterns(c, encoder) : null));
  const comma = 44;
  const lineEnd = encoder.encode(LINE_END);

  const flush = (): void => {
    if (used === 0) return;
    sink(buffer.subarray(0, used));
    total += used;
    used = 0;
  };
  const bytes = (part: Uint8Array): void => {
    if (used + part.length > buffer.length) flush();
    if (part.length > buffer.length) {
      sink(part);
      total += part.length;
      return;
    }
    buffer.set(part, used);
    used += part.length;
  };
  const ascii = (text: string): void => {
    if (used + text.length * 3 > buffer.length) flush();
    if (text.length * 3 > buffer.length) return bytes(encoder.encode(text));
    used += encoder.encodeInto(text, buffer.subarray(used)).written;
  };
  const byte = (b: number): void => {
    if (used + 1 > buffer.length) flush();
    buffer[used++] = b;
  };

  return {
    writeHeader() {
      plan.outputs.forEach((name, i) => {
        if (i > 0) byte(comma);
        ascii(textCell(name));
      });
      bytes(lineEnd);
    },
    writeBatch(batch) {
      const rows = batch.end - batch.start;
      for (let r = 0; r < rows; r++) {
        if (batch.rejected[r]) continue;
        let first = true;
        for (let c = 0; c < plan.columns.length; c++) {
          const columnPlan = plan.columns[c]!;
          const encoded = batch.columns[c]!;
          if (columnPlan.width === 0) continue;
          if (!first) byte(comma);
          first = false;
          if (encoded.kind === 'levels') {
            const level = encoded.level[r] ?? ALL_ZEROS;
            const pattern = patterns[c]!;
            bytes(level === ALL_ZEROS ? pattern.zeros : pattern.levels[level]!);
            if (columnPlan.kind === 'categorical' && columnPlan.indicator) {
              if (columnPlan.codes.width > 0) byte(comma);
              byte(encoded.missing[r] ? ONE : ZERO);
            }
          } else if (encoded.kind === 'numbers') {
            ascii(numberCell(encoded.values[r] ?? NaN));
            if (columnPlan.kind === 'continuous' && columnPlan.indicator) {
              byte(comma);
              byte(encoded.missing[r] ? ONE : ZERO);
            }
          } else if (encoded.kind === 'text') {
            ascii(encoded.source === null ? '' : textCell(cellText(encoded.source, batch.start + r)));
          }
        }
        bytes(lineEnd);
      }
    },
    finish: flush,
    get bytesWritten() {
      return total + used;
    },
  };
}

/** The bytes of each level's codes ("0,1,0") and of the all-zero row. */
function levelPatterns(plan: CategoricalPlan, encoder: TextEncoder): { levels: Uint8Array[]; zeros: Uint8Array } {
  const { width, matrix, levels } = plan.codes;
  const row = (level: number): Uint8Array => {
    const cells: string[] = [];
    for (let j = 0; j < width; j++) cells.push(level === ALL_ZEROS ? '0' : numberCell(matrix[level * width + j] ?? 0));
    return encoder.encode(cells.join(','));
  };
  return { levels: levels.map((_, i) => row(i)), zeros: row(ALL_ZEROS) };
}
