/**
 * The plain-record scanner in WebAssembly (record-scanner.wat), for RecordParser.scanPlainRecords:
 * the same bounds and hashes as its JavaScript loop, the field ends found 16 bytes at a time. On
 * the benchmark's 1M-row file the scan took ~215 against ~350 ms (bench/README.md).
 *
 * One instance per thread, made when first asked for and kept: its memory holds the bounds, the
 * hashes and a copy of the input being scanned. Where there is none (webassembly.ts), the parser
 * scans in JavaScript; the results are the same either way.
 */
import { RECORD_SCANNER_WASM } from './record-scanner-wasm.ts';
import { growMemory, instantiateModule, webAssemblyEnabled } from './webassembly.ts';

/** Why `records` stopped (see record-scanner.wat). */
export const ScanStop = {
  /** The input, or the limit, reached. */
  end: 0,
  /** The record at `start` has a field that starts with a quote. */
  quoted: 1,
  /** The record at `start` does not end in the input, and more input may come. */
  incomplete: 2,
  /** An empty line at `start`; the next record starts at `next`. */
  emptyLine: 3,
  /** The record at `start` has another width than the block's; it was not added. */
  otherWidth: 4,
  /** The block reached the `full` entries asked for. */
  full: 5,
  /** The record at `start` has more fields than the room left; it was not added. */
  tooWide: 6,
} as const;
export type ScanStop = (typeof ScanStop)[keyof typeof ScanStop];

/** What a call of `records` did besides answering why it stopped. */
export interface Scanned {
  /** Where the next record starts (the one it stopped at, if any). */
  start: number;
  /** After an empty line: where the record after it starts. */
  next: number;
  /** The next free entry of the bounds. */
  entries: number;
  /** The records it added, the line breaks they ended with, and their width. */
  records: number;
  lines: number;
  width: number;
}

/** Bounds (and hashes) the scanner's memory has room for; a block is handed on well before. */
const ROOM_ENTRIES = (1 << 18) + (1 << 16);
const HASHES_AT = 4 * ROOM_ENTRIES;
const INPUT_AT = 8 * ROOM_ENTRIES;
/**
 * Input longer than this (pushed in one piece) is scanned in JavaScript: the scanner's memory keeps
 * the size of the largest input it held, and the readers push a megabyte or so at a time.
 */
export const MAX_HELD_BYTES = 64 << 20;
/** Bytes after the input that a 16-byte load may read. */
const SLACK = 16;

interface ScannerExports {
  readonly memory: WebAssembly.Memory;
  readonly base: WebAssembly.Global;
  readonly hashAt: WebAssembly.Global;
  readonly outB: WebAssembly.Global;
  readonly outStart: WebAssembly.Global;
  readonly outNext: WebAssembly.Global;
  readonly outRecords: WebAssembly.Global;
  readonly outLines: WebAssembly.Global;
  readonly outWidth: WebAssembly.Global;
  records(start: number, n: number, limit: number, final: number, b: number, width: number, room: number, full: number, delimiter: number, lineBreak: number, lf: number): ScanStop;
}

export class WasmRecordScanner {
  /** Entries of `bounds` and `hashes`. */
  readonly room = ROOM_ENTRIES;
  /** Views of the scanner's memory; made again when it grows. */
  bounds: Int32Array<ArrayBuffer>;
  hashes: Int32Array<ArrayBuffer>;
  /** A scan is using the scanner (a sink that starts another parser's scan gets JavaScript). */
  busy = false;
  /** What the last call of `records` did (one object, rewritten by each call). */
  readonly scanned: Scanned = { start: 0, next: 0, entries: 0, records: 0, lines: 0, width: 0 };
  private readonly exports: ScannerExports;
  private bytes: Uint8Array<ArrayBuffer>;
  /** The input whose bytes from `heldFrom` on are in memory, or null. */
  private held: Uint8Array | null = null;
  private heldFrom = 0;

  constructor(exports: ScannerExports) {
    this.exports = exports;
    exports.hashAt.value = HASHES_AT;
    // Room for the bounds, the hashes and a first megabyte of input (pages not yet touched cost nothing).
    if (!growMemory(exports.memory, INPUT_AT + (1 << 20))) throw new RangeError('no memory for the record scanner');
    const buffer = exports.memory.buffer;
    this.bytes = new Uint8Array(buffer);
    this.bounds = new Int32Array(buffer, 0, ROOM_ENTRIES);
    this.hashes = new Int32Array(buffer, HASHES_AT, ROOM_ENTRIES);
  }

  /**
   * Makes `input` from `from` on (at least) readable by the scanner: copies it unless it is there
   * already. False when that is over MAX_HELD_BYTES or memory cannot grow to hold it; the caller
   * then scans in JavaScript.
   */
  hold(input: Uint8Array, from: number): boolean {
    if (this.held === input && this.heldFrom <= from) return true;
    const length = input.length - from;
    if (length > MAX_HELD_BYTES) return false;
    const needed = INPUT_AT + length + SLACK;
    if (needed > this.bytes.length) {
      if (!growMemory(this.exports.memory, needed)) return false;
      this.makeViews();
    }
    this.bytes.set(input.subarray(from), INPUT_AT);
    // Byte p of the input is at INPUT_AT + p − from; the scanner adds positions to this base in
    // 32-bit arithmetic, so a base below 0 wraps round to the right addresses.
    this.exports.base.value = (INPUT_AT - from) | 0;
    this.held = input;
    this.heldFrom = from;
    return true;
  }

  /** Forgets the input held: its caller may change its bytes. */
  release(input: Uint8Array): void {
    if (this.held === input) this.held = null;
  }

  /**
   * Reads records of the held input from `start`, bounds from entry `b` on (see record-scanner.wat);
   * says why it stopped, and `scanned` what it did.
   */
  records(start: number, n: number, limit: number, final: boolean, b: number, width: number, full: number, delimiter: number, lineBreak: number, lf: boolean): ScanStop {
    const { exports } = this;
    const stop = exports.records(start, n, limit, final ? 1 : 0, b, width, this.room, full, delimiter, lineBreak, lf ? 1 : 0);
    const scanned = this.scanned;
    scanned.start = exports.outStart.value as number;
    scanned.next = exports.outNext.value as number;
    scanned.entries = exports.outB.value as number;
    scanned.records = exports.outRecords.value as number;
    scanned.lines = exports.outLines.value as number;
    scanned.width = exports.outWidth.value as number;
    return stop;
  }

  private makeViews(): void {
    const buffer = this.exports.memory.buffer;
    this.bytes = new Uint8Array(buffer);
    this.bounds = new Int32Array(buffer, 0, ROOM_ENTRIES);
    this.hashes = new Int32Array(buffer, HASHES_AT, ROOM_ENTRIES);
  }
}

let scanner: WasmRecordScanner | null | undefined;

/** This thread's scanner; null where the module cannot be had here, or while WebAssembly is switched off (webassembly.ts). */
export function wasmRecordScanner(): WasmRecordScanner | null {
  if (!webAssemblyEnabled()) return null;
  if (scanner === undefined) {
    const instance = instantiateModule(RECORD_SCANNER_WASM);
    try {
      scanner = instance === null ? null : new WasmRecordScanner(instance.exports as unknown as ScannerExports);
    } catch {
      scanner = null; // no memory for it: the JavaScript scanner reads
    }
  }
  return scanner;
}
