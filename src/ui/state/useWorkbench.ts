/**
 * The workbench's state and its conversation with the worker: the open table, the recipe history,
 * which recipe the worker is using for the preview, the long task running, and messages for the
 * person. Components get values and callbacks from here; none of them talks to the worker.
 */
import { useCallback, useEffect, useMemo, useReducer, useRef, useState } from 'react';
import type { Decision } from '../../core/decisions.ts';
import { DEFAULT_MISSING_TOKENS, sameMissingTokens, spellingsOutnumberingValues } from '../../core/missing.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import type { Recipe } from '../../core/recipe.ts';
import { DEMO_ROW_COUNT } from '../../demo/household-energy.ts';
import { startWorkbenchWorker, type WorkbenchClient } from '../../worker/client.ts';
import { Cancelled, WorkerProblem, type OpenedTable, type Problem, type RecipeInUse, type Reprofiled, type TableSource } from '../../worker/protocol.ts';
import { countOf, formatCount } from '../columns/labels.ts';
import { readingNotices } from '../files/reading-notices.ts';
import { EMPTY_HISTORY, historyReducer } from './history.ts';
import { browserStore, forgetDecisions, loadDecisions, loadMissingTokens, saveDecisions } from './persist.ts';
import { useTask } from './useTask.ts';

export interface Notice {
  readonly id: number;
  readonly tone: 'info' | 'success' | 'warning' | 'error';
  readonly title: string;
  readonly detail?: string;
  readonly hint?: string;
  /** Shown as a button beside the message. */
  readonly action?: { readonly label: string; run(): void };
}

/** The recipe the worker is using for the preview, with the revision it belongs to. */
export interface RecipeShown extends RecipeInUse {
  readonly recipe: Recipe;
}

let nextNoticeId = 1;

/**
 * One worker for the life of the page. Made outside React so StrictMode's double rendering and
 * effect replays neither start a second worker nor stop the one in use.
 */
let sharedClient: WorkbenchClient | null = null;
function pageClient(): WorkbenchClient {
  sharedClient ??= startWorkbenchWorker();
  return sharedClient;
}

/**
 * The file size limit the page was told to use instead of its own (`?max-file-mb=5` in its
 * address), in bytes; undefined normally. Tests use it to reach the limit with small files.
 */
export function fileLimitFromAddress(search: string = globalThis.location?.search ?? ''): number | undefined {
  const megabytes = Number(new URLSearchParams(search).get('max-file-mb') ?? NaN);
  return Number.isFinite(megabytes) && megabytes > 0 ? Math.round(megabytes * 1024 * 1024) : undefined;
}

const FILE_LIMIT_OVERRIDE = fileLimitFromAddress();

export function problemNotice(problem: Problem, title = 'That did not work'): Omit<Notice, 'id'> {
  const where = [problem.line !== undefined ? `line ${formatCount(problem.line)}` : null, problem.column !== undefined ? `column ${formatCount(problem.column)}` : null]
    .filter(Boolean)
    .join(', ');
  return { tone: 'error', title, detail: where ? `${problem.message.replace(/\.$/, '')} (${where}).` : problem.message, ...(problem.hint ? { hint: problem.hint } : {}) };
}

export function errorNotice(error: unknown, title: string): Omit<Notice, 'id'> {
  if (error instanceof WorkerProblem) return problemNotice(error.problem, title);
  return { tone: 'error', title, detail: error instanceof Error ? error.message : String(error) };
}

/** A change of missing spellings in a few words: “None” is read as a value now; “-999” is read as missing now. */
export function spellingChange(before: readonly string[], after: readonly string[]): string {
  const quoted = (list: readonly string[]) => list.map((t) => `“${t}”`).join(', ');
  const added = after.filter((t) => !before.includes(t));
  const dropped = before.filter((t) => !after.includes(t));
  const parts = [
    ...(dropped.length === 0 ? [] : [`${quoted(dropped)} ${dropped.length === 1 ? 'is' : 'are'} read as ${dropped.length === 1 ? 'a value' : 'values'}`]),
    ...(added.length === 0 ? [] : [`${quoted(added)} ${added.length === 1 ? 'is' : 'are'} read as missing`]),
  ];
  return parts.length === 0 ? 'The missing spellings were read again' : `${parts.join('; ')} now`;
}

export function useWorkbench() {
  const client = pageClient();

  const [table, setTable] = useState<OpenedTable | null>(null);
  const [history, dispatch] = useReducer(historyReducer, EMPTY_HISTORY);
  const [shown, setShown] = useState<RecipeShown | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  const [notices, setNotices] = useState<readonly Notice[]>([]);
  const [lastFile, setLastFile] = useState<File | null>(null);
  const { task, run } = useTask();
  const store = useMemo(() => browserStore(), []);

  const notify = useCallback((notice: Omit<Notice, 'id'>) => {
    const id = nextNoticeId++;
    setNotices((list) => [...list.filter((n) => n.title !== notice.title), { ...notice, id }].slice(-3));
    return id;
  }, []);
  const dismiss = useCallback((id: number) => setNotices((list) => list.filter((n) => n.id !== id)), []);

  // ---- opening files --------------------------------------------------------------------------

  const selectedRef = useRef(selected);
  selectedRef.current = selected;
  const tableRef = useRef(table);
  tableRef.current = table;
  const decisionsRef = useRef<readonly Decision[]>([]);
  decisionsRef.current = history.present?.decisions ?? [];

  /** The open table profiled and drafted again with `tokens` as its missing spellings; null when that did not happen. */
  const reprofile = useCallback(
    async (opened: OpenedTable, tokens: readonly string[], label: string): Promise<Reprofiled | null> => {
      try {
        return await run(label, (onProgress) => client.start('reprofile', { slot: 'work', version: opened.version, missingTokens: tokens }, { onProgress }));
      } catch (error) {
        if (!(error instanceof Cancelled)) notify(errorNotice(error, 'The missing spellings were not changed'));
        return null;
      }
    },
    [client, notify, run],
  );

  // Set below; the notices' buttons call it.
  const readMissingAsRef = useRef<(tokens: readonly string[], replay?: readonly Decision[]) => Promise<void>>(async () => undefined);

  /** A spelling read as missing in more cells of a column than its values may be a value: say so, with a button. */
  const spellingNotices = useCallback(
    (profiles: readonly ColumnProfile[], tokens: readonly string[]) => {
      for (const found of spellingsOutnumberingValues(profiles).slice(0, 2)) {
        notify({
          tone: 'warning',
          title: `“${found.spelling}” may be a value of ${found.column}`,
          detail: `It is read as missing in ${countOf(found.cells, 'cell', 'cells')}, more than all of the column's values together (${countOf(found.valueCells, 'cell', 'cells')}).`,
          action: { label: `Read “${found.spelling}” as a value`, run: () => void readMissingAsRef.current(tokens.filter((t) => t !== found.spelling)) },
        });
      }
    },
    [notify],
  );

  const changeNoticeRef = useRef<number | null>(null);
  const tokensRef = useRef<readonly string[]>(DEFAULT_MISSING_TOKENS);
  tokensRef.current = history.present?.recipe.reading.missingTokens ?? DEFAULT_MISSING_TOKENS;

  const readMissingAs = useCallback(
    async (tokens: readonly string[], replay: readonly Decision[] = decisionsRef.current) => {
      const current = tableRef.current;
      if (current === null) return;
      const before = tokensRef.current;
      const again = await reprofile(current, tokens, 'Reading the missing values again');
      if (again === null) return;
      setTable({ ...current, profiles: again.profiles, draft: again.draft });
      // The decisions made so far are made again on the new proposal; any that no longer fits is named.
      dispatch({ type: 'start', recipe: again.draft, profiles: again.profiles, replay });
      // The undo history starts again with the new proposal, so the change is undone from here; only
      // the latest change keeps such a notice (an older one's Undo would bring back a list since changed).
      if (changeNoticeRef.current !== null) dismiss(changeNoticeRef.current);
      changeNoticeRef.current = notify({
        tone: 'success',
        title: spellingChange(before, tokens),
        detail: 'The file was profiled again and your decisions made again on the new proposal.',
        action: { label: 'Undo', run: () => void readMissingAsRef.current(before) },
      });
      spellingNotices(again.profiles, tokens);
    },
    [dismiss, notify, reprofile, spellingNotices],
  );
  readMissingAsRef.current = readMissingAs;

  const open = useCallback(
    async (source: TableSource) => {
      const label = source.kind === 'demo' ? 'Preparing the invented demo survey' : `Reading ${source.file.name}`;
      let opened: OpenedTable;
      try {
        opened = await run(label, (onProgress) =>
          client.start('open', { slot: 'work', source, draft: true, ...(FILE_LIMIT_OVERRIDE === undefined ? {} : { maxBytes: FILE_LIMIT_OVERRIDE }) }, { onProgress }),
        );
      } catch (error) {
        if (!(error instanceof Cancelled)) notify(errorNotice(error, source.kind === 'file' ? `Could not open ${source.file.name}` : 'Could not prepare the demo'));
        return;
      }
      if (opened.draft === null) return;
      const replay = loadDecisions(store, opened.fingerprint);
      // Messages about the previous file no longer apply.
      setNotices([]);
      // Spellings changed when the person last worked on this file: the proposal is made with them again.
      const savedTokens = loadMissingTokens(store, opened.fingerprint);
      let tokensRestored = false;
      if (savedTokens !== null && !sameMissingTokens(savedTokens, opened.draft.reading.missingTokens)) {
        const again = await reprofile(opened, savedTokens, 'Reading with the missing spellings saved for this file');
        if (again !== null) {
          opened = { ...opened, profiles: again.profiles, draft: again.draft };
          tokensRestored = true;
        } else {
          notify({
            tone: 'warning',
            title: 'The missing spellings saved for this file were not used',
            detail: `It is read with the usual ones. The saved list was: ${savedTokens.map((t) => `“${t}”`).join(', ')}; choose them again in the Missing values tab.`,
          });
        }
      }
      const draft = opened.draft;
      if (draft === null) return;
      setTable(opened);
      setShown(null);
      setLastFile(source.kind === 'file' ? source.file : null);
      dispatch({ type: 'start', recipe: draft, profiles: opened.profiles, replay });
      const keep = selectedRef.current !== null && opened.names.includes(selectedRef.current);
      setSelected(keep ? selectedRef.current : (opened.names[0] ?? null));
      if (replay.length > 0 || tokensRestored) {
        const { fingerprint, profiles } = opened;
        const decisions = replay.length === 0 ? '' : `${replay.length} ${replay.length === 1 ? 'decision' : 'decisions'}`;
        const what = tokensRestored ? (decisions === '' ? 'the missing spellings' : `the missing spellings and ${decisions}`) : decisions;
        notify({
          tone: 'info',
          title: `Restored ${what} saved for this file`,
          detail: 'They were kept in this browser when you last worked on the same file.',
          action: {
            label: 'Start from the proposal',
            run: () => {
              forgetDecisions(store, fingerprint);
              if (tokensRestored) void readMissingAsRef.current(DEFAULT_MISSING_TOKENS, []);
              else dispatch({ type: 'start', recipe: draft, profiles });
            },
          },
        });
      }
      for (const notice of readingNotices(opened)) notify(notice);
      spellingNotices(opened.profiles, draft.reading.missingTokens);
    },
    [client, notify, run, store, reprofile, spellingNotices],
  );

  const openFile = useCallback((file: File, sheet?: string) => open({ kind: 'file', file, sheet: sheet ?? null }), [open]);
  const openDemo = useCallback(() => open({ kind: 'demo', rows: DEMO_ROW_COUNT }), [open]);

  // ---- the recipe: history, persistence, and the worker's copy ---------------------------------

  const recipe = history.present?.recipe ?? null;
  const decideNow = useCallback((decision: Decision) => dispatch({ type: 'decide', decision }), []);
  const undo = useCallback(() => dispatch({ type: 'undo' }), []);
  const redo = useCallback(() => dispatch({ type: 'redo' }), []);

  useEffect(() => {
    if (!table || !history.present) return;
    const tokens = history.present.recipe.reading.missingTokens;
    saveDecisions(store, table.fingerprint, history.present.decisions, new Date(), sameMissingTokens(tokens, DEFAULT_MISSING_TOKENS) ? null : tokens);
  }, [store, table, history.present]);

  useEffect(() => {
    if (history.refused) notify({ tone: 'warning', title: 'That change was not made', detail: history.refused });
  }, [history.refused, notify]);

  useEffect(() => {
    if (history.skipped.length === 0) return;
    notify({
      tone: 'warning',
      title: `${history.skipped.length} saved ${history.skipped.length === 1 ? 'decision' : 'decisions'} no longer applied`,
      detail: history.skipped.map((s) => `${s.label}: ${s.reason}`).join(' · '),
    });
  }, [history.skipped, notify]);

  useEffect(() => {
    if (table === null || recipe === null) return;
    let current = true;
    const revision = history.revision;
    client.call('use-recipe', { slot: 'work', version: table.version, revision, recipe }).then(
      (inUse) => current && setShown({ ...inUse, recipe }),
      (error: unknown) => current && !(error instanceof Cancelled) && notify(errorNotice(error, 'The preview could not be updated')),
    );
    return () => {
      current = false;
    };
  }, [client, table, recipe, history.revision, notify]);

  return {
    client,
    table,
    history,
    recipe,
    shown,
    selected,
    setSelected,
    notices,
    notify,
    dismiss,
    task,
    run,
    lastFile,
    /** The file size limit to pass with every open request, when the address set one. */
    maxBytes: FILE_LIMIT_OVERRIDE,
    openFile,
    openDemo,
    decide: decideNow,
    undo,
    redo,
    /** Profiles the open file again with these missing spellings, and makes the decisions so far again. */
    readMissingAs,
  };
}

export type Workbench = ReturnType<typeof useWorkbench>;
