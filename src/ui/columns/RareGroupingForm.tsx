/**
 * Rules that fold rare levels of a nominal column into one other level. The three rules are typed
 * as a whole and applied with one button, so a half-typed number never triggers a refit.
 * An empty box switches its rule off.
 */
import { useId, useState, type FormEvent } from 'react';
import type { Decision } from '../../core/decisions.ts';
import type { NominalColumn, RareGrouping } from '../../core/recipe.ts';
import { countOf, formatCount } from './labels.ts';
import './RareGroupingForm.css';

export interface RareGroupingFormProps {
  readonly column: NominalColumn;
  readonly onDecide: (d: Decision) => void;
}

interface Draft {
  readonly minCount: string;
  readonly minShare: string;
  readonly keepTop: string;
  readonly otherLabel: string;
}

type Parsed = { ok: true; rare: RareGrouping } | { ok: false; field: keyof RareGrouping; message: string };

export function RareGroupingForm({ column, onDecide }: RareGroupingFormProps) {
  const id = useId();
  const [draft, setDraft] = useState<Draft>(() => ({
    minCount: column.rare.minCount === null ? '' : String(column.rare.minCount),
    // Shares are typed as percentages; the recipe holds a fraction.
    minShare: column.rare.minShare === null ? '' : String(roundPercent(column.rare.minShare * 100)),
    keepTop: column.rare.keepTop === null ? '' : String(column.rare.keepTop),
    otherLabel: column.otherLabel,
  }));
  const [error, setError] = useState<{ field: keyof RareGrouping; message: string } | null>(null);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const parsed = parseRare(draft);
    if (!parsed.ok) {
      setError({ field: parsed.field, message: parsed.message });
      return;
    }
    setError(null);
    const label = draft.otherLabel.trim();
    if (label !== '' && label !== column.otherLabel) onDecide({ type: 'set-other-label', column: column.name, label });
    onDecide({ type: 'set-rare', column: column.name, rare: parsed.rare });
  };

  const field = (key: keyof RareGrouping, label: string, unit: string, attrs: { min: number; max?: number; step: number | 'any' }) => {
    const invalid = error?.field === key;
    return (
      <div className="lw-rare__rule">
        <label htmlFor={`${id}-${key}`} className="lw-rare__label">
          {label}
        </label>
        <input
          id={`${id}-${key}`}
          className="lw-field__input lw-rare__input"
          type="number"
          inputMode="decimal"
          placeholder="off"
          value={draft[key]}
          aria-invalid={invalid}
          aria-describedby={invalid ? `${id}-error` : undefined}
          onChange={(event) => setDraft({ ...draft, [key]: event.target.value })}
          {...attrs}
        />
        <span className="lw-rare__unit">{unit}</span>
      </div>
    );
  };

  const otherCount = column.levels.find((l) => l.value === column.otherLabel)?.count ?? 0;
  return (
    <form className="lw-rare" onSubmit={submit} aria-label="Rare-level grouping" noValidate>
      <p className="lw-field__hint">A level is grouped when it fails any rule that is switched on. Leave a box empty to switch its rule off.</p>
      <div className="lw-rare__rules">
        {field('minCount', 'Group levels with fewer than', 'rows', { min: 0, step: 1 })}
        {field('minShare', 'Group levels with less than', '% of rows', { min: 0, max: 100, step: 'any' })}
        {field('keepTop', 'Keep only the', 'most frequent levels', { min: 1, step: 1 })}
      </div>
      <div className="lw-field">
        <label htmlFor={`${id}-other`} className="lw-field__label">
          Name of the grouped level
        </label>
        <input
          id={`${id}-other`}
          className="lw-field__input"
          type="text"
          value={draft.otherLabel}
          onChange={(event) => setDraft({ ...draft, otherLabel: event.target.value })}
        />
      </div>
      {error ? (
        <p className="lw-field__error" id={`${id}-error`} role="alert">
          {error.message}
        </p>
      ) : null}
      <div className="lw-rare__actions">
        <button type="submit" className="lw-button lw-button--primary">
          Apply grouping
        </button>
        <button
          type="button"
          className="lw-button"
          disabled={column.rare.minCount === null && column.rare.minShare === null && column.rare.keepTop === null}
          onClick={() => onDecide({ type: 'set-rare', column: column.name, rare: { minCount: null, minShare: null, keepTop: null } })}
        >
          Stop grouping
        </button>
      </div>
      <p className="lw-note" aria-live="polite">
        {column.grouped.length === 0
          ? 'No level is grouped now.'
          : `${countOf(column.grouped.length, 'level', 'levels')} (${formatCount(otherCount)} rows) grouped into “${column.otherLabel}”: ${preview(column.grouped)}.`}
      </p>
    </form>
  );
}

function preview(values: readonly string[]): string {
  const shown = values.slice(0, 8).join(', ');
  return values.length > 8 ? `${shown} and ${formatCount(values.length - 8)} more` : shown;
}

function roundPercent(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

export function parseRare(draft: Draft): Parsed {
  const minCount = parseOptional(draft.minCount);
  if (minCount !== null && (!Number.isInteger(minCount) || minCount < 0))
    return { ok: false, field: 'minCount', message: 'The row count must be a whole number, 0 or more.' };
  const percent = parseOptional(draft.minShare);
  if (percent !== null && (Number.isNaN(percent) || percent < 0 || percent > 100))
    return { ok: false, field: 'minShare', message: 'The share must be a percentage between 0 and 100.' };
  const keepTop = parseOptional(draft.keepTop);
  if (keepTop !== null && (!Number.isInteger(keepTop) || keepTop < 1))
    return { ok: false, field: 'keepTop', message: 'The number of levels to keep must be a whole number, 1 or more.' };
  return { ok: true, rare: { minCount, minShare: percent === null ? null : percent / 100, keepTop } };
}

/** '' → null (rule off); anything else → its number, NaN when it is not one. */
function parseOptional(text: string): number | null {
  const trimmed = text.trim();
  return trimmed === '' ? null : Number(trimmed);
}
