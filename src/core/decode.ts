/**
 * Bytes → text, chunk by chunk. Spreadsheet exports arrive as UTF-8 (with or without a byte order
 * mark), as UTF-16 with a byte order mark, or in the Windows code page 1252 of older office
 * programs. The encoding is decided once, from the byte order mark or from the first chunk(s);
 * multi-byte characters split across chunk boundaries decode correctly because one `TextDecoder`
 * in stream mode sees all the bytes.
 *
 * A file that looks like UTF-8 at the start can hold Windows-1252 bytes further down. By then text
 * has been handed on, so the decoder cannot quietly switch: it throws a LevelwiseError of code
 * 'encoding-restart' and the caller reads the source again as Windows-1252 (`retryAsWindows1252`).
 */
import { LevelwiseError, isLevelwiseError } from './errors.ts';
import { placeBadUtf8 } from './bad-utf8.ts';
import { encodeUtf8 } from './utf8-text.ts';

export type EncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

/** Bytes looked at before choosing an encoding, and searched for signs of a binary file. */
export const SNIFF_BYTES = 8192;

export class ChunkDecoder {
  private readonly forced: EncodingName | null;
  private head: Uint8Array[] = [];
  private headLength = 0;
  private decoder: TextDecoder | null = null;
  private chosen: EncodingName | null = null;
  /** Whether the encoding was guessed from content (so a later contradiction means restart). */
  private guessed = false;
  private offset = 0;

  /** `forced` skips the choice (byte order marks included), e.g. when restarting as Windows-1252. */
  constructor(forced: EncodingName | null = null) {
    this.forced = forced;
  }

  /** The encoding in use; null until enough bytes were seen to choose. */
  get encoding(): EncodingName | null {
    return this.chosen;
  }

  /** Decodes the next chunk. May return '' while still collecting bytes to choose the encoding. */
  decode(chunk: Uint8Array): string {
    if (this.decoder !== null) return this.run(chunk);
    // Copied because callers may reuse their read buffer while we hold on to it.
    this.head.push(chunk.slice());
    this.headLength += chunk.length;
    return this.headLength < SNIFF_BYTES ? '' : this.start(false);
  }

  /** Decodes whatever is left; throws if the bytes end in the middle of a character. */
  finish(): string {
    const text = this.decoder === null ? this.start(true) : '';
    return text + this.run(undefined);
  }

  /** `whole`: the collected bytes are the entire input, so they cannot end mid-character. */
  private start(whole: boolean): string {
    const bytes = concatBytes(this.head, this.headLength);
    this.head = [];
    rejectBinary(bytes, this.forced);
    const declared = this.forced ?? encodingFromByteOrderMark(bytes);
    if (declared !== null) return this.open(declared, bytes);
    this.guessed = true;
    return isValidUtf8(bytes, whole) ? this.open('utf-8', bytes) : this.open('windows-1252', bytes);
  }

  private open(encoding: EncodingName, bytes: Uint8Array): string {
    this.chosen = encoding;
    // fatal: invalid bytes must stop the reading, never turn silently into U+FFFD.
    this.decoder = new TextDecoder(encoding, { fatal: encoding !== 'windows-1252' });
    return this.run(bytes);
  }

  /** `bytes` undefined flushes the decoder at the end of the input. */
  private run(bytes: Uint8Array | undefined): string {
    const decoder = this.decoder;
    if (decoder === null) throw new Error('ChunkDecoder.run before an encoding was chosen');
    try {
      const text = bytes === undefined ? decoder.decode() : decoder.decode(bytes, { stream: true });
      this.offset += bytes?.length ?? 0;
      return text;
    } catch {
      throw this.invalidBytesError(bytes === undefined);
    }
  }

  private invalidBytesError(atEnd: boolean): LevelwiseError {
    const where = atEnd ? 'at the end of the file' : `after byte ${this.offset.toLocaleString('en-US')}`;
    return invalidBytes(this.guessed && this.chosen === 'utf-8', this.chosen, where);
  }
}

/**
 * `restart`: the encoding was a guess of UTF-8, so the caller may read the source again as
 * Windows-1252. `where`: where the bytes are, when known ("after byte 1,048,576").
 */
function invalidBytes(restart: boolean, encoding: EncodingName | null, where: string | null): LevelwiseError {
  if (restart) {
    return new LevelwiseError(
      'encoding-restart',
      `The file started as UTF-8 text but holds bytes that are not UTF-8 ${where ?? 'further on'}.`,
      { hint: 'Read the file again as Windows-1252 (the readers in Levelwise do this by themselves).' },
    );
  }
  return new LevelwiseError('bad-encoding', `The file is not valid ${encoding ?? 'text'}: it holds bytes that are not ${encoding ?? 'text'}${where === null ? '' : ` ${where}`}.`, {
    hint: 'Open the file in a spreadsheet or text editor and save it again as UTF-8 CSV.',
  });
}

/**
 * Bytes → UTF-8 bytes, chunk by chunk, for the byte-level reader (parse.ts), which keeps the file
 * as bytes and makes text only of values met for the first time. The encoding is chosen as
 * ChunkDecoder chooses it. UTF-8 passes through untouched, less its byte order mark; UTF-16 and
 * Windows-1252 are decoded and written again as UTF-8, so the reader meets one encoding only.
 *
 * Passing through means not checking: the reader checks the bytes of every value it decodes
 * (utf8-text.ts) and, meeting bytes that are not UTF-8, asks `invalidUtf8Error` for the error
 * to throw, a restart as Windows-1252 when UTF-8 was only a guess.
 */
export class Utf8Chunks {
  private readonly forced: EncodingName | null;
  private head: Uint8Array[] = [];
  private headLength = 0;
  private chosen: EncodingName | null = null;
  private guessed = false;
  private skipped = 0;
  /** For encodings other than UTF-8: their text, to be written again as UTF-8. */
  private transcoder: ChunkDecoder | null = null;

  constructor(forced: EncodingName | null = null) {
    this.forced = forced;
  }

  /** The encoding of the source; null until enough bytes were seen to choose. */
  get encoding(): EncodingName | null {
    return this.chosen;
  }

  /** Bytes of the source's start not passed on: a UTF-8 byte order mark. */
  get skippedBytes(): number {
    return this.skipped;
  }

  /** Whether the encoding was guessed from the bytes (not given, no byte order mark). */
  get encodingGuessed(): boolean {
    return this.guessed;
  }

  /**
   * The next chunk as UTF-8: `chunk` itself (or a part of it) when the source is UTF-8, so valid
   * only until the caller reuses its buffer. Empty while collecting bytes to choose the encoding.
   */
  next(chunk: Uint8Array): Uint8Array {
    if (this.chosen !== null) return this.transcoder === null ? chunk : encodeUtf8(this.transcoder.decode(chunk));
    // Copied because callers may reuse their read buffer while we hold on to it.
    this.head.push(chunk.slice());
    this.headLength += chunk.length;
    return this.headLength < SNIFF_BYTES ? EMPTY : this.start(false);
  }

  /** What is left at the end of the source. */
  finish(): Uint8Array {
    const rest = this.chosen === null ? this.start(true) : EMPTY;
    if (this.transcoder === null) return rest;
    const tail = encodeUtf8(this.transcoder.finish());
    return rest.length === 0 ? tail : concatBytes([rest, tail], rest.length + tail.length);
  }

  /** The error for bytes that are not UTF-8, met somewhere in what was read so far. */
  invalidUtf8Error(): LevelwiseError {
    return invalidUtf8(this.guessed && this.chosen === 'utf-8', this.chosen);
  }

  private start(whole: boolean): Uint8Array {
    const bytes = concatBytes(this.head, this.headLength);
    this.head = [];
    rejectBinary(bytes, this.forced);
    const declared = this.forced ?? encodingFromByteOrderMark(bytes);
    this.guessed = declared === null;
    this.chosen = declared ?? (isValidUtf8(bytes, whole) ? 'utf-8' : 'windows-1252');
    if (this.chosen === 'utf-8') {
      this.skipped = encodingFromByteOrderMark(bytes) === 'utf-8' ? 3 : 0;
      return bytes.subarray(this.skipped);
    }
    this.transcoder = new ChunkDecoder(this.chosen);
    return encodeUtf8(this.transcoder.decode(bytes));
  }
}

const EMPTY = new Uint8Array(0);

/**
 * The error for bytes that are not UTF-8 in a source read as `encoding` (a restart as Windows-1252
 * when UTF-8 was only a guess). The byte-level reader checks a value's bytes when the value first
 * becomes text, so it cannot say where they are; callers that can read the source again add the
 * place (bad-utf8.ts).
 */
export function invalidUtf8(guessed: boolean, encoding: EncodingName | null): LevelwiseError {
  return invalidBytes(guessed, encoding, null);
}

/**
 * Runs `read` on a fresh pass over the source; if the pass ends in 'encoding-restart', runs it
 * once more forced to Windows-1252; if it ends in bad bytes, finds where they are (bad-utf8.ts).
 * `open` must give the same bytes each time (a File, a path).
 */
export async function retryAsWindows1252<T>(
  open: () => AsyncIterable<Uint8Array>,
  read: (chunks: AsyncIterable<Uint8Array>, encoding: EncodingName | null) => Promise<T>,
  encoding: EncodingName | null = null,
): Promise<T> {
  try {
    return await read(open(), encoding);
  } catch (error) {
    if (!isLevelwiseError(error, 'encoding-restart')) throw await placeBadUtf8(error, open);
    return read(open(), 'windows-1252');
  }
}

/** Decodes a whole buffer, choosing the encoding from all of it. */
export function decodeBytes(bytes: Uint8Array, encoding: EncodingName | null = null): { text: string; encoding: EncodingName } {
  const decoder = new ChunkDecoder(encoding);
  const text = decoder.decode(bytes) + decoder.finish();
  return { text, encoding: decoder.encoding ?? 'utf-8' };
}

function encodingFromByteOrderMark(bytes: Uint8Array): EncodingName | null {
  const [b0, b1, b2] = bytes;
  if (b0 === 0xef && b1 === 0xbb && b2 === 0xbf) return 'utf-8';
  if (b0 === 0xff && b1 === 0xfe) return 'utf-16le';
  if (b0 === 0xfe && b1 === 0xff) return 'utf-16be';
  return null;
}

/** Valid UTF-8; unless `whole`, the bytes may stop in the middle of a character (more follow). */
function isValidUtf8(bytes: Uint8Array, whole: boolean): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes, { stream: !whole });
    return true;
  } catch {
    return false;
  }
}

interface Signature {
  readonly bytes: readonly number[];
  readonly what: string;
  readonly hint: string;
}

const SAVE_AS_CSV = 'Open it in its program and save or export the table as CSV (or load an .xlsx workbook as a spreadsheet).';

/** File signatures ("magic numbers") of formats people pick by mistake. Common practice. */
const SIGNATURES: readonly Signature[] = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a ZIP archive (an .xlsx workbook is one)', hint: 'If it is an .xlsx workbook, load it as a spreadsheet; otherwise unpack it first.' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old-style .xls workbook', hint: SAVE_AS_CSV },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image', hint: 'Choose the CSV or text file that holds the table.' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image', hint: 'Choose the CSV or text file that holds the table.' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document', hint: SAVE_AS_CSV },
  { bytes: [0x1f, 0x8b], what: 'a gzip-compressed file', hint: 'Unpack it first, then load the CSV inside.' },
];

/** The first two bytes of every gzip member (RFC 1952 §2.3.1, ID1 and ID2): the command line and the page unpack such files. */
export function startsLikeGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
}

function rejectBinary(bytes: Uint8Array, forced: EncodingName | null): void {
  const signature = SIGNATURES.find((s) => s.bytes.every((b, i) => bytes[i] === b));
  if (signature !== undefined) {
    throw new LevelwiseError('not-text', `This is not a text table: it looks like ${signature.what}.`, { hint: signature.hint });
  }
  if (forced === 'utf-16le' || forced === 'utf-16be' || encodingFromByteOrderMark(bytes)?.startsWith('utf-16')) return;
  const nul = bytes.subarray(0, SNIFF_BYTES).indexOf(0);
  if (nul === -1) return;
  throw new LevelwiseError('not-text', `This is not a text table: byte ${nul + 1} is a NUL byte, which text files do not contain.`, {
    hint: looksLikeUtf16WithoutMark(bytes)
      ? 'It may be UTF-16 text without a byte order mark: save it again as UTF-8 CSV.'
      : 'Choose the CSV or tab-separated text file that holds the table, or export one from the program that made this file.',
  });
}

/** NUL in every other byte of the first few hundred is how ASCII looks in UTF-16. */
function looksLikeUtf16WithoutMark(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 512) & ~1;
  if (n < 4) return false;
  let evenNul = 0;
  let oddNul = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenNul++;
    if (bytes[i + 1] === 0) oddNul++;
  }
  return Math.max(evenNul, oddNul) >= (n / 2) * 0.9 && Math.min(evenNul, oddNul) === 0;
}

function concatBytes(parts: readonly Uint8Array[], length: number): Uint8Array {
  if (parts.length === 1 && parts[0] !== undefined) return parts[0];
  const out = new Uint8Array(length);
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}
