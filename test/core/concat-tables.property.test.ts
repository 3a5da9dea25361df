/**
 * Reading a file in segments and joining them (read-in-segments.ts: the first reader with stopAt,
 * segment readers, their placement, concatTables) gives what reading it whole gives: every cell,
 * line, row issue and the profile, and the same storage per column. On random CSV text: number
 * spellings, repeated categories, missing spellings, quoted fields with delimiters, doubled quotes
 * and line breaks inside, empty lines, CRLF, rows with too few or too many fields, a quote left
 * open at the end (quoting as in RFC 4180, malformed cases as parse.ts reads them).
 *
 * The first reader takes its header and at least its first parse's worth of bytes (64 KiB, see
 * parse.ts) before it can stop, so each file is about that long: rows A, repeated to fill, then
 * rows B, in which the first reader stops. Small segments and a dictionary cap of 4 or 16 cut
 * rows B inside quoted fields (segments read again or left out) and give every pair of storages.
 */
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { cellText, tableBuffers, type Column, type Table, type TextColumn } from '../../src/core/columns.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readInSegments } from '../../src/core/read-in-segments.ts';
import { readTable } from '../../src/core/read-table.ts';

const FIRST_PARSE_BYTES = 64 * 1024;

const NUMBERS = ['1', '2', '-3', '0', '1.5', '1.50', '134.00', '007', '1e3', '-0', '0.00', '2.25', '12345678901234567'];
const MISSING = ['', 'n/a', 'NA', ' '];
const CATEGORIES = ['red', 'blue', 'green', 'Grüße', 'x y'];
const QUOTED = ['"a,b"', '"two\nlines"', '"cr\r\nlf"', '"say ""hi"""', '"12"', '"3.50"', '""', '"\n"'];

/** A quoted field spanning several lines, longer than many segments: segments begin inside it. */
const longQuoted = fc.integer({ min: 2, max: 12 }).map((lines) => `"${Array.from({ length: lines }, (_, i) => `line ${i}, part`).join('\n')}"`);

type Flavour = 'numbers' | 'categories' | 'mixed';

function cellOf(flavour: Flavour): fc.Arbitrary<string> {
  const many = fc.oneof(fc.integer({ min: -999, max: 99_999 }).map(String), fc.integer({ min: -9999, max: 9999 }).map((n) => (n / 100).toFixed(2)));
  const weights: Record<Flavour, [number, number, number, number, number, number]> = {
    // many numbers, few numbers, missing, categories, quoted, long quoted
    numbers: [10, 3, 1, 0, 1, 0],
    categories: [0, 1, 1, 10, 1, 1],
    mixed: [3, 3, 2, 3, 2, 1],
  };
  const [w0, w1, w2, w3, w4, w5] = weights[flavour];
  return fc.oneof(
    { weight: w0, arbitrary: many },
    { weight: w1, arbitrary: fc.constantFrom(...NUMBERS) },
    { weight: w2, arbitrary: fc.constantFrom(...MISSING) },
    { weight: w3, arbitrary: fc.constantFrom(...CATEGORIES) },
    { weight: w4, arbitrary: fc.constantFrom(...QUOTED) },
    { weight: w5, arbitrary: longQuoted },
  );
}

/** Three columns; now and then a row with fewer or more fields, an empty line, a CRLF. */
function rowsOf(flavours: readonly Flavour[]): fc.Arbitrary<string> {
  const row = fc
    .tuple(
      fc.tuple(...flavours.map(cellOf)),
      fc.oneof({ weight: 12, arbitrary: fc.constant(3) }, { weight: 1, arbitrary: fc.constantFrom(1, 2, 4, 5) }),
      fc.oneof({ weight: 6, arbitrary: fc.constant('\n') }, { weight: 2, arbitrary: fc.constant('\r\n') }, { weight: 1, arbitrary: fc.constant('\n\n') }),
    )
    .map(([cells, width, end]) => [...cells, 'extra', 'more'].slice(0, width).join(',') + end);
  return fc.array(row, { maxLength: 150 }).map((rows) => rows.join(''));
}

const flavours = fc.tuple(...[0, 1, 2].map(() => fc.constantFrom<Flavour>('numbers', 'categories', 'mixed')));

/**
 * header, rows A repeated until the first parse's end falls `into` (a share) of the way through
 * rows B, rows B, and maybe a last record without its line break or with a quote never closed.
 */
const csvText = fc
  .record({
    rowsA: flavours.chain(rowsOf),
    rowsB: flavours.chain(rowsOf),
    into: fc.double({ min: 0, max: 0.6, noNaN: true }),
    tail: fc.constantFrom('', '', '7,red,1.50', '"never closed,\n8,blue\n'),
  })
  .map(({ rowsA, rowsB, into, tail }) => {
    const header = 'a,b,c\n';
    const filler = rowsA === '' ? '1,red,2.5\n' : rowsA;
    const target = FIRST_PARSE_BYTES - Math.floor(into * rowsB.length);
    let text = header + rowsA;
    while (text.length + filler.length <= target) text += filler;
    return text + rowsB + tail;
  });

/** A column's storage, capacity left out. */
function storageOf(column: Column): unknown {
  if (column.kind === 'text') {
    // The width of a code too: as narrow as the values allow, however the column was made.
    return { kind: 'text', values: column.values, counts: column.counts, codes: Array.from(column.codes.subarray(0, column.length)), bytesPerCode: column.codes.BYTES_PER_ELEMENT };
  }
  return {
    kind: 'number',
    values: Array.from(column.values.subarray(0, column.length)),
    exceptions: [...column.exceptions].sort((a, b) => a[0] - b[0]),
    fixedDigits: column.fixedDigits === null ? null : Array.from(column.fixedDigits.subarray(0, column.length)),
  };
}

/** In place, by a seeded linear congruential generator (the same order for the same seed). */
function shuffle<T>(items: T[], seed: number): void {
  let state = seed >>> 0;
  for (let i = items.length - 1; i > 0; i--) {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    const j = state % (i + 1);
    [items[i], items[j]] = [items[j]!, items[i]!];
  }
}

function cellsOf(table: Table): string[][] {
  return table.columns.map((column) => Array.from({ length: table.rowCount }, (_, row) => cellText(column, row)));
}

/** What the runs met: segments read again or left out, and neighbouring parts' storages → the joined one. */
const met = { redone: 0, skipped: 0, pairs: new Map<string, number>() };

function notePairs(parts: readonly Table[], joined: Table): void {
  joined.columns.forEach((column, c) => {
    for (let k = 1; k < parts.length; k++) {
      const pair = `${parts[k - 1]!.columns[c]!.kind} + ${parts[k]!.columns[c]!.kind} → ${column.kind}`;
      met.pairs.set(pair, (met.pairs.get(pair) ?? 0) + 1);
    }
  });
}

/**
 * Invented texts that between them meet every pair of storages the afterAll check asks for (with
 * a cap of 4 and 300-byte segments), so that check does not rest on chance: 150 random texts once
 * met no "number + number → number". Past the first parse, rows B: column a many distinct numbers
 * then a few, column c three numbers then three others (text parts joined into numbers).
 */
function exampleText(rowA: (i: number) => string, rowB: (k: number) => string): string {
  let text = 'a,b,c\n';
  for (let i = 0; text.length < FIRST_PARSE_BYTES + 200; i++) text += `${rowA(i)}\n`;
  for (let k = 0; k < 40; k++) text += `${rowB(k)}\n`;
  return text;
}
const PAIR_EXAMPLES: [string, number, number, 'whole-file' | 'own-share'][] = [
  [exampleText((i) => `${i},red,${i % 3}`, (k) => `${k},blue,${5 + (k % 3)}`), 300, 4, 'own-share'],
  [exampleText((i) => `${i % 3},${['red', 'blue'][i % 2]},${i}`, (k) => `${k % 2},${50_000 + k},${k % 3}`), 300, 4, 'whole-file'],
];

describe('reading in segments and joining them gives the whole read', () => {
  it('for random CSV text, segment sizes and a small dictionary cap', async () => {
    await fc.assert(
      // Both ways of sizing the first reader's storage (ParallelRead.firstReserve), whatever this engine would choose.
      fc.asyncProperty(csvText, fc.integer({ min: 24, max: 400 }), fc.constantFrom(4, 16), fc.constantFrom('whole-file' as const, 'own-share' as const), async (text, segmentBytes, cap, reserve) => {
        const bytes = new TextEncoder().encode(text);
        const whole = readTable(bytes, { dictionaryCap: cap });
        const parts: Table[] = [];
        const joined = await readInSegments(bytes, segmentBytes, { dictionaryCap: cap, reserve, onPart: (part) => parts.push(part) });

        expect(cellsOf(joined.table)).toEqual(cellsOf(whole.table));
        expect(Array.from(joined.table.lineOfRow)).toEqual(Array.from(whole.table.lineOfRow));
        expect(joined.table.rowIssues).toEqual(whole.table.rowIssues);
        expect(joined.table.headerIssues).toEqual(whole.table.headerIssues);
        expect(profileTable(joined.table)).toEqual(profileTable(whole.table));
        expect(joined.table.columns.map(storageOf)).toEqual(whole.table.columns.map(storageOf));
        expect({ rows: joined.totalRows, empty: joined.emptyLinesSkipped, lineBreaks: joined.lineBreaks, delimiter: joined.delimiter }).toEqual({
          rows: whole.totalRows,
          empty: whole.emptyLinesSkipped,
          lineBreaks: whole.lineBreaks,
          delimiter: whole.delimiter,
        });

        // Once joined, the parts have given up their storage (concatTables releaseParts): every buffer
        // of the later parts, and those of the first part that the joined table does not keep.
        const kept = new Set(tableBuffers(joined.table));
        for (const part of parts) {
          const given = tableBuffers(part).filter((buffer) => !kept.has(buffer));
          expect(given.map((buffer) => buffer.byteLength)).toEqual(given.map(() => 0));
        }
        if (parts.length > 1) for (const part of parts.slice(1)) expect(tableBuffers(part).some((buffer) => kept.has(buffer))).toBe(false);

        met.redone += joined.segments.redone;
        met.skipped += joined.segments.skipped;
        notePairs(parts, joined.table);
      }),
      { numRuns: 150, examples: PAIR_EXAMPLES },
    );
  });

  it('with cells joined only when read (as a table to profile is read), the parts given up as their cells are', async () => {
    // The profile, made before any cell is read, then the cells and their storage: the whole read's.
    await fc.assert(
      fc.asyncProperty(csvText, fc.integer({ min: 24, max: 400 }), fc.constantFrom(4, 16), fc.constantFrom('whole-file' as const, 'own-share' as const), async (text, segmentBytes, cap, reserve) => {
        const bytes = new TextEncoder().encode(text);
        const whole = readTable(bytes, { dictionaryCap: cap });
        const parts: Table[] = [];
        const later = await readInSegments(bytes, segmentBytes, { dictionaryCap: cap, cellsWhenRead: true, reserve, onPart: (part) => parts.push(part) });
        expect(profileTable(later.table)).toEqual(profileTable(whole.table));
        expect(later.table.columns.map(storageOf)).toEqual(whole.table.columns.map(storageOf));
        expect(cellsOf(later.table)).toEqual(cellsOf(whole.table));
        // Every cell read, every column joined: the parts' storage is given up but for what the table keeps.
        const kept = new Set(tableBuffers(later.table));
        for (const part of parts) {
          const given = tableBuffers(part).filter((buffer) => !kept.has(buffer));
          expect(given.map((buffer) => buffer.byteLength)).toEqual(given.map(() => 0));
        }
      }),
      { numRuns: 60 },
    );
  });

  it('with cells joined only when read, a column\'s parts are kept until its own cells are read', async () => {
    // 12,000 invented rows (~100 kB; the first reader reads 64 kB before it may stop), cut in 20 kB
    // segments: colour and size are dictionaries in every part.
    const rows = Array.from({ length: 12_000 }, (_, i) => `${['red', 'blue', 'green'][i % 3]},${['S', 'M', 'L', 'XL'][i % 4]}`);
    const bytes = new TextEncoder().encode(`colour,size\n${rows.join('\n')}\n`);
    const parts: Table[] = [];
    const later = await readInSegments(bytes, 20_000, { cellsWhenRead: true, reserve: 'own-share', onPart: (part) => parts.push(part) });
    expect(parts.length).toBeGreaterThan(2);
    const codesOf = (table: Table, c: number): ArrayBufferLike => (table.columns[c] as TextColumn).codes.buffer;
    const partCodes = (c: number): ArrayBufferLike[] => parts.slice(1).map((part) => codesOf(part, c));
    // Nothing read yet: every part's codes are whole.
    expect(partCodes(0).every((buffer) => buffer.byteLength > 0)).toBe(true);
    expect(cellsOf({ ...later.table, columns: [later.table.columns[0]!], names: ['colour'] })[0]!.slice(0, 4)).toEqual(['red', 'blue', 'green', 'red']);
    // colour's cells read: its parts' codes given up; size's still held, and read as the whole file's.
    expect(partCodes(0).map((buffer) => buffer.byteLength)).toEqual(partCodes(0).map(() => 0));
    expect(partCodes(1).every((buffer) => buffer.byteLength > 0)).toBe(true);
    expect(cellsOf(later.table)[1]).toEqual(rows.map((row) => row.split(',')[1]));
  });

  it('for an export that quotes every field (read a record after another as quoted records), cut anywhere', async () => {
    // 3,000 invented rows, ~150 kB: past the 64 kB the first reader reads whole before it may stop.
    const rows = Array.from({ length: 3000 }, (_, i) => `"HH-${String(i).padStart(5, '0')}","${['red, light', 'blue', 'say ""hi""'][i % 3]}","${(i % 97) / 4}"`);
    const bytes = new TextEncoder().encode(`"id","colour","size"\r\n${rows.join('\r\n')}\r\n`);
    const whole = readTable(bytes);
    const rowOf = (table: Table, row: number) => cellsOf(table).map((column) => column[row]);
    expect(rowOf(whole.table, 0)).toEqual(['HH-00000', 'red, light', '0']);
    expect(rowOf(whole.table, 2)).toEqual(['HH-00002', 'say "hi"', '0.5']);
    for (const segmentBytes of [9_000, 20_000, 70_000]) {
      const joined = await readInSegments(bytes, segmentBytes);
      expect(joined.table.rowCount).toBe(3000);
      expect(cellsOf(joined.table)).toEqual(cellsOf(whole.table));
      expect(Array.from(joined.table.lineOfRow)).toEqual(Array.from(whole.table.lineOfRow));
    }
  });

  it('when the first reader hands the rest of its segment over to idle runners, cut anywhere, quoted line breaks included', async () => {
    // 12,000 invented rows, ~450 kB (the first reader reads 64 kB before it may stop), a quoted note
    // with a line break in every 7th: a cut inside one makes a segment that must be read again.
    let handedOver = 0;
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 2 ** 31 }), fc.constantFrom(2_000, 5_000, 20_000), fc.constantFrom(1_000, 3_000, 9_000), async (seed, fromBytes, pushBytes) => {
        const rows = Array.from({ length: 12_000 }, (_, i) => {
          const note = i % 7 === 0 ? `"line one\nline ""two"", ${(seed + i) % 13}"` : `note ${(seed * i) % 41}`;
          return `R-${i},${['red', 'blue', 'NA', ' Red'][(seed + i) % 4]},${note},${((seed + i) % 1000) / 8}`;
        });
        const bytes = new TextEncoder().encode(`id,colour,note,amount\n${rows.join('\n')}\n`);
        const whole = readTable(bytes);
        // Half the file each at first; the runner is done long before this thread, which hands over.
        const joined = await readInSegments(bytes, Math.ceil(bytes.length / 2), { handOver: { fromBytes, pushBytes } });
        expect(cellsOf(joined.table)).toEqual(cellsOf(whole.table));
        expect(Array.from(joined.table.lineOfRow)).toEqual(Array.from(whole.table.lineOfRow));
        expect(joined.table.columns.map(storageOf)).toEqual(whole.table.columns.map(storageOf));
        expect(profileTable(joined.table)).toEqual(profileTable(whole.table));
        expect({ rows: joined.totalRows, lineBreaks: joined.lineBreaks }).toEqual({ rows: whole.totalRows, lineBreaks: whole.lineBreaks });
        handedOver += joined.segments.taken - 2;
        met.redone += joined.segments.redone;
      }),
      { numRuns: 30 },
    );
    // The check proves little unless segments were handed over, several times in a run.
    expect(handedOver).toBeGreaterThan(60);
  });

  it('for an identifier kept as bytes in every segment (packValues), sorted or not, with values repeated across segments', async () => {
    // 6,000 invented rows, ~90 kB: identifiers in order, shuffled, in two sorted runs, or one repeated far apart.
    const orders = ['sorted', 'shuffled', 'two runs', 'repeated'] as const;
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...orders), fc.integer({ min: 0, max: 2 ** 31 }), fc.constantFrom(2_500, 9_000, 20_000, 70_000), fc.constantFrom('whole-file' as const, 'own-share' as const), async (order, seed, segmentBytes, reserve) => {
        const ids = Array.from({ length: 6000 }, (_, i) => `HH-${String(i).padStart(6, '0')}`);
        if (order === 'shuffled') shuffle(ids, seed);
        if (order === 'two runs') ids.push(...ids.splice(0, 3000 + (seed % 1000)));
        if (order === 'repeated') ids[5000 + (seed % 1000)] = ids[seed % 1000]!;
        const text = `id,colour\n${ids.map((id, i) => `${id},${['red', 'blue', 'NA'][i % 3]}`).join('\n')}\n`;
        const bytes = new TextEncoder().encode(text);
        const whole = readTable(bytes);
        const joined = await readInSegments(bytes, segmentBytes, { packValues: true, reserve });
        expect(cellsOf(joined.table)).toEqual(cellsOf(whole.table));
        expect(joined.table.columns.map(storageOf)).toEqual(whole.table.columns.map(storageOf));
        expect(profileTable(joined.table)).toEqual(profileTable(whole.table));
        const later = await readInSegments(bytes, segmentBytes, { packValues: true, cellsWhenRead: true });
        expect(profileTable(later.table)).toEqual(profileTable(whole.table));
        expect(later.table.columns.map(storageOf)).toEqual(whole.table.columns.map(storageOf));
        const id = joined.table.columns[0]!;
        // Sorted identifiers join as bytes, without a lookup; any other order falls back to strings.
        expect(id.kind === 'text' && id.packed?.ascending === true).toBe(order === 'sorted');
      }),
      { numRuns: 40 },
    );
  });

  afterAll(() => {
    // The runs must have met what the join has to get right, or the check above proves little.
    expect(met.redone).toBeGreaterThan(0);
    expect(met.skipped).toBeGreaterThan(0);
    expect([...met.pairs.keys()]).toEqual(
      expect.arrayContaining(['text + text → text', 'text + text → number', 'number + number → number', 'number + text → number', 'text + number → text']),
    );
  });
});
