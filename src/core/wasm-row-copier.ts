/**
 * The CSV writer's row loop in WebAssembly (row-copier.wat): the same bytes as the loop in
 * csv-write.ts, copied 16 at a time. The writer's output buffer is then the start of the module's
 * memory; for each batch the rows' pieces, the rejected flags and the pieces' bounds and bytes are
 * copied in after it (a few megabytes a batch), and the rows copied out of them into the buffer.
 */
import { ROW_COPIER_WASM } from './row-copier-wasm.ts';
import { growMemory, instantiateModule } from './webassembly.ts';

/** Room a copy may run into past a piece's bytes and past the output (see row-copier.wat). */
const SLACK = 16;

interface CopierExports {
  readonly memory: WebAssembly.Memory;
  readonly outPos: WebAssembly.Global;
  copyRows(pieceOfAt: number, n: number, rejectedAt: number, row: number, rows: number, boundsAt: number, bytesAt: number, outAt: number, pos: number, limit: number): number;
}

/** The writer's pieces: piece p is bytes[bounds[2p], bounds[2p + 1]); `used` bytes and `count` pieces in all. */
export interface PieceTable {
  readonly bytes: Uint8Array;
  readonly bounds: Int32Array;
  readonly count: number;
  readonly used: number;
}

export class WasmRowCopier {
  private readonly exports: CopierExports;
  private readonly outBytes: number;
  private memory: ArrayBuffer;
  private bufferView: Uint8Array<ArrayBuffer>;

  constructor(exports: CopierExports, outBytes: number) {
    this.exports = exports;
    this.outBytes = outBytes;
    this.memory = exports.memory.buffer;
    this.bufferView = new Uint8Array(0);
    if (!this.reserve(outBytes + SLACK)) throw new RangeError(`no memory for a ${outBytes}-byte output buffer`);
  }

  /** The writer's output buffer: a view of the memory's start, made again when the memory grows. */
  get buffer(): Uint8Array<ArrayBuffer> {
    return this.bufferView;
  }

  /**
   * Copies the rows into the buffer from `pos` on as csv-write.ts writeRows does, calling
   * `flush(end)` whenever a row starts past `limit` (the buffer is then free again from 0);
   * returns where the output ends, or −1 having copied nothing when the memory cannot grow to
   * hold the batch (the writer's own loop then copies it).
   */
  copyRows(pieces: PieceTable, pieceOf: Int32Array, n: number, rejected: Uint8Array, rows: number, pos: number, limit: number, flush: (end: number) => void): number {
    const entries = rows * n;
    const pieceOfAt = aligned(this.outBytes + SLACK);
    const rejectedAt = aligned(pieceOfAt + 4 * entries);
    const boundsAt = aligned(rejectedAt + rows);
    const bytesAt = aligned(boundsAt + 8 * pieces.count);
    if (!this.reserve(bytesAt + pieces.used + SLACK)) return -1;
    const memory = this.memory;
    new Int32Array(memory, pieceOfAt, entries).set(pieceOf.subarray(0, entries));
    new Uint8Array(memory, rejectedAt, rows).set(rejected.subarray(0, rows));
    new Int32Array(memory, boundsAt, 2 * pieces.count).set(pieces.bounds.subarray(0, 2 * pieces.count));
    new Uint8Array(memory, bytesAt, pieces.used).set(pieces.bytes.subarray(0, pieces.used));
    const { exports } = this;
    for (let row = 0; ; ) {
      row = exports.copyRows(pieceOfAt, n, rejectedAt, row, rows, boundsAt, bytesAt, 0, pos, limit);
      pos = exports.outPos.value as number;
      if (row >= rows) return pos;
      flush(pos);
      pos = 0;
    }
  }

  /** Grows the memory to at least `bytes` (false when it cannot); the buffer's view is made again when it did. */
  private reserve(bytes: number): boolean {
    if (!growMemory(this.exports.memory, bytes)) return false;
    if (this.memory !== this.exports.memory.buffer || this.bufferView.length === 0) {
      this.memory = this.exports.memory.buffer;
      this.bufferView = new Uint8Array(this.memory, 0, this.outBytes);
    }
    return true;
  }
}

function aligned(at: number): number {
  return (at + 15) & ~15;
}

/** A copier whose buffer holds `outBytes`; null where the module cannot be had here (webassembly.ts). */
export function wasmRowCopier(outBytes: number): WasmRowCopier | null {
  const instance = instantiateModule(ROW_COPIER_WASM);
  if (instance === null) return null;
  try {
    return new WasmRowCopier(instance.exports as unknown as CopierExports, outBytes);
  } catch {
    return null;
  }
}
