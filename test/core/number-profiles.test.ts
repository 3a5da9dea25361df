/**
 * Number columns profiled on other threads from a table's parts (core number-profiles.ts), as the
 * command line's reading threads and the page's segment workers do it: whichever thread takes which
 * column, before or after the parts are joined, the profiles are profileTable's of the whole table.
 */
import { describe, expect, it } from 'vitest';
import { tableBuffers, type Table } from '../../src/core/columns.ts';
import { concatTables } from '../../src/core/concat-tables.ts';
import { COLUMNS_IN_HAND, NumberProfiles, profileNumberParts, requestBuffers, type NumberPartsProfiler, type NumberPartsRequest } from '../../src/core/number-profiles.ts';
import { DEFAULT_PROFILE_OPTIONS, profileTable, profileTableSharing, type ColumnProfile, type ProfileOptions } from '../../src/core/profile.ts';
import { rebaseRows } from '../../src/core/read-segment.ts';
import { readTable } from '../../src/core/read-table.ts';

const HEADER = 'a,b,c,colour';
/** Each part past the dictionary's 4,096 values, so that a, b and c are kept as numbers in both, as in the whole. */
const FIRST_ROWS = 7000;
const ROWS = 12_000;
/** "-999" read as missing too: a missing spelling that is a number, counted by text. */
const OPTIONS: ProfileOptions = { missingTokens: [...DEFAULT_PROFILE_OPTIONS.missingTokens, '-999'] };

/** Invented row i: b has missing and invalid cells, c fixed decimals and a coded missing number. */
function line(i: number): string {
  const b = i % 50 === 0 ? 'NA' : i % 61 === 0 ? 'no reading' : String(i / 4);
  const c = i % 9 === 0 ? `${i}.50` : i % 77 === 0 ? '-999' : String(i * 13);
  return `${i * 7},${b},${c},${['red', 'blue'][i % 2]}`;
}

const csv = (from: number, to: number): Uint8Array =>
  new TextEncoder().encode(`${HEADER}\n${Array.from({ length: to - from }, (_, k) => line(from + k)).join('\n')}\n`);

/** The table read whole, and read as two parts numbered from the file's start, as segments arrive. */
function wholeAndParts(): { whole: Table; parts: Table[] } {
  const whole = readTable(csv(0, ROWS)).table;
  const first = readTable(csv(0, FIRST_ROWS)).table;
  // Read alone, the second part's first row is on line 2; in the file it is on line FIRST_ROWS + 2.
  const second = rebaseRows(readTable(csv(FIRST_ROWS, ROWS)).table, FIRST_ROWS, FIRST_ROWS);
  return { whole, parts: [first, second] };
}

/** The parts joined as the page joins them: into the first, the second's storage given up (detached). */
function joinAndGiveUp(parts: readonly Table[]): Table {
  const table = concatTables(parts, { reuseFirst: true });
  for (const part of parts.slice(1)) for (const buffer of tableBuffers(part)) structuredClone(buffer, { transfer: [buffer] });
  return table;
}

/** A profiler that answers only when told to (`answerNext`), so that the test sets the order of events. */
function heldProfiler(): { profiler: NumberPartsProfiler; requests: NumberPartsRequest[]; answerNext: () => void } {
  const requests: NumberPartsRequest[] = [];
  const held: (() => void)[] = [];
  const profiler: NumberPartsProfiler = (request) => {
    requests.push(request);
    return new Promise<ColumnProfile>((resolve) => held.push(() => resolve(profileNumberParts(request))));
  };
  return { profiler, requests, answerNext: () => held.shift()!() };
}

/** profileTableSharing through `shared.take`, noting the columns left to this thread; `asked` runs after each take. */
async function profileSharing(shared: NumberProfiles, table: Table, asked: (index: number) => void): Promise<{ profiles: ColumnProfile[]; leftHere: number[] }> {
  const leftHere: number[] = [];
  const profiles = await profileTableSharing(table, OPTIONS, (_, index) => {
    const taken = shared.take(index);
    if (taken === null) leftHere.push(index);
    asked(index);
    return taken;
  });
  return { profiles, leftHere };
}

/** Lets settled promises run their callbacks (a profiler come free starts the next column). */
const settle = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

describe('number columns profiled on other threads', () => {
  it('are what profileTable finds: the first from the parts, a later one from the joined table after the parts are given up (one column in hand)', async () => {
    const { whole, parts } = wholeAndParts();
    expect(parts.map((part) => part.columns.map((column) => column.kind))).toEqual([
      ['number', 'number', 'number', 'text'],
      ['number', 'number', 'number', 'text'],
    ]);
    const expected = profileTable(whole, OPTIONS);
    const one = heldProfiler();
    const two = heldProfiler();
    const shared = new NumberProfiles(parts, OPTIONS, [one.profiler, two.profiler], 1);
    // Both threads start at once, each on a column, with copies of both parts.
    expect([...one.requests, ...two.requests].map((r) => [r.index, r.rowCounts])).toEqual([
      [0, [FIRST_ROWS, ROWS - FIRST_ROWS]],
      [1, [FIRST_ROWS, ROWS - FIRST_ROWS]],
    ]);
    const table = joinAndGiveUp(parts);
    shared.joinedInto(table);
    one.answerNext();
    await settle();
    // The first thread, free again, takes column c: from the joined table, one part of every row.
    expect(one.requests.map((r) => [r.index, r.rowCounts])).toEqual([
      [0, [FIRST_ROWS, ROWS - FIRST_ROWS]],
      [2, [ROWS]],
    ]);
    two.answerNext();
    one.answerNext();
    const profiles = await profileTableSharing(table, OPTIONS, (_, index) => shared.take(index));
    expect(profiles).toEqual(expected);
    // Counted by hand, rows 0 to 11,999. b: "NA" on the 240 multiples of 50; "no reading" on the 197
    // multiples of 61 (0 to 11,956) but the 4 that are multiples of 50 too (of 3,050): 193.
    const b = profiles[1]!;
    expect(b.missingSpellings).toEqual([{ value: 'NA', count: 240 }]);
    expect(b.numeric?.invalidCount).toBe(193);
    // c: "-999" on the 156 multiples of 77 (0 to 11,935) but the 18 that are multiples of 9 too (of
    // 693: 0 to 11,781), whose cells are fixed decimals: 138.
    expect(profiles[2]!.missingSpellings).toEqual([{ value: '-999', count: 138 }]);
  });

  it('are handed out two to a thread at once, and a column no thread can take is left to this thread', async () => {
    expect(COLUMNS_IN_HAND).toBe(2);
    const { whole, parts } = wholeAndParts();
    const one = heldProfiler();
    const shared = new NumberProfiles(parts, OPTIONS, [one.profiler]);
    // The second is there for the thread when it finishes the first, whatever this thread is doing then.
    expect(one.requests.map((r) => r.index)).toEqual([0, 1]);
    const table = joinAndGiveUp(parts);
    shared.joinedInto(table);
    const { profiles, leftHere } = await profileSharing(shared, table, (index) => {
      // Still busy with columns a and b while this thread asks for c; it answers after.
      if (index === 2) {
        one.answerNext();
        one.answerNext();
      }
    });
    expect(one.requests.map((r) => r.index)).toEqual([0, 1]);
    expect(leftHere).toEqual([2]);
    expect(profiles).toEqual(profileTable(whole, OPTIONS));
  });

  it('a column its thread has not begun is taken back by this thread when the caller can claim it', async () => {
    const { whole, parts } = wholeAndParts();
    const one = heldProfiler();
    const claimed: number[] = [];
    // The thread has begun column a (the first it holds) and waits to begin b.
    const shared = new NumberProfiles(parts, OPTIONS, [one.profiler], COLUMNS_IN_HAND, (index) => (claimed.push(index), index !== 0));
    expect(one.requests.map((r) => r.index)).toEqual([0, 1]);
    const table = joinAndGiveUp(parts);
    shared.joinedInto(table);
    const { profiles, leftHere } = await profileSharing(shared, table, (index) => {
      if (index === 2) one.answerNext(); // a, answered once this thread has done its share
    });
    // a from the thread; b taken back; c never given (the thread had two in hand).
    expect(claimed).toEqual([0, 1]);
    expect(leftHere).toEqual([1, 2]);
    expect(profiles).toEqual(profileTable(whole, OPTIONS));
  });

  it('send copies of the rows: transferring a request\'s arrays away leaves the parts whole', () => {
    const { whole, parts } = wholeAndParts();
    const requests: NumberPartsRequest[] = [];
    new NumberProfiles(parts, OPTIONS, [(request) => (requests.push(request), new Promise<ColumnProfile>(() => undefined))]);
    const request = requests[0]!;
    const buffers = requestBuffers(request);
    // Values of both parts, and the fixed decimals of each part (column a has none: no such array).
    expect(buffers.length).toBe(2);
    const sent = structuredClone(request, { transfer: buffers });
    expect(request.parts[0]!.values.length).toBe(0); // detached here…
    expect(profileNumberParts(sent)).toEqual(profileTable(whole, OPTIONS)[0]); // …whole there
    expect(profileTable(concatTables(parts), OPTIONS)).toEqual(profileTable(whole, OPTIONS)); // and the parts untouched
  });

  it('a thread that profiles a request with releaseParts gives its copies back and answers the same profile', () => {
    const { whole, parts } = wholeAndParts();
    const requests: NumberPartsRequest[] = [];
    new NumberProfiles(parts, OPTIONS, [(request) => (requests.push(request), new Promise<ColumnProfile>(() => undefined))]);
    const sent = structuredClone(requests[0]!, { transfer: requestBuffers(requests[0]!) });
    const buffers = requestBuffers(sent);
    expect(buffers.every((buffer) => buffer.byteLength > 0)).toBe(true);
    expect(profileNumberParts(sent, true)).toEqual(profileTable(whole, OPTIONS)[0]);
    // Released (release-buffers.ts): detached, whether the memory went at once (ES2024 transfer) or goes at the next collection.
    expect(buffers.map((buffer) => buffer.byteLength)).toEqual(buffers.map(() => 0));
  });
});
