/**
 * Typed arrays an encoded batch is made of, kept from one batch to the next. A streamed apply
 * encodes a batch, writes it and forgets it; making its arrays anew for every batch (~6 MB per
 * 65,536 rows of the benchmark's recipe) was garbage for the collector and fresh pages for the
 * operating system to hand over and take back. Only for a caller that is done with a batch before
 * it encodes the next: the arrays handed out are those of the batch before, zeroed.
 */
export class BatchArrays {
  /** The buffer behind each slot (a plan column's role), grown as batches need. */
  private readonly buffers = new Map<string, ArrayBuffer>();

  int32(slot: string, length: number): Int32Array {
    return new Int32Array(this.zeroed(slot, length * 4), 0, length);
  }

  float64(slot: string, length: number): Float64Array {
    return new Float64Array(this.zeroed(slot, length * 8), 0, length);
  }

  uint8(slot: string, length: number): Uint8Array {
    return new Uint8Array(this.zeroed(slot, length), 0, length);
  }

  /** A buffer of at least `bytes` for `slot`, its first `bytes` zero. */
  private zeroed(slot: string, bytes: number): ArrayBuffer {
    const buffer = this.buffers.get(slot);
    if (buffer !== undefined && buffer.byteLength >= bytes) {
      new Uint8Array(buffer, 0, bytes).fill(0);
      return buffer;
    }
    const made = new ArrayBuffer(Math.max(bytes, 8));
    this.buffers.set(slot, made);
    return made;
  }
}
