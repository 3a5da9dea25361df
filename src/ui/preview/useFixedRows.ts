/**
 * The rows on screen in a scrolling grid whose rows all have one height, found by arithmetic from
 * the scroll position. A general virtualiser keeps an entry per row and measures them all whenever
 * the row count changes: for a million-row file that was ~50 ms of the main thread when the file
 * opened (bench/README.md, "In the page"), growing with the file. Here the cost is that of the
 * rows on screen, whatever the file's length.
 */
import { useLayoutEffect, useState, type RefObject } from 'react';

export interface FixedRow {
  readonly index: number;
  /** Offset of the row's top from the first row's, in pixels. */
  readonly start: number;
}

interface Viewport {
  readonly top: number;
  readonly height: number;
}

/** Rows [first, last] that meet the viewport, with `overscan` more on each side, clipped to the rows there are. */
export function rowsInView(viewport: Viewport, count: number, rowHeight: number, overscan: number): FixedRow[] {
  if (count <= 0 || rowHeight <= 0) return [];
  const first = Math.max(0, Math.floor(viewport.top / rowHeight) - overscan);
  const last = Math.min(count - 1, Math.ceil((viewport.top + viewport.height) / rowHeight) + overscan);
  const rows: FixedRow[] = [];
  for (let index = first; index <= last; index++) rows.push({ index, start: index * rowHeight });
  return rows;
}

export function useFixedRows(scrollRef: RefObject<HTMLElement | null>, count: number, rowHeight: number, overscan: number) {
  const [viewport, setViewport] = useState<Viewport>({ top: 0, height: 0 });
  useLayoutEffect(() => {
    const element = scrollRef.current;
    if (element === null) return;
    const update = () =>
      setViewport((seen) => (seen.top === element.scrollTop && seen.height === element.clientHeight ? seen : { top: element.scrollTop, height: element.clientHeight }));
    update();
    element.addEventListener('scroll', update, { passive: true });
    const resizes = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(update);
    resizes?.observe(element);
    return () => {
      element.removeEventListener('scroll', update);
      resizes?.disconnect();
    };
  }, [scrollRef]);
  return { rows: rowsInView(viewport, count, rowHeight, overscan), totalSize: Math.max(0, count) * rowHeight };
}
