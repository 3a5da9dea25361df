/**
 * Writing encoded rows as CSV bytes (RFC 4180: comma-separated, CRLF line ends, §2.1–2.7).
 * Output is often several times larger than the input and can exceed the longest string a
 * JavaScript engine allows, so it is written into large reusable byte buffers and handed to a
 * sink in parts.
 *
 * Every cell is a *piece*: bytes made once, then copied into place for each row that needs them.
 * A piece carries its separators (the comma before it, the line end after the last column), so a
 * row is its pieces one after the other.
 *   - a level's codes ("0,1,0", with the missing indicator): made once per plan;
 *   - a number (with its indicator): made once per distinct number and remembered across batches
 *     (formatting a double is the costliest step of writing); a number column read from a
 *     dictionary looks its number up once per code of the batch, not once per cell; one in number
 *     storage looks it up first on a grid of the file's steps (number-piece-grid.ts), then by hash;
 *   - a text cell (an identifier): made once per code of the batch, quoted and neutralised as
 *     textCell does; plain texts (most identifiers) are copied while they are checked, from their
 *     bytes when the column kept them so (columns.ts `withPackedValues`), no string made.
 * All pieces live in one byte array. A batch is first turned into a piece number per row and
 * column, column by column; the row loop then only copies bytes, the same way for every column.
 * Adjacent categorical columns share their pieces: a piece for each combination of their levels
 * (while there are at most JOINT_PIECES_LIMIT), so the row loop copies one piece where it would
 * copy several small ones (the dozen categorical columns of a survey export become four pieces).
 * The row loop runs in WebAssembly where it can (wasm-row-copier.ts: 16 bytes a copy, ~70 against
 * ~170 ms for the benchmark's 1M rows), else here; the bytes are the same.
 */
import { cellText, type Codes, type Column, type PackedTexts } from './columns.ts';
import { numberCell, textCell } from './csv-cell.ts';
import type { EncodedBatch } from './apply.ts';
import { ALL_ZEROS, type CategoricalPlan, type Plan } from './plan.ts';
import { wasmRowCopier, type WasmRowCopier } from './wasm-row-copier.ts';
import { NumberPieceGrid } from './number-piece-grid.ts';
import type { LinearTransform } from './encoders/index.ts';

export const LINE_END = '\r\n';
const DEFAULT_BUFFER_BYTES = 1 << 22;
const CR = 13;
const LF = 10;
const COMMA = 44;
const QUOTE = 34;
/** Distinct numbers remembered across batches, all columns together, at most (checked between batches). */
const NUMBER_CACHE_LIMIT = 1 << 18;
/** The row loop copies eight bytes at a time, so it may run up to seven bytes past a piece's end. */
const COPY_SLACK = 7;
/**
 * Adjacent categorical columns are written as one piece per combination of their levels while the
 * combinations number at most this, and their bytes at most JOINT_BYTES_LIMIT: the pieces then
 * stay few enough to be made at once and at hand in the processor's cache.
 */
export const JOINT_PIECES_LIMIT = 4096;
const JOINT_BYTES_LIMIT = 1 << 20;

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
export function createCsvWriter(plan: Plan, sink: (bytes: Uint8Array) => void, bufferBytes = DEFAULT_BUFFER_BYTES, jointLimit = JOINT_PIECES_LIMIT): CsvWriter {
  return new BufferedCsvWriter(plan, sink, bufferBytes, jointLimit);
}

/** What comes before and after a column's cells: a comma unless it is the first, a line end after the last. */
interface Separators {
  readonly before: string;
  readonly after: string;
}

/** How far the pieces went: `Pieces.truncate` goes back to it. */
interface PiecesMark {
  readonly count: number;
  readonly used: number;
}

/**
 * Byte strings stored end to end in one growing array: piece p is bytes[bounds[2p] .. bounds[2p + 1]).
 * COPY_SLACK spare bytes always follow the last piece; `zeroSlack` clears them before a row loop.
 */
class Pieces {
  bytes = new Uint8Array(1 << 16);
  bounds = new Int32Array(1 << 12);
  count = 0;
  /** Bytes of `bytes` in use. */
  used = 0;

  mark(): PiecesMark {
    return { count: this.count, used: this.used };
  }

  truncate(mark: PiecesMark): void {
    this.count = mark.count;
    this.used = mark.used;
  }

  /** Clears the spare bytes after the last piece (a batch's pieces end before an earlier batch's did). */
  zeroSlack(): void {
    this.bytes.fill(0, this.used, this.used + COPY_SLACK);
  }

  length(piece: number): number {
    return this.bounds[2 * piece + 1]! - this.bounds[2 * piece]!;
  }

  /** Adds a text known to be ASCII (numbers, plain identifiers, level codes). */
  addAscii(text: string): number {
    const n = text.length;
    const at = this.reserve(n);
    const bytes = this.bytes;
    for (let k = 0; k < n; k++) bytes[at + k] = text.charCodeAt(k);
    return this.close(at, n);
  }

  /** Adds any text as UTF-8. */
  addText(text: string, encoder: TextEncoder): number {
    const at = this.reserve(3 * text.length);
    return this.close(at, encoder.encodeInto(text, this.bytes.subarray(at)).written);
  }

  /**
   * Adds `texts` as consecutive pieces with their separators, checking while copying that each is
   * plain (ASCII, no quote, comma, CR or LF, no formula start: textCell would leave it as it is).
   * Returns the first piece; or −1, having added nothing, when one is not plain.
   */
  addPlainRun(texts: readonly string[], separators: Separators): number {
    let length = 0;
    for (const text of texts) length += text.length;
    return this.addRun(texts.length, length, separators, (t, bytes, at) => copyPlainText(texts[t]!, bytes, at));
  }

  /** addPlainRun for texts held as ASCII bytes (PackedTexts): the same pieces, or −1 with nothing added. */
  addPlainBytesRun({ bytes: from, starts }: PackedTexts, separators: Separators): number {
    const count = starts.length - 1;
    return this.addRun(count, starts[count]! - starts[0]!, separators, (t, bytes, at) => copyPlainBytes(from, starts[t]!, starts[t + 1]!, bytes, at));
  }

  /**
   * `count` texts of `length` bytes in all as consecutive pieces with their separators; `copy`
   * writes text t at `at` and says where it stopped, or −1 for a text that is not plain.
   */
  private addRun(count: number, length: number, { before, after }: Separators, copy: (text: number, bytes: Uint8Array, at: number) => number): number {
    const mark = this.mark();
    this.reserve(length + count * (before.length + after.length));
    this.reservePieces(count);
    const { bytes, bounds } = this;
    const comma = before.length > 0;
    const lineEnd = after.length > 0;
    let at = this.used;
    let p = this.count;
    for (let text = 0; text < count; text++) {
      bounds[2 * p] = at;
      if (comma) bytes[at++] = COMMA;
      at = copy(text, bytes, at);
      if (at < 0) return this.undo(mark);
      if (lineEnd) {
        bytes[at++] = CR;
        bytes[at++] = LF;
      }
      bounds[2 * p++ + 1] = at;
    }
    const first = this.count;
    this.count = p;
    this.used = at;
    return first;
  }

  private undo(mark: PiecesMark): -1 {
    this.truncate(mark);
    return -1;
  }

  private reserve(n: number): number {
    const needed = this.used + n + COPY_SLACK;
    if (needed > this.bytes.length) {
      const grown = new Uint8Array(Math.max(2 * this.bytes.length, needed));
      grown.set(this.bytes.subarray(0, this.used));
      this.bytes = grown;
    }
    return this.used;
  }

  private reservePieces(n: number): void {
    if (2 * (this.count + n) > this.bounds.length) {
      const grown = new Int32Array(Math.max(2 * this.bounds.length, 2 * (this.count + n)));
      grown.set(this.bounds.subarray(0, 2 * this.count));
      this.bounds = grown;
    }
  }

  private close(at: number, n: number): number {
    this.reservePieces(1);
    const p = this.count++;
    this.bounds[2 * p] = at;
    this.bounds[2 * p + 1] = at + n;
    this.used = at + n;
    return p;
  }
}

/** Remembers the piece of each distinct number (with its missing flag) of one column, across batches. */
class NumberPieces {
  /** Length of the longest piece made. */
  longest = 0;
  /** Open addressing by the number's bits: [low word, high word, missing, piece + 1] per slot. */
  private slots = new Int32Array(4 << 10);
  private size = 0;
  private readonly bits = new Float64Array(1);
  private readonly words = new Int32Array(this.bits.buffer);
  private readonly pieces: Pieces;
  private readonly indicator: boolean;
  private readonly separators: Separators;
  private readonly transform: LinearTransform;
  /** The grid in front of the hash (number-piece-grid.ts), fitted to the first batch; null when none fits. */
  private grid: NumberPieceGrid | null | undefined;

  constructor(pieces: Pieces, indicator: boolean, separators: Separators, transform: LinearTransform) {
    this.pieces = pieces;
    this.indicator = indicator;
    this.separators = separators;
    this.transform = transform;
  }

  get distinct(): number {
    return this.size;
  }

  forget(): void {
    this.slots = new Int32Array(4 << 10);
    this.size = 0;
    this.longest = 0;
    this.grid?.clear();
  }

  /** The piece of each row's number (and missing flag) into column `w` of `pieceOf`, through the grid where it can. */
  piecesOfRows(values: Float64Array, missing: Uint8Array, rows: number, pieceOf: Int32Array, w: number, n: number): void {
    if (this.grid === undefined) this.grid = NumberPieceGrid.fit(values, missing, rows, this.transform.center, this.transform.scale);
    const grid = this.grid;
    for (let r = 0, i = w; r < rows; r++, i += n) {
      const value = values[r]!;
      const slot = grid === null || missing[r] !== 0 ? -1 : grid.slotOf(value);
      let piece = slot === -1 ? -1 : grid!.pieceIn(slot, value);
      if (piece === -1) {
        piece = this.pieceOf(value, missing[r]!);
        if (slot !== -1) grid!.keep(slot, value, piece);
      }
      pieceOf[i] = piece;
    }
  }

  pieceOf(value: number, missing: number): number {
    this.bits[0] = value;
    const low = this.words[0]!;
    const high = this.words[1]!;
    const slots = this.slots;
    const mask = (slots.length >> 2) - 1;
    for (let i = slotOf(low, high, missing) & mask; ; i = (i + 1) & mask) {
      const at = 4 * i;
      const piece = slots[at + 3]!;
      if (piece === 0) return this.add(value, missing, at, low, high);
      if (slots[at] === low && slots[at + 1] === high && slots[at + 2] === missing) return piece - 1;
    }
  }

  private add(value: number, missing: number, at: number, low: number, high: number): number {
    const number = numberCell(value);
    const cell = this.indicator ? (missing ? `${number},1` : `${number},0`) : number;
    const text = this.separators.before + cell + this.separators.after;
    const piece = this.pieces.addAscii(text);
    if (text.length > this.longest) this.longest = text.length;
    const slots = this.slots;
    slots[at] = low;
    slots[at + 1] = high;
    slots[at + 2] = missing;
    slots[at + 3] = piece + 1;
    if (2 * ++this.size > slots.length >> 2) this.rehash();
    return piece;
  }

  private rehash(): void {
    const old = this.slots;
    const slots = new Int32Array(2 * old.length);
    const mask = (slots.length >> 2) - 1;
    for (let from = 0; from < old.length; from += 4) {
      if (old[from + 3] === 0) continue;
      let i = slotOf(old[from]!, old[from + 1]!, old[from + 2]!) & mask;
      while (slots[4 * i + 3] !== 0) i = (i + 1) & mask;
      // Four stores: set(subarray) would make a typed-array view per slot moved.
      const to = 4 * i;
      slots[to] = old[from]!;
      slots[to + 1] = old[from + 1]!;
      slots[to + 2] = old[from + 2]!;
      slots[to + 3] = old[from + 3]!;
    }
    this.slots = slots;
  }
}

/** A well-spread hash of a number's two 32-bit words and its missing flag. */
function slotOf(low: number, high: number, missing: number): number {
  let h = Math.imul(low ^ missing, 0x85ebca6b) ^ high;
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d);
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b);
  return h ^ (h >>> 16);
}

/**
 * How one part of a written row (a piece per row) is made from a batch: a run of adjacent
 * categorical columns, or one continuous or identifier column. `column` is the plan's column.
 */
type RowPart =
  | { readonly kind: 'levels'; readonly members: readonly LevelMember[]; readonly first: number; readonly longest: number }
  | { readonly kind: 'numbers'; readonly column: number; readonly numbers: NumberPieces }
  | { readonly kind: 'text'; readonly column: number; readonly separators: Separators };

/**
 * A categorical column within its run: its key is level + 1 (0 for the all-zero row), times two
 * plus the missing flag when it writes a missing indicator; the run's piece is `first` plus the
 * sum of its members' keys times their strides.
 */
interface LevelMember {
  readonly column: number;
  readonly indicator: boolean;
  readonly stride: number;
}

/** A categorical column of a run being formed, with its cells for each key (levelPatterns). */
interface RunMember {
  readonly column: number;
  readonly indicator: boolean;
  readonly patterns: readonly string[];
}

class BufferedCsvWriter implements CsvWriter {
  private readonly plan: Plan;
  private readonly sink: (bytes: Uint8Array) => void;
  private readonly encoder = new TextEncoder();
  /** The row loop in WebAssembly, whose memory then holds the output buffer; null: the loop here. */
  private readonly copier: WasmRowCopier | null;
  private readonly ownBuffer: Uint8Array | null;
  /** Bytes of `buffer` in use. */
  private used = 0;
  private total = 0;
  /** The parts of a written row, in order. */
  private readonly parts: readonly RowPart[];
  /**
   * Every piece: first the levels' (for good), then the numbers' (across batches, until there are
   * too many), then the current batch's text cells.
   */
  private readonly pieces = new Pieces();
  private readonly levelsEnd: PiecesMark;
  private numbersEnd: PiecesMark;
  /** The piece of each row and written column of a batch, row by row; reused by the next batch. */
  private pieceOf = new Int32Array(0);

  constructor(plan: Plan, sink: (bytes: Uint8Array) => void, bufferBytes: number, jointLimit: number) {
    this.plan = plan;
    this.sink = sink;
    this.copier = wasmRowCopier(Math.max(bufferBytes, 64));
    this.ownBuffer = this.copier === null ? new Uint8Array(Math.max(bufferBytes, 64)) : null;
    this.parts = rowParts(plan, this.pieces, jointLimit);
    this.levelsEnd = this.pieces.mark();
    this.numbersEnd = this.levelsEnd;
  }

  get bytesWritten(): number {
    return this.total + this.used;
  }

  /** The output buffer: the copier's (a new view whenever its memory grew), or the writer's own. */
  private get buffer(): Uint8Array {
    return this.copier?.buffer ?? this.ownBuffer!;
  }

  writeHeader(): void {
    this.bytes(this.encoder.encode(this.plan.outputs.map(textCell).join(',') + LINE_END));
  }

  writeBatch(batch: EncodedBatch): void {
    const rows = batch.end - batch.start;
    const n = this.parts.length;
    if (n === 0) return this.writeEmptyRows(batch.rejected, rows);
    this.dropBatchPieces();
    if (this.pieceOf.length < rows * n) this.pieceOf = new Int32Array(rows * n);
    const pieceOf = this.pieceOf;
    let longestRow = COPY_SLACK;
    // Numbers before texts: numbers' pieces are kept for later batches, texts' only for this one.
    const prepare = (texts: boolean): void => {
      this.parts.forEach((part, w) => {
        if ((part.kind === 'text') === texts) longestRow += this.prepare(w, batch, rows, pieceOf);
      });
    };
    prepare(false);
    this.numbersEnd = this.pieces.mark();
    prepare(true);
    if (longestRow > this.buffer.length) this.writeRowsPieceByPiece(pieceOf, n, batch.rejected, rows);
    else this.writeRows(pieceOf, n, batch.rejected, rows, this.buffer.length - longestRow);
  }

  finish(): void {
    this.flush();
  }

  /** Forgets the last batch's text pieces, and every number when the columns have met too many. */
  private dropBatchPieces(): void {
    const numbers = this.parts.flatMap((part) => (part.kind === 'numbers' ? [part.numbers] : []));
    if (numbers.reduce((sum, n) => sum + n.distinct, 0) > NUMBER_CACHE_LIMIT) {
      for (const n of numbers) n.forget();
      this.numbersEnd = this.levelsEnd;
    }
    this.pieces.truncate(this.numbersEnd);
  }

  /**
   * The row loop: a row is its pieces one after the other, copied eight bytes at a time as a double
   * (the bytes copied past a piece's end are overwritten by the next piece, or lie past the end of
   * the output). A double copied may be rewritten only if it is a NaN, and none is: the bytes read
   * are the pieces, which are UTF-8, and then zeros (zeroSlack). A NaN's last two bytes (little
   * endian) are 0xF0 or more followed by 0x7F or 0xFF, and in UTF-8 a byte from 0xF0 up is followed
   * by one from 0x80 to 0xBF, when it appears at all (RFC 3629 §4). Four bytes at a time as int32
   * took ~10 % more CPU time for the benchmark's 1M rows.
   */
  private writeRows(pieceOf: Int32Array, n: number, rejected: Uint8Array, rows: number, limit: number): void {
    if (this.copier !== null) {
      const end = this.copier.copyRows(this.pieces, pieceOf, n, rejected, rows, this.used, limit, (at) => {
        this.used = at;
        this.flush();
      });
      if (end >= 0) {
        this.used = end;
        return;
      }
    }
    const buffer = this.buffer;
    const out = new DataView(buffer.buffer, buffer.byteOffset, buffer.byteLength);
    this.pieces.zeroSlack();
    const { bytes, bounds } = this.pieces;
    const from = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    let pos = this.used;
    for (let r = 0, i = 0; r < rows; r++) {
      if (rejected[r] === 1) {
        i += n;
        continue;
      }
      if (pos > limit) {
        this.used = pos;
        this.flush();
        pos = 0;
      }
      for (const end = i + n; i < end; i++) {
        const piece = 2 * pieceOf[i]!;
        const start = bounds[piece]!;
        const length = bounds[piece + 1]! - start;
        for (let k = 0; k < length; k += 8) out.setFloat64(pos + k, from.getFloat64(start + k, true), true);
        pos += length;
      }
    }
    this.used = pos;
  }

  /** The same for rows that may not fit the buffer (a text cell of megabytes): pieces too long go to the sink on their own. */
  private writeRowsPieceByPiece(pieceOf: Int32Array, n: number, rejected: Uint8Array, rows: number): void {
    const { bytes, bounds } = this.pieces;
    for (let r = 0; r < rows; r++) {
      if (rejected[r] === 1) continue;
      for (let i = r * n; i < (r + 1) * n; i++) {
        const piece = 2 * pieceOf[i]!;
        this.bytes(bytes.subarray(bounds[piece]!, bounds[piece + 1]!));
      }
    }
  }

  /** A plan whose columns are all excluded writes an empty line per row. */
  private writeEmptyRows(rejected: Uint8Array, rows: number): void {
    const line = this.encoder.encode(LINE_END);
    for (let r = 0; r < rows; r++) if (rejected[r] !== 1) this.bytes(line);
  }

  private flush(): void {
    if (this.used === 0) return;
    this.sink(this.buffer.subarray(0, this.used));
    this.total += this.used;
    this.used = 0;
  }

  private bytes(part: Uint8Array): void {
    if (this.used + part.length > this.buffer.length) this.flush();
    if (part.length > this.buffer.length) {
      this.sink(part);
      this.total += part.length;
      return;
    }
    this.buffer.set(part, this.used);
    this.used += part.length;
  }

  /**
   * Fills column `w` of `pieceOf` (row-major, one piece per row and row part) for this batch;
   * returns the length of the part's longest piece.
   */
  private prepare(w: number, batch: EncodedBatch, rows: number, pieceOf: Int32Array): number {
    const part = this.parts[w]!;
    const n = this.parts.length;
    const mismatch = (column: number): Error => {
      const encoded = batch.columns[column];
      const planned = this.plan.columns[column];
      return new Error(`column ${planned?.recipe.name ?? column} of the batch (${encoded?.kind ?? 'absent'}) does not match the plan (${planned?.kind ?? 'absent'})`);
    };
    if (part.kind === 'levels') {
      part.members.forEach((member, m) => {
        const encoded = batch.columns[member.column];
        if (encoded?.kind !== 'levels') throw mismatch(member.column);
        levelKeyOfRow(encoded.level, member.indicator ? encoded.missing : null, member.stride, m === 0 ? part.first : -1, rows, pieceOf, w, n);
      });
      return part.longest;
    }
    const encoded = batch.columns[part.column];
    if (part.kind === 'numbers' && encoded?.kind === 'numbers') {
      const { values, missing, codes } = encoded;
      if (codes === undefined) part.numbers.piecesOfRows(values, missing, rows, pieceOf, w, n);
      else codedNumberPieceOfRow(codes, values, missing, part.numbers, rows, pieceOf, w, n);
      return part.numbers.longest;
    }
    if (part.kind === 'text' && encoded?.kind === 'text') {
      return textPieceOfRow(encoded.source, batch.start, rows, pieceOf, w, n, this.pieces, part.separators, this.encoder);
    }
    throw mismatch(part.column);
  }
}

/**
 * Column `w` of `pieceOf` for one member of a run of categorical columns: the run's first member
 * (`first` ≥ 0) sets it to the run's first piece plus its key times its stride, the others add
 * theirs. The key counts the all-zero row (ALL_ZEROS = −1) as 0.
 */
function levelKeyOfRow(level: Int32Array, missing: Uint8Array | null, stride: number, first: number, rows: number, pieceOf: Int32Array, w: number, n: number): void {
  if (first >= 0 && missing === null) for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = first + stride * (level[r]! + 1);
  else if (first >= 0 && missing !== null) for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = first + stride * (2 * level[r]! + 2 + missing[r]!);
  else if (missing === null) for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = pieceOf[i]! + stride * (level[r]! + 1);
  else for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = pieceOf[i]! + stride * (2 * level[r]! + 2 + missing[r]!);
}

/** Rows of one code hold the same number and missing flag, so each code is looked up once. */
function codedNumberPieceOfRow(
  codes: Codes, values: Float64Array, missing: Uint8Array, numbers: NumberPieces, rows: number, pieceOf: Int32Array, w: number, n: number,
): void {
  const pieceOfCode = new Int32Array(maxOf(codes, rows) + 1);
  for (let r = 0, i = w; r < rows; r++, i += n) {
    const code = codes[r]!;
    let piece = pieceOfCode[code]! - 1;
    if (piece < 0) {
      piece = numbers.pieceOf(values[r]!, missing[r]!);
      pieceOfCode[code] = piece + 1;
    }
    pieceOf[i] = piece;
  }
}

function maxOf(codes: Codes, rows: number): number {
  let max = 0;
  for (let r = 0; r < rows; r++) if (codes[r]! > max) max = codes[r]!;
  return max;
}

/** Copies a plain text (see addPlainRun) to `bytes` at `at`; returns where it stopped, or −1 when it is not plain. */
function copyPlainText(text: string, bytes: Uint8Array, at: number): number {
  if (startsLikeFormula(text)) return -1;
  for (let k = 0; k < text.length; k++) {
    const c = text.charCodeAt(k);
    if (!isPlainByte(c)) return -1;
    bytes[at++] = c;
  }
  return at;
}

/** copyPlainText for a text held as bytes, from[start, end). */
function copyPlainBytes(from: Uint8Array, start: number, end: number, bytes: Uint8Array, at: number): number {
  if (end > start && startsFormula(from[start]!)) return -1;
  for (let k = start; k < end; k++) {
    const c = from[k]!;
    if (!isPlainByte(c)) return -1;
    bytes[at++] = c;
  }
  return at;
}

/** A character a plain text may hold: ASCII other than the quote, the comma, CR and LF. */
function isPlainByte(c: number): boolean {
  return c < 0x80 && c !== QUOTE && c !== COMMA && c !== CR && c !== LF;
}

/** OWASP "CSV Injection" starts (see csv-cell.ts): =, +, -, @, tab, CR, LF. */
function startsLikeFormula(text: string): boolean {
  return startsFormula(text.charCodeAt(0));
}

function startsFormula(first: number): boolean {
  return first === 0x3d || first === 0x2b || first === 0x2d || first === 0x40 || first === 9 || first === CR || first === LF;
}

/**
 * Text cells: one piece per distinct text of the batch (per code of a dictionary, per row otherwise),
 * each as textCell makes it. Returns the length of the longest.
 */
function textPieceOfRow(
  source: Column | null, start: number, rows: number, pieceOf: Int32Array, w: number, n: number, pieces: Pieces, separators: Separators, encoder: TextEncoder,
): number {
  let texts: readonly string[];
  if (source === null) {
    texts = [''];
    for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = 0;
  } else if (source.kind === 'text' && source.counts.length <= 2 * rows) {
    // The rows use most of the dictionary: a piece for every code, from the values' bytes when
    // the column kept them (no string made), else from the values.
    for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = source.codes[start + r]!;
    const packed = source.packed === undefined ? -1 : pieces.addPlainBytesRun(source.packed, separators);
    if (packed !== -1) return finishTextPieces(packed, source.counts.length, rows, pieceOf, w, n, pieces);
    texts = source.values;
  } else if (source.kind === 'text') {
    // A few rows of a big dictionary (a window of a whole table): pieces for the codes they use.
    const used: string[] = [];
    const textOfCode = new Int32Array(source.values.length);
    for (let r = 0, i = w; r < rows; r++, i += n) {
      const code = source.codes[start + r]!;
      let text = textOfCode[code]! - 1;
      if (text < 0) {
        text = used.length;
        used.push(source.values[code]!);
        textOfCode[code] = text + 1;
      }
      pieceOf[i] = text;
    }
    texts = used;
  } else {
    const cells: string[] = [];
    for (let r = 0, i = w; r < rows; r++, i += n) {
      pieceOf[i] = r;
      cells.push(cellText(source, start + r));
    }
    texts = cells;
  }
  return finishTextPieces(addTextPieces(texts, pieces, separators, encoder), texts.length, rows, pieceOf, w, n, pieces);
}

/** The rows' pieces counted from `first`, the first of `count` pieces added; returns the longest. */
function finishTextPieces(first: number, count: number, rows: number, pieceOf: Int32Array, w: number, n: number, pieces: Pieces): number {
  for (let r = 0, i = w; r < rows; r++, i += n) pieceOf[i] = pieceOf[i]! + first;
  let longest = 0;
  for (let p = first; p < first + count; p++) longest = Math.max(longest, pieces.length(p));
  return longest;
}

/** Adds `texts` as consecutive pieces, each as textCell makes it; returns the first. */
function addTextPieces(texts: readonly string[], pieces: Pieces, separators: Separators, encoder: TextEncoder): number {
  const plain = pieces.addPlainRun(texts, separators);
  if (plain !== -1) return plain;
  const first = pieces.count;
  for (const text of texts) pieces.addText(separators.before + textCell(text) + separators.after, encoder);
  return first;
}

/**
 * The row's parts: runs of adjacent categorical columns (as long as their combinations stay within
 * `jointLimit`), and the continuous and identifier columns one by one. Excluded and zero-width
 * columns write nothing. Each run's pieces are added to `pieces` here, for good.
 */
function rowParts(plan: Plan, pieces: Pieces, jointLimit: number): RowPart[] {
  const written = plan.columns.flatMap((c, i) => (c.width > 0 && c.kind !== 'excluded' ? [i] : []));
  const last = written.length - 1;
  const separatorsOf = (w: number): Separators => ({ before: w === 0 ? '' : ',', after: w === last ? LINE_END : '' });
  const parts: RowPart[] = [];
  let run: RunMember[] = [];
  let combinations = 1;
  /** The longest piece the run would make. */
  let runLongest = 0;
  const closeRun = (): void => {
    if (run.length > 0) parts.push(levelRunPieces(run, pieces));
    run = [];
    combinations = 1;
    runLongest = 0;
  };
  written.forEach((c, w) => {
    const column = plan.columns[c]!;
    if (column.kind !== 'categorical') {
      closeRun();
      const separators = separatorsOf(w);
      parts.push(column.kind === 'continuous' ? { kind: 'numbers', column: c, numbers: new NumberPieces(pieces, column.indicator, separators, column.transform) } : { kind: 'text', column: c, separators });
      return;
    }
    const patterns = levelPatterns(column, separatorsOf(w));
    const longest = patterns.reduce((most, p) => Math.max(most, p.length), 0);
    const joined = combinations * patterns.length;
    if (run.length > 0 && (joined > jointLimit || joined * (runLongest + longest) > JOINT_BYTES_LIMIT)) closeRun();
    run.push({ column: c, indicator: column.indicator, patterns });
    combinations *= patterns.length;
    runLongest += longest;
  });
  closeRun();
  return parts;
}

/** A categorical column's cells for each key (see LevelMember), with its separators. */
function levelPatterns(plan: CategoricalPlan, separators: Separators): string[] {
  const { width, matrix, levels } = plan.codes;
  const patterns: string[] = [];
  for (let level = ALL_ZEROS; level < levels.length; level++) {
    const cells: string[] = [];
    for (let j = 0; j < width; j++) cells.push(level === ALL_ZEROS ? '0' : numberCell(matrix[level * width + j] ?? 0));
    const flags = plan.indicator ? ['0', '1'] : [null];
    for (const flag of flags) patterns.push(separators.before + (flag === null ? cells : [...cells, flag]).join(',') + separators.after);
  }
  return patterns;
}

/**
 * A piece for every combination of a run's keys, the last member's key varying fastest: piece
 * `first + Σ key × stride`.
 */
function levelRunPieces(run: readonly RunMember[], pieces: Pieces): RowPart {
  const strides: number[] = [];
  let stride = 1;
  for (let m = run.length - 1; m >= 0; m--) {
    strides[m] = stride;
    stride *= run[m]!.patterns.length;
  }
  const first = pieces.count;
  let longest = 0;
  const add = (m: number, prefix: string): void => {
    if (m === run.length) {
      longest = Math.max(longest, pieces.length(pieces.addAscii(prefix)));
      return;
    }
    for (const pattern of run[m]!.patterns) add(m + 1, prefix + pattern);
  };
  add(0, '');
  const members = run.map(({ column, indicator }, m): LevelMember => ({ column, indicator, stride: strides[m]! }));
  return { kind: 'levels', members, first, longest };
}
