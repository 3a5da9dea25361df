/**
 * How a continuous column's numbers are written: decimal separator, digit groups, a currency or
 * percent sign or a unit beside them, and how negatives are written. The draft detects it; a person corrects it here when the numbers
 * were misread ("1.234" meant one thousand two hundred thirty-four) or a unit was not recognised.
 */
import { useId, useState, type FormEvent } from 'react';
import type { Decision } from '../../core/decisions.ts';
import { formatNumber } from '../../core/numbers.ts';
import { NumberFormat, type ContinuousColumn } from '../../core/recipe.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { SelectField } from './fields.tsx';
import './NumberFormatForm.css';

export interface NumberFormatFormProps {
  readonly profile: ColumnProfile;
  readonly column: ContinuousColumn;
  readonly onDecide: (d: Decision) => void;
}

type Decimal = NumberFormat['decimal'];
type Group = NumberFormat['group'];
type Side = 'before' | 'after';
/** '' for a leading minus only. */
type Negative = NonNullable<NumberFormat['negative']> | '';

interface Draft {
  readonly decimal: Decimal;
  readonly group: Group;
  readonly symbol: string;
  readonly side: Side;
  readonly negative: Negative;
}

const DECIMALS: readonly { value: Decimal; label: string }[] = [
  { value: '.', label: 'point (12.5)' },
  { value: ',', label: 'comma (12,5)' },
];
const GROUPS: readonly { value: Group; label: string }[] = [
  { value: '', label: 'none (1234)' },
  { value: ',', label: 'comma (1,234)' },
  { value: '.', label: 'point (1.234)' },
  { value: ' ', label: 'space (1 234)' },
];

const SIDES: readonly { value: Side; label: string }[] = [
  { value: 'before', label: 'before the number' },
  { value: 'after', label: 'after the number' },
];

const NEGATIVES: readonly { value: Negative; label: string }[] = [
  { value: '', label: 'minus before (-12)' },
  { value: 'parentheses', label: 'or in parentheses ((12))' },
  { value: 'trailing', label: 'or minus after (12-)' },
];

function draftOf(format: NumberFormat): Draft {
  return { decimal: format.decimal, group: format.group, symbol: format.symbol?.text ?? '', side: format.symbol?.side ?? 'after', negative: format.negative ?? '' };
}

/** The draft as a format, or the reason it is not one. */
function formatOf(draft: Draft): { ok: true; format: NumberFormat } | { ok: false; message: string } {
  const symbol = draft.symbol.trim();
  const candidate = {
    decimal: draft.decimal,
    group: draft.group,
    ...(symbol === '' ? {} : { symbol: { text: symbol, side: draft.side } }),
    ...(draft.negative === '' ? {} : { negative: draft.negative }),
  };
  const parsed = NumberFormat.safeParse(candidate);
  if (parsed.success) return { ok: true, format: parsed.data };
  return { ok: false, message: `“${symbol}” cannot stand beside the numbers: ${parsed.error.issues[0]?.message ?? 'not a symbol'}.` };
}

export function NumberFormatForm({ profile, column, onDecide }: NumberFormatFormProps) {
  const id = useId();
  const [draft, setDraft] = useState<Draft>(() => draftOf(column.format));
  const [error, setError] = useState<string | null>(null);
  // A column stored as plain numbers keeps no levels to read again (core decisions.ts refuses it).
  const fixed = profile.levels === null;
  const chosen = formatOf(draft);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    if (!chosen.ok) {
      setError(chosen.message);
      return;
    }
    setError(null);
    onDecide({ type: 'set-number-format', column: column.name, format: chosen.format });
  };

  if (fixed) {
    return <p className="lw-field__hint">Every filled cell is a plain decimal number (“1234.5”): there is no other format to read it in.</p>;
  }
  return (
    <form className="lw-numfmt" onSubmit={submit} aria-label="Number format" noValidate>
      <div className="lw-numfmt__fields">
        <SelectField label="Decimal separator" value={draft.decimal} choices={DECIMALS} onChange={(decimal) => setDraft({ ...draft, decimal })} />
        <SelectField label="Digit groups" value={draft.group} choices={GROUPS} onChange={(group) => setDraft({ ...draft, group })} />
        <div className="lw-field">
          <label htmlFor={`${id}-symbol`} className="lw-field__label">
            Sign or unit
          </label>
          <input
            id={`${id}-symbol`}
            className="lw-field__input lw-numfmt__symbol"
            type="text"
            placeholder="none"
            maxLength={8}
            value={draft.symbol}
            aria-invalid={error !== null}
            aria-describedby={error !== null ? `${id}-error` : undefined}
            onChange={(event) => setDraft({ ...draft, symbol: event.target.value })}
          />
        </div>
        <SelectField label="Written" value={draft.side} choices={SIDES} onChange={(side) => setDraft({ ...draft, side })} />
        <SelectField label="Negative numbers" value={draft.negative} choices={NEGATIVES} onChange={(negative) => setDraft({ ...draft, negative })} />
      </div>
      <p className="lw-field__hint">
        {chosen.ok ? `Read like ${formatNumber(-1234.5, chosen.format)}. ` : ''}
        The sign or unit may be left out in a cell; “12 %” is read as 12.
      </p>
      {error !== null ? (
        <p className="lw-field__error" id={`${id}-error`} role="alert">
          {error}
        </p>
      ) : null}
      <div className="lw-numfmt__actions">
        <button type="submit" className="lw-button lw-button--primary">
          Read in this format
        </button>
      </div>
    </form>
  );
}
