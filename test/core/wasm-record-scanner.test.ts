/**
 * The record scanner in WebAssembly (src/core/record-scanner.wat, driven by
 * wasm-record-scanner.ts) against the one in JavaScript (parse.ts scanPlainRecordsInJs): every
 * call the sink gets — records, their bounds, hashes and lines, empty lines, where a segment stops
 * — must be the same, however the text is cut into pieces. The other parse tests (papaparse,
 * csv-spectrum) run with the WebAssembly scanner, as the project does wherever it can.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterEach, describe, expect, it } from 'vitest';
import { hashBytes, plainFields, RecordParser, type Delimiter, type RecordSink } from '../../src/core/parse.ts';
import { encodeUtf8 } from '../../src/core/utf8-text.ts';
import { MAX_HELD_BYTES, wasmRecordScanner } from '../../src/core/wasm-record-scanner.ts';
import { useWebAssembly } from '../../src/core/webassembly.ts';

type Event = readonly (string | number | boolean)[];

interface Feed {
  /** Byte pieces pushed one after the other. */
  readonly pieces: readonly Uint8Array[];
  readonly delimiter?: Delimiter;
  /** RecordParser.stopAt, before the first push. */
  readonly stopAt?: number;
}

/** Every call the sink gets, in order; plain records with their bounds, hashes and lines. */
function eventsOf(feed: Feed, wasm: boolean): { events: Event[]; stoppedAt: number | null } {
  useWebAssembly(wasm);
  const events: Event[] = [];
  let wrongHashes = 0;
  const sink: RecordSink = {
    record: (fields, line, unclosed) => void events.push(['record', line, unclosed, ...fields]),
    emptyLine: (line) => void events.push(['empty', line]),
    plainRecords(block) {
      for (let r = 0; r < block.count; r++) {
        const first = r * (block.width + 1);
        const bounds = Array.from(block.bounds.subarray(first, first + block.width + 1));
        const hashes = Array.from(block.hashes.subarray(first, first + block.width));
        // The hash the dictionaries look a cell up by: FNV-1a of its bytes (parse.ts hashBytes).
        hashes.forEach((hash, f) => void (hash === hashBytes(block.bytes, bounds[f]!, bounds[f + 1]! - 1) || wrongHashes++));
        events.push(['plain', block.lines[r]!, block.width, ...plainFields(block, r), ...bounds, ...hashes]);
      }
      events.push(['block end']);
    },
  };
  const parser = new RecordParser(sink, { delimiter: feed.delimiter ?? null });
  if (feed.stopAt !== undefined) parser.stopAt(feed.stopAt);
  for (const piece of feed.pieces) parser.push(piece);
  parser.finish();
  expect(wrongHashes).toBe(0);
  return { events, stoppedAt: parser.stoppedAt };
}

function expectSameEvents(feed: Feed): Event[] {
  const js = eventsOf(feed, false);
  const wasm = eventsOf(feed, true);
  expect(wasm).toEqual(js);
  return wasm.events;
}

function cut(bytes: Uint8Array, size: number): Uint8Array[] {
  const pieces: Uint8Array[] = [];
  for (let at = 0; at < bytes.length; at += size) pieces.push(bytes.slice(at, at + size));
  return pieces;
}

afterEach(() => useWebAssembly(true));

describe('the WebAssembly record scanner', () => {
  it('is in use in this Node, so these tests compare two scanners and not one with itself', () => {
    expect(wasmRecordScanner()).not.toBeNull();
    useWebAssembly(false);
    expect(wasmRecordScanner()).toBeNull();
  });

  it('gives a small CRLF text the bounds and hashes worked out by hand', () => {
    // "ab,c\r\n,x\r\n": fields start at 0 and 3 (the bound after the last field is its end + 1, the
    // CR left out), then at 6 and 7. FNV-1a of the empty field is its offset basis 0x811c9dc5, cut
    // to 30 bits: 0x011c9dc5 (the FNV reference, draft-eastlake-fnv, offset basis for 32 bits).
    const events = expectSameEvents({ pieces: [encodeUtf8('ab,c\r\n,x\r\n')], delimiter: ',' });
    expect(events[0]?.slice(0, 9)).toEqual(['plain', 1, 2, 'ab', 'c', 0, 3, 5, hashBytes(encodeUtf8('ab'), 0, 2)]);
    expect(events[1]?.slice(0, 8)).toEqual(['plain', 2, 2, '', 'x', 6, 7, 9]);
    expect(events[1]?.[8]).toBe(0x011c9dc5);
  });

  it('matches on random text: quotes, empty lines, widths that change, CR and LF, any cut', () => {
    const cell = fc.string({ unit: fc.constantFrom('a', 'Z', '7', ' ', '"', ',', ';', '\r', '\n', 'é', '😀', 'longer text'), maxLength: 5 });
    const text = fc.array(fc.array(cell, { minLength: 0, maxLength: 6 }), { minLength: 1, maxLength: 20 }).chain((rows) =>
      fc.record({
        rows: fc.constant(rows),
        lineBreak: fc.constantFrom('\n', '\r\n', '\r'),
        delimiter: fc.constantFrom<Delimiter>(',', ';'),
        pieceSize: fc.integer({ min: 1, max: 64 }),
        stopAt: fc.option(fc.integer({ min: 0, max: 200 }), { nil: undefined }),
      }),
    );
    fc.assert(
      fc.property(text, ({ rows, lineBreak, delimiter, pieceSize, stopAt }) => {
        const bytes = encodeUtf8(rows.map((row) => row.join(delimiter)).join(lineBreak));
        expectSameEvents({ pieces: [bytes], delimiter, stopAt });
        expectSameEvents({ pieces: cut(bytes, pieceSize), delimiter, stopAt });
      }),
      { numRuns: 400 },
    );
  });

  it('matches on published data: vega-datasets cars.json written as CSV, and seattle-weather.csv', () => {
    // vega-datasets 3.2.1 (npm): cars.json has 406 cars; seattle-weather.csv 1,461 days (2012–2015).
    const data = join(import.meta.dirname, '../../node_modules/vega-datasets/data');
    const cars = JSON.parse(readFileSync(join(data, 'cars.json'), 'utf8')) as Record<string, unknown>[];
    const names = Object.keys(cars[0]!);
    const carsCsv = [names.join(','), ...cars.map((car) => names.map((name) => String(car[name] ?? '')).join(','))].join('\r\n');
    const carRecords = expectSameEvents({ pieces: cut(encodeUtf8(carsCsv), 4096) }).filter((e) => e[0] === 'plain');
    expect(carRecords).toHaveLength(407);
    const weather = new Uint8Array(readFileSync(join(data, 'seattle-weather.csv')));
    const weatherRecords = expectSameEvents({ pieces: cut(weather, 1000) }).filter((e) => e[0] === 'plain');
    expect(weatherRecords).toHaveLength(1462);
  });

  it('hands a block on when it is full, and takes a record wider than its room from JavaScript', () => {
    // 200,000 one-field records fill the block (2^18 bounds) once; one record of 70,000 fields is
    // more than the scanner's room for a record (2^16 bounds beyond a block).
    const many = encodeUtf8(Array.from({ length: 200_000 }, (_, i) => `v${i % 977}`).join('\n'));
    const blocks = expectSameEvents({ pieces: [many] }).filter((e) => e[0] === 'block end');
    expect(blocks.length).toBeGreaterThan(1);
    const wide = Array.from({ length: 70_000 }, (_, i) => `c${i}`).join(',');
    const events = expectSameEvents({ pieces: [encodeUtf8(`a,b\n${wide}\nx,y\n`)], delimiter: ',' });
    expect(events.filter((e) => e[0] === 'plain').map((e) => e[2])).toEqual([2, 70_000, 2]);
  });

  it('reads a piece larger than its memory held, and a buffer its caller fills anew for each push', () => {
    const big = encodeUtf8(Array.from({ length: 300_000 }, (_, i) => `${i},row ${i},${i % 7}`).join('\n') + '\n');
    expect(big.length).toBeGreaterThan(4 << 20);
    expectSameEvents({ pieces: [big] });
    // Past 64 MB in one piece, JavaScript scans it: the scanner's memory does not grow to that.
    const scanner = wasmRecordScanner()!;
    expect(scanner.hold(new Uint8Array(MAX_HELD_BYTES + 1), 0)).toBe(false);
    expect(scanner.hold(big, 0)).toBe(true);
    scanner.release(big);
    // One buffer, reused: each push must be read from the bytes it holds then, not a copy of before.
    const first = encodeUtf8('id,name\n' + 'x'.repeat(70_000) + ',1\n');
    const second = encodeUtf8('y'.repeat(70_000) + ',2\n');
    const reused = new Uint8Array(first.length);
    const events: string[][] = [];
    const parser = new RecordParser({ record: () => {}, emptyLine: () => {}, plainRecords: (b) => void events.push(...Array.from({ length: b.count }, (_, r) => plainFields(b, r))) });
    reused.set(first);
    parser.push(reused);
    reused.fill(0x20);
    reused.set(second);
    parser.push(reused.subarray(0, second.length));
    parser.finish();
    expect(events.map((fields) => fields[1])).toEqual(['name', '1', '2']);
  });

  it('gives way to JavaScript when a sink starts another scan while it is busy', () => {
    // The nested push is past the parser's first 64 kB, so it is scanned at once, inside the sink.
    const nestedText = encodeUtf8('p,q\n' + 'k,v\n'.repeat(20_000));
    const outer: string[][] = [];
    let nestedRecords = 0;
    const nestedSink: RecordSink = { record: () => {}, emptyLine: () => {}, plainRecords: (b) => void (nestedRecords += b.count) };
    const parser = new RecordParser({
      record: () => {},
      emptyLine: () => {},
      plainRecords(b) {
        for (let r = 0; r < b.count; r++) outer.push(plainFields(b, r));
        const nested = new RecordParser(nestedSink);
        nested.push(nestedText);
        expect(nestedRecords).toBeGreaterThan(0);
        nested.finish();
      },
    });
    parser.push(encodeUtf8('a,b\n1,2\n3,4\n'));
    parser.finish();
    expect(outer).toEqual([['a', 'b'], ['1', '2'], ['3', '4']]);
    expect(nestedRecords).toBe(20_001);
  });
});
