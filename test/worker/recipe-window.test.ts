/**
 * A new recipe comes back with the rows the page last asked to see already encoded with it
 * (RecipeInUse.window), so a decision reaches the preview in one round trip.
 */
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { WorkbenchClient } from '../../src/worker/client.ts';
import { createInPagePort } from '../../src/worker/in-page-port.ts';

// Invented rows: a parcel code and its colour.
const CSV = 'parcel,colour\nA1,red\nA2,blue\nA3,red\nA4,green\nA5,blue\n';

describe('a recipe put in use', () => {
  it('has no window before the page asked for rows, and then the last rows asked for, encoded with it', async () => {
    const client = new WorkbenchClient(createInPagePort());
    const opened = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([CSV], 'parcels.csv') }, draft: true });
    const first = decide(opened.draft!, { type: 'set-level', column: 'parcel', level: 'identifier' }, opened.profiles);
    const inUse = await client.call('use-recipe', { slot: 'work', version: opened.version, revision: 1, recipe: first });
    expect(inUse.window).toBeUndefined();
    await client.call('window', { slot: 'work', version: opened.version, revision: 1, start: 1, end: 4 });

    const dummy = decide(first, { type: 'set-nominal-coding', column: 'colour', coding: 'dummy' }, opened.profiles);
    const next = await client.call('use-recipe', { slot: 'work', version: opened.version, revision: 2, recipe: dummy });
    expect(next.outputs).toEqual(['parcel', 'colour=blue', 'colour=green']);
    const window = next.window!;
    expect({ revision: window.revision, start: window.start, end: window.end, width: window.width }).toEqual({ revision: 2, start: 1, end: 4, width: 3 });
    // Levels by count, ties first seen first: red 2, blue 2, green 1; dummy coding drops the first, red.
    // Rows 1–3 are A2 blue, A3 red, A4 green; the identifier's numbers are NaN (its text is in `cells`).
    expect([...window.values]).toEqual([NaN, 1, 0, NaN, 0, 0, NaN, 0, 1]);
    expect(window.cells).toEqual(['A2', 'blue', 'A3', 'red', 'A4', 'green']);
    expect([...window.lines]).toEqual([3, 4, 5]);
    const asked = await client.call('window', { slot: 'work', version: opened.version, revision: 2, start: 1, end: 4 });
    expect(asked).toEqual(window);
  });
});
