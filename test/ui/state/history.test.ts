/**
 * The recipe history: decisions go through core decide(), undo/redo walk the steps, and saved
 * decisions replay on a freshly drafted recipe of the same file (and survive in localStorage).
 *
 * Runs in Node: the store is a Map-backed stand-in for localStorage with the same three methods
 * (jsdom 31 needs Node >= 22; the page's real localStorage is exercised by the e2e reload test).
 */
import fc from 'fast-check';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Decision } from '../../../src/core/decisions.ts';
import { draftRecipe } from '../../../src/core/fit.ts';
import { profileTable } from '../../../src/core/profile.ts';
import { readTable } from '../../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type NominalColumn } from '../../../src/core/recipe.ts';
import { EMPTY_HISTORY, HISTORY_LIMIT, historyReducer, redoLabel, undoLabel, type HistoryAction, type RecipeHistory } from '../../../src/ui/state/history.ts';
import { loadDecisions, loadMissingTokens, saveDecisions, SAVED_FILES_LIMIT, type KeyValueStore } from '../../../src/ui/state/persist.ts';

const CSV = 'colour,size,score\nred,S,1\nblue,M,2\nred,L,\ngreen,M,4\n';
const table = readTable(new TextEncoder().encode(CSV)).table;
const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
const draft = draftRecipe(profiles, { file: 'small.csv', rows: table.rowCount });

function started(replay?: Decision[]): RecipeHistory {
  return historyReducer(EMPTY_HISTORY, { type: 'start', recipe: draft, profiles, ...(replay ? { replay } : {}) });
}

function run(history: RecipeHistory, ...actions: HistoryAction[]): RecipeHistory {
  return actions.reduce(historyReducer, history);
}

const toDummy: Decision = { type: 'set-nominal-coding', column: 'colour', coding: 'dummy' };
const toBlue: Decision = { type: 'set-reference', column: 'colour', reference: 'blue' };

function colour(history: RecipeHistory): NominalColumn {
  return history.present!.recipe.columns.find((c) => c.name === 'colour') as NominalColumn;
}

describe('history reducer', () => {
  it('starts at the drafted recipe with nothing to undo', () => {
    const h = started();
    expect(h.present?.recipe).toBe(draft);
    expect(h.present?.label).toBe('Proposed recipe');
    expect(undoLabel(h)).toBeNull();
    expect(redoLabel(h)).toBeNull();
  });

  it('applies decisions through core decide(), with labels for undo', () => {
    const h = run(started(), { type: 'decide', decision: toDummy }, { type: 'decide', decision: toBlue });
    // levels by count: red (2), blue, green; dummy coding leaves the reference out.
    expect(colour(h).coding).toBe('dummy');
    expect(colour(h).reference).toBe('blue');
    expect(colour(h).outputs).toEqual(['colour=red', 'colour=green']);
    expect(h.present?.decisions).toEqual([toDummy, toBlue]);
    expect(undoLabel(h)).toBe('colour: reference level “blue”');
  });

  it('undoes and redoes step by step; a new decision clears the redo steps', () => {
    const h2 = run(started(), { type: 'decide', decision: toDummy }, { type: 'decide', decision: toBlue });
    const back = run(h2, { type: 'undo' });
    expect(colour(back).reference).toBe('red');
    expect(redoLabel(back)).toBe('colour: reference level “blue”');
    const again = run(back, { type: 'redo' });
    expect(again.present).toBe(h2.present);
    const branched = run(back, { type: 'decide', decision: { type: 'set-nominal-coding', column: 'colour', coding: 'effect' } });
    expect(branched.future).toEqual([]);
    expect(colour(branched).coding).toBe('effect');
    const toDraft = run(h2, { type: 'undo' }, { type: 'undo' }, { type: 'undo' });
    expect(toDraft.present?.recipe).toBe(draft);
  });

  it('counts a revision for every change of the present recipe, and none for a no-op', () => {
    const h = started();
    const same = run(h, { type: 'decide', decision: { type: 'set-nominal-coding', column: 'colour', coding: 'one-hot' } });
    expect(same.revision).toBe(h.revision);
    expect(same.past).toHaveLength(0);
    const changed = run(h, { type: 'decide', decision: toDummy }, { type: 'undo' }, { type: 'redo' });
    expect(changed.revision).toBe(h.revision + 3);
  });

  it('refuses a decision about a column that is not there, keeping the recipe', () => {
    const h = run(started(), { type: 'decide', decision: { type: 'set-level', column: 'nope', level: 'nominal' } });
    expect(h.refused).toMatch(/nope/);
    expect(h.present?.recipe).toBe(draft);
    expect(run(h, { type: 'dismiss-refusal' }).refused).toBeNull();
  });

  it('replays saved decisions as undoable steps and lists those that no longer apply', () => {
    const h = started([toDummy, { type: 'set-level', column: 'gone', level: 'nominal' }, toBlue]);
    expect(colour(h).reference).toBe('blue');
    expect(h.past).toHaveLength(2);
    expect(h.skipped).toHaveLength(1);
    expect(h.skipped[0]?.label).toBe('gone: nominal');
  });

  it('forgets the oldest steps beyond the limit', () => {
    let h = started();
    for (let i = 0; i < HISTORY_LIMIT + 5; i++) {
      h = historyReducer(h, { type: 'decide', decision: i % 2 === 0 ? toDummy : { type: 'set-nominal-coding', column: 'colour', coding: 'one-hot' } });
    }
    expect(h.past).toHaveLength(HISTORY_LIMIT);
  });

  it('property: undo after any sequence of decisions returns the previous recipe (fast-check)', () => {
    const decisions = fc.constantFrom<Decision>(
      toDummy,
      toBlue,
      { type: 'set-nominal-coding', column: 'colour', coding: 'effect' },
      { type: 'set-level', column: 'size', level: 'nominal' },
      { type: 'set-level', column: 'score', level: 'continuous' },
      { type: 'set-scaling', column: 'score', scaling: 'z-score' },
      { type: 'reverse-order', column: 'size' },
    );
    fc.assert(
      fc.property(fc.array(decisions, { maxLength: 12 }), (list) => {
        let h = started();
        for (const decision of list) {
          const before = h.present;
          h = historyReducer(h, { type: 'decide', decision });
          if (h.present !== before) expect(historyReducer(h, { type: 'undo' }).present).toBe(before);
        }
        // Undoing everything leads back to the draft; redoing everything leads back here.
        const end = h.present;
        let back = h;
        while (back.past.length > 0) back = historyReducer(back, { type: 'undo' });
        expect(back.present?.recipe).toBe(draft);
        let forward = back;
        while (forward.future.length > 0) forward = historyReducer(forward, { type: 'redo' });
        expect(forward.present).toBe(end);
      }),
      { numRuns: 60 },
    );
  });
});

/** The three Storage methods over a Map; `raw` exposes what was stored. */
function memoryStore(): KeyValueStore & { raw: Map<string, string> } {
  const raw = new Map<string, string>();
  return {
    raw,
    getItem: (key) => raw.get(key) ?? null,
    setItem: (key, value) => void raw.set(key, value),
    removeItem: (key) => void raw.delete(key),
  };
}

describe('saving decisions per file', () => {
  let store = memoryStore();
  beforeEach(() => {
    store = memoryStore();
  });

  it('keeps decisions under the file fingerprint, in the browser store', () => {
    expect(saveDecisions(store, 'fp-1', [toDummy, toBlue])).toBe(true);
    expect(loadDecisions(store, 'fp-1')).toEqual([toDummy, toBlue]);
    expect(loadDecisions(store, 'fp-2')).toEqual([]);
    // Only decisions are kept: no cell values.
    expect(store.getItem('levelwise.decisions.v1:fp-1')).not.toContain('green');
  });

  it('drops an empty list and survives broken stored text', () => {
    saveDecisions(store, 'fp', [toDummy]);
    saveDecisions(store, 'fp', []);
    expect(store.getItem('levelwise.decisions.v1:fp')).toBeNull();
    store.setItem('levelwise.decisions.v1:bad', '{not json');
    expect(loadDecisions(store, 'bad')).toEqual([]);
  });

  it('keeps the missing spellings beside the decisions, even with no decision, and forgets them with the decisions', () => {
    const tokens = ['NA', '-999'];
    saveDecisions(store, 'fp', [], new Date(), tokens);
    expect(loadMissingTokens(store, 'fp')).toEqual(tokens);
    expect(loadDecisions(store, 'fp')).toEqual([]);
    saveDecisions(store, 'fp', [toDummy], new Date(), tokens);
    expect([loadDecisions(store, 'fp'), loadMissingTokens(store, 'fp')]).toEqual([[toDummy], tokens]);
    // The usual spellings are not stored (null): a file opened again is then read with whatever the usual ones are by then.
    saveDecisions(store, 'fp', [toDummy]);
    expect(loadMissingTokens(store, 'fp')).toBeNull();
    saveDecisions(store, 'fp', []);
    expect(store.getItem('levelwise.decisions.v1:fp')).toBeNull();
    store.setItem('levelwise.decisions.v1:odd', JSON.stringify({ decisions: [], missingTokens: ['NA', 7] }));
    expect(loadMissingTokens(store, 'odd')).toBeNull();
  });

  it('remembers at most the most recent files', () => {
    for (let i = 0; i < SAVED_FILES_LIMIT + 3; i++) saveDecisions(store, `f${i}`, [toDummy]);
    expect(loadDecisions(store, 'f0')).toEqual([]);
    expect(loadDecisions(store, 'f2')).toEqual([]);
    expect(loadDecisions(store, 'f3')).toEqual([toDummy]);
    expect(loadDecisions(store, `f${SAVED_FILES_LIMIT + 2}`)).toEqual([toDummy]);
  });

  it('reports a refusing store instead of throwing', () => {
    const refusing = {
      getItem: () => null,
      setItem: () => {
        throw new DOMException('full', 'QuotaExceededError');
      },
      removeItem: () => undefined,
    };
    expect(saveDecisions(refusing, 'fp', [toDummy])).toBe(false);
  });
});
