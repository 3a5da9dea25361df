/**
 * Keeps the preview's window of encoded rows in step with what is on screen. The worker encodes
 * only the rows asked for (a screenful plus a screenful either side); a newer need cancels an older
 * request, and an answer for another data version or recipe revision is never shown.
 */
import { useCallback, useEffect, useLayoutEffect, useRef, useState } from 'react';
import type { Job, WorkbenchClient } from '../../worker/client.ts';
import { Cancelled, type PreviewWindow, type Slot } from '../../worker/protocol.ts';

export interface WindowTarget {
  readonly slot: Slot;
  readonly version: number;
  readonly revision: number;
  readonly rowCount: number;
}

/** Rows [first, last] on screen. */
export interface VisibleRows {
  readonly first: number;
  readonly last: number;
}

export function windowCovers(window: PreviewWindow | null, target: WindowTarget, visible: VisibleRows): boolean {
  if (window === null || window.version !== target.version || window.revision !== target.revision) return false;
  const last = Math.min(visible.last, target.rowCount - 1);
  return window.start <= visible.first && window.end > last;
}

/** The range to fetch for what is visible: a screenful of margin on each side, clipped to the table. */
export function windowToFetch(visible: VisibleRows, rowCount: number): { start: number; end: number } {
  const span = Math.max(1, visible.last - visible.first + 1);
  return { start: Math.max(0, visible.first - span), end: Math.min(rowCount, visible.last + 1 + span) };
}

/**
 * `seed` is the window that came with the recipe now in use (RecipeInUse.window): when it covers
 * the rows on screen, a decision needs no request of its own.
 */
export function useWindow(client: WorkbenchClient | null, target: WindowTarget | null, seed: PreviewWindow | null = null) {
  const [window, setWindow] = useState<PreviewWindow | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const visibleRef = useRef<VisibleRows>({ first: 0, last: 40 });
  const inFlight = useRef<{ job: Job<PreviewWindow>; key: string } | null>(null);
  // Numbers from another revision would sit under the wrong headers (outputs move), so they are not
  // shown. A window fetched for this revision is newer than the seed, so it wins.
  const fits = (w: PreviewWindow | null): w is PreviewWindow => w !== null && target !== null && w.version === target.version && w.revision === target.revision;
  const current = fits(window) ? window : fits(seed) ? seed : null;
  const windowRef = useRef<PreviewWindow | null>(null);
  windowRef.current = current;

  const fetchIfNeeded = useCallback(() => {
    if (client === null || target === null || target.rowCount === 0) return;
    const visible = visibleRef.current;
    if (windowCovers(windowRef.current, target, visible)) return;
    const { start, end } = windowToFetch(visible, target.rowCount);
    const key = `${target.version}:${target.revision}:${start}:${end}`;
    if (inFlight.current?.key === key) return;
    inFlight.current?.job.cancel();
    const job = client.start('window', { slot: target.slot, version: target.version, revision: target.revision, start, end });
    inFlight.current = { job, key };
    job.result.then(
      (result) => {
        if (inFlight.current?.job === job) inFlight.current = null;
        setProblem(null);
        setWindow(result);
      },
      (error: unknown) => {
        if (inFlight.current?.job === job) inFlight.current = null;
        if (!(error instanceof Cancelled)) setProblem(error instanceof Error ? error.message : String(error));
      },
    );
  }, [client, target]);

  // A new version or revision: fetch the rows on screen again at once — before the browser paints,
  // so the worker encodes while the page draws (an effect would wait for the paint first).
  useLayoutEffect(() => {
    fetchIfNeeded();
  }, [fetchIfNeeded]);

  useEffect(() => () => inFlight.current?.job.cancel(), []);

  const onVisibleRows = useCallback(
    (visible: VisibleRows) => {
      visibleRef.current = visible;
      fetchIfNeeded();
    },
    [fetchIfNeeded],
  );

  return { window: current, problem, onVisibleRows };
}
