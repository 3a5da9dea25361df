/**
 * The worker's state and its answers to each request. The worker file only forwards messages here,
 * so the same session runs in Node tests (and could run in the page as a fallback).
 *
 * Held per slot: the table read from the file, and the plan compiled from the recipe last put in
 * use. Every long job yields between batches so a `cancel` message can get through.
 */
import { createApplyReport, type ApplyReport } from '../core/apply-report.ts';
import { encodeBatch, encodeWindow } from '../core/apply.ts';
import { cellText, type Table } from '../core/columns.ts';
import { createCsvWriter } from '../core/csv-write.ts';
import { isLevelwiseError } from '../core/errors.ts';
import { draftRecipe } from '../core/fit.ts';
import { compilePlan, type Plan } from '../core/plan.ts';
import { levelCount, levelSourceOf, profileTable, withField, type ColumnProfile } from '../core/profile.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../core/recipe.ts';
import { fingerprintFile } from './fingerprint.ts';
import { PACK_ABOVE_LEVELS, packLevels, packLevelsFromBytes, runBuffers, type PackedLevels } from './packed-levels.ts';
import {
  Cancelled,
  type CallKind,
  type ExportSummary,
  type FromWorker,
  type OpenedTable,
  type Phase,
  type PreviewWindow,
  type Problem,
  type RecipeInUse,
  type RequestOf,
  type ResultOf,
  type Slot,
  type ToWorker,
} from './protocol.ts';
import { readSource } from './read-source.ts';
import { wasmRecordScanner } from '../core/wasm-record-scanner.ts';
import { gzipParts } from './gzip-parts.ts';
import { profileSharingWorkers } from './segment-pool.ts';
import { windowTable } from './window-table.ts';

/** Rows encoded between two looks at the message queue during exports and checks. */
export const BATCH_ROWS = 16_384;
/** Row problems listed in an OpenedTable; the count covers all of them. */
export const ROW_ISSUES_LISTED = 200;
/** A preview window larger than this many rows is refused: the page only ever needs a few screens. */
export const MAX_WINDOW_ROWS = 5_000;

export type Post = (message: FromWorker, transfer?: Transferable[]) => void;

interface SlotState {
  readonly version: number;
  readonly table: Table;
  readonly fileName: string;
  plan: Plan | null;
  revision: number;
  /** Rows [start, end) of the last preview window asked for: encoded again with each new recipe. */
  shownRows: { readonly start: number; readonly end: number } | null;
}

interface Context {
  readonly id: number;
  readonly signal: AbortSignal;
  progress(phase: Phase, done: number, total: number | null): void;
  chunk(bytes: Uint8Array): void;
  blob(part: Blob): void;
  levels(column: number, levels: PackedLevels): void;
}

type Handler<K extends CallKind> = (request: RequestOf<K>, context: Context) => Promise<{ result: ResultOf<K>; transfer?: Transferable[] }>;

export interface Session {
  receive(message: ToWorker): void;
}

export function createSession(post: Post): Session {
  const slots = new Map<Slot, SlotState>();
  const running = new Map<number, AbortController>();
  let nextVersion = 1;

  const slotFor = (slot: Slot, version: number): SlotState => {
    const state = slots.get(slot);
    if (state === undefined || state.version !== version) throw new Cancelled(); // superseded by a newer file
    return state;
  };

  const handlers: { [K in CallKind]: Handler<K> } = {
    async open(request, context) {
      const version = nextVersion++;
      const missingTokens = request.missingTokens ?? DEFAULT_MISSING_TOKENS;
      // A chosen file's fingerprint is read (two small slices) while the file itself is: after the
      // read it would be two more trips to the browser before the summary.
      const early = request.source.kind === 'file' ? fingerprintFile(request.source.file, request.source.file.name) : null;
      early?.catch(() => undefined); // a read that fails reports its own error
      // Long level lists go to the page while the number columns are still being profiled elsewhere.
      const levelsSent = new Set<number>();
      const read = await readSource(request.source, {
        delimiter: request.delimiter ?? null,
        ...(request.maxBytes === undefined ? {} : { maxBytes: request.maxBytes }),
        signal: context.signal,
        onProgress: (done, total) => context.progress('reading', done, total),
        // Read on several threads, the table is profiled there as it is joined.
        profiling: request.draft ? { missingTokens } : null,
        onProfiling: () => context.progress('profiling', 0, null),
        onTextProfiles: (profiles) =>
          profiles.forEach((profile, column) => {
            if (profile !== null && sendLongLevels(profile, column, context)) levelsSent.add(column);
          }),
      });
      const { table } = read.read;
      const fingerprint = await (early ?? fingerprintFile(read.file, read.fileName));
      let profiles: OpenedTable['profiles'] = [];
      let draft: Recipe | null = null;
      if (request.draft) {
        context.progress('profiling', 0, null);
        await breathe(context.signal);
        ({ profiles, draft } = proposal(table, read.fileName, missingTokens, read.profiles));
      }
      if (context.signal.aborted) throw new Cancelled();
      slots.set(request.slot, { version, table, fileName: read.fileName, plan: null, revision: -1, shownRows: null });
      const result: OpenedTable = {
        slot: request.slot,
        version,
        fileName: read.fileName,
        fingerprint,
        byteSize: read.file.size,
        rowCount: table.rowCount,
        names: table.names,
        format:
          read.sheet === null
            ? { kind: 'text', delimiter: read.read.delimiter, encoding: read.read.encoding, scanner: wasmRecordScanner() === null ? 'javascript' : 'webassembly', ...(read.compressed ? { compressed: 'gzip' as const } : {}) }
            : { kind: 'sheet', sheet: read.sheet.name, sheets: read.sheet.names },
        rowIssues: table.rowIssues.slice(0, ROW_ISSUES_LISTED),
        rowIssueCount: table.rowIssues.length,
        headerIssues: table.headerIssues,
        profiles: sendLongLevelsAhead(profiles, context, levelsSent),
        draft,
      };
      return { result };
    },

    async 'use-recipe'(request) {
      const state = slotFor(request.slot, request.version);
      const plan = compilePlan(request.recipe, state.table.names);
      state.plan = plan;
      state.revision = request.revision;
      const rows = state.shownRows;
      const window = rows === null ? null : previewWindow(plan, state.table, rows.start, rows.end, request.version, request.revision);
      const result: RecipeInUse = {
        revision: request.revision,
        outputs: plan.outputs,
        missingColumns: plan.missingColumns,
        extraColumns: plan.extraColumns,
        ...(window === null ? {} : { window }),
      };
      return { result, ...(window === null ? {} : { transfer: windowBuffers(window) }) };
    },

    async window(request) {
      const state = slotFor(request.slot, request.version);
      state.shownRows = { start: request.start, end: request.end };
      if (state.plan === null || state.revision !== request.revision) throw new Cancelled(); // a newer recipe is on its way
      const result = previewWindow(state.plan, state.table, request.start, request.end, request.version, request.revision);
      return { result, transfer: windowBuffers(result) };
    },

    async export(request, context) {
      const state = slotFor(request.slot, request.version);
      const plan = compilePlan(request.recipe, state.table.names);
      // The writer reuses its buffer: a copy is what travels — a byte array (transferred, not
      // cloned), or a Blob, whose bytes go to the browser's blob store and never reach the page.
      const send = (part: Uint8Array): void =>
        request.parts === 'blobs' ? context.blob(new Blob([part as Uint8Array<ArrayBuffer>])) : context.chunk(part.slice());
      const gzip = request.compress === 'gzip' ? gzipParts(send) : null;
      const writer = createCsvWriter(plan, gzip === null ? send : (part) => gzip.write(part));
      try {
        writer.writeHeader();
        const report = await encodeAll(plan, state.table, context, 'writing', (batch) => writer.writeBatch(batch), gzip?.drained);
        writer.finish();
        const compressedBytes = gzip === null ? null : await gzip.finish();
        const result: ExportSummary = { bytes: writer.bytesWritten, compressedBytes, rowsWritten: report.rowsWritten, report };
        return { result };
      } catch (error) {
        gzip?.abort();
        throw error;
      }
    },

    async check(request, context) {
      const state = slotFor(request.slot, request.version);
      const plan = compilePlan(request.recipe, state.table.names);
      const result = await encodeAll(plan, state.table, context, 'checking', () => undefined);
      return { result };
    },

    async reprofile(request, context) {
      const state = slotFor(request.slot, request.version);
      context.progress('profiling', 0, null);
      await breathe(context.signal);
      const { table } = state;
      const profiled = await profileSharingWorkers(table, { missingTokens: request.missingTokens }, context.signal);
      const { profiles, draft } = proposal(table, state.fileName, request.missingTokens, profiled);
      if (context.signal.aborted) throw new Cancelled();
      return { result: { profiles: sendLongLevelsAhead(profiles, context), draft } };
    },

    async close(request) {
      slots.delete(request.slot);
      return { result: null };
    },
  };

  const run = async (message: Exclude<ToWorker, { type: 'cancel' }>): Promise<void> => {
    const controller = new AbortController();
    running.set(message.id, controller);
    const context: Context = {
      id: message.id,
      signal: controller.signal,
      progress: throttledProgress((phase, done, total) => post({ type: 'progress', id: message.id, phase, done, total })),
      chunk: (bytes) => post({ type: 'chunk', id: message.id, bytes }, [bytes.buffer]),
      blob: (blob) => post({ type: 'blob', id: message.id, blob }),
      levels: (column, levels) => post({ type: 'levels', id: message.id, column, levels }, runBuffers(levels)),
    };
    try {
      // The handler table is keyed by message type; TypeScript cannot narrow the pair, hence the cast.
      const handler = handlers[message.type] as Handler<CallKind>;
      const { result, transfer } = await handler(message as RequestOf<CallKind>, context);
      if (controller.signal.aborted) post({ type: 'cancelled', id: message.id });
      else post({ type: 'done', id: message.id, result }, transfer);
    } catch (error) {
      if (error instanceof Cancelled || controller.signal.aborted) post({ type: 'cancelled', id: message.id });
      else post({ type: 'failed', id: message.id, problem: problemOf(error) });
    } finally {
      running.delete(message.id);
    }
  };

  return {
    receive(message) {
      if (message.type === 'cancel') {
        running.get(message.id)?.abort();
        return;
      }
      void run(message);
    },
  };
}

/**
 * The table's profiles and the recipe proposed from them, reading `missingTokens` as missing;
 * `profiled`: the profiles already made with those spellings while the table was read.
 */
function proposal(table: Table, fileName: string, missingTokens: readonly string[], profiled: ColumnProfile[] | null = null): { profiles: ColumnProfile[]; draft: Recipe } {
  const profiles = profiled ?? profileTable(table, { missingTokens });
  // The delimiter is left to detection (null) rather than pinned to this file's: a recipe made on
  // a comma file then still reads a semicolon or tab export of the same data.
  const draft = draftRecipe(profiles, { file: fileName, rows: table.rowCount }, { missingTokens: [...missingTokens], delimiter: null });
  return { profiles, draft };
}

/**
 * Posts each level list longer than PACK_ABOVE_LEVELS ahead, packed (the `levels` message), but for
 * the columns in `alreadySent` (sendLongLevels did), and returns the profiles with those lists left
 * empty for the `done` answer.
 */
export function sendLongLevelsAhead(profiles: readonly ColumnProfile[], context: Pick<Context, 'levels'>, alreadySent: ReadonlySet<number> = new Set()): ColumnProfile[] {
  return profiles.map((profile, column) => {
    if (!hasLongLevels(profile)) return profile;
    if (!alreadySent.has(column)) sendLongLevels(profile, column, context);
    return withField(profile, 'levels', []);
  });
}

function hasLongLevels(profile: ColumnProfile): boolean {
  const count = levelCount(profile);
  return count !== null && count > PACK_ABOVE_LEVELS;
}

/** Posts the level list of `profile` (column `column`) packed, when it is longer than PACK_ABOVE_LEVELS; whether it did. */
export function sendLongLevels(profile: ColumnProfile, column: number, context: Pick<Context, 'levels'>): boolean {
  if (!hasLongLevels(profile)) return false;
  // An identifier's levels, still bytes, go packed from there: no string per level is made here.
  const source = levelSourceOf(profile);
  for (const run of source === null ? packLevels(profile.levels ?? []) : packLevelsFromBytes(source)) context.levels(column, run);
  return true;
}

function windowBuffers(window: PreviewWindow): Transferable[] {
  return [window.values.buffer, window.lines.buffer, window.rejected.buffer];
}

/** Rows [start, end) encoded for the preview, with their lines, rejections and original texts. */
export function previewWindow(plan: Plan, table: Table, start: number, end: number, version: number, revision: number): PreviewWindow {
  const from = Math.max(0, Math.min(start, table.rowCount));
  const to = Math.max(from, Math.min(end, table.rowCount, from + MAX_WINDOW_ROWS));
  const { values, batch } = encodeWindow(plan, windowTable(table, from, to), 0, to - from);
  const cells: string[] = [];
  for (let row = from; row < to; row++) for (const column of table.columns) cells.push(cellText(column, row));
  return {
    version,
    revision,
    start: from,
    end: to,
    values,
    width: plan.outputs.length,
    lines: table.lineOfRow.slice(from, to),
    rejected: batch.rejected.slice(),
    cells,
  };
}

/**
 * Encodes every row in batches, recording the report, handing each batch to `write`. The same
 * steps as core's encodeTable, with a pause between batches so the job can be cancelled and
 * progress can be shown.
 */
async function encodeAll(
  plan: Plan,
  table: Table,
  context: Context,
  phase: Phase,
  write: (batch: ReturnType<typeof encodeBatch>) => void,
  /** Awaited after each batch: where the bytes go can take more. */
  drained?: () => Promise<void>,
): Promise<ApplyReport> {
  const report = createApplyReport(plan);
  context.progress(phase, 0, table.rowCount);
  for (let start = 0; start < table.rowCount; start += BATCH_ROWS) {
    const end = Math.min(table.rowCount, start + BATCH_ROWS);
    write(encodeBatch(plan, table, start, end, report));
    context.progress(phase, end, table.rowCount);
    await drained?.();
    await breathe(context.signal);
  }
  return report.finish();
}

/** Progress within a phase is passed on at most this often: ten times a second moves a bar smoothly. */
export const PROGRESS_EVERY_MS = 100;

/**
 * Passes on a progress report only when it moved by at least half a percent and PROGRESS_EVERY_MS
 * have passed since the last, changed phase, or finished: a gigabyte read in 64 KB chunks would
 * otherwise send the page 16,000 messages. Each message costs the worker more than its copy: in
 * Chromium on 2 cores, 49 reports while a 123 MB file loaded took 81 ms of the worker's time in
 * postMessage (a profile), 21 reports 14 ms.
 */
export function throttledProgress(send: Context['progress'], now: () => number = () => performance.now()): Context['progress'] {
  let lastPhase: Phase | null = null;
  let lastStep = -1;
  let lastAt = -Infinity;
  return (phase, done, total) => {
    // Whole steps of 0.5 %, so rounding in the division cannot skip or repeat one.
    const step = total ? Math.floor((done * 200) / total) : 0;
    if (phase === lastPhase && total !== null && done < total && (step <= lastStep || now() - lastAt < PROGRESS_EVERY_MS)) return;
    lastPhase = phase;
    lastStep = step;
    lastAt = now();
    send(phase, done, total);
  };
}

/** Lets queued messages (a cancel) in, then stops the job if it was cancelled. */
async function breathe(signal: AbortSignal): Promise<void> {
  await new Promise<void>((resolve) => setTimeout(resolve, 0));
  if (signal.aborted) throw new Cancelled();
}

export function problemOf(error: unknown): Problem {
  if (isLevelwiseError(error)) {
    return {
      code: error.code,
      message: error.message,
      hint: error.hint,
      ...(error.line !== undefined ? { line: error.line } : {}),
      ...(error.column !== undefined ? { column: error.column } : {}),
    };
  }
  const message = error instanceof Error ? error.message : String(error);
  return { code: 'internal', message: `Something went wrong inside Levelwise: ${message}`, hint: 'Reload the page and try again; if it happens again, the file may have found a fault in Levelwise.' };
}
