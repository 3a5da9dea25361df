/**
 * The order of an ordinal column's levels, lowest first, rearranged by dragging. Works with the
 * keyboard alone: focus a level's handle, Space lifts it, the up and down arrows move it, Space
 * drops it and Escape puts it back. Each step is announced in our own words.
 */
import {
  DndContext,
  KeyboardSensor,
  PointerSensor,
  closestCenter,
  useSensor,
  useSensors,
  type Announcements,
  type DragEndEvent,
  type ScreenReaderInstructions,
  type UniqueIdentifier,
} from '@dnd-kit/core';
import { SortableContext, arrayMove, sortableKeyboardCoordinates, useSortable, verticalListSortingStrategy } from '@dnd-kit/sortable';
import { CSS } from '@dnd-kit/utilities';
import { useId, useMemo } from 'react';
import type { Decision } from '../../core/decisions.ts';
import type { FittedLevel } from '../../core/recipe.ts';
import { formatCount } from './labels.ts';
import './OrdinalOrderList.css';

export interface OrdinalOrderListProps {
  /** Name of the source column the decisions are about. */
  readonly column: string;
  /** The levels in their current order, lowest first. */
  readonly levels: readonly FittedLevel[];
  readonly onDecide: (d: Decision) => void;
  /** What each level becomes (its rank or score), shown beside it; parallel to `levels`. */
  readonly codes?: readonly string[];
}

/** Sortable ids must not be empty, and a level may be any text, so each gets a prefix. */
const toId = (value: string): string => `level:${value}`;
const fromId = (id: UniqueIdentifier): string => String(id).slice('level:'.length);

export const ORDER_INSTRUCTIONS: ScreenReaderInstructions = {
  draggable:
    'To move this level, press Space. Then use the up and down arrow keys to change its place in the order, ' +
    'press Space again to put it down there, or Escape to leave it where it was.',
};

/**
 * Our wording for each step of a move. The sensor reports the lifted level as "over" its own place
 * right after the lift; saying so would drown the lift message, so that first report is skipped.
 */
export function orderAnnouncements(values: readonly string[]): Announcements {
  const place = (id: UniqueIdentifier | undefined) => values.indexOf(fromId(id ?? '')) + 1;
  const of = `of ${formatCount(values.length)}`;
  let leftHome = false;
  return {
    onDragStart: ({ active }) => {
      leftHome = false;
      return `Lifted “${fromId(active.id)}”, place ${place(active.id)} ${of}.`;
    },
    onDragOver: ({ active, over }) => {
      if (over?.id === active.id && !leftHome) return undefined;
      leftHome = true;
      return over ? `“${fromId(active.id)}” is over place ${place(over.id)} ${of}.` : `“${fromId(active.id)}” is outside the list.`;
    },
    onDragEnd: ({ active, over }) =>
      over && over.id !== active.id
        ? `“${fromId(active.id)}” put down at place ${place(over.id)} ${of}.`
        : `“${fromId(active.id)}” put down where it was, place ${place(active.id)} ${of}.`,
    onDragCancel: ({ active }) => `Move cancelled. “${fromId(active.id)}” stays at place ${place(active.id)} ${of}.`,
  };
}

export function OrdinalOrderList({ column, levels, onDecide, codes }: OrdinalOrderListProps) {
  const headingId = useId();
  const values = levels.map((l) => l.value);
  const ids = values.map(toId);
  const orderKey = values.join('\u0000');
  // One announcer per order, so its small memory of the current move survives re-renders during a drag.
  const announcements = useMemo(() => orderAnnouncements(values), [orderKey]); // values change exactly when orderKey does
  const sensors = useSensors(
    useSensor(PointerSensor, { activationConstraint: { distance: 4 } }),
    useSensor(KeyboardSensor, { coordinateGetter: sortableKeyboardCoordinates }),
  );

  const onDragEnd = ({ active, over }: DragEndEvent) => {
    if (!over || over.id === active.id) return;
    const from = ids.indexOf(String(active.id));
    const to = ids.indexOf(String(over.id));
    if (from < 0 || to < 0) return;
    onDecide({ type: 'set-order', column, order: arrayMove(values, from, to) });
  };

  return (
    <div className="lw-order">
      <p className="lw-field__hint" id={headingId}>
        Drag a level by its handle, or focus the handle and press Space, then the arrow keys.
      </p>
      <DndContext
        sensors={sensors}
        collisionDetection={closestCenter}
        onDragEnd={onDragEnd}
        accessibility={{ announcements, screenReaderInstructions: ORDER_INSTRUCTIONS }}
      >
        <SortableContext items={ids} strategy={verticalListSortingStrategy}>
          <ol className="lw-order__list" aria-describedby={headingId} aria-label={`Order of ${column}, lowest first`}>
            {levels.map((level, i) => (
              <SortableLevel
                key={ids[i]}
                id={ids[i] ?? toId(level.value)}
                level={level}
                place={i + 1}
                total={levels.length}
                code={codes?.[i]}
              />
            ))}
          </ol>
        </SortableContext>
      </DndContext>
      <div>
        <button type="button" className="lw-button" onClick={() => onDecide({ type: 'reverse-order', column })} disabled={levels.length < 2}>
          Reverse the order
        </button>
      </div>
    </div>
  );
}

interface SortableLevelProps {
  readonly id: string;
  readonly level: FittedLevel;
  readonly place: number;
  readonly total: number;
  readonly code: string | undefined;
}

function SortableLevel({ id, level, place, total, code }: SortableLevelProps) {
  const { attributes, listeners, setNodeRef, setActivatorNodeRef, transform, transition, isDragging } = useSortable({ id });
  return (
    <li
      ref={setNodeRef}
      className="lw-order__item"
      data-dragging={isDragging}
      data-level={level.value}
      style={{ transform: CSS.Translate.toString(transform), transition }}
    >
      <button
        ref={setActivatorNodeRef}
        type="button"
        className="lw-order__handle"
        {...attributes}
        {...listeners}
        aria-label={`Move “${level.value}”, place ${place} of ${total}`}
      >
        <svg width="12" height="16" viewBox="0 0 12 16" aria-hidden="true" focusable="false">
          {[3, 8, 13].map((y) => (
            <g key={y}>
              <circle cx="3.5" cy={y} r="1.5" />
              <circle cx="8.5" cy={y} r="1.5" />
            </g>
          ))}
        </svg>
      </button>
      <span className="lw-order__place" aria-hidden="true">
        {place}
      </span>
      <span className="lw-order__value">{level.value}</span>
      <span className="lw-order__count">{formatCount(level.count)} rows</span>
      {code !== undefined ? <span className="lw-order__code">→ {code}</span> : null}
    </li>
  );
}
