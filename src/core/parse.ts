/**
 * Delimited text → records, fed text chunk by chunk (the decoder's output), with the physical
 * line each record starts on. papaparse's core `Parser` does the field splitting and quote
 * handling; with `ignoreLastRow` it stops before an incomplete record, and we keep that tail for
 * the next chunk. Everything papaparse leaves to its callers or gets inconsistent is done here:
 * choosing the delimiter and line break, line numbers, CRLF mixed with LF, telling empty lines
 * apart, the trailing newline, unclosed quotes.
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
   * One record. `fields` is papaparse's array, valid only during the call. `line` is the 1-based
   * physical line the record starts on; `unclosedQuote` says a quoted field ran to the end of the file.
   */
  record(fields: readonly string[], line: number, unclosedQuote: boolean): void;
  /** A line with nothing on it. Whether it is skipped or is an empty cell is the table's call. */
  emptyLine(line: number): void;
}

export interface RecordParserOptions {
  /** null or absent: chosen from the start of the text. */
  readonly delimiter?: Delimiter | null;
}

/** Text collected before choosing the delimiter and line break, unless the text ends sooner. */
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

export class RecordParser {
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
