/**
 * A preview window is encoded from a table cut down to its rows (src/worker/window-table.ts): the
 * numbers, rejections and cell texts must be those of the same rows in the whole table.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { encodeWindow } from '../../src/core/apply.ts';
import { cellText, type Table } from '../../src/core/columns.ts';
import { decide } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { windowTable } from '../../src/worker/window-table.ts';

function tableOf(csv: string, dictionaryCap?: number): Table {
  return readTable(new TextEncoder().encode(csv), dictionaryCap === undefined ? {} : { dictionaryCap }).table;
}

describe('a window of a table whose identifier is kept as bytes', () => {
  it('makes the texts of its own rows only, not the million of the column', () => {
    // An invented identifier column of 200,000 rows, read as the page reads big files (packValues).
    const ids = Array.from({ length: 200_000 }, (_, i) => `HH-${String(i).padStart(6, '0')}`);
    const table = readTable(new TextEncoder().encode(`id\n${ids.join('\n')}\n`), { packValues: true }).table;
    const id = table.columns[0]!;
    expect(id.kind === 'text' && id.packed !== undefined).toBe(true);
    let made = 0;
    const counted = Object.defineProperty({ ...id }, 'values', { get: () => (made++, ids) });
    const watched: Table = { ...table, columns: [counted] };
    const window = windowTable(watched, 150_000, 150_003);
    expect([0, 1, 2].map((row) => cellText(window.columns[0]!, row))).toEqual(['HH-150000', 'HH-150001', 'HH-150002']);
    expect(cellText(counted, 199_999)).toBe('HH-199999');
    expect(made).toBe(0);
  });
});

describe('a window of a table', () => {
  // Invented rows: a colour, an amount with a gap and a stray text.
  const csv = 'colour,amount\nred,1\nblue,x\nred,3\ngreen,\nblue,5\n';

  it('keeps only the values its rows use, renumbered in order of first use', () => {
    const table = tableOf(csv);
    const window = windowTable(table, 1, 4); // rows 1–3: blue/x, red/3, green/(empty)
    expect(window.rowCount).toBe(3);
    const colour = window.columns[0]!;
    expect(colour.kind).toBe('text');
    if (colour.kind !== 'text') return;
    expect(colour.values).toEqual(['blue', 'red', 'green']);
    expect([...colour.codes]).toEqual([0, 1, 2]);
    expect(colour.counts).toEqual([1, 1, 1]);
    // The file's lines: the header is line 1, row 1 starts on line 3.
    expect([...window.lineOfRow]).toEqual([3, 4, 5]);
    expect([0, 1, 2].map((r) => cellText(window.columns[1]!, r))).toEqual(['x', '3', '']);
  });

  it('keeps number storage and its exceptions, shifted to the window', () => {
    // Only numbers and a gap: past a dictionary cap of 2 the amounts move to number storage, where
    // "1.50" (not how JavaScript writes 1.5) and the empty cell are kept as exceptions.
    const table = tableOf('id,amount\na,1\nb,1.50\nc,3\nd,\ne,5\n', 2);
    expect(table.columns[1]?.kind).toBe('number');
    const window = windowTable(table, 1, 5);
    expect(window.columns[1]?.kind).toBe('number');
    expect([0, 1, 2, 3].map((r) => cellText(window.columns[1]!, r))).toEqual(['1.50', '3', '', '5']);
  });

  it('property: encodes every window exactly as the whole table encodes those rows (fast-check)', () => {
    let numberStored = 0;
    const row = fc.record({
      colour: fc.constantFrom('red', 'blue', 'green', 'NA', ''),
      size: fc.constantFrom('S', 'M', 'L'),
      amount: fc.oneof(fc.integer({ min: -50, max: 50 }).map(String), fc.constantFrom('', 'x', '2.50', 'n/a')),
    });
    fc.assert(
      fc.property(
        fc.array(row, { minLength: 1, maxLength: 40 }),
        fc.nat(),
        fc.nat(),
        fc.constantFrom(undefined, 4),
        fc.boolean(),
        fc.boolean(),
        (rows, a, b, cap, zScore, stray) => {
          // Without stray texts, amounts past the cap move to number storage.
          const amount = (text: string): string => (stray || (text !== 'x' && text !== 'n/a') ? text : '');
          const text = `colour,size,amount\n${rows.map((r) => `${r.colour},${r.size},${amount(r.amount)}`).join('\n')}\n`;
          const table = tableOf(text, cap);
          if (table.columns[2]?.kind === 'number') numberStored++;
          const profiles = profileTable(table);
          let recipe = draftRecipe(profiles, { file: 'rows.csv', rows: table.rowCount });
          recipe = decide(recipe, { type: 'set-level', column: 'colour', level: 'nominal' }, profiles);
          if (zScore && profiles[2]?.numeric) {
            recipe = decide(recipe, { type: 'set-level', column: 'amount', level: 'continuous' }, profiles);
            recipe = decide(recipe, { type: 'set-scaling', column: 'amount', scaling: 'z-score' }, profiles);
          }
          const plan = compilePlan(recipe, table.names);
          const from = a % table.rowCount;
          const to = from + (b % (table.rowCount - from + 1));
          const whole = encodeWindow(plan, table, from, to);
          const window = windowTable(table, from, to);
          const part = encodeWindow(plan, window, 0, to - from);
          expect(part.values).toEqual(whole.values);
          expect(part.batch.rejected).toEqual(whole.batch.rejected);
          for (let r = 0; r < to - from; r++) {
            expect(window.columns.map((c) => cellText(c, r))).toEqual(table.columns.map((c) => cellText(c, from + r)));
          }
        },
      ),
      { numRuns: 200 },
    );
    expect(numberStored).toBeGreaterThan(0);
  });
});
