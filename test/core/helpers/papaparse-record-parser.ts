/**
 * The record reader Levelwise used before it had its own scanner: papaparse's core `Parser` splits
 * the fields (with `ignoreLastRow`, stopping before an incomplete record whose text is kept for the
 * next chunk), and this class adds what papaparse leaves to its callers: line numbers, CRLF mixed
 * with LF, empty lines, the trailing newline, unclosed quotes. Kept as the reference that the
 * property tests hold src/core/parse.ts to, on any text, malformed quoting included.
 */
import Papa from 'papaparse';
import { chooseDelimiter, chooseLineBreak, type Delimiter, type LineBreak, type RecordParserOptions, type RecordSink } from '../../../src/core/parse.ts';

const SNIFF_CHARS = 64 * 1024;
const QUOTE = 0x22;
const CR = 0x0d;
const LF = 0x0a;

/** What papaparse's core Parser passes to `step`: the one row in `data`, its end in `meta.cursor`. */
interface StepResult {
  readonly data: string[][];
  readonly errors: readonly { readonly code: string }[];
  readonly meta: { readonly cursor: number };
}

export class PapaparseRecordParser {
  private readonly sink: RecordSink;
  private delimiterChoice: Delimiter | null;
  private lineBreak: LineBreak = '\n';
  private parser: Papa.Parser | null = null;
  /** Text not yet parsed: an incomplete record, then newer text. */
  private pending = '';
  /** Wait for this much pending text before parsing again (grows when one record spans chunks). */
  private parseAt = SNIFF_CHARS;
  /** Line on which `pending` starts. */
  private line = 1;
  // State of the parse in progress, read by the step callback.
  private input = '';
  private recordStart = 0;
  private nextQuote = -1;

  constructor(sink: RecordSink, options: RecordParserOptions = {}) {
    this.sink = sink;
    this.delimiterChoice = options.delimiter ?? null;
  }

  /** The delimiter in use; null until enough text was seen to choose. */
  get delimiter(): Delimiter | null {
    return this.parser === null ? null : this.delimiterChoice;
  }

  push(text: string): void {
    this.pending += text;
    if (this.pending.length < this.parseAt) return;
    this.parse(false);
  }

  /** Parses what is left, including a last record without a line break. */
  finish(): void {
    this.parse(true);
  }

  private parse(final: boolean): void {
    this.parser ??= this.createParser(this.pending, final);
    const input = this.pending;
    this.input = input;
    this.recordStart = 0;
    this.nextQuote = input.indexOf('"');
    this.parser.parse(input, 0, !final);
    this.pending = final ? '' : input.slice(this.recordStart);
    this.input = '';
    // A record longer than a chunk would otherwise be re-parsed from its start on every push.
    this.parseAt = Math.max(SNIFF_CHARS, 2 * this.pending.length);
  }

  private createParser(sample: string, final: boolean): Papa.Parser {
    this.lineBreak = chooseLineBreak(sample);
    this.delimiterChoice ??= chooseDelimiter(sample, this.lineBreak, final);
    const config = { delimiter: this.delimiterChoice, newline: this.lineBreak, step: this.step };
    // The typings describe the high-level parse config; the core Parser takes the same fields.
    return new Papa.Parser(config as unknown as Papa.ParseConfig);
  }

  private readonly step = (result: StepResult): void => {
    const fields = result.data[0];
    const start = this.recordStart;
    const end = result.meta.cursor;
    const line = this.line;
    const quoted = this.hasQuoteWithin(start, end);
    this.recordStart = end;
    this.line += this.lineBreaksIn(start, end, quoted);
    if (fields === undefined || start === end) return; // nothing after the final line break
    if (this.lineBreak === '\n') dropCarriageReturn(fields, this.input, start, end, this.delimiterChoice ?? ',', quoted);
    if (this.isEmptyLine(fields, start)) this.sink.emptyLine(line);
    else this.sink.record(fields, line, result.errors.length > 0 && hasUnclosedQuote(result.errors));
  };

  /** Whether input[start, end) holds a quote; one forward-moving search over the whole input. */
  private hasQuoteWithin(start: number, end: number): boolean {
    if (this.nextQuote !== -1 && this.nextQuote < start) this.nextQuote = this.input.indexOf('"', start);
    return this.nextQuote !== -1 && this.nextQuote < end;
  }

  /** Only a record holding a quote can hold a line break before its end. */
  private lineBreaksIn(start: number, end: number, quoted: boolean): number {
    if (quoted) return countOccurrences(this.input, this.lineBreak, start, end);
    return end > start && this.input.charCodeAt(end - 1) === this.lineBreak.charCodeAt(0) ? 1 : 0;
  }

  /** A line with nothing on it; `""` is not empty: it is one empty field, written on purpose. */
  private isEmptyLine(fields: readonly string[], start: number): boolean {
    return fields.length === 1 && fields[0] === '' && this.input.charCodeAt(start) !== QUOTE;
  }
}

/**
 * In LF mode a CRLF ends the record, and papaparse leaves its CR on an unquoted last field. A
 * quoted last field keeps a CR written inside its quotes. In a record holding quotes, the last
 * field was unquoted when the raw text before the line break is that field, not starting with a
 * quote and right after a delimiter (or at the record's start).
 */
function dropCarriageReturn(fields: string[], input: string, start: number, end: number, delimiter: string, quoted: boolean): void {
  if (input.charCodeAt(end - 1) !== LF || input.charCodeAt(end - 2) !== CR) return;
  const last = fields.length - 1;
  const field = fields[last];
  if (field === undefined || field.charCodeAt(field.length - 1) !== CR) return;
  if (quoted && !isRawLastField(field, input, start, end - 1, delimiter, last === 0)) return;
  fields[last] = field.slice(0, -1);
}

function isRawLastField(field: string, input: string, recordStart: number, fieldEnd: number, delimiter: string, only: boolean): boolean {
  const fieldStart = fieldEnd - field.length;
  const afterDelimiter = only ? fieldStart === recordStart : input[fieldStart - 1] === delimiter;
  return afterDelimiter && input.charCodeAt(fieldStart) !== QUOTE && input.slice(fieldStart, fieldEnd) === field;
}

function hasUnclosedQuote(errors: StepResult['errors']): boolean {
  return errors.some((e) => e.code === 'MissingQuotes');
}

function countOccurrences(text: string, needle: string, start: number, end: number): number {
  let count = 0;
  for (let at = text.indexOf(needle, start); at !== -1 && at < end; at = text.indexOf(needle, at + 1)) count++;
  return count;
}
