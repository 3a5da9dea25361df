/**
 * Long level lists travel from the worker to the page packed (src/worker/packed-levels.ts): the
 * page must get back exactly the levels core's profile made, in order, with their counts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { TextColumn } from '../../src/core/columns.ts';
import type { ColumnProfile, LevelCount } from '../../src/core/profile.ts';
import { DEFAULT_PROFILE_OPTIONS, levelSourceOf, profileColumn, profileTable, profileTableSharing } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { WorkbenchClient } from '../../src/worker/client.ts';
import { createInPagePort } from '../../src/worker/in-page-port.ts';
import { PACK_ABOVE_LEVELS, packLevels, packLevelsFromBytes, RUN_LEVELS, RUN_TEXT_UNITS, runBuffers, spanRuns, unpackLevels, withPackedLevels, type PackedLevels } from '../../src/worker/packed-levels.ts';
import type { FromWorker } from '../../src/worker/protocol.ts';
import { createSession, sendLongLevels, sendLongLevelsAhead } from '../../src/worker/session.ts';
import { textColumnsOf } from '../helpers/text-columns.ts';

/** Any text a cell may hold, surrogate pairs, empty and line breaks included. */
const level = fc.record({ value: fc.string({ unit: 'binary', maxLength: 12 }), count: fc.integer({ min: 1, max: 1_000_000 }) });

describe('packing level lists', () => {
  it('property: unpacking the packed runs gives the same levels in the same order (fast-check)', () => {
    fc.assert(
      fc.property(fc.array(level, { maxLength: 300 }), (levels) => {
        expect(unpackLevels(packLevels(levels))).toEqual(levels);
      }),
    );
  });

  it('ends a run after RUN_LEVELS levels', () => {
    const levels: LevelCount[] = Array.from({ length: RUN_LEVELS + 3 }, (_, i) => ({ value: `v${i}`, count: i + 1 }));
    const runs = packLevels(levels);
    expect(runs.map((r) => r.lengths.length)).toEqual([RUN_LEVELS, 3]);
    // The second run starts at level 65,536: "v65536" is 6 code units long and counted 65,537 times.
    expect(runs[1]?.text.startsWith('v65536')).toBe(true);
    expect(runs[1]?.lengths[0]).toBe(6);
    expect(runs[1]?.counts[0]).toBe(65_537);
  });

  it('ends a run once its text passes RUN_TEXT_UNITS code units, with at least one level per run', () => {
    const long = 'x'.repeat(RUN_TEXT_UNITS);
    const runs = packLevels([
      { value: long, count: 1 },
      { value: 'a', count: 2 },
      { value: long, count: 3 },
    ]);
    // The first level alone reaches the limit; "a" starts the next run and the long one joins it.
    expect(runs.map((r) => [...r.lengths])).toEqual([[RUN_TEXT_UNITS], [1, RUN_TEXT_UNITS]]);
    expect(runs.map((r) => [...r.counts])).toEqual([[1], [2, 3]]);
  });

  it('unpacks a profile’s levels the first time they are read, once', () => {
    const profile = { ...profileTable(readTable(new TextEncoder().encode('id\nb\na\nb\n')).table)[0]!, levels: [] };
    const lazy = withPackedLevels(profile, packLevels([{ value: 'b', count: 2 }, { value: 'a', count: 1 }]));
    expect(lazy.levels).toEqual([{ value: 'b', count: 2 }, { value: 'a', count: 1 }]);
    expect(lazy.levels).toBe(lazy.levels);
    expect(lazy.distinct).toBe(2);
  });
});

describe('opening a file with a column of many distinct values', () => {
  const rows = PACK_ABOVE_LEVELS + 2_000;
  // An invented list: ids all different (12,000 levels, each once), colours red/blue alternating.
  const csv = `id,colour\n${Array.from({ length: rows }, (_, i) => `k${String(i).padStart(5, '0')},${i % 2 === 0 ? 'red' : 'blue'}`).join('\n')}\n`;

  it('sends the long list ahead, packed, and the page gets back exactly the profile core made', async () => {
    const messages: FromWorker['type'][] = [];
    const port = createInPagePort();
    port.addEventListener('message', (event: MessageEvent<FromWorker>) => messages.push(event.data.type));
    const client = new WorkbenchClient(port);
    const opened = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([csv], 'ids.csv') }, draft: true });
    const expected = profileTable(readTable(new TextEncoder().encode(csv)).table);
    // 12,000 levels make one packed run (under RUN_LEVELS); colour's 2 levels stay in the answer.
    expect(messages.filter((m) => m === 'levels')).toHaveLength(1);
    expect(opened.profiles[0]?.levels).toHaveLength(rows);
    expect(opened.profiles[0]?.levels?.[0]).toEqual({ value: 'k00000', count: 1 });
    expect(opened.profiles[0]?.levels?.at(-1)).toEqual({ value: `k${rows - 1}`, count: 1 });
    expect(opened.profiles[1]?.levels).toEqual([{ value: 'red', count: 6_000 }, { value: 'blue', count: 6_000 }]);
    expect(opened.profiles).toEqual(expected);
  });

  it('posts the levels with their typed arrays transferred', async () => {
    const transfers: number[] = [];
    const session = createSession((message, transfer) => {
      if (message.type === 'levels') transfers.push(transfer?.length ?? 0);
    });
    session.receive({ type: 'open', id: 1, slot: 'work', source: { kind: 'file', file: new File([csv], 'ids.csv') }, draft: true });
    await expect.poll(() => transfers.length, { timeout: 20_000 }).toBe(1);
    // Lengths and counts: a file this small is read on one thread, its ids made strings as read.
    expect(transfers).toEqual([2]);
  });
});

/** Each level's length from the starts that bound the levels. */
function lengthsOf(starts: Int32Array): Uint32Array {
  return Uint32Array.from({ length: starts.length - 1 }, (_, i) => starts[i + 1]! - starts[i]!);
}

describe('packing level lists kept as bytes', () => {
  it('property: gives the runs the levels themselves give, in the same order (fast-check)', () => {
    const cell = fc.oneof(fc.constantFrom('', 'NA', 'a', 'bb', 'x y'), fc.integer({ min: 0, max: 40 }).map((n) => `K-${n}`), fc.string({ unit: fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c)), maxLength: 6 }));
    fc.assert(
      fc.property(fc.array(cell, { maxLength: 200 }), (cells) => {
        const profile = profileColumn(textColumnsOf(cells).bytes, 0);
        const source = levelSourceOf(profile);
        expect(source).not.toBeNull();
        const fromBytes = packLevelsFromBytes(source!);
        const fromLevels = packLevels(profile.levels ?? []);
        // The same runs, level by level; a run of levels each counted once may be spans of the storage.
        expect(fromBytes.map((run) => ('starts' in run ? { lengths: lengthsOf(run.starts), counts: new Float64Array(run.starts.length - 1).fill(1) } : { lengths: run.lengths, counts: run.counts }))).toEqual(
          fromLevels.map(({ lengths, counts }) => ({ lengths, counts })),
        );
        // The same text, still as its ASCII bytes.
        expect(fromBytes.map((run) => ('ascii' in run ? new TextDecoder().decode(run.ascii) : run.text))).toEqual(fromLevels.map((run) => run.text));
        expect(unpackLevels(fromBytes)).toEqual(profile.levels);
      }),
    );
  });

  it('cuts spans of storage where level lists are cut: after RUN_LEVELS levels, or at the level that takes a run\'s text to RUN_TEXT_UNITS', () => {
    const startsOf = (lengths: readonly number[]): Int32Array => Int32Array.from([0, ...lengths.map((_, i) => lengths.slice(0, i + 1).reduce((a, b) => a + b, 0))]);
    const sizes = (lengths: readonly number[]): number[] => {
      const starts = startsOf(lengths);
      return spanRuns(new Uint8Array(starts[starts.length - 1]!), starts).map((run) => run.starts.length - 1);
    };
    const seven = 7 << 20; // three of them pass RUN_TEXT_UNITS (16 Mi units), two do not
    expect(RUN_TEXT_UNITS).toBe(16 << 20);
    expect(sizes([seven, seven, seven, seven, seven, seven])).toEqual([3, 3]);
    // A level past the limit alone is a run of its own; the next run starts after it.
    expect(sizes([RUN_TEXT_UNITS + 5, 1, 1])).toEqual([1, 2]);
    expect(sizes(Array.from({ length: RUN_LEVELS + 10 }, () => 3))).toEqual([RUN_LEVELS, 10]);
    expect(sizes([])).toEqual([]);
  });

  it('sends a 70,000-row identifier ahead in the same runs, without making its levels', () => {
    const cells = Array.from({ length: 70_000 }, (_, i) => `ID-${String(i).padStart(6, '0')}`);
    const column = textColumnsOf(cells).bytes;
    let made = 0;
    const counted = Object.defineProperty({ ...column }, 'values', { get: () => (made++, cells) }) as TextColumn;
    const profile = profileColumn(counted, 0);
    const sent: PackedLevels[] = [];
    const [ahead] = sendLongLevelsAhead([profile], { levels: (_, run) => sent.push(run) });
    expect(made).toBe(0);
    expect(ahead!.levels).toEqual([]);
    expect(ahead!.distinct).toBe(70_000);
    // Runs of RUN_LEVELS levels: 65,536, then 4,464; every id counted once, in order: spans of the column's bytes.
    expect(sent.map((run) => ('starts' in run ? run.starts.length - 1 : -1))).toEqual([RUN_LEVELS, 70_000 - RUN_LEVELS]);
    expect(unpackLevels(sent)).toEqual(cells.map((value) => ({ value, count: 1 })));
    // No string made here: the runs carry the bytes, moved to the page with the typed arrays.
    expect(sent.every((run) => 'starts' in run && run.ascii.length === run.starts[run.starts.length - 1]! - run.starts[0]!)).toBe(true);
    expect(sent.map((run) => ('ascii' in run ? run.ascii.length : -1))).toEqual([RUN_LEVELS * 9, (70_000 - RUN_LEVELS) * 9]);
    expect(runBuffers(sent[0]!)).toHaveLength(2);
  });

  it('sends a long level list while the number columns are still being profiled elsewhere, and not again with the answer', async () => {
    const ids = Array.from({ length: 12_000 }, (_, i) => `ID-${String(i).padStart(5, '0')}`);
    const { table } = readTable(new TextEncoder().encode(`id,reading\n${ids.map((id, i) => `${id},${(i * 7919) % 10_000}`).join('\n')}\n`));
    expect(table.columns.map((column) => column.kind)).toEqual(['text', 'number']);
    const sent: number[] = [];
    const context = { levels: (column: number) => void sent.push(column) };
    const alreadySent = new Set<number>();
    let answer: ((profile: ColumnProfile) => void) | null = null;
    const profiling = profileTableSharing(
      table,
      DEFAULT_PROFILE_OPTIONS,
      () => new Promise<ColumnProfile>((resolve) => (answer = resolve)),
      (profiles) => profiles.forEach((profile, column) => profile !== null && sendLongLevels(profile, column, context) && alreadySent.add(column)),
    );
    await new Promise((resolve) => setTimeout(resolve, 0));
    // The number column's profile has not come, and the identifier's levels have gone: one run.
    expect(answer).not.toBeNull();
    expect(sent).toEqual([0]);
    answer!(profileColumn(table.columns[1]!, 1));
    const profiles = await profiling;
    const [id] = sendLongLevelsAhead(profiles, context, alreadySent);
    expect(sent).toEqual([0]);
    expect(id!.levels).toEqual([]);
    expect(id!.distinct).toBe(12_000);
  });
});
