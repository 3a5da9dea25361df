/**
 * Every message between the page and its worker, in one place.
 *
 * The page sends a request carrying a request `id`; the worker answers with any number of
 * `progress` (and, for exports, `chunk`) messages and then exactly one of `done`, `failed` or
 * `cancelled` with the same id. Requests about an open table carry its data `version` (a new
 * number each time a file is opened into a slot) and, where a recipe is involved, the recipe's
 * `revision`; answers about an older version or revision are refused or dropped, never shown
 * against the wrong data.
 *
 * Tables stay in the worker. What crosses the boundary is small (profiles, a recipe, a report) or
 * a transferable typed array (a preview window's numbers, a part of the encoded CSV).
 */
import type { HeaderIssue, RowIssue } from '../core/columns.ts';
import type { ColumnProfile } from '../core/profile.ts';
import type { Recipe } from '../core/recipe.ts';
import type { ApplyReport } from '../core/apply-report.ts';
import type { PackedLevels } from './packed-levels.ts';

/**
 * Two tables can be open at once: the one being decided about, and a second file a finished
 * recipe is re-applied to.
 */
export type Slot = 'work' | 'reuse';

/** Where a table comes from. */
export type TableSource =
  | { readonly kind: 'file'; readonly file: File; readonly sheet?: string | null }
  /** The built-in, invented demo survey, generated inside the worker. */
  | { readonly kind: 'demo'; readonly rows: number };

/** A problem a person can act on: what, where, what to do. */
export interface Problem {
  readonly code: string;
  readonly message: string;
  /** 1-based line in the file, when the problem has one. */
  readonly line?: number;
  /** 1-based column position, when the problem has one. */
  readonly column?: number;
  readonly hint?: string;
}

export type Phase = 'reading' | 'profiling' | 'encoding' | 'writing' | 'checking';

// ---------------------------------------------------------------------------------------------
// Requests, one interface per kind; `Call` maps each kind to its request and result.

export interface OpenRequest {
  readonly type: 'open';
  readonly slot: Slot;
  readonly source: TableSource;
  /** Missing-value tokens for profiling; the re-use slot takes them from the recipe. */
  readonly missingTokens?: readonly string[];
  /** Field delimiter to use instead of detecting one (the re-use slot takes it from the recipe). */
  readonly delimiter?: Recipe['reading']['delimiter'];
  /** Draft a recipe for the table (the work slot); the re-use slot gets its recipe from the person. */
  readonly draft: boolean;
  /** Largest file to open, in bytes, instead of the page's limit (worker/page-limits.ts); for tests. */
  readonly maxBytes?: number;
}

export interface OpenedTable {
  readonly slot: Slot;
  readonly version: number;
  readonly fileName: string;
  /** Name + size + hash of the file's edges; keys the saved decisions. */
  readonly fingerprint: string;
  readonly byteSize: number;
  readonly rowCount: number;
  readonly names: readonly string[];
  /** How the file was read, to show the person ("comma-separated, UTF-8", "sheet Survey"). */
  readonly format:
    | {
        readonly kind: 'text';
        readonly delimiter: string;
        readonly encoding: string;
        /** Present when the file was gzip-compressed (and unpacked while read). */
        readonly compressed?: 'gzip';
        /**
         * Which record scanner this worker has (core wasm-record-scanner.ts): WebAssembly, or
         * JavaScript where the engine or the page's policy refuses WebAssembly. The records are
         * the same; only the time differs. For tests and measurements, not shown.
         */
        readonly scanner: 'webassembly' | 'javascript';
      }
    | { readonly kind: 'sheet'; readonly sheet: string; readonly sheets: readonly string[] };
  /** The first structural problems (rows with too few or too many fields …); see rowIssueCount for all. */
  readonly rowIssues: readonly RowIssue[];
  readonly rowIssueCount: number;
  readonly headerIssues: readonly HeaderIssue[];
  readonly profiles: readonly ColumnProfile[];
  /** The proposed recipe, when the request asked for one. */
  readonly draft: Recipe | null;
}

export interface UseRecipeRequest {
  readonly type: 'use-recipe';
  readonly slot: Slot;
  readonly version: number;
  readonly revision: number;
  readonly recipe: Recipe;
}

export interface RecipeInUse {
  readonly revision: number;
  readonly outputs: readonly string[];
  readonly missingColumns: readonly string[];
  readonly extraColumns: readonly string[];
  /**
   * The rows the page last asked to see, already encoded with this recipe, so a decision reaches
   * the preview in one round trip instead of two; absent before the page has asked for any.
   */
  readonly window?: PreviewWindow;
}

export interface WindowRequest {
  readonly type: 'window';
  readonly slot: Slot;
  readonly version: number;
  readonly revision: number;
  /** Rows [start, end) of the table, 0-based. */
  readonly start: number;
  readonly end: number;
}

export interface PreviewWindow {
  readonly version: number;
  readonly revision: number;
  readonly start: number;
  /** One past the last row actually encoded (clipped to the table). */
  readonly end: number;
  /** Row-major numbers: (end − start) × outputs. Identifier outputs hold NaN; their text is in `cells`. */
  readonly values: Float64Array;
  readonly width: number;
  /** 1-based file line where each row starts. */
  readonly lines: Uint32Array;
  /** 1 where a policy rejects the row (it would not be written). */
  readonly rejected: Uint8Array;
  /** The original cell texts, row-major: (end − start) × names.length. */
  readonly cells: readonly string[];
}

export interface ExportRequest {
  readonly type: 'export';
  readonly slot: Slot;
  readonly version: number;
  readonly recipe: Recipe;
  /**
   * How the parts travel: 'bytes' (the default) as transferred byte arrays; 'blobs' as Blobs made in
   * the worker, so the page's main thread never copies or holds the file's bytes (the page's choice).
   */
  readonly parts?: 'bytes' | 'blobs';
  /** 'gzip': the parts are the CSV gzip-compressed (gzip-parts.ts). */
  readonly compress?: 'gzip';
}

export interface ExportSummary {
  /** Bytes of CSV written (before any compression). */
  readonly bytes: number;
  /** With `compress`: the bytes of the parts, compressed; else null. */
  readonly compressedBytes: number | null;
  readonly rowsWritten: number;
  readonly report: ApplyReport;
}

/** A full pass over the slot's table with the recipe, recording what every policy did. */
export interface CheckRequest {
  readonly type: 'check';
  readonly slot: Slot;
  readonly version: number;
  readonly recipe: Recipe;
}

/** The open table profiled and drafted again with other missing spellings (no reading again). */
export interface ReprofileRequest {
  readonly type: 'reprofile';
  readonly slot: Slot;
  readonly version: number;
  /** Cell texts (after trimming) read as missing; the empty cell always is. */
  readonly missingTokens: readonly string[];
}

export interface Reprofiled {
  readonly profiles: readonly ColumnProfile[];
  /** The recipe proposed under these spellings; they are in its `reading.missingTokens`. */
  readonly draft: Recipe;
}

export interface CloseRequest {
  readonly type: 'close';
  readonly slot: Slot;
}

export interface Call {
  open: { request: OpenRequest; result: OpenedTable };
  'use-recipe': { request: UseRecipeRequest; result: RecipeInUse };
  window: { request: WindowRequest; result: PreviewWindow };
  export: { request: ExportRequest; result: ExportSummary };
  check: { request: CheckRequest; result: ApplyReport };
  reprofile: { request: ReprofileRequest; result: Reprofiled };
  close: { request: CloseRequest; result: null };
}

export type CallKind = keyof Call;
export type RequestOf<K extends CallKind> = Call[K]['request'];
export type ResultOf<K extends CallKind> = Call[K]['result'];

/** What the page posts: a request with its id, or a cancellation of an earlier one. */
export type ToWorker =
  | { readonly [K in CallKind]: RequestOf<K> & { readonly id: number } }[CallKind]
  | { readonly type: 'cancel'; readonly id: number };

// ---------------------------------------------------------------------------------------------
// Answers.

export type FromWorker =
  | {
      readonly type: 'progress';
      readonly id: number;
      readonly phase: Phase;
      /** Work done and total in the same unit (bytes while reading, rows after); total null when unknown. */
      readonly done: number;
      readonly total: number | null;
    }
  /** A part of an export, in order; the page writes it out or keeps it for one Blob. */
  | { readonly type: 'chunk'; readonly id: number; readonly bytes: Uint8Array }
  /** The same, as a Blob made in the worker, for an export that asked for `parts: 'blobs'`. */
  | { readonly type: 'blob'; readonly id: number; readonly blob: Blob }
  /**
   * A packed run of one column's profile levels, sent ahead of an `open` answer's `done` when the
   * column has very many (packed-levels.ts). That column's `levels` in `done` is empty; the client
   * gives the profile its runs back, unpacked when first read.
   */
  | { readonly type: 'levels'; readonly id: number; readonly column: number; readonly levels: PackedLevels }
  | { readonly type: 'done'; readonly id: number; readonly result: ResultOf<CallKind> }
  | { readonly type: 'failed'; readonly id: number; readonly problem: Problem }
  | { readonly type: 'cancelled'; readonly id: number };

/** Thrown by the client when the worker answers `failed`. */
export class WorkerProblem extends Error {
  constructor(readonly problem: Problem) {
    super(problem.message);
    this.name = 'WorkerProblem';
  }
}

/** Thrown by the client when a request was cancelled (by the person, or by a newer request). */
export class Cancelled extends Error {
  constructor() {
    super('Cancelled.');
    this.name = 'Cancelled';
  }
}
