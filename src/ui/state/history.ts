/**
 * The recipe's undo history, as a pure reducer: (history, action) → new history.
 *
 * Every change to the recipe is a core `Decision` run through core `decide()`, so a decision made
 * in the page means exactly what it means on the command line. Each step remembers the list of
 * decisions that led to it from the drafted recipe; that list is what gets saved for a reload
 * (see persist.ts), because it replays on a freshly drafted recipe of the same file.
 */
import { decide, type Decision } from '../../core/decisions.ts';
import { isLevelwiseError } from '../../core/errors.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import type { Recipe } from '../../core/recipe.ts';
import { describeDecision } from './describe-decision.ts';

export interface HistoryStep {
  readonly recipe: Recipe;
  /** Decisions applied to the drafted recipe, in order, to reach `recipe`. */
  readonly decisions: readonly Decision[];
  /** What this step did, in words ("heating: dummy coding"); the draft's label is "Proposed recipe". */
  readonly label: string;
}

export interface RecipeHistory {
  readonly past: readonly HistoryStep[];
  /** null until a file is open. */
  readonly present: HistoryStep | null;
  readonly future: readonly HistoryStep[];
  readonly profiles: readonly ColumnProfile[];
  /** Counts every change of `present`; worker requests carry it so stale answers can be dropped. */
  readonly revision: number;
  /** Why the last decision was refused, in words; null when it went through. */
  readonly refused: string | null;
  /** Saved decisions that no longer applied when the file was reopened, with the reason. */
  readonly skipped: readonly { readonly label: string; readonly reason: string }[];
}

export type HistoryAction =
  | {
      readonly type: 'start';
      readonly recipe: Recipe;
      readonly profiles: readonly ColumnProfile[];
      /** Decisions saved for this file earlier; each becomes an undoable step. */
      readonly replay?: readonly Decision[];
    }
  | { readonly type: 'decide'; readonly decision: Decision }
  | { readonly type: 'undo' }
  | { readonly type: 'redo' }
  | { readonly type: 'dismiss-refusal' };

/** Older steps beyond this are forgotten; a recipe is small, but a session can be long. */
export const HISTORY_LIMIT = 300;

export const DRAFT_LABEL = 'Proposed recipe';

export const EMPTY_HISTORY: RecipeHistory = {
  past: [],
  present: null,
  future: [],
  profiles: [],
  revision: 0,
  refused: null,
  skipped: [],
};

export function historyReducer(history: RecipeHistory, action: HistoryAction): RecipeHistory {
  switch (action.type) {
    case 'start':
      return start(history, action.recipe, action.profiles, action.replay ?? []);
    case 'decide':
      return applyDecision(history, action.decision);
    case 'undo':
      return undo(history);
    case 'redo':
      return redo(history);
    case 'dismiss-refusal':
      return history.refused === null ? history : { ...history, refused: null };
  }
}

function start(history: RecipeHistory, recipe: Recipe, profiles: readonly ColumnProfile[], replay: readonly Decision[]): RecipeHistory {
  let next: RecipeHistory = {
    ...EMPTY_HISTORY,
    present: { recipe, decisions: [], label: DRAFT_LABEL },
    profiles,
    revision: history.revision + 1,
  };
  const skipped: { label: string; reason: string }[] = [];
  for (const decision of replay) {
    const attempt = applyDecision(next, decision);
    if (attempt.refused !== null) skipped.push({ label: describeDecision(decision), reason: attempt.refused });
    else next = attempt;
  }
  return { ...next, refused: null, skipped };
}

function applyDecision(history: RecipeHistory, decision: Decision): RecipeHistory {
  const present = history.present;
  if (present === null) return { ...history, refused: 'Open a file before deciding about its columns.' };
  let recipe: Recipe;
  try {
    recipe = decide(present.recipe, decision, history.profiles);
  } catch (error) {
    // A refusal the person can act on says what to do as well.
    const refused = isLevelwiseError(error) ? `${error.message} ${error.hint}` : error instanceof Error ? error.message : String(error);
    return { ...history, refused };
  }
  // A decision that changes nothing (choosing the coding already chosen) is not worth an undo step.
  if (recipe === present.recipe || sameRecipe(recipe, present.recipe)) return { ...history, refused: null };
  const step: HistoryStep = { recipe, decisions: [...present.decisions, decision], label: describeDecision(decision) };
  return {
    ...history,
    past: [...history.past, present].slice(-HISTORY_LIMIT),
    present: step,
    future: [],
    revision: history.revision + 1,
    refused: null,
  };
}

function undo(history: RecipeHistory): RecipeHistory {
  const previous = history.past.at(-1);
  if (previous === undefined || history.present === null) return history;
  return {
    ...history,
    past: history.past.slice(0, -1),
    present: previous,
    future: [history.present, ...history.future],
    revision: history.revision + 1,
    refused: null,
  };
}

function redo(history: RecipeHistory): RecipeHistory {
  const next = history.future[0];
  if (next === undefined || history.present === null) return history;
  return {
    ...history,
    past: [...history.past, history.present].slice(-HISTORY_LIMIT),
    present: next,
    future: history.future.slice(1),
    revision: history.revision + 1,
    refused: null,
  };
}

function sameRecipe(a: Recipe, b: Recipe): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/** Labels for the undo and redo buttons ("Undo heating: dummy coding"), null when there is nothing to undo/redo. */
export function undoLabel(history: RecipeHistory): string | null {
  return history.past.length > 0 && history.present ? history.present.label : null;
}

export function redoLabel(history: RecipeHistory): string | null {
  return history.future[0]?.label ?? null;
}
