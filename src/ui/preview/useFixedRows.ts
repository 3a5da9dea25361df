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
  /** Offset of the row's top from the top of the scrolling content, in pixels. */
  readonly start: number;
}

interface Viewport {
  readonly top: number;
  readonly height: number;
}

/**
 * Tallest scrolling content made, in pixels. Browsers lay out elements only up to a height (about
 * 33.5 million pixels in Chromium, 17.9 million in Firefox, from memory), so 28-pixel rows stop
 * being reachable after ~600,000–1,200,000 rows (in Chromium, uncapped, the last of 1,300,000 rows
 * could not be scrolled to: test/e2e/workbench.test.ts); a taller table scrolls through a scaled range.
 */
export const MAX_SCROLL_SIZE = 15_000_000;

/** The scrolling content's height for `count` rows: their height, or MAX_SCROLL_SIZE when taller. */
export function scrollSize(count: number, rowHeight: number, maxSize = MAX_SCROLL_SIZE): number {
  return Math.min(Math.max(0, count) * rowHeight, maxSize);
}

/**
 * Rows [first, last] that meet the viewport, with `overscan` more on each side, clipped to the rows
 * there are. When the rows are taller than `maxSize`, the scroll position is scaled: the top of the
 * range shows the first row, its bottom the last, and rows are placed around the viewport.
 */
export function rowsInView(viewport: Viewport, count: number, rowHeight: number, overscan: number, maxSize = MAX_SCROLL_SIZE): FixedRow[] {
  if (count <= 0 || rowHeight <= 0) return [];
  const size = count * rowHeight;
  const shown = scrollSize(count, rowHeight, maxSize);
  // Where the viewport's top is among the rows: the scroll position itself, or scaled so that the
  // last scroll position shows the last rows.
  const scale = size > shown && shown > viewport.height ? (size - viewport.height) / (shown - viewport.height) : 1;
  const top = viewport.top * scale;
  const first = Math.max(0, Math.floor(top / rowHeight) - overscan);
  const last = Math.min(count - 1, Math.ceil((top + viewport.height) / rowHeight) + overscan);
  const rows: FixedRow[] = [];
  for (let index = first; index <= last; index++) rows.push({ index, start: viewport.top + index * rowHeight - top });
  return rows;
}

/** `headerSize`: pixels at the top of the scrolling content above the first row (a sticky header). */
export function useFixedRows(scrollRef: RefObject<HTMLElement | null>, count: number, rowHeight: number, overscan: number, headerSize = 0) {
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
  // The rows' own viewport: below the header, which stays in view over them.
  const rowsViewport = { top: viewport.top, height: Math.max(0, viewport.height - headerSize) };
  return { rows: rowsInView(rowsViewport, count, rowHeight, overscan), totalSize: scrollSize(count, rowHeight) };
}
