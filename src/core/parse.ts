/**
 * Delimited text → records, fed text chunk by chunk (the decoder's output), with the physical
 * line each record starts on. Our own scanner, shaped for big files:
 *
 * - Records with no quoted field (nearly all of a typical export) are split with `indexOf`, which
 *   engines run natively, never looking at the characters one by one in JavaScript. Such records
 *   are handed on in blocks, as positions in the text (`RecordSink.plainRecords`), so no string is
 *   made per cell (the table keeps one string per distinct value, columns-builder.ts) and the
 *   table can take a block column by column, one column's dictionary at a time.
 * - A record with a field that starts with a quote goes through a slower path that reads quoted
 *   fields the way papaparse's parser does, down to its handling of malformed quoting: a quote
 *   closes a field only when blanks and then a delimiter, a line break or the end of the text
 *   follow it; `""` inside is one quote; any other quote is kept as text; a quote never closed
 *   keeps the rest of the text, unchanged, in the field (reported as an unclosed quote).
 *   test/core/parse.property.test.ts checks both paths against papaparse on random text.
 * - A quote inside an unquoted field is text (`12"`), as in papaparse.
 * - A record is handed on only once its line break is seen (or the text ends), so the records do
 *   not depend on where the chunks were cut.
 *
 * papaparse still chooses the delimiter (`chooseDelimiter`), on the first records only.
 *
 * Line breaks: a file with any LF outside quotes is read by LF, and a CR right before an LF that
 * ends a record is dropped with it (CRLF files, and files mixing CRLF and LF); a file of lone CRs
 * is read by CR.
 * Line numbers count those breaks; breaks inside quoted fields count too, so a record's line is
 * the one an editor shows.
 */
import Papa from 'papaparse';
import type { HeaderIssue } from './columns.ts';

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
   * Optional fast path: consecutive records without quoted fields, as positions in the text (see
   * PlainRecords), so that no string need be made per cell. Without this method such records come
   * through `record` one by one like the others. Empty lines never come this way.
   */
  plainRecords?(records: PlainRecords): void;
}

/**
 * Consecutive records without quoted fields, all with `width` fields. Field f of record r is
 * `text.slice(bounds[r * (width + 1) + f], bounds[r * (width + 1) + f + 1] - 1)`, and the record
 * starts on line `lines[r]`. Valid only during the call: the arrays are reused.
 */
export interface PlainRecords {
  readonly text: string;
  readonly count: number;
  readonly width: number;
  readonly bounds: Int32Array;
  readonly lines: Int32Array;
}

export interface RecordParserOptions {
  /** null or absent: chosen from the start of the text. */
  readonly delimiter?: Delimiter | null;
}

/** Text collected before choosing the delimiter and line break, unless the text ends sooner. */
const SNIFF_CHARS = 64 * 1024;

const QUOTE = 0x22;
const CR = 0x0d;

/** The scanner stopped before a record that is not complete yet (more text may follow). */
const INCOMPLETE = -1;

/** A block of plain records is handed on once its bounds fill this many entries (1 MB). */
const BLOCK_BOUNDS = 1 << 18;

export class RecordParser {
  private readonly sink: RecordSink;
  private delimiterChoice: Delimiter | null;
  private lineBreak: LineBreak = '\n';
  private started = false;
  /** Text not yet parsed: an incomplete record, then newer text, in pieces. */
  private pending: string[] = [];
  private pendingLength = 0;
  /** Wait for this much pending text before parsing again (grows when one record spans chunks). */
  private parseAt = SNIFF_CHARS;
  /** Line on which the pending text starts. */
  private line = 1;
  /** Plain records collected for the sink (see PlainRecords); the arrays grow as needed. */
  private readonly block = { text: '', count: 0, width: 0, bounds: new Int32Array(1 << 12), lines: new Int32Array(1 << 8) };
  /** Where scanPlainRecords met a record holding a quoted field; -1 when it did not. */
  private stoppedAt = -1;

  constructor(sink: RecordSink, options: RecordParserOptions = {}) {
    this.sink = sink;
    this.delimiterChoice = options.delimiter ?? null;
  }

  /** The delimiter in use; null until enough text was seen to choose. */
  get delimiter(): Delimiter | null {
    return this.started ? this.delimiterChoice : null;
  }

  push(text: string): void {
    if (text === '') return;
    this.pending.push(text);
    this.pendingLength += text.length;
    if (this.pendingLength < this.parseAt) return;
    this.parse(false);
  }

  /** Parses what is left, including a last record without a line break. */
  finish(): void {
    this.parse(true);
  }

  private parse(final: boolean): void {
    // One flat string: joining copies the pieces once, where `+` would leave a tree of pieces for
    // the engine to flatten on the first search.
    const input = this.pending.length === 1 ? (this.pending[0] ?? '') : this.pending.join('');
    if (!this.started) this.start(input, final);
    const consumed = this.scan(input, final);
    const rest = final ? '' : input.slice(consumed);
    this.pending = rest === '' ? [] : [rest];
    this.pendingLength = rest.length;
    // A record longer than a chunk would otherwise be re-parsed from its start on every push.
    this.parseAt = Math.max(SNIFF_CHARS, 2 * rest.length);
  }

  private start(sample: string, final: boolean): void {
    this.lineBreak = chooseLineBreak(sample);
    this.delimiterChoice ??= chooseDelimiter(sample, this.lineBreak, final);
    this.started = true;
  }

  /** Reads the complete records of `input`; returns where the unread rest starts. */
  private scan(input: string, final: boolean): number {
    let at = 0;
    while (at < input.length) {
      const plainEnd = this.scanPlainRecords(input, at, final);
      if (plainEnd === INCOMPLETE) return at;
      at = plainEnd;
      if (at === input.length || this.stoppedAt !== at) continue;
      // The record at `at` has a field that starts with a quote.
      const quotedEnd = this.scanQuotedRecord(input, at, final);
      if (quotedEnd === INCOMPLETE) return at;
      at = quotedEnd;
    }
    return at;
  }

  /**
   * Reads records without quoted fields from `at` on, for as long as they come, into the block of
   * plain records. Returns where it stopped: the end of the text, the start of a record with a
   * quoted field (then `stoppedAt` is that position too), or the start of a record the text does
   * not complete yet (when `final` is false; then, if that is `at` itself, INCOMPLETE). Hands the
   * block to the sink before returning and before anything that is not a plain record.
   */
  private scanPlainRecords(input: string, at: number, final: boolean): number {
    const n = input.length;
    const block = this.block;
    block.text = input;
    let bounds = block.bounds;
    const delimiter = this.delimiterChoice ?? ',';
    const lineBreak = this.lineBreak;
    const lfMode = lineBreak === '\n';
    // Where the next record's bounds go.
    let b = 0;
    let line = this.line;
    let start = at;
    this.stoppedAt = -1;
    // The next delimiter and quote at or after the current position (-1: none in the text).
    let nextDelimiter = input.indexOf(delimiter, start);
    let nextQuote = input.indexOf('"', start);
    while (start < n) {
      let end = input.indexOf(lineBreak, start);
      let next: number;
      if (end === -1) {
        if (!final) break; // the record's line break is in a later chunk
        end = n;
        next = n;
      } else {
        next = end + 1;
      }
      // In LF mode a CR right before the LF belongs to the line break.
      const fieldsEnd = lfMode && end < n && end > start && input.charCodeAt(end - 1) === CR ? end - 1 : end;
      if (nextQuote !== -1 && nextQuote < start) nextQuote = input.indexOf('"', start);
      // A quote in the record is text unless a field starts with it (then the slow path reads it).
      const quotes = nextQuote !== -1 && nextQuote < end;
      if (fieldsEnd === start) {
        this.flushBlock();
        b = 0;
        this.sink.emptyLine(line);
        line++;
        start = next;
        continue;
      }
      let count = 0;
      let fieldStart = start;
      for (;;) {
        if (quotes && input.charCodeAt(fieldStart) === QUOTE) {
          this.stoppedAt = start;
          break;
        }
        if (b + count + 2 >= bounds.length) bounds = block.bounds = growInt32(bounds);
        bounds[b + count++] = fieldStart;
        if (nextDelimiter !== -1 && nextDelimiter < fieldStart) nextDelimiter = input.indexOf(delimiter, fieldStart);
        if (nextDelimiter === -1 || nextDelimiter >= fieldsEnd) break;
        fieldStart = nextDelimiter + 1;
      }
      if (this.stoppedAt === start) break;
      bounds[b + count] = fieldsEnd + 1;
      if (block.count > 0 && count !== block.width) {
        // A record of another width starts a new block: hand over the others, keep this one.
        this.flushBlock();
        bounds.copyWithin(0, b, b + count + 1);
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
      if (next > end) line++;
      start = next;
    }
    this.line = line;
    this.flushBlock();
    block.text = ''; // the block must not keep the chunk alive
    return start === at && this.stoppedAt === -1 && start < n ? INCOMPLETE : start;
  }

  /** Hands the collected plain records to the sink. */
  private flushBlock(): void {
    const block = this.block;
    if (block.count === 0) return;
    if (this.sink.plainRecords !== undefined) this.sink.plainRecords(block);
    else for (let r = 0; r < block.count; r++) this.sink.record(plainFields(block, r), block.lines[r] ?? 0, false);
    block.count = 0;
  }

  /**
   * Reads the record at `start`, which has a quoted field; returns where the next record starts,
   * or INCOMPLETE when the text does not complete it yet.
   */
  private scanQuotedRecord(input: string, start: number, final: boolean): number {
    const delimiter = this.delimiterChoice ?? ',';
    const lineBreak = this.lineBreak;
    const fields: string[] = [];
    let cursor = start;
    for (;;) {
      const field = input.charCodeAt(cursor) === QUOTE && cursor < input.length
        ? readQuotedField(input, cursor, delimiter, lineBreak, final)
        : readUnquotedField(input, cursor, delimiter, lineBreak, final);
      if (field === null) return INCOMPLETE;
      fields.push(field.value);
      cursor = field.next;
      if (!field.endsRecord) continue;
      if (field.endsWithBreak && !field.quoted && lineBreak === '\n') dropCarriageReturn(fields, input, field.next);
      const line = this.line;
      this.line += countOccurrences(input, lineBreak, start, cursor);
      this.sink.record(fields, line, field.unclosed);
      return cursor;
    }
  }
}

/** Record r of a block of plain records, as strings. */
export function plainFields(records: PlainRecords, r: number): string[] {
  const fields: string[] = [];
  const first = r * (records.width + 1);
  for (let f = 0; f < records.width; f++) {
    fields.push(records.text.slice(records.bounds[first + f] ?? 0, (records.bounds[first + f + 1] ?? 0) - 1));
  }
  return fields;
}

/** Parses a whole text at once; returns the records with their lines. For tests and small inputs. */
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
  parser.push(text);
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
function readUnquotedField(input: string, at: number, delimiter: string, lineBreak: string, final: boolean): FieldRead | null {
  const nextDelimiter = input.indexOf(delimiter, at);
  const nextBreak = input.indexOf(lineBreak, at);
  if (nextDelimiter !== -1 && (nextBreak === -1 || nextDelimiter < nextBreak)) {
    return { value: input.slice(at, nextDelimiter), next: nextDelimiter + 1, endsRecord: false, endsWithBreak: false, quoted: false, unclosed: false };
  }
  if (nextBreak !== -1) {
    return { value: input.slice(at, nextBreak), next: nextBreak + 1, endsRecord: true, endsWithBreak: true, quoted: false, unclosed: false };
  }
  if (!final) return null;
  return { value: input.slice(at), next: input.length, endsRecord: true, endsWithBreak: false, quoted: false, unclosed: false };
}

/**
 * A field starting with a quote at `open`. A later quote closes it when only blanks (what
 * `trim` removes) stand between it and the next delimiter or line break; `""` is an escaped
 * quote; a quote at the very end of the text closes the field. Any other quote is text, and
 * the search goes on. With no closing quote the field is the rest of the text, as written.
 * null when the text may go on.
 */
function readQuotedField(input: string, open: number, delimiter: string, lineBreak: string, final: boolean): FieldRead | null {
  const n = input.length;
  for (let quote = input.indexOf('"', open + 1); ; quote = input.indexOf('"', quote + 2)) {
    if (quote === -1) {
      if (!final) return null;
      return { value: input.slice(open + 1), next: n, endsRecord: true, endsWithBreak: false, quoted: true, unclosed: true };
    }
    if (quote === n - 1) {
      if (!final) return null;
      return { value: unescapeQuotes(input.slice(open + 1, quote)), next: n, endsRecord: true, endsWithBreak: false, quoted: true, unclosed: false };
    }
    if (input.charCodeAt(quote + 1) === QUOTE) continue; // "" is an escaped quote: search on after the pair
    const after = firstOf(input, delimiter, lineBreak, quote + 1);
    if (after !== -1 && isBlank(input, quote + 1, after)) {
      const value = unescapeQuotes(input.slice(open + 1, quote));
      const endsRecord = input[after] !== delimiter;
      return { value, next: after + 1, endsRecord, endsWithBreak: endsRecord, quoted: true, unclosed: false };
    }
    // Not a closing quote (text follows it): it is part of the field; search on after it.
  }
}

/** The first delimiter or line break at or after `from`; -1 when there is none. */
function firstOf(input: string, delimiter: string, lineBreak: string, from: number): number {
  const d = input.indexOf(delimiter, from);
  const b = input.indexOf(lineBreak, from);
  return d === -1 ? b : b === -1 ? d : Math.min(d, b);
}

function isBlank(input: string, start: number, end: number): boolean {
  return start === end || input.slice(start, end).trim() === '';
}

function unescapeQuotes(text: string): string {
  return text.includes('"') ? text.replace(/""/g, '"') : text;
}

/**
 * In LF mode a CRLF ends the record; the CR belongs to the break, not to an unquoted last field.
 * A quoted last field keeps a CR written inside its quotes.
 */
function dropCarriageReturn(fields: string[], input: string, next: number): void {
  const last = fields.length - 1;
  const field = fields[last];
  if (field !== undefined && input.charCodeAt(next - 2) === CR && field.charCodeAt(field.length - 1) === CR) {
    fields[last] = field.slice(0, -1);
  }
}

function growInt32(array: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> {
  const bigger = new Int32Array(array.length * 2);
  bigger.set(array);
  return bigger;
}

function countOccurrences(text: string, needle: string, start: number, end: number): number {
  let count = 0;
  for (let at = text.indexOf(needle, start); at !== -1 && at < end; at = text.indexOf(needle, at + 1)) count++;
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
