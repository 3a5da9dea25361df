/**
 * The few form controls the column editor is built from: a group of choices (radio tiles), a
 * drop-down, a switch-like checkbox. Every control has a visible label tied to it; hints are
 * descriptions (aria-describedby), so a control's accessible name stays short.
 */
import { useId, type ReactNode } from 'react';
import './fields.css';

export interface Choice<T> {
  readonly value: T;
  readonly label: string;
  readonly hint?: string;
  readonly disabled?: boolean;
}

export interface ChoiceGroupProps<T extends string | number> {
  readonly legend: string;
  readonly value: T;
  readonly choices: readonly Choice<T>[];
  readonly onChange: (value: T) => void;
  /** Tiles per row; the grid wraps to fewer on narrow panels. */
  readonly columns?: number;
  readonly description?: ReactNode;
}

export function ChoiceGroup<T extends string | number>({ legend, value, choices, onChange, columns = 3, description }: ChoiceGroupProps<T>) {
  const id = useId();
  return (
    <fieldset className="lw-choices" aria-describedby={description ? `${id}-desc` : undefined}>
      <legend className="lw-choices__legend">{legend}</legend>
      {description ? (
        <p className="lw-field__hint" id={`${id}-desc`}>
          {description}
        </p>
      ) : null}
      <div className="lw-choices__grid" style={{ ['--lw-choice-columns' as string]: String(columns) }}>
        {choices.map((choice, i) => {
          const inputId = `${id}-${i}`;
          return (
            <label key={String(choice.value)} className="lw-choice" data-checked={choice.value === value} data-disabled={choice.disabled ?? false}>
              <input
                id={inputId}
                type="radio"
                name={id}
                checked={choice.value === value}
                disabled={choice.disabled}
                aria-labelledby={`${inputId}-label`}
                aria-describedby={choice.hint ? `${inputId}-hint` : undefined}
                onChange={() => onChange(choice.value)}
              />
              <span className="lw-choice__text">
                <span className="lw-choice__label" id={`${inputId}-label`}>
                  {choice.label}
                </span>
                {choice.hint ? (
                  <span className="lw-choice__hint" id={`${inputId}-hint`}>
                    {choice.hint}
                  </span>
                ) : null}
              </span>
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}

export interface SelectFieldProps<T extends string> {
  readonly label: string;
  readonly value: T;
  readonly choices: readonly Choice<T>[];
  readonly onChange: (value: T) => void;
  readonly disabled?: boolean;
  readonly hint?: ReactNode;
}

export function SelectField<T extends string>({ label, value, choices, onChange, disabled, hint }: SelectFieldProps<T>) {
  const id = useId();
  return (
    <div className="lw-field">
      <label className="lw-field__label" htmlFor={id}>
        {label}
      </label>
      <select
        id={id}
        className="lw-field__select"
        value={value}
        disabled={disabled}
        aria-describedby={hint ? `${id}-hint` : undefined}
        onChange={(event) => {
          const picked = choices.find((c) => c.value === event.target.value);
          if (picked) onChange(picked.value);
        }}
      >
        {choices.map((choice) => (
          <option key={choice.value} value={choice.value} disabled={choice.disabled}>
            {choice.label}
          </option>
        ))}
      </select>
      {hint ? (
        <p className="lw-field__hint" id={`${id}-hint`}>
          {hint}
        </p>
      ) : null}
    </div>
  );
}

export interface ToggleFieldProps {
  readonly label: string;
  readonly checked: boolean;
  readonly onChange: (checked: boolean) => void;
  readonly hint?: ReactNode;
  readonly disabled?: boolean;
}

export function ToggleField({ label, checked, onChange, hint, disabled }: ToggleFieldProps) {
  const id = useId();
  return (
    <div className="lw-toggle">
      <input
        id={id}
        type="checkbox"
        className="lw-toggle__input"
        checked={checked}
        disabled={disabled}
        aria-describedby={hint ? `${id}-hint` : undefined}
        onChange={(event) => onChange(event.target.checked)}
      />
      <label htmlFor={id} className="lw-toggle__label">
        {label}
      </label>
      {hint ? (
        <p className="lw-field__hint lw-toggle__hint" id={`${id}-hint`}>
          {hint}
        </p>
      ) : null}
    </div>
  );
}

/** A titled block of the editor. */
export function Panel({ title, children, className }: { readonly title: string; readonly children: ReactNode; readonly className?: string }) {
  const id = useId();
  return (
    <section className={`lw-panel ${className ?? ''}`} aria-labelledby={id}>
      <h3 className="lw-panel__title" id={id}>
        {title}
      </h3>
      {children}
    </section>
  );
}
