/**
 * The bar between the decisions above and the output below: drag it, or focus it and use the up
 * and down arrow keys (Home and End for the limits), to give one of them more room. A window
 * splitter in the WAI-ARIA Authoring Practices sense: role "separator" with a value.
 */
import { useRef, type KeyboardEvent, type PointerEvent } from 'react';

export const MIN_SHARE = 0.2;
export const MAX_SHARE = 0.8;
const STEP = 0.05;

export interface SplitterProps {
  /** Share of the height given to the part above, between MIN_SHARE and MAX_SHARE. */
  readonly share: number;
  onChange(share: number): void;
  /** The element whose height is being shared. */
  readonly container: () => HTMLElement | null;
}

export function clampShare(share: number): number {
  return Math.min(MAX_SHARE, Math.max(MIN_SHARE, share));
}

export function Splitter({ share, onChange, container }: SplitterProps) {
  const dragging = useRef(false);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    const next =
      event.key === 'ArrowUp' ? share - STEP : event.key === 'ArrowDown' ? share + STEP : event.key === 'Home' ? MIN_SHARE : event.key === 'End' ? MAX_SHARE : null;
    if (next === null) return;
    event.preventDefault();
    onChange(clampShare(next));
  };

  const moveTo = (clientY: number) => {
    const box = container()?.getBoundingClientRect();
    if (!box || box.height === 0) return;
    onChange(clampShare((clientY - box.top) / box.height));
  };

  return (
    <div
      className="splitter"
      role="separator"
      aria-orientation="horizontal"
      aria-label="Share of height between the column decisions and the output"
      aria-valuemin={Math.round(MIN_SHARE * 100)}
      aria-valuemax={Math.round(MAX_SHARE * 100)}
      aria-valuenow={Math.round(share * 100)}
      tabIndex={0}
      onKeyDown={onKeyDown}
      onPointerDown={(event: PointerEvent<HTMLDivElement>) => {
        dragging.current = true;
        event.currentTarget.setPointerCapture(event.pointerId);
      }}
      onPointerMove={(event) => dragging.current && moveTo(event.clientY)}
      onPointerUp={() => {
        dragging.current = false;
      }}
      onDoubleClick={() => onChange(0.5)}
    >
      <span className="splitter-grip" aria-hidden="true" />
    </div>
  );
}
