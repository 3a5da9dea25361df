/**
 * Profiling a table's number columns on other threads while this one joins the table and profiles
 * its text columns: the command line's reading threads and the page's segment workers, once they
 * have read their segments, have nothing else to do.
 *
 * The columns kept as numbers in every part are the costly ones to profile (a million numbers
 * counted and sorted), cheap to send (typed arrays), and their profiles small to send back (no
 * levels). Each goes, as copies of its parts, in column order, to the thread with the fewest in
 * hand, up to COLUMNS_IN_HAND each: the next is there when a thread finishes one, however long
 * this thread is busy joining before it sees the answer and could send another. A column no thread
 * has been given when this thread asks for it (`take`, from core profileTableSharing) is left to
 * this thread, so the threads share the columns with it, whichever finishes its own work first.
 * Where the caller can `claim` a column from its thread (the command line: a flag in memory both
 * threads share), a column that thread holds but has not begun (it waits behind another) is taken
 * back when this thread asks for it: on two cores `levelwise draft` otherwise waited ~0.15 s for
 * its one reading thread to profile the second of two number columns.
 *
 * How a request reaches a thread is the caller's (a `NumberPartsProfiler` each); what the thread
 * does with it is `profileNumberParts`.
 */
import type { NumberColumn, Table } from './columns.ts';
import { missingNumbers } from './missing.ts';
import { countNumberCells, joinNumberCells } from './number-cells.ts';
import { releaseBuffer } from './release-buffers.ts';
import { profileNumberCells, profileTableSharing, withInvalidExamples, type ColumnProfile, type ProfileOptions, type TextProfilesListener } from './profile.ts';

/** One number column's parts, in file order, with the rows each holds. */
export interface NumberPartsRequest {
  readonly parts: readonly NumberColumn[];
  readonly rowCounts: readonly number[];
  /** The column's index in the table. */
  readonly index: number;
  readonly options: ProfileOptions;
}

/** Sends a request to one other thread; resolves with that thread's `profileNumberParts` answer. */
export type NumberPartsProfiler = (request: NumberPartsRequest) => Promise<ColumnProfile>;

/**
 * What the other thread answers: profileColumn of the parts joined as the table's column is joined.
 * Each part is counted on its own and the counts added (number-cells.ts), so the parts are never
 * joined into one column here: no second copy of a million numbers while they are profiled. With
 * `releaseParts` (the parts are copies made for this request, as requestBuffers sends them), their
 * storage is given back once profiled. The request must not be used afterwards.
 */
export function profileNumberParts(request: NumberPartsRequest, releaseParts = false): ColumnProfile {
  const { parts, rowCounts, index, options } = request;
  // Each part's cells are its first rowCounts[k] rows.
  const columns = parts.map((part, k) => (part.length === rowCounts[k] ? part : { ...part, length: rowCounts[k]! }));
  const codedMissing = missingNumbers(options.missingTokens);
  const firstRows: number[] = [];
  let rows = 0;
  for (const count of rowCounts) {
    firstRows.push(rows);
    rows += count;
  }
  const cells = joinNumberCells(columns.map((column) => countNumberCells(column, codedMissing)), firstRows);
  const profile = withInvalidExamples(profileNumberCells(cells, { name: columns[0]!.name, index, length: rows }, options), columns, options);
  if (releaseParts) for (const buffer of requestBuffers(request)) releaseBuffer(buffer);
  return profile;
}

/** The typed arrays of a request, for a caller that transfers them rather than copying them again. */
export function requestBuffers(request: NumberPartsRequest): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  for (const part of request.parts) {
    buffers.add(part.values.buffer as ArrayBuffer);
    if (part.fixedDigits !== null) buffers.add(part.fixedDigits.buffer as ArrayBuffer);
  }
  return [...buffers];
}

/**
 * Columns a thread has in hand at most. With one, a thread waited for the next while this one was
 * still joining the table: in the page, 200–250 ms of a 123 MB file's profile (Chromium, 2 cores).
 */
export const COLUMNS_IN_HAND = 2;

/**
 * Takes column `index` back from the thread it was given to: true when that thread had not begun
 * it and now never will (its answer to that request is then never used), false when it has begun.
 */
export type ColumnClaim = (index: number) => boolean;

export class NumberProfiles {
  private parts: readonly Table[];
  private readonly options: ProfileOptions;
  private readonly profilers: readonly NumberPartsProfiler[];
  /** Column indices not yet started, in column order. */
  private readonly waiting: number[] = [];
  private readonly started = new Map<number, Promise<ColumnProfile>>();
  /** Per profiler, the columns it has been given and not yet answered. */
  private readonly inHand: number[];
  private readonly inHandAtMost: number;
  private readonly claim: ColumnClaim | null;

  /**
   * `parts`: the table's parts in file order, as read; the profiling starts at once. `claim`: see
   * ColumnClaim; without it, a column given to a thread is always awaited from it.
   */
  constructor(parts: readonly Table[], options: ProfileOptions, profilers: readonly NumberPartsProfiler[], inHandAtMost = COLUMNS_IN_HAND, claim: ColumnClaim | null = null) {
    this.parts = parts;
    this.options = options;
    this.profilers = profilers;
    this.inHand = profilers.map(() => 0);
    this.inHandAtMost = inHandAtMost;
    this.claim = claim;
    parts[0]?.columns.forEach((_, index) => {
      if (parts.every((part) => part.columns[index]!.kind === 'number')) this.waiting.push(index);
    });
    this.startWhileFree();
  }

  /**
   * The parts have been joined into `table` and may be given up (the page's worker detaches their
   * storage): columns started from now on are sent from the table's, as one part.
   */
  joinedInto(table: Table): void {
    this.parts = [table];
  }

  /**
   * profileTable's profiles of `table`: its number columns from the other threads where they have
   * them. `onTextProfiles`: see profileTableSharing's onHereDone.
   */
  profile(table: Table, onTextProfiles?: TextProfilesListener): Promise<ColumnProfile[]> {
    return profileTableSharing(table, this.options, (_, index) => this.take(index), onTextProfiles);
  }

  /**
   * The profile of column `index` from another thread; null, for this thread to profile it, when
   * no thread has it or can take it, or when the one that has it had not begun it (`claim`).
   */
  take(index: number): Promise<ColumnProfile> | null {
    const started = this.started.get(index);
    if (started !== undefined) return this.claim?.(index) === true ? null : started;
    const at = this.waiting.indexOf(index);
    if (at < 0) return null;
    this.waiting.splice(at, 1);
    const profiler = this.leastBusy();
    return profiler === null ? null : this.start(profiler, index);
  }

  /** The profiler with the fewest columns in hand, if it can take one more; the first of equals. */
  private leastBusy(): number | null {
    let best: number | null = null;
    this.inHand.forEach((count, p) => {
      if (count < this.inHandAtMost && (best === null || count < this.inHand[best]!)) best = p;
    });
    return best;
  }

  private startWhileFree(): void {
    for (let p = this.leastBusy(); p !== null && this.waiting.length > 0; p = this.leastBusy()) this.start(p, this.waiting.shift()!);
  }

  private start(profiler: number, index: number): Promise<ColumnProfile> {
    this.inHand[profiler]!++;
    const rowCounts = this.parts.map((part) => part.rowCount);
    // Copies of the rows only: a part's arrays may have room for more (the first has room for the
    // whole file), and this thread keeps its own.
    const parts = this.parts.map((part, k) => numberRowsCopy(part.columns[index] as NumberColumn, rowCounts[k]!));
    const profiled = this.profilers[profiler]!({ parts, rowCounts, index, options: this.options }).finally(() => {
      this.inHand[profiler]!--;
      this.startWhileFree();
    });
    profiled.catch(() => undefined); // awaited when taken, or not at all when the read fails
    this.started.set(index, profiled);
    return profiled;
  }
}

function numberRowsCopy(column: NumberColumn, rows: number): NumberColumn {
  return { ...column, values: column.values.slice(0, rows), fixedDigits: column.fixedDigits?.slice(0, rows) ?? null };
}
