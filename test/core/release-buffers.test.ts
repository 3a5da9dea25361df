import { describe, expect, it } from 'vitest';
import { releaseBuffer, releaseChunk, RELEASES_AT_ONCE } from '../../src/core/release-buffers.ts';

describe('releasing a buffer', () => {
  it('detaches it: every view of it reads as empty', () => {
    const bytes = new Uint8Array(1 << 20).fill(7);
    const words = new Uint32Array(bytes.buffer);
    releaseBuffer(bytes.buffer);
    expect([bytes.buffer.byteLength, bytes.length, words.length]).toEqual([0, 0, 0]);
  });

  it('leaves alone a buffer already released, or empty', () => {
    const bytes = new Uint8Array(16);
    releaseBuffer(bytes.buffer);
    expect(() => releaseBuffer(bytes.buffer)).not.toThrow();
    expect(() => releaseBuffer(new ArrayBuffer(0))).not.toThrow();
  });

  it('gives the memory back at once only where the engine has ArrayBuffer.prototype.transfer (ES2024)', () => {
    expect(RELEASES_AT_ONCE).toBe(typeof (ArrayBuffer.prototype as { transfer?: unknown }).transfer === 'function');
  });
});

describe('releasing a chunk', () => {
  it('releases a chunk that is the whole of its buffer (one a stream made)', () => {
    const chunk = new Uint8Array(64).fill(1);
    releaseChunk(chunk);
    expect(chunk.length).toBe(0);
  });

  it('leaves a view of part of a buffer alone: the rest of the buffer may be someone else\'s', () => {
    const whole = new Uint8Array(64).fill(1);
    const part = whole.subarray(8, 24);
    releaseChunk(part);
    expect([whole.length, part.length, whole[63]]).toEqual([64, 16, 1]);
  });
});
