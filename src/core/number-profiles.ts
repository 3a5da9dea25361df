/**
 * Profiling a table's number columns on other threads while this one joins the table and profiles
 * its text columns: the command line's reading threads and the page's segment workers, once they
 * have read their segments, have nothing else to do.
 *
 * The columns kept as numbers in every part are the costly ones to profile (a million numbers
 * counted and sorted), cheap to send (typed arrays), and their profiles small to send back (no
 * levels). Each goes, as copies of its parts, to a thread that is free: one column per thread at a
 * time, in column order, the next as soon as one comes free. A column no thread has started when
 * this thread asks for it (`take`, from core profileTableSharing) is left to this thread, so the
 * threads share the columns with it, whichever finishes its own work first.
 *
 * How a request reaches a thread is the caller's (a `NumberPartsProfiler` each); what the thread
 * does with it is `profileNumberParts`.
 */
import type { NumberColumn, Table } from './columns.ts';
import { concatColumns } from './concat-tables.ts';
import { profileColumn, type ColumnProfile, type ProfileOptions } from './profile.ts';

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

/** What the other thread answers: profileColumn of the parts joined as the table's column is joined. */
export function profileNumberParts(request: NumberPartsRequest): ColumnProfile {
  return profileColumn(concatColumns(request.parts, request.rowCounts), request.index, request.options);
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

export class NumberProfiles {
  private parts: readonly Table[];
  private readonly options: ProfileOptions;
  private readonly profilers: readonly NumberPartsProfiler[];
  /** Column indices not yet started, in column order. */
  private readonly waiting: number[] = [];
  private readonly started = new Map<number, Promise<ColumnProfile>>();
  /** Indices into `profilers` of the threads free now. */
  private readonly free: number[];

  /** `parts`: the table's parts in file order, as read; the profiling starts at once. */
  constructor(parts: readonly Table[], options: ProfileOptions, profilers: readonly NumberPartsProfiler[]) {
    this.parts = parts;
    this.options = options;
    this.profilers = profilers;
    this.free = profilers.map((_, p) => p).reverse();
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

  /** The profile of column `index` from another thread, or null when none has it or is free to take it. */
  take(index: number): Promise<ColumnProfile> | null {
    const started = this.started.get(index);
    if (started !== undefined) return started;
    const at = this.waiting.indexOf(index);
    if (at < 0) return null;
    this.waiting.splice(at, 1);
    const profiler = this.free.pop();
    return profiler === undefined ? null : this.start(profiler, index);
  }

  private startWhileFree(): void {
    while (this.free.length > 0 && this.waiting.length > 0) this.start(this.free.pop()!, this.waiting.shift()!);
  }

  private start(profiler: number, index: number): Promise<ColumnProfile> {
    const rowCounts = this.parts.map((part) => part.rowCount);
    // Copies of the rows only: a part's arrays may have room for more (the first has room for the
    // whole file), and this thread keeps its own.
    const parts = this.parts.map((part, k) => numberRowsCopy(part.columns[index] as NumberColumn, rowCounts[k]!));
    const profiled = this.profilers[profiler]!({ parts, rowCounts, index, options: this.options }).finally(() => {
      this.free.push(profiler);
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
