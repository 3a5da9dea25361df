/**
 * Every column of the table in file order, each with its level, the reason for it, its counts, how
 * many output columns it makes and a small chart. A single-select listbox: Tab reaches it once,
 * the arrow keys, Home and End move through the columns and selection follows focus.
 */
import { useVirtualizer } from '@tanstack/react-virtual';
import { memo, useCallback, useEffect, useId, useLayoutEffect, useRef, type KeyboardEvent } from 'react';
import type { ColumnProfile } from '../../core/profile.ts';
import type { ColumnRecipe, Recipe } from '../../core/recipe.ts';
import { chartFor } from './chart-data.ts';
import { countOf, formatCount } from './labels.ts';
import { LevelBadge } from './LevelBadge.tsx';
import { MiniChart } from './MiniChart.tsx';
import './ColumnList.css';

export interface ColumnListProps {
  profiles: ColumnProfile[];
  recipe: Recipe;
  selected: string | null;
  onSelect(name: string): void;
  /** Accessible name of the list; "Columns" unless told otherwise. */
  label?: string;
}

/**
 * Above this many columns the list draws only the rows in view (and a few around them): a file of
 * thousands of columns would otherwise put hundreds of thousands of elements in the page and make
 * every click wait seconds for layout. Shorter lists are drawn whole.
 */
export const WINDOWED_ABOVE = 200;
/** A row's height before it is measured; rows grow with their reason's length. */
const ESTIMATED_ROW_HEIGHT = 112;
const ROW_GAP = 4;

export function ColumnList({ profiles, recipe, selected, onSelect, label = 'Columns' }: ColumnListProps) {
  const baseId = useId();
  const listRef = useRef<HTMLUListElement>(null);
  const optionRefs = useRef(new Map<string, HTMLLIElement>());
  /** A column to focus once its row is drawn (keyboard moves into rows scrolled out of view). */
  const pendingFocus = useRef<string | null>(null);
  const byName = new Map(recipe.columns.map((c) => [c.name, c]));
  const selectedIndex = profiles.findIndex((p) => p.name === selected);
  const tabbableIndex = selectedIndex >= 0 ? selectedIndex : 0;
  const windowed = profiles.length > WINDOWED_ABOVE;
  // Rows are redrawn only when their own column changes (a decision redraws one row, not all):
  // what they are handed must keep its identity from one drawing of the list to the next.
  const latestOnSelect = useRef(onSelect);
  useLayoutEffect(() => {
    latestOnSelect.current = onSelect;
  });
  const select = useCallback((name: string) => latestOnSelect.current(name), []);
  const virtualizer = useVirtualizer({
    count: windowed ? profiles.length : 0,
    // The list scrolls inside the pane around it.
    getScrollElement: () => listRef.current?.parentElement ?? null,
    estimateSize: () => ESTIMATED_ROW_HEIGHT,
    gap: ROW_GAP,
    paddingStart: ROW_GAP,
    paddingEnd: ROW_GAP,
    overscan: 6,
  });

  useEffect(() => {
    const name = pendingFocus.current;
    const node = name === null ? undefined : optionRefs.current.get(name);
    if (node === undefined) return;
    node.focus();
    pendingFocus.current = null;
  });

  const moveTo = (index: number) => {
    const at = Math.max(0, Math.min(profiles.length - 1, index));
    const target = profiles[at];
    if (!target) return;
    const node = optionRefs.current.get(target.name);
    if (node) node.focus();
    else {
      pendingFocus.current = target.name;
      virtualizer.scrollToIndex(at, { align: 'auto' });
    }
    if (target.name !== selected) select(target.name);
  };

  const onKeyDown = (event: KeyboardEvent<HTMLUListElement>) => {
    const current = profiles.findIndex((p) => optionRefs.current.get(p.name) === document.activeElement);
    const from = current >= 0 ? current : tabbableIndex;
    const step = { ArrowDown: 1, ArrowUp: -1, PageDown: 5, PageUp: -5 }[event.key];
    if (step !== undefined) moveTo(from + step);
    else if (event.key === 'Home') moveTo(0);
    else if (event.key === 'End') moveTo(profiles.length - 1);
    else if (event.key === 'Enter' || event.key === ' ') moveTo(from);
    else return;
    event.preventDefault();
  };

  const register = useCallback(
    (name: string, node: HTMLLIElement | null, measure: boolean) => {
      if (node) {
        optionRefs.current.set(name, node);
        if (measure) virtualizer.measureElement(node);
      } else optionRefs.current.delete(name);
    },
    [virtualizer],
  );

  const row = (index: number, placed?: { readonly start: number }) => {
    const profile = profiles[index];
    if (profile === undefined) return null;
    return (
      <ColumnRow
        key={profile.name}
        id={`${baseId}-${index}`}
        profile={profile}
        column={byName.get(profile.name) ?? null}
        selected={profile.name === selected}
        // In a windowed list the row drawn first holds the tab stop when the selected one is not drawn.
        tabbable={index === tabbableIndex}
        onSelect={select}
        {...(placed === undefined ? {} : { index, setSize: profiles.length, top: placed.start })}
        register={register}
      />
    );
  };

  if (!windowed) {
    return (
      <ul ref={listRef} className="lw-collist" role="listbox" aria-label={label} onKeyDown={onKeyDown}>
        {profiles.map((_, index) => row(index))}
      </ul>
    );
  }
  return (
    <ul
      ref={listRef}
      className="lw-collist lw-collist--windowed"
      role="listbox"
      aria-label={label}
      onKeyDown={onKeyDown}
      style={{ height: virtualizer.getTotalSize() }}
    >
      {virtualizer.getVirtualItems().map((item) => row(item.index, item))}
    </ul>
  );
}

interface ColumnRowProps {
  readonly id: string;
  /** In a windowed list: the row's place, the list's length, and where the row is drawn. */
  readonly index?: number;
  readonly setSize?: number;
  readonly top?: number;
  readonly profile: ColumnProfile;
  readonly column: ColumnRecipe | null;
  readonly selected: boolean;
  readonly tabbable: boolean;
  readonly onSelect: (name: string) => void;
  /** Told of the row's element (null when it goes); `measure` in a windowed list, whose rows are measured. */
  readonly register: (name: string, node: HTMLLIElement | null, measure: boolean) => void;
}

const ColumnRow = memo(function ColumnRow({ id, profile, column, selected, tabbable, onSelect, register, index, setSize, top }: ColumnRowProps) {
  const chart = column ? chartFor(profile, column) : null;
  const outputs = column?.outputs.length ?? 0;
  return (
    <li
      ref={(node) => register(profile.name, node, index !== undefined)}
      id={id}
      role="option"
      aria-selected={selected}
      aria-labelledby={`${id}-name ${id}-level`}
      aria-describedby={`${id}-width ${id}-reason ${id}-counts`}
      tabIndex={tabbable ? 0 : -1}
      className="lw-collist__row"
      data-column={profile.name}
      {...(index === undefined
        ? {}
        : { 'data-index': index, 'aria-posinset': index + 1, 'aria-setsize': setSize, style: { transform: `translateY(${top ?? 0}px)` } })}
      onClick={() => onSelect(profile.name)}
    >
      <div className="lw-collist__top">
        <span className="lw-collist__name" id={`${id}-name`} title={profile.name}>
          {profile.name}
        </span>
        {chart ? <MiniChart data={chart} /> : <span className="lw-collist__nochart" aria-hidden="true" />}
      </div>
      <div className="lw-collist__meta">
        <LevelBadge id={`${id}-level`} level={column?.level ?? null} />
        <span className="lw-collist__width" id={`${id}-width`} data-outputs={outputs}>
          {countOf(outputs, 'output column', 'output columns')}
        </span>
      </div>
      <p className="lw-collist__reason" id={`${id}-reason`}>
        {column?.reason ?? 'No decision yet.'}
      </p>
      <p className="lw-collist__counts" id={`${id}-counts`}>
        <span>{formatCount(profile.missing)} missing</span>
        <span aria-hidden="true"> · </span>
        <span>{formatCount(profile.distinct)} distinct</span>
      </p>
    </li>
  );
});
