/**
 * Giving the memory of a big typed array back at once, when the code that made it knows it is done
 * with it. A buffer no longer referenced is freed only at the engine's next collection, and while
 * a big file is read the collector lets tens of megabytes of read chunks and joined parts wait for
 * it: in Chromium 150 the workbench's worker still held ~100 MB more than its table 1.5 s after a
 * million-row file was read.
 *
 * `ArrayBuffer.prototype.transfer(0)` (ES2024; Chromium 114, Firefox 122, Safari 17.4, Node 22)
 * detaches the buffer and frees its memory then and there. Without it (Node 20) the buffer is
 * detached by transferring it to a clone nothing holds; its memory goes at the next collection, as
 * it would have anyway, and nothing can read it meanwhile.
 *
 * Every view of a released buffer reads as empty afterwards: release only what no one else holds.
 */

/** ArrayBuffer with the ES2024 members, which the project's TypeScript library may lack. */
interface TransferableBuffer extends ArrayBuffer {
  readonly detached?: boolean;
  transfer?(newLength?: number): ArrayBuffer;
}

/** Whether this engine gives a released buffer's memory back at once (ES2024 transfer), not at the next collection. */
export const RELEASES_AT_ONCE = typeof (ArrayBuffer.prototype as TransferableBuffer).transfer === 'function';

export function releaseBuffer(buffer: ArrayBufferLike): void {
  // A SharedArrayBuffer is never ours alone; an empty or detached buffer holds nothing.
  if (!(buffer instanceof ArrayBuffer) || buffer.byteLength === 0) return;
  const own = buffer as TransferableBuffer;
  if (own.detached === true) return;
  if (typeof own.transfer === 'function') own.transfer(0);
  else structuredClone(buffer, { transfer: [buffer] });
}

/** Releases the buffer under `bytes` when `bytes` is the whole of it (a chunk a stream made for us), else nothing. */
export function releaseChunk(bytes: Uint8Array): void {
  if (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength) releaseBuffer(bytes.buffer);
}
