/**
 * A file's fingerprint: its name, its size and a hash of its first and last 64 KB. Cheap to take
 * on a file of any size (two small reads), and it changes when the file is re-exported with other
 * rows. It keys the decisions saved in the page (src/ui/state/persist.ts); it is not a security
 * measure, and two different files agreeing on all three is possible though unlikely.
 */

export const FINGERPRINT_EDGE_BYTES = 64 * 1024;

/** cyrb53 (a public-domain 53-bit string/byte hash by bryc): two 32-bit lanes mixed with Math.imul. */
export function hash53(bytes: Uint8Array, seed = 0): number {
  let h1 = 0xdeadbeef ^ seed;
  let h2 = 0x41c6ce57 ^ seed;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i] ?? 0;
    h1 = Math.imul(h1 ^ b, 2654435761);
    h2 = Math.imul(h2 ^ b, 1597334677);
  }
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507) ^ Math.imul(h2 ^ (h2 >>> 13), 3266489909);
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  return 4294967296 * (2097151 & h2) + (h1 >>> 0);
}

/** The fingerprint from its parts; `head` and `tail` are the first and last 64 KB (the same bytes for a small file). */
export function fingerprintOf(name: string, size: number, head: Uint8Array, tail: Uint8Array): string {
  const edges = hash53(tail, hash53(head) % 0x7fffffff);
  return `${size}-${edges.toString(36)}-${encodeURIComponent(name)}`;
}

/** Reads only the two edges of the file. */
export async function fingerprintFile(file: Blob, name: string): Promise<string> {
  const head = new Uint8Array(await file.slice(0, FINGERPRINT_EDGE_BYTES).arrayBuffer());
  const tailStart = Math.max(0, file.size - FINGERPRINT_EDGE_BYTES);
  const tail = tailStart === 0 ? head : new Uint8Array(await file.slice(tailStart).arrayBuffer());
  return fingerprintOf(name, file.size, head, tail);
}
