/**
 * Delimited text → records, fed as UTF-8 bytes chunk by chunk (decode.ts `Utf8Chunks`), with the
 * physical line each record starts on. Our own scanner, shaped for big files:
 *
 * - It reads bytes, not text. Records with no quoted field (nearly all of a typical export) are
 *   handed on in blocks, as positions in the bytes plus a hash of each field computed while
 *   scanning (`RecordSink.plainRecords`): the table looks each cell up in its column's
 *   dictionary by hash and bytes (columns-builder.ts) and makes a string only of a value met for
 *   the first time. Nothing is made per cell, and the bytes of repeated values are never decoded.
 * - A record with a field that starts with a quote goes through a slower path that reads quoted
 *   fields the way papaparse's parser does, down to its handling of malformed quoting: a quote
 *   closes a field only when blanks and then a delimiter, a line break or the end of the text
 *   follow it; `""` inside is one quote; any other quote is kept as text; a quote never closed
 *   keeps the rest of the text, unchanged, in the field (reported as an unclosed quote). For a
 *   sink that takes plain records, such records (and the ones after them that also start with a
 *   quote, as in exports that quote every field) are handed on as plain records as well: their
 *   fields' bytes, unescaped, copied into a block of their own (`quoted`); only a record with a
 *   quote never closed comes through `record`.
 *   test/core/parse.property.test.ts checks every path against papaparse on random text.
 * - A quote inside an unquoted field is text (`12"`), as in papaparse.
 * - A record is handed on only once its line break is seen (or the text ends), so the records do
 *   not depend on where the chunks were cut, even inside a character.
 *
 * papaparse still chooses the delimiter (`chooseDelimiter`), on the first records only. Delimiters,
 * quotes and line breaks are ASCII, so they are single bytes in UTF-8 and never part of another
 * character's bytes.
 *
 * Line breaks: a file with any LF outside quotes is read by LF, and a CR right before an LF that
 * ends a record is dropped with it (CRLF files, and files mixing CRLF and LF); a file of lone CRs
 * is read by CR.
 * Line numbers count those breaks; breaks inside quoted fields count too, so a record's line is
 * the one an editor shows.
 */
import Papa from 'papaparse';
import type { HeaderIssue } from './columns.ts';
import { encodeUtf8, utf8Text } from './utf8-text.ts';
import { ScanStop, wasmRecordScanner, type WasmRecordScanner } from './wasm-record-scanner.ts';

export type Delimiter = ',' | '\t' | ';' | '|';

/** Candidates in order of preference when they fit the text equally well. */
export const DELIMITERS: readonly Delimiter[] = [',', '\t', ';', '|'];

export type LineBreak = '\n' | '\r';

export interface RecordSink {
  /**
   * One record. `fields` is valid only during the call. `line` is the 1-based physical line the
   * record starts on; `unclosedQuote` says a quoted field ran to the end of the file.
   */
  record(fields: readonly string[], line: number, unclosedQuote: boolean): void;
  /** A line with nothing on it. Whether it is skipped or is an empty cell is the table's call. */
  emptyLine(line: number): void;
  /**
   * Optional fast path: consecutive records without quoted fields, as positions in the bytes (see
   * PlainRecords), so that no string need be made per cell. Without this method such records come
   * through `record` one by one like the others. Empty lines never come this way.
   */
  plainRecords?(records: PlainRecords): void;
}

/**
 * Consecutive records without quoted fields, all with `width` fields. Field f of record r is the
 * UTF-8 bytes `bytes[bounds[i], bounds[i + 1] - 1)` with i = r * (width + 1) + f, its hash
 * (`hashBytes`) is `hashes[i]`, and the record starts on line `lines[r]`. Valid only during the
 * call: the arrays are reused.
 */
export interface PlainRecords {
  readonly bytes: Uint8Array;
  /** `bytes` as a DataView, for reading four bytes at a time (made once per run of plain records). */
  readonly words: DataView;
  readonly count: number;
  readonly width: number;
  readonly bounds: Int32Array;
  readonly hashes: Int32Array;
  readonly lines: Int32Array;
}

export interface RecordParserOptions {
  /** null or absent: chosen from the start of the text. */
  readonly delimiter?: Delimiter | null;
  /** Absent: chosen from the start of the text (see chooseLineBreak). */
  readonly lineBreak?: LineBreak;
}

/** Bytes collected before choosing the delimiter and line break, unless the text ends sooner. */
const SNIFF_BYTES = 64 * 1024;

const QUOTE = 0x22;
const CR = 0x0d;
const LF = 0x0a;

/** The scanner stopped before a record that is not complete yet (more bytes may follow). */
const INCOMPLETE = -1;
/** A record holds a quote never closed (readQuotedRecord): it goes the way that reports it. */
const UNCLOSED = -2;
/** A record the one-pass reader of quoted records leaves to readQuotedRecord (see readQuotedRecordInOnePass). */
const NOT_SIMPLE = -3;

/** A block of plain records is handed on once its bounds fill this many entries (1 MB). */
const BLOCK_BOUNDS = 1 << 18;

const FNV_OFFSET = 0x811c9dc5 | 0;
const FNV_PRIME = 0x01000193;
/**
 * Hashes are cut to 30 bits: a full 32-bit value would not stay a small integer in V8, and every
 * hash passed around would be boxed.
 */
const HASH_MASK = 0x3fffffff;

/** FNV-1a over bytes[start, end), the hash the scanner computes for each field of PlainRecords. */
export function hashBytes(bytes: Uint8Array, start: number, end: number): number {
  let hash = FNV_OFFSET;
  for (let i = start; i < end; i++) hash = Math.imul(hash ^ bytes[i]!, FNV_PRIME);
  return hash & HASH_MASK;
}

const EMPTY_BYTES = new Uint8Array(0);
const EMPTY_WORDS = new DataView(EMPTY_BYTES.buffer);
const EMPTY_INT32 = new Int32Array(0);

export class RecordParser {
  private readonly sink: RecordSink;
  private delimiterChoice: Delimiter | null;
  private delimiterByte = 0x2c;
  private lineBreak: LineBreak = '\n';
  private started = false;
  /** Bytes not yet parsed, in work[0, pendingLength): an incomplete record, then newer bytes. */
  private work = new Uint8Array(0);
  private pendingLength = 0;
  /** Wait for this many pending bytes before parsing again (grows when one record spans chunks). */
  private parseAt = SNIFF_BYTES;
  /** Line on which the pending bytes start. */
  private line = 1;
  /** Plain records collected for the sink (see PlainRecords); the arrays grow as needed. */
  private readonly block = recordBlock(EMPTY_BYTES, 1 << 12, 1 << 8);
  /**
   * The same for the WebAssembly scanner: its bounds and hashes are views of the scanner's memory
   * while it runs; a block holds at most one record per two entries, and one more.
   */
  private readonly wasmBlock = recordBlock(EMPTY_BYTES, 0, BLOCK_BOUNDS / 2 + 2);
  /**
   * Records with a quoted field, handed on as plain records too: their fields' bytes, quotes taken
   * off and `""` made one quote, one after another in `bytes` (a field's end is followed by one
   * spare byte, as in the file a delimiter follows it), with their hashes.
   */
  private readonly quoted = recordBlock(new Uint8Array(1 << 12), 1 << 8, 1 << 4);
  /** Bytes of `quoted.bytes` in use. */
  private quotedUsed = 0;
  /** Where each field of the record being read ends in `quoted.bytes`. */
  private fieldEnds = new Int32Array(1 << 6);
  /** The hash of each field of the record being read, when readQuotedRecordInOnePass made it. */
  private fieldHashes = new Int32Array(1 << 6);
  /** Where scanPlainRecords met a record holding a quoted field; -1 when it did not. */
  private quotedAt = -1;
  /** Position in the pushed bytes of the first pending byte (input[0] of the next scan). */
  private consumed = 0;
  /** No record starting at or after this position in the pushed bytes is read (see stopAt). */
  private stopLimit = Infinity;
  /** Where reading stopped for stopAt: the position of the first record not read. */
  private stopped: number | null = null;
  private readonly givenLineBreak: LineBreak | null;
  /** The WebAssembly scanner, once this parser has used it. */
  private wasmScanner: WasmRecordScanner | null = null;

  constructor(sink: RecordSink, options: RecordParserOptions = {}) {
    this.sink = sink;
    this.delimiterChoice = options.delimiter ?? null;
    this.givenLineBreak = options.lineBreak ?? null;
  }

  /**
   * Reads no record that starts at or after `position` in the pushed bytes (counted from the first
   * byte pushed): the parser stops at the first record start at or after it, or after what it has
   * read already if that is further. For reading a file in segments: the next segment starts where
   * this one stopped (`stoppedAt`).
   */
  stopAt(position: number): void {
    this.stopLimit = position;
  }

  /** The position of the first record not read because of stopAt; null while reading on. */
  get stoppedAt(): number | null {
    return this.stopped;
  }

  /** The line break in use; null until enough text was seen to choose. */
  get lineBreakInUse(): LineBreak | null {
    return this.started ? this.lineBreak : null;
  }

  /** Line breaks read so far, those inside quoted fields included (the next record's line − 1). */
  get lineBreaksRead(): number {
    return this.line - 1;
  }

  /** The delimiter in use; null until enough text was seen to choose. */
  get delimiter(): Delimiter | null {
    return this.started ? this.delimiterChoice : null;
  }

  /** Bytes pushed but not parsed yet (the start of a record that did not end yet). */
  get pendingBytes(): number {
    return this.pendingLength;
  }

  /** The next UTF-8 bytes. They are read or copied before this returns: the caller may reuse its buffer. */
  push(bytes: Uint8Array): void {
    if (bytes.length === 0 || this.stopped !== null) return;
    if (this.pendingLength === 0 && bytes.length >= this.parseAt) {
      this.parse(bytes, false);
      return;
    }
    this.append(bytes);
    if (this.pendingLength >= this.parseAt) this.parse(this.work.subarray(0, this.pendingLength), false);
  }

  /** Parses what is left, including a last record without a line break. */
  finish(): void {
    if (this.stopped === null) this.parse(this.work.subarray(0, this.pendingLength), true);
  }

  private append(bytes: Uint8Array): void {
    const needed = this.pendingLength + bytes.length;
    if (needed > this.work.length) {
      const bigger = new Uint8Array(Math.max(needed, 2 * this.work.length));
      bigger.set(this.work.subarray(0, this.pendingLength));
      this.work = bigger;
    }
    this.work.set(bytes, this.pendingLength);
    this.pendingLength = needed;
  }

  /** Reads the complete records of `input` and keeps the rest for later. */
  private parse(input: Uint8Array, final: boolean): void {
    if (!this.started) this.start(input, final);
    let consumed: number;
    try {
      consumed = this.scan(input, final);
    } finally {
      // The WebAssembly scanner keeps a copy of `input` for the scan's next calls; whoever pushed
      // it may reuse its bytes once this returns.
      this.wasmScanner?.release(input);
    }
    this.consumed += consumed;
    const rest = final || this.stopped !== null ? 0 : input.length - consumed;
    if (input.buffer === this.work.buffer) this.work.copyWithin(0, consumed, consumed + rest);
    else {
      this.pendingLength = 0;
      this.append(input.subarray(consumed, consumed + rest));
    }
    this.pendingLength = rest;
    // A record longer than a chunk would otherwise be re-parsed from its start on every push.
    this.parseAt = Math.max(SNIFF_BYTES, 2 * rest);
  }

  private start(input: Uint8Array, final: boolean): void {
    // Only for choosing: a character cut at the end of the sample does no harm here.
    const sample = this.givenLineBreak !== null && this.delimiterChoice !== null ? '' : new TextDecoder().decode(input);
    this.lineBreak = this.givenLineBreak ?? chooseLineBreak(sample);
    this.delimiterChoice ??= chooseDelimiter(sample, this.lineBreak, final);
    this.delimiterByte = this.delimiterChoice.charCodeAt(0);
    this.started = true;
  }

  /** Reads the complete records of `input`; returns where the unread rest starts. */
  private scan(input: Uint8Array, final: boolean): number {
    let at = 0;
    // Positions in `input` from which no record is read (stopAt).
    const limit = this.stopLimit - this.consumed;
    while (at < input.length) {
      if (at >= limit) {
        this.stopped = this.consumed + at;
        return at;
      }
      const plainEnd = this.scanPlainRecords(input, at, final, limit);
      if (plainEnd === INCOMPLETE) return at;
      at = plainEnd;
      if (at === input.length || this.quotedAt !== at) continue;
      // The record at `at` has a field that starts with a quote.
      const quotedEnd = this.sink.plainRecords === undefined ? this.scanQuotedRecord(input, at, final) : this.scanQuotedRecords(input, at, final, limit);
      if (quotedEnd === INCOMPLETE) return at;
      at = quotedEnd;
    }
    return at;
  }

  /**
   * Reads records without quoted fields from `at` on, for as long as they come, into the block of
   * plain records. Returns where it stopped: the end of the input, the start of a record with a
   * quoted field (then `quotedAt` is that position too), or the start of a record the input does
   * not complete yet (when `final` is false; then, if that is `at` itself, INCOMPLETE). Hands the
   * block to the sink before returning and before anything that is not a plain record.
   * In WebAssembly where it can be had (wasm-record-scanner.ts), else in JavaScript: the same
   * records, bounds and hashes either way.
   */
  private scanPlainRecords(input: Uint8Array, at: number, final: boolean, limit: number): number {
    const scanner = wasmRecordScanner();
    if (scanner === null || scanner.busy || !scanner.hold(input, at)) return this.scanPlainRecordsInJs(input, at, final, limit);
    this.wasmScanner = scanner;
    scanner.busy = true;
    try {
      return this.scanPlainRecordsInWasm(scanner, input, at, final, limit);
    } finally {
      scanner.busy = false;
    }
  }

  /** scanPlainRecords on the WebAssembly scanner, which holds `input` from `at` on. */
  private scanPlainRecordsInWasm(scanner: WasmRecordScanner, input: Uint8Array, at: number, final: boolean, limit: number): number {
    const n = input.length;
    const block = this.wasmBlock;
    block.bytes = input;
    block.words = new DataView(input.buffer, input.byteOffset, input.byteLength);
    const delimiter = this.delimiterByte;
    const lineBreak = this.lineBreak === '\n' ? LF : CR;
    const end = Math.max(0, Math.min(limit, n));
    let b = 0;
    let line = this.line;
    let start = at;
    this.quotedAt = -1;
    let stop: ScanStop;
    for (;;) {
      block.bounds = scanner.bounds;
      block.hashes = scanner.hashes;
      stop = scanner.records(start, n, end, final, b, block.count > 0 ? block.width : 0, BLOCK_BOUNDS, delimiter, lineBreak, lineBreak === LF);
      const { scanned } = scanner;
      for (let k = 0; k < scanned.records; k++) block.lines[block.count + k] = line + k;
      if (scanned.records > 0) block.width = scanned.width;
      block.count += scanned.records;
      line += scanned.lines;
      b = scanned.entries;
      start = scanned.start;
      if (stop === ScanStop.full || stop === ScanStop.otherWidth || stop === ScanStop.emptyLine) {
        // As the JavaScript loop: the block goes to the sink, and a record of another width starts the next.
        this.flushBlock(block);
        b = 0;
        if (stop === ScanStop.emptyLine) {
          this.sink.emptyLine(line++);
          start = scanned.next;
        }
        continue;
      }
      if (stop === ScanStop.quoted) this.quotedAt = start;
      break;
    }
    this.line = line;
    this.flushBlock(block);
    block.bytes = EMPTY_BYTES; // the block must not keep the chunk alive
    block.words = EMPTY_WORDS;
    block.bounds = block.hashes = EMPTY_INT32;
    if (stop === ScanStop.tooWide) {
      // A record of tens of thousands of fields: the JavaScript loop grows its arrays for it.
      const rest = this.scanPlainRecordsInJs(input, start, final, limit);
      return rest === INCOMPLETE && start !== at ? start : rest;
    }
    return start === at && this.quotedAt === -1 && start < n ? INCOMPLETE : start;
  }

  /** scanPlainRecords in JavaScript. */
  private scanPlainRecordsInJs(input: Uint8Array, at: number, final: boolean, limit: number): number {
    const n = input.length;
    const block = this.block;
    block.bytes = input;
    block.words = new DataView(input.buffer, input.byteOffset, input.byteLength);
    let bounds = block.bounds;
    let hashes = block.hashes;
    const delimiter = this.delimiterByte;
    const lineBreak = this.lineBreak === '\n' ? LF : CR;
    const lfMode = lineBreak === LF;
    // Where the next record's bounds go.
    let b = 0;
    let line = this.line;
    let start = at;
    this.quotedAt = -1;
    while (start < n && start < limit) {
      let i = start;
      let count = 0;
      let fieldStart = start;
      let quoted = false;
      // The fields, hashed while they are scanned: one pass over the bytes.
      for (;;) {
        if (input[i] === QUOTE) {
          quoted = true;
          break;
        }
        let hash = FNV_OFFSET;
        while (i < n) {
          const byte = input[i]!;
          if (byte === delimiter || byte === lineBreak) break;
          hash = Math.imul(hash ^ byte, FNV_PRIME);
          i++;
        }
        if (b + count + 2 >= bounds.length) {
          bounds = block.bounds = growInt32(bounds);
          hashes = block.hashes = growInt32(hashes);
        }
        bounds[b + count] = fieldStart;
        hashes[b + count] = hash & HASH_MASK;
        count++;
        if (i === n || input[i] !== delimiter) break;
        fieldStart = ++i;
      }
      if (quoted) {
        this.quotedAt = start;
        break;
      }
      if (i === n && !final) break; // the record's line break is in a later chunk
      // In LF mode a CR right before the LF belongs to the line break.
      let fieldsEnd = i;
      if (lfMode && i < n && i > fieldStart && input[i - 1] === CR) {
        fieldsEnd = i - 1;
        hashes[b + count - 1] = hashBytes(input, fieldStart, fieldsEnd);
      }
      const next = i < n ? i + 1 : n;
      if (fieldsEnd === start) {
        this.flushBlock();
        b = 0;
        this.sink.emptyLine(line);
        line++;
        start = next;
        continue;
      }
      bounds[b + count] = fieldsEnd + 1;
      if (block.count > 0 && count !== block.width) {
        // A record of another width starts a new block: hand over the others, keep this one.
        this.flushBlock();
        bounds.copyWithin(0, b, b + count + 1);
        hashes.copyWithin(0, b, b + count + 1);
        b = 0;
      }
      block.width = count;
      if (block.count === block.lines.length) block.lines = growInt32(block.lines);
      block.lines[block.count++] = line;
      b += count + 1;
      if (b >= BLOCK_BOUNDS) {
        this.flushBlock();
        b = 0;
      }
      if (next > i) line++;
      start = next;
    }
    this.line = line;
    this.flushBlock();
    block.bytes = EMPTY_BYTES; // the block must not keep the chunk alive
    block.words = EMPTY_WORDS;
    return start === at && this.quotedAt === -1 && start < n ? INCOMPLETE : start;
  }

  /** Hands the collected plain records to the sink. */
  private flushBlock(block = this.block): void {
    if (block.count === 0) return;
    if (this.sink.plainRecords !== undefined) this.sink.plainRecords(block);
    else for (let r = 0; r < block.count; r++) this.sink.record(plainFields(block, r), block.lines[r] ?? 0, false);
    block.count = 0;
  }

  /**
   * Reads the record at `start`, which has a quoted field, and the records after it for as long as
   * they start with a quote (an export that quotes every field), as plain records over their
   * unescaped bytes: no string is made per cell. Returns where the next record starts, or
   * INCOMPLETE when the input does not complete the first one yet. A quote never closed goes the
   * way of scanQuotedRecord, which reports it.
   */
  private scanQuotedRecords(input: Uint8Array, start: number, final: boolean, limit: number): number {
    let cursor = start;
    do {
      let next = this.readQuotedRecordInOnePass(input, cursor);
      if (next === NOT_SIMPLE) next = this.readQuotedRecord(input, cursor, final);
      if (next === INCOMPLETE) break;
      if (next === UNCLOSED) {
        this.flushQuoted();
        return this.scanQuotedRecord(input, cursor, final);
      }
      cursor = next;
    } while (cursor < input.length && cursor < limit && input[cursor] === QUOTE);
    this.flushQuoted();
    return cursor === start ? INCOMPLETE : cursor;
  }

  /**
   * Adds the record at `start` to the block of quoted records; returns where the next record
   * starts, INCOMPLETE when the input does not complete it yet (nothing added), or UNCLOSED when
   * one of its quotes is never closed (nothing added).
   */
  private readQuotedRecord(input: Uint8Array, start: number, final: boolean): number {
    const delimiter = this.delimiterByte;
    const lineBreak = this.lineBreak === '\n' ? LF : CR;
    const recordStart = this.quotedUsed;
    // Unescaping only shortens a field: the record's bytes plus a spare byte per field fit here.
    this.reserveQuoted(recordStart + 2 * (input.length - start) + 2);
    const bytes = this.quoted.bytes;
    let used = recordStart;
    let count = 0;
    let cursor = start;
    for (;;) {
      let next: number;
      let endsRecord: boolean;
      let endsWithBreak: boolean;
      let quoted = false;
      if (input[cursor] === QUOTE) {
        const field = quotedFieldEnd(input, cursor, delimiter, lineBreak, final);
        if (field === null) return INCOMPLETE;
        if (field.close === -1) return UNCLOSED;
        used = copyUnescaped(input, cursor + 1, field.close, bytes, used);
        ({ next, endsRecord, endsWithBreak } = field);
        quoted = true;
      } else {
        const nextDelimiter = input.indexOf(delimiter, cursor);
        const nextBreak = input.indexOf(lineBreak, cursor);
        let end: number;
        if (nextDelimiter !== -1 && (nextBreak === -1 || nextDelimiter < nextBreak)) {
          end = nextDelimiter;
          endsRecord = endsWithBreak = false;
        } else if (nextBreak !== -1) {
          end = nextBreak;
          endsRecord = endsWithBreak = true;
        } else if (final) {
          end = input.length;
          endsRecord = true;
          endsWithBreak = false;
        } else return INCOMPLETE;
        bytes.set(input.subarray(cursor, end), used);
        used += end - cursor;
        next = end < input.length ? end + 1 : end;
      }
      // In LF mode a CR right before the LF ends the record with it; a quoted field keeps its own.
      if (endsWithBreak && !quoted && lineBreak === LF && used > (count === 0 ? recordStart : this.fieldEnds[count - 1]! + 1) && input[next - 2] === CR) used--;
      if (count === this.fieldEnds.length) this.fieldEnds = growInt32(this.fieldEnds);
      this.fieldEnds[count++] = used;
      used++; // the spare byte after a field (see `quoted`)
      cursor = next;
      if (endsRecord) break;
    }
    this.addQuotedRecord(recordStart, count, this.line, false);
    this.line += countByte(input, lineBreak, start, cursor);
    return cursor;
  }

  /**
   * readQuotedRecord for the usual record, in one pass over its bytes that copies, unescapes and
   * hashes each field as the plain scanner does (a file with every field quoted read ~2.8× slower
   * than the same file unquoted when each field took several passes). Usual: each quoted field's
   * closing quote is followed at once by the delimiter or the line break (in LF mode also CR LF),
   * and the whole record is in `input`. Any other record (text or blanks after a closing quote,
   * a quote never closed, the input ending inside the record) is NOT_SIMPLE, with nothing added:
   * readQuotedRecord reads it.
   */
  private readQuotedRecordInOnePass(input: Uint8Array, start: number): number {
    const n = input.length;
    const delimiter = this.delimiterByte;
    const lineBreak = this.lineBreak === '\n' ? LF : CR;
    const lfMode = lineBreak === LF;
    const recordStart = this.quotedUsed;
    this.reserveQuoted(recordStart + 2 * (n - start) + 2);
    const bytes = this.quoted.bytes;
    let used = recordStart;
    let count = 0;
    let cursor = start;
    // Line breaks inside quoted fields: the next record starts that many lines further down.
    let innerBreaks = 0;
    for (;;) {
      const fieldStart = used;
      let hash = FNV_OFFSET;
      let endsRecord: boolean;
      let i = cursor;
      if (input[i] === QUOTE) {
        for (i++; ; ) {
          if (i >= n) return NOT_SIMPLE;
          const byte = input[i]!;
          if (byte === QUOTE) {
            if (i + 1 < n && input[i + 1] === QUOTE) {
              bytes[used++] = QUOTE;
              hash = Math.imul(hash ^ QUOTE, FNV_PRIME);
              i += 2;
              continue;
            }
            i++;
            break;
          }
          if (byte === lineBreak) innerBreaks++;
          bytes[used++] = byte;
          hash = Math.imul(hash ^ byte, FNV_PRIME);
          i++;
        }
        // After the closing quote: the delimiter, the line break, or (LF mode) CR LF.
        if (i >= n) return NOT_SIMPLE;
        const after = input[i]!;
        if (after === delimiter) endsRecord = false;
        else if (after === lineBreak) endsRecord = true;
        else if (lfMode && after === CR && i + 1 < n && input[i + 1] === LF) {
          endsRecord = true;
          i++;
        } else return NOT_SIMPLE;
      } else {
        let withoutLast = hash;
        for (; ; i++) {
          if (i >= n) return NOT_SIMPLE;
          const byte = input[i]!;
          if (byte === delimiter || byte === lineBreak) break;
          bytes[used++] = byte;
          withoutLast = hash;
          hash = Math.imul(hash ^ byte, FNV_PRIME);
        }
        endsRecord = input[i] !== delimiter;
        // In LF mode a CR right before the LF ends the record with it (as in readQuotedRecord).
        if (endsRecord && lfMode && used > fieldStart && bytes[used - 1] === CR) {
          used--;
          hash = withoutLast;
        }
      }
      if (count === this.fieldEnds.length) this.fieldEnds = growInt32(this.fieldEnds);
      if (count === this.fieldHashes.length) this.fieldHashes = growInt32(this.fieldHashes);
      this.fieldEnds[count] = used;
      this.fieldHashes[count++] = hash & HASH_MASK;
      used++; // the spare byte after a field (see `quoted`)
      cursor = i + 1;
      if (endsRecord) break;
    }
    this.addQuotedRecord(recordStart, count, this.line, true);
    this.line += innerBreaks + 1;
    return cursor;
  }

  /**
   * The record whose `count` fields were just copied from `recordStart` on joins the block;
   * `hashed`: their hashes are in `fieldHashes`, else they are made here.
   */
  private addQuotedRecord(recordStart: number, count: number, line: number, hashed: boolean): void {
    const block = this.quoted;
    if (block.count > 0 && count !== block.width) {
      // A record of another width starts a new block: hand over the others, keep this one.
      const end = this.fieldEnds[count - 1]! + 1;
      this.flushQuoted();
      block.bytes.copyWithin(0, recordStart, end);
      for (let f = 0; f < count; f++) this.fieldEnds[f] = this.fieldEnds[f]! - recordStart;
      recordStart = 0;
    }
    block.width = count;
    let b = block.count * (count + 1);
    while (b + count + 1 > block.bounds.length) {
      block.bounds = growInt32(block.bounds);
      block.hashes = growInt32(block.hashes);
    }
    if (block.count === block.lines.length) block.lines = growInt32(block.lines);
    let fieldStart = recordStart;
    for (let f = 0; f < count; f++, b++) {
      const end = this.fieldEnds[f]!;
      block.bounds[b] = fieldStart;
      block.hashes[b] = hashed ? this.fieldHashes[f]! : hashBytes(block.bytes, fieldStart, end);
      fieldStart = end + 1;
    }
    block.bounds[b] = fieldStart;
    block.lines[block.count++] = line;
    this.quotedUsed = fieldStart;
  }

  private reserveQuoted(bytes: number): void {
    if (bytes <= this.quoted.bytes.length) return;
    const bigger = new Uint8Array(Math.max(bytes, 2 * this.quoted.bytes.length));
    bigger.set(this.quoted.bytes.subarray(0, this.quotedUsed));
    this.quoted.bytes = bigger;
  }

  /** Hands the block of quoted records to the sink. */
  private flushQuoted(): void {
    const block = this.quoted;
    if (block.count > 0) {
      block.words = new DataView(block.bytes.buffer, block.bytes.byteOffset, block.bytes.byteLength);
      this.sink.plainRecords!(block);
    }
    block.count = 0;
    this.quotedUsed = 0;
  }

  /**
   * Reads the record at `start`, which has a quoted field; returns where the next record starts,
   * or INCOMPLETE when the input does not complete it yet.
   */
  private scanQuotedRecord(input: Uint8Array, start: number, final: boolean): number {
    const delimiter = this.delimiterByte;
    const lineBreak = this.lineBreak === '\n' ? LF : CR;
    const fields: string[] = [];
    let cursor = start;
    for (;;) {
      const field = input[cursor] === QUOTE
        ? readQuotedField(input, cursor, delimiter, lineBreak, final)
        : readUnquotedField(input, cursor, delimiter, lineBreak, final);
      if (field === null) return INCOMPLETE;
      fields.push(field.value);
      cursor = field.next;
      if (!field.endsRecord) continue;
      if (field.endsWithBreak && !field.quoted && lineBreak === LF) dropCarriageReturn(fields, input, field.next);
      const line = this.line;
      this.line += countByte(input, lineBreak, start, cursor);
      this.sink.record(fields, line, field.unclosed);
      return cursor;
    }
  }
}

/** An empty block of plain records over `bytes`, its arrays made for `bounds` fields and `lines` records; they grow as needed. */
function recordBlock(bytes: Uint8Array, bounds: number, lines: number) {
  return { bytes, words: EMPTY_WORDS as DataView, count: 0, width: 0, bounds: new Int32Array(bounds), hashes: new Int32Array(bounds), lines: new Int32Array(lines) };
}

/** Record r of a block of plain records, as strings. */
export function plainFields(records: PlainRecords, r: number): string[] {
  const fields: string[] = [];
  const first = r * (records.width + 1);
  for (let f = 0; f < records.width; f++) {
    fields.push(utf8Text(records.bytes, records.bounds[first + f] ?? 0, (records.bounds[first + f + 1] ?? 0) - 1));
  }
  return fields;
}

/**
 * Parses a whole text at once; returns the records with their lines. For tests and small inputs;
 * the text is read as its UTF-8 bytes.
 */
export function parseRecords(
  text: string,
  options: RecordParserOptions = {},
): { records: string[][]; lines: number[]; unclosedQuoteLines: number[]; emptyLines: number[]; delimiter: Delimiter } {
  const records: string[][] = [];
  const lines: number[] = [];
  const unclosedQuoteLines: number[] = [];
  const emptyLines: number[] = [];
  const sink: RecordSink = {
    record(fields, line, unclosed) {
      records.push([...fields]);
      lines.push(line);
      if (unclosed) unclosedQuoteLines.push(line);
    },
    emptyLine: (line) => emptyLines.push(line),
  };
  const parser = new RecordParser(sink, options);
  parser.push(encodeUtf8(text));
  parser.finish();
  return { records, lines, unclosedQuoteLines, emptyLines, delimiter: parser.delimiter ?? ',' };
}

/** LF if the text has any outside quoted fields (LF or CRLF files); CR if it has only CRs (old Mac files). */
export function chooseLineBreak(sample: string): LineBreak {
  const outsideQuotes = sample.replace(/"[^"]*"/g, '');
  return outsideQuotes.includes('\n') || !outsideQuotes.includes('\r') ? '\n' : '\r';
}

/**
 * The candidate under which the header has at least two fields and the most following records
 * have as many fields as the header; ties go to more fields, then to the order of DELIMITERS.
 * When no candidate splits the header, the file has one column: comma, unless commas split its
 * records (a column of decimal commas, "12,5"), then the first candidate that splits none.
 */
export function chooseDelimiter(sample: string, lineBreak: LineBreak, final: boolean): Delimiter {
  let best: Delimiter | null = null;
  let bestScore = { share: -1, fields: 0 };
  for (const delimiter of DELIMITERS) {
    const score = scoreDelimiter(sample, delimiter, lineBreak, final);
    if (score === null) continue;
    if (score.share > bestScore.share || (score.share === bestScore.share && score.fields > bestScore.fields)) {
      best = delimiter;
      bestScore = score;
    }
  }
  return best ?? DELIMITERS.find((d) => splitsNoRecord(sample, d, lineBreak, final)) ?? ',';
}

function splitsNoRecord(sample: string, delimiter: Delimiter, lineBreak: LineBreak, final: boolean): boolean {
  const config = { delimiter, newline: lineBreak, preview: SCORED_RECORDS };
  const parsed = new Papa.Parser(config as unknown as Papa.ParseConfig).parse(sample, 0, !final) as { data: string[][] };
  return parsed.data.every((record) => record.length <= 1);
}

const SCORED_RECORDS = 50;

function scoreDelimiter(sample: string, delimiter: Delimiter, lineBreak: LineBreak, final: boolean): { share: number; fields: number } | null {
  const config = { delimiter, newline: lineBreak, preview: SCORED_RECORDS };
  const parsed = new Papa.Parser(config as unknown as Papa.ParseConfig).parse(sample, 0, !final) as { data: string[][] };
  const records = parsed.data.filter((r) => !(r.length === 1 && (r[0] === '' || r[0] === '\r')));
  const header = records[0];
  if (header === undefined || header.length < 2) return null;
  const rest = records.slice(1);
  const matching = rest.filter((r) => r.length === header.length).length;
  return { share: rest.length === 0 ? 1 : matching / rest.length, fields: header.length };
}

interface FieldRead {
  readonly value: string;
  /** Where the next field or record starts. */
  readonly next: number;
  readonly endsRecord: boolean;
  /** The record ended at a line break (not at the end of the text). */
  readonly endsWithBreak: boolean;
  readonly quoted: boolean;
  readonly unclosed: boolean;
}

/** An unquoted field ends at the next delimiter or line break; null when the text may go on. */
function readUnquotedField(input: Uint8Array, at: number, delimiter: number, lineBreak: number, final: boolean): FieldRead | null {
  const nextDelimiter = input.indexOf(delimiter, at);
  const nextBreak = input.indexOf(lineBreak, at);
  if (nextDelimiter !== -1 && (nextBreak === -1 || nextDelimiter < nextBreak)) {
    return { value: utf8Text(input, at, nextDelimiter), next: nextDelimiter + 1, endsRecord: false, endsWithBreak: false, quoted: false, unclosed: false };
  }
  if (nextBreak !== -1) {
    return { value: utf8Text(input, at, nextBreak), next: nextBreak + 1, endsRecord: true, endsWithBreak: true, quoted: false, unclosed: false };
  }
  if (!final) return null;
  return { value: utf8Text(input, at, input.length), next: input.length, endsRecord: true, endsWithBreak: false, quoted: false, unclosed: false };
}

/**
 * A field starting with a quote at `open`. A later quote closes it when only blanks (what
 * `trim` removes) stand between it and the next delimiter or line break; `""` is an escaped
 * quote; a quote at the very end of the text closes the field. Any other quote is text, and
 * the search goes on. With no closing quote the field is the rest of the text, as written.
 * null when the text may go on.
 */
function readQuotedField(input: Uint8Array, open: number, delimiter: number, lineBreak: number, final: boolean): FieldRead | null {
  const field = quotedFieldEnd(input, open, delimiter, lineBreak, final);
  if (field === null) return null;
  const { close, next, endsRecord, endsWithBreak } = field;
  if (close === -1) return { value: utf8Text(input, open + 1, input.length), next, endsRecord, endsWithBreak, quoted: true, unclosed: true };
  return { value: unescapedText(input, open + 1, close), next, endsRecord, endsWithBreak, quoted: true, unclosed: false };
}

/**
 * Where the field starting with a quote at `open` ends: its closing quote (`close`; −1 when it is
 * never closed, and the field is the rest of the text), where the next field or record starts,
 * and whether the record ends with it. The rules are readQuotedField's. null when the text may go on.
 */
function quotedFieldEnd(
  input: Uint8Array, open: number, delimiter: number, lineBreak: number, final: boolean,
): { close: number; next: number; endsRecord: boolean; endsWithBreak: boolean } | null {
  const n = input.length;
  for (let quote = input.indexOf(QUOTE, open + 1); ; quote = input.indexOf(QUOTE, quote + 2)) {
    if (quote === -1) return final ? { close: -1, next: n, endsRecord: true, endsWithBreak: false } : null;
    if (quote === n - 1) return final ? { close: quote, next: n, endsRecord: true, endsWithBreak: false } : null;
    if (input[quote + 1] === QUOTE) continue; // "" is an escaped quote: search on after the pair
    const after = firstOf(input, delimiter, lineBreak, quote + 1);
    if (after !== -1 && isBlank(input, quote + 1, after)) {
      const endsRecord = input[after] !== delimiter;
      return { close: quote, next: after + 1, endsRecord, endsWithBreak: endsRecord };
    }
    // Not a closing quote (text follows it): it is part of the field; search on after it.
  }
}

/** Copies input[start, end) to out at `at`, each `""` as one quote (as unescapedText); returns where it stopped writing. */
function copyUnescaped(input: Uint8Array, start: number, end: number, out: Uint8Array, at: number): number {
  for (let i = start; i < end; i++) {
    const byte = input[i]!;
    out[at++] = byte;
    if (byte === QUOTE && i + 1 < end && input[i + 1] === QUOTE) i++;
  }
  return at;
}

/** The first delimiter or line break at or after `from`; -1 when there is none. */
function firstOf(input: Uint8Array, delimiter: number, lineBreak: number, from: number): number {
  const d = input.indexOf(delimiter, from);
  const b = input.indexOf(lineBreak, from);
  return d === -1 ? b : b === -1 ? d : Math.min(d, b);
}

/** Whether bytes[start, end) is only what `trim` removes (ASCII blanks, or Unicode spaces written in UTF-8). */
function isBlank(input: Uint8Array, start: number, end: number): boolean {
  let ascii = true;
  for (let i = start; i < end; i++) {
    const byte = input[i]!;
    if (byte >= 0x80) ascii = false;
    else if (byte !== 0x20 && (byte < 0x09 || byte > 0x0d)) return false;
  }
  return ascii || utf8Text(input, start, end).trim() === '';
}

function unescapedText(input: Uint8Array, start: number, end: number): string {
  const text = utf8Text(input, start, end);
  return text.includes('"') ? text.replace(/""/g, '"') : text;
}

/**
 * In LF mode a CRLF ends the record; the CR belongs to the break, not to an unquoted last field.
 * A quoted last field keeps a CR written inside its quotes.
 */
function dropCarriageReturn(fields: string[], input: Uint8Array, next: number): void {
  const last = fields.length - 1;
  const field = fields[last];
  if (field !== undefined && input[next - 2] === CR && field.charCodeAt(field.length - 1) === CR) {
    fields[last] = field.slice(0, -1);
  }
}

function growInt32(array: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> {
  const bigger = new Int32Array(array.length * 2);
  bigger.set(array);
  return bigger;
}

function countByte(bytes: Uint8Array, byte: number, start: number, end: number): number {
  let count = 0;
  for (let at = bytes.indexOf(byte, start); at !== -1 && at < end; at = bytes.indexOf(byte, at + 1)) count++;
  return count;
}

/**
 * Header cells → unique column names. A blank cell becomes `column N` (N its 1-based position), a
 * repeated name `name (2)`, `name (3)`…; first occurrences keep their names. Each change is reported.
 */
export function uniqueColumnNames(header: readonly string[]): { names: string[]; issues: HeaderIssue[] } {
  const taken = new Set<string>();
  const names: (string | null)[] = header.map((raw) => {
    if (raw.trim() === '' || taken.has(raw)) return null;
    taken.add(raw);
    return raw;
  });
  const issues: HeaderIssue[] = [];
  const finalNames = names.map((name, column) => {
    if (name !== null) return name;
    const original = header[column] ?? '';
    const blank = original.trim() === '';
    const renamedTo = freeName(blank ? `column ${column + 1}` : original, blank ? 1 : 2, taken);
    taken.add(renamedTo);
    issues.push({ column, kind: blank ? 'blank' : 'duplicate', original, renamedTo });
    return renamedTo;
  });
  return { names: finalNames, issues };
}

/** `base` if free and `first` is 1, else the first free `base (k)` with k ≥ max(first, 2). */
function freeName(base: string, first: number, taken: ReadonlySet<string>): string {
  if (first === 1 && !taken.has(base)) return base;
  for (let k = Math.max(first, 2); ; k++) {
    const candidate = `${base} (${k})`;
    if (!taken.has(candidate)) return candidate;
  }
}
