/**
 * Every column of the table in file order, each with its level, the reason for it, its counts, how
 * many output columns it makes and a small chart. A single-select listbox: Tab reaches it once,
 * the arrow keys, Home and End move through the columns and selection follows focus.
 */
import { useId, useRef, type KeyboardEvent } from 'react';
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

export function ColumnList({ profiles, recipe, selected, onSelect, label = 'Columns' }: ColumnListProps) {
  const baseId = useId();
  const optionRefs = useRef(new Map<string, HTMLLIElement>());
  const byName = new Map(recipe.columns.map((c) => [c.name, c]));
  const selectedIndex = profiles.findIndex((p) => p.name === selected);
  const tabbableIndex = selectedIndex >= 0 ? selectedIndex : 0;

  const moveTo = (index: number) => {
    const target = profiles[Math.max(0, Math.min(profiles.length - 1, index))];
    if (!target) return;
    optionRefs.current.get(target.name)?.focus();
    if (target.name !== selected) onSelect(target.name);
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

  return (
    <ul className="lw-collist" role="listbox" aria-label={label} onKeyDown={onKeyDown}>
      {profiles.map((profile, index) => (
        <ColumnRow
          key={profile.name}
          id={`${baseId}-${index}`}
          profile={profile}
          column={byName.get(profile.name) ?? null}
          selected={profile.name === selected}
          tabbable={index === tabbableIndex}
          onSelect={onSelect}
          register={(node) => {
            if (node) optionRefs.current.set(profile.name, node);
            else optionRefs.current.delete(profile.name);
          }}
        />
      ))}
    </ul>
  );
}

interface ColumnRowProps {
  readonly id: string;
  readonly profile: ColumnProfile;
  readonly column: ColumnRecipe | null;
  readonly selected: boolean;
  readonly tabbable: boolean;
  readonly onSelect: (name: string) => void;
  readonly register: (node: HTMLLIElement | null) => void;
}

function ColumnRow({ id, profile, column, selected, tabbable, onSelect, register }: ColumnRowProps) {
  const chart = column ? chartFor(profile, column) : null;
  const outputs = column?.outputs.length ?? 0;
  return (
    <li
      ref={register}
      id={id}
      role="option"
      aria-selected={selected}
      aria-labelledby={`${id}-name ${id}-level`}
      aria-describedby={`${id}-width ${id}-reason ${id}-counts`}
      tabIndex={tabbable ? 0 : -1}
      className="lw-collist__row"
      data-column={profile.name}
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
}
