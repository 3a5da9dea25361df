/**
 * Putting segments of a file read on several threads back in order (see read-segment.ts): which
 * segment comes next, where its rows and lines start in the file, and which one to read again
 * because it began at a line break inside a quoted field.
 *
 * The first segment (the header and the first rows) is read alone; the jobs for the rest are cut
 * from where it stopped. Their results may arrive in any order; the caller hands them to `place`
 * in job order.
 */

/** One segment to read: push the file's bytes from `firstByte` on, stop at `stopAt` (see SegmentOptions). */
export interface SegmentJob {
  readonly firstByte: number;
  readonly stopAt: number;
  /** Byte `firstByte` is known to end a record (a segment read again): start right after it. */
  readonly afterRecord?: boolean;
}

/** What a segment reported (SegmentResult without its rows). */
export interface SegmentBounds {
  readonly start: number;
  readonly end: number;
  readonly rows: number;
  readonly lineBreaks: number;
}

export type Placement =
  /** Its rows come next: number them from `rowOffset`, its lines from `lineOffset`. */
  | { readonly kind: 'take'; readonly rowOffset: number; readonly lineOffset: number }
  /** All its records were read by the segments before it (one ran past its stop, in a quoted field). */
  | { readonly kind: 'skip' }
  /** It began inside a quoted field: read `job` instead, before any later segment. */
  | { readonly kind: 'redo'; readonly job: SegmentJob };

/**
 * Jobs covering the file from byte `from` (where the first segment stopped) to its end, each of
 * about `segmentBytes`; the last runs to the end of the file whatever its stop says.
 */
export function segmentJobs(from: number, fileBytes: number, segmentBytes: number): SegmentJob[] {
  if (!(segmentBytes >= 1)) throw new Error(`segmentJobs: segments of ${segmentBytes} bytes`);
  const jobs: SegmentJob[] = [];
  for (let cut = from; cut < fileBytes; cut += segmentBytes) {
    const stopAt = cut + segmentBytes;
    // Every record starts after a line break, so byte cut − 1 is where a segment starting at a
    // record start is pushed from (it skips through that line break).
    jobs.push({ firstByte: cut - 1, stopAt: stopAt >= fileBytes ? Infinity : stopAt });
  }
  return jobs;
}

export class SegmentOrder {
  private nextStart: number;
  private rowsBefore: number;
  private lineBreaksBefore: number;

  /** `first`: the first segment (header included), read from the file's start. */
  constructor(first: { readonly end: number; readonly rows: number; readonly lineBreaks: number }) {
    this.nextStart = first.end;
    this.rowsBefore = first.rows;
    this.lineBreaksBefore = first.lineBreaks;
  }

  /** The file byte where the next segment must start. */
  get next(): number {
    return this.nextStart;
  }

  /** Data rows placed so far, the first segment's included. */
  get rows(): number {
    return this.rowsBefore;
  }

  /** Line breaks before the next segment's start, from the file's start. */
  get lineBreaks(): number {
    return this.lineBreaksBefore;
  }

  /** Where `segment`, read for `job`, goes; a segment taken moves the order past it. */
  place(job: SegmentJob, segment: SegmentBounds): Placement {
    const placement = this.check(job, segment.start);
    if (placement.kind === 'take') this.advance(segment);
    return placement;
  }

  /**
   * Where a segment read for `job` goes, from its start alone (known before its end, so that its
   * rows can be taken while it is still being read). After a 'take', call `advance` with its bounds.
   */
  check(job: SegmentJob, start: number): Placement {
    if (start === this.nextStart) return { kind: 'take', rowOffset: this.rowsBefore, lineOffset: this.lineBreaksBefore };
    // Its records, all starting before its stop, were read by the segments before it.
    if (job.stopAt <= this.nextStart) return { kind: 'skip' };
    return { kind: 'redo', job: { firstByte: this.nextStart - 1, stopAt: job.stopAt, afterRecord: true } };
  }

  /** The segment taken last ended at `end` after `rows` rows and `lineBreaks` line breaks. */
  advance(segment: Omit<SegmentBounds, 'start'>): void {
    this.nextStart = segment.end;
    this.rowsBefore += segment.rows;
    this.lineBreaksBefore += segment.lineBreaks;
  }
}
