/**
 * The page asks for the encoded CSV as Blobs made in the worker (`parts: 'blobs'`), so the file's
 * bytes never pass through its main thread; they must be exactly the bytes the byte parts carry.
 */
import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import { WorkbenchClient } from '../../src/worker/client.ts';
import { createInPagePort } from '../../src/worker/in-page-port.ts';

// Invented rows: an order number, a size and a weight with one gap.
const CSV = 'order,size,weight\nP-1,S,2.5\nP-2,L,\nP-3,S,4\nP-4,M,1.5\n';

describe('exporting as Blobs', () => {
  it('sends Blob parts only, and their bytes are those of the byte parts and of core encodeToCsv', async () => {
    const client = new WorkbenchClient(createInPagePort());
    const opened = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([CSV], 'orders.csv') }, draft: true });
    const decisions = [
      { type: 'set-level', column: 'order', level: 'identifier' },
      { type: 'set-level', column: 'size', level: 'nominal' },
      { type: 'set-level', column: 'weight', level: 'continuous' },
    ] as const satisfies readonly Parameters<typeof decide>[1][];
    const decided = decisions.reduce((r, d) => decide(r, d, opened.profiles), opened.draft!);
    const blobs: Blob[] = [];
    const bytes: Uint8Array[] = [];
    const asBlobs = await client.call('export', { slot: 'work', version: opened.version, recipe: decided, parts: 'blobs' }, { onBlob: (b) => blobs.push(b), onChunk: (b) => bytes.push(b) });
    expect(bytes).toHaveLength(0);
    expect(blobs.length).toBeGreaterThan(0);
    const fromBlobs = await new Blob(blobs).text();

    const byteParts: Uint8Array[] = [];
    await client.call('export', { slot: 'work', version: opened.version, recipe: decided }, { onChunk: (b) => byteParts.push(b) });
    expect(fromBlobs).toBe(new TextDecoder().decode(Buffer.concat(byteParts)));
    expect(fromBlobs).toBe(new TextDecoder().decode(encodeToCsv(decided, readTable(new TextEncoder().encode(CSV)).table).bytes));
    // Worked by hand: sizes by count, ties first seen first (S 2, L 1, M 1), one-hot; P-2's missing
    // weight filled with the mean (2.5 + 4 + 1.5) / 3 = 8/3 and flagged; CRLF line ends (RFC 4180 §2).
    expect(fromBlobs).toBe(
      'order,size=S,size=L,size=M,weight,weight (missing)\r\n' +
        'P-1,1,0,0,2.5,0\r\n' +
        'P-2,0,1,0,2.6666666666666665,1\r\n' +
        'P-3,1,0,0,4,0\r\n' +
        'P-4,0,0,1,1.5,0\r\n',
    );
    expect(asBlobs.rowsWritten).toBe(4);
    expect(asBlobs.bytes).toBe(new Blob(blobs).size);
  });

  it('gzip-compressed (RFC 1952), as Blobs or bytes, the parts unpack to the CSV the plain export writes', async () => {
    // The invented demo survey at 30,000 rows: ~8 MB of encoded CSV, several compressed parts' worth of writes.
    const client = new WorkbenchClient(createInPagePort());
    const opened = await client.call('open', { slot: 'work', source: { kind: 'demo', rows: 30_000 }, draft: true });
    const recipe = opened.draft!;
    const plain: Uint8Array[] = [];
    const summary = await client.call('export', { slot: 'work', version: opened.version, recipe }, { onChunk: (b) => plain.push(b) });
    const blobs: Blob[] = [];
    const packedBlobs = await client.call('export', { slot: 'work', version: opened.version, recipe, parts: 'blobs', compress: 'gzip' }, { onBlob: (b) => blobs.push(b) });
    const chunks: Uint8Array[] = [];
    const packedBytes = await client.call('export', { slot: 'work', version: opened.version, recipe, compress: 'gzip' }, { onChunk: (b) => chunks.push(b) });
    const csv = Buffer.concat(plain);
    expect(csv.length).toBeGreaterThan(5_000_000);
    const fromBlobs = Buffer.from(await new Blob(blobs).arrayBuffer());
    expect(gunzipSync(fromBlobs).equals(csv)).toBe(true);
    expect(gunzipSync(Buffer.concat(chunks)).equals(csv)).toBe(true);
    expect(summary.compressedBytes).toBeNull();
    expect(packedBlobs.bytes).toBe(csv.length);
    expect(packedBlobs.compressedBytes).toBe(fromBlobs.length);
    expect(packedBytes.compressedBytes).toBe(fromBlobs.length);
    // One-hot columns of 0s and 1s pack tightly.
    expect(fromBlobs.length).toBeLessThan(csv.length / 4);
    expect(packedBlobs.rowsWritten).toBe(summary.rowsWritten);
  });
});
