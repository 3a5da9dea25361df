/** One number per ordinal level (e.g. −2 … 2 for an agreement scale), applied together. */
import { useId, useState, type FormEvent } from 'react';
import type { Decision } from '../../core/decisions.ts';
import type { OrdinalColumn } from '../../core/recipe.ts';
import './ScoresForm.css';

export interface ScoresFormProps {
  readonly column: OrdinalColumn;
  readonly onDecide: (d: Decision) => void;
}

export function ScoresForm({ column, onDecide }: ScoresFormProps) {
  const id = useId();
  const [texts, setTexts] = useState<string[]>(() => column.levels.map((_, i) => String(column.scores?.[i] ?? i + column.start)));
  const [bad, setBad] = useState<number[]>([]);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const scores = texts.map((t) => (t.trim() === '' ? Number.NaN : Number(t)));
    const invalid = scores.flatMap((s, i) => (Number.isFinite(s) ? [] : [i]));
    setBad(invalid);
    if (invalid.length === 0) onDecide({ type: 'set-scores', column: column.name, scores });
  };

  return (
    <form className="lw-scores" onSubmit={submit} aria-label="Scores per level" noValidate>
      <p className="lw-field__hint">The number each level becomes. Scores need not be evenly spaced.</p>
      <ol className="lw-scores__list">
        {column.levels.map((level, i) => (
          <li key={level.value} className="lw-scores__row">
            <label htmlFor={`${id}-${i}`} className="lw-scores__label">
              Score for “{level.value}”
            </label>
            <input
              id={`${id}-${i}`}
              className="lw-field__input lw-scores__input"
              type="number"
              step="any"
              value={texts[i] ?? ''}
              aria-invalid={bad.includes(i)}
              onChange={(event) => setTexts(texts.map((t, j) => (j === i ? event.target.value : t)))}
            />
          </li>
        ))}
      </ol>
      {bad.length > 0 ? (
        <p className="lw-field__error" role="alert">
          Every level needs a number; {bad.map((i) => `“${column.levels[i]?.value ?? ''}”`).join(', ')} {bad.length === 1 ? 'has' : 'have'} none.
        </p>
      ) : null}
      <div>
        <button type="submit" className="lw-button lw-button--primary">
          Apply scores
        </button>
      </div>
    </form>
  );
}
