/**
 * Where a file stops being UTF-8. The byte-level reader checks a value's bytes only when the value
 * first becomes text (utf8-text.ts), often at the end of a batch or of the file, so it knows that a
 * file holds bytes that are not UTF-8 but not where. A person needs the place to fix the file, so
 * the callers that can read the source again (a path, a File, bytes in memory) run this second,
 * plain pass over it; it stops at the first bad byte.
 *
 * The rules are the UTF-8 decoder's of the WHATWG Encoding Standard (§4.1): a bad sequence starts at
 * its lead byte, and a sequence cut short by a byte that cannot continue it is bad where it starts.
 */
import { isLevelwiseError, LevelwiseError } from './errors.ts';

export interface BadUtf8Place {
  /** 0-based offset in the source of the first byte of the bad sequence. */
  readonly byte: number;
  /** 1-based line it is on, as an editor counts them (LF, CRLF or a lone CR ends a line). */
  readonly line: number;
  /** The bad sequence, e.g. [0xFC]; at most 4 bytes. */
  readonly bytes: readonly number[];
  /** The line around it, bad bytes written \xHH; "…" where the line goes on. */
  readonly excerpt: string;
}

/** Bytes of the line shown before and after the bad sequence. */
const EXCERPT_BYTES = 32;
const LF = 0x0a;
const CR = 0x0d;

/** The bad sequence once found, and the line around it as gathered so far. */
interface Found {
  readonly byte: number;
  readonly line: number;
  readonly bytes: number[];
  readonly before: number[];
  readonly cutBefore: boolean;
  /** Bytes after the sequence, up to EXCERPT_BYTES or the end of its line. */
  readonly after: number[];
  lineEnded: boolean;
}

/** Feed the source's bytes in order with `push` until it returns a place, then `finish` at the end. */
export class Utf8Locator {
  private offset = 0;
  private line = 1;
  private afterCr = false;
  /** Continuation bytes still expected, and the range the next one must fall in. */
  private needed = 0;
  private lower = 0x80;
  private upper = 0xbf;
  /** The current sequence so far, and where it started. */
  private sequence: number[] = [];
  private sequenceStart = 0;
  /** The current line's last bytes before the current sequence (for the excerpt). */
  private lineTail: number[] = [];
  /** Whether the tail lost bytes from the line's start. */
  private cutBefore = false;
  private found: Found | null = null;
  private atStart = true;
  /** The source starts with a UTF-16 byte order mark: not UTF-8 at all, nothing to point at. */
  private utf16 = false;

  /** The next bytes of the source. Returns the place once it is known (and complete), else null. */
  push(chunk: Uint8Array): BadUtf8Place | null {
    let i = 0;
    if (this.atStart && chunk.length > 0) {
      this.atStart = false;
      if (chunk.length >= 3 && chunk[0] === 0xef && chunk[1] === 0xbb && chunk[2] === 0xbf) i = 3;
      this.utf16 = chunk.length >= 2 && ((chunk[0] === 0xff && chunk[1] === 0xfe) || (chunk[0] === 0xfe && chunk[1] === 0xff));
    }
    if (this.utf16) return null;
    // Runs of plain ASCII (nearly every byte of most files) are only stepped over; their bytes join
    // the line's tail in one go, when something else comes or the chunk ends.
    let run = i;
    for (; i < chunk.length; i++) {
      const byte = chunk[i]!;
      if (this.found !== null) {
        if (this.takeAfter(byte)) return this.place();
        continue;
      }
      if (this.needed === 0 && byte < 0x80 && byte !== LF && byte !== CR) continue;
      this.addToTail(chunk, run, i);
      this.step(byte, this.offset + i);
      run = i + 1;
    }
    if (this.found === null) this.addToTail(chunk, run, chunk.length);
    this.offset += chunk.length;
    return this.found !== null && (this.found.lineEnded || this.found.after.length >= EXCERPT_BYTES) ? this.place() : null;
  }

  /** Plain ASCII bytes chunk[from, to) end the current line's tail. */
  private addToTail(chunk: Uint8Array, from: number, to: number): void {
    if (to <= from) return;
    this.afterCr = false;
    if (to - from > EXCERPT_BYTES) {
      this.lineTail = Array.from(chunk.subarray(to - EXCERPT_BYTES, to));
      this.cutBefore = true;
      return;
    }
    for (let k = from; k < to; k++) this.lineTail.push(chunk[k]!);
    this.trimTail();
  }

  private trimTail(): void {
    if (this.lineTail.length <= 2 * EXCERPT_BYTES) return;
    this.lineTail = this.lineTail.slice(-EXCERPT_BYTES);
    this.cutBefore = true;
  }

  /** The end of the source: a sequence left unfinished there is bad too. */
  finish(): BadUtf8Place | null {
    if (this.utf16) return null;
    if (this.found === null && this.needed > 0) this.markBad(this.sequenceStart);
    return this.found === null ? null : this.place();
  }

  private step(byte: number, at: number): void {
    if (this.needed > 0) {
      if (byte >= this.lower && byte <= this.upper) {
        this.sequence.push(byte);
        this.lower = 0x80;
        this.upper = 0xbf;
        if (--this.needed === 0) this.endSequence();
        return;
      }
      // Cut short: the sequence is bad where it started; this byte is not part of it, but follows it.
      this.markBad(this.sequenceStart);
      this.takeAfter(byte);
      return;
    }
    if (byte < 0x80) {
      this.sequenceStart = at;
      this.sequence = [byte];
      this.endSequence();
      return;
    }
    this.sequenceStart = at;
    this.sequence = [byte];
    const rule = leadRule(byte);
    if (rule === null) this.markBad(at);
    else this.expect(...rule);
  }

  private expect(needed: number, lower: number, upper: number): void {
    this.needed = needed;
    this.lower = lower;
    this.upper = upper;
  }

  /** A whole character: counted into lines and kept in the line's tail. */
  private endSequence(): void {
    const first = this.sequence[0]!;
    if (first === LF || first === CR) {
      if (!(first === LF && this.afterCr)) this.line++;
      this.afterCr = first === CR;
      this.lineTail = [];
      this.cutBefore = false;
      return;
    }
    this.afterCr = false;
    this.lineTail.push(...this.sequence);
    this.trimTail();
  }

  private markBad(byte: number): void {
    let before = this.lineTail.slice(-EXCERPT_BYTES);
    const cutBefore = this.cutBefore || before.length < this.lineTail.length;
    // Start the excerpt on a character's first byte.
    while (before.length > 0 && (before[0]! & 0xc0) === 0x80) before = before.slice(1);
    this.found = { byte, line: this.line, bytes: this.sequence.slice(0, 4), before, after: [], cutBefore, lineEnded: false };
  }

  /** A byte after the bad sequence, for the excerpt; true once the excerpt is complete. */
  private takeAfter(byte: number): boolean {
    const found = this.found!;
    if (found.lineEnded) return true;
    if (byte === LF || byte === CR) {
      found.lineEnded = true;
      return true;
    }
    found.after.push(byte);
    return found.after.length >= EXCERPT_BYTES;
  }

  private place(): BadUtf8Place {
    const found = this.found!;
    const cutAfter = !found.lineEnded && found.after.length >= EXCERPT_BYTES;
    const excerpt = (found.cutBefore ? '…' : '') + showBytes([...found.before, ...found.bytes, ...found.after]) + (cutAfter ? '…' : '');
    return { byte: found.byte, line: found.line, bytes: found.bytes, excerpt };
  }
}

/** The first bad sequence in `bytes`, or null when they are all UTF-8. */
export function findBadUtf8(bytes: Uint8Array): BadUtf8Place | null {
  const locator = new Utf8Locator();
  return locator.push(bytes) ?? locator.finish();
}

/** The first bad sequence in a source read chunk by chunk (it stops reading there), or null. */
export async function locateBadUtf8(chunks: AsyncIterable<Uint8Array>): Promise<BadUtf8Place | null> {
  const locator = new Utf8Locator();
  for await (const chunk of chunks) {
    const place = locator.push(chunk);
    if (place !== null) return place;
  }
  return locator.finish();
}

/**
 * Bytes as text for a message: UTF-8 characters as themselves, anything else (bad bytes, control
 * characters) as \xHH, so the person sees exactly which bytes to fix.
 */
export function showBytes(bytes: readonly number[]): string {
  const decoder = new TextDecoder('utf-8', { fatal: true });
  let text = '';
  for (let i = 0; i < bytes.length; ) {
    const length = characterLength(bytes, i);
    if (length === 0) {
      text += hex(bytes[i]!);
      i++;
      continue;
    }
    const character = decoder.decode(Uint8Array.from(bytes.slice(i, i + length)));
    text += length === 1 && (bytes[i]! < 0x20 || bytes[i] === 0x7f) ? hex(bytes[i]!) : character;
    i += length;
  }
  return text;
}

/**
 * For a lead byte of 0x80 or more: the continuation bytes it needs, and the range the first of them
 * must fall in (the others: 0x80–0xBF); null for a byte no character starts with (WHATWG Encoding
 * Standard §4.1, UTF-8 decoder).
 */
function leadRule(lead: number): [needed: number, lower: number, upper: number] | null {
  if (lead >= 0xc2 && lead <= 0xdf) return [1, 0x80, 0xbf];
  if (lead === 0xe0) return [2, 0xa0, 0xbf];
  if (lead === 0xed) return [2, 0x80, 0x9f];
  if (lead >= 0xe1 && lead <= 0xef) return [2, 0x80, 0xbf];
  if (lead === 0xf0) return [3, 0x90, 0xbf];
  if (lead === 0xf4) return [3, 0x80, 0x8f];
  if (lead >= 0xf1 && lead <= 0xf3) return [3, 0x80, 0xbf];
  return null;
}

/** Length of the UTF-8 character starting at bytes[i], or 0 when none starts there. */
function characterLength(bytes: readonly number[], i: number): number {
  const lead = bytes[i]!;
  if (lead < 0x80) return 1;
  const rule = leadRule(lead);
  if (rule === null) return 0;
  const [needed, lower, upper] = rule;
  for (let k = 1; k <= needed; k++) {
    const next = bytes[i + k];
    const [low, high] = k === 1 ? [lower, upper] : [0x80, 0xbf];
    if (next === undefined || next < low || next > high) return 0;
  }
  return needed + 1;
}

function hex(byte: number): string {
  return `\\x${byte.toString(16).toUpperCase().padStart(2, '0')}`;
}

/** The error for a source that is not UTF-8, with the place of its first bad bytes. */
export function badUtf8Error(place: BadUtf8Place): LevelwiseError {
  const one = place.bytes.length === 1;
  const sequence = place.bytes.map(hex).join('');
  return new LevelwiseError(
    'bad-encoding',
    `The file is not valid UTF-8: ${one ? 'byte' : 'bytes'} ${sequence} (offset ${place.byte.toLocaleString('en-US')}) ${one ? 'is' : 'are'} not part of any UTF-8 character, in "${place.excerpt}".`,
    {
      hint: 'Open the file in the program that made it, or in a text editor, and save it again as UTF-8 CSV.',
      line: place.line,
    },
  );
}

/**
 * Whether `error` is the readers' 'bad-encoding' for a source read as UTF-8 (not one read as UTF-16,
 * whose bad bytes this module cannot point at). Every such message starts "The file is not valid
 * utf-8" (decode.ts, badUtf8Error).
 */
export function isNotUtf8Error(error: unknown): boolean {
  return isLevelwiseError(error, 'bad-encoding') && /^The file is not valid utf-8\b/i.test(error.message);
}

/**
 * A reader's 'bad-encoding' error said again with the place of the bad bytes, found in a second
 * pass over the source; any other error, or one whose place is not found (a UTF-16 file), as it is.
 */
export async function placeBadUtf8(error: unknown, source: () => AsyncIterable<Uint8Array>): Promise<unknown> {
  if (!isNotUtf8Error(error)) return error;
  const place = await locateBadUtf8(source());
  return place === null ? error : badUtf8Error(place);
}

/** placeBadUtf8 for a source held in memory. */
export function placeBadUtf8In(error: unknown, bytes: Uint8Array): unknown {
  if (!isNotUtf8Error(error)) return error;
  const place = findBadUtf8(bytes);
  return place === null ? error : badUtf8Error(place);
}
