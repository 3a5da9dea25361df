/**
 * The file's missing spellings: which cell texts every column reads as missing, how many cells of
 * this file each one fills, and the spellings that fill more of a column than its values (which may
 * be values in disguise). Changing the list profiles the file again (useWorkbench.readMissingAs).
 */
import { useId, useState, type FormEvent } from 'react';
import { DEFAULT_MISSING_TOKENS, missingSpellingCells, sameMissingTokens, spellingsOutnumberingValues, type SpellingCells } from '../../core/missing.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { countOf, formatCount } from '../columns/labels.ts';
import '../columns/fields.css';
import './MissingSpellings.css';

export interface MissingSpellingsProps {
  readonly profiles: readonly ColumnProfile[];
  /** The spellings the recipe reads as missing. */
  readonly tokens: readonly string[];
  /** A long task is running: no change can start. */
  readonly busy: boolean;
  onChange(tokens: readonly string[]): void;
}

export function MissingSpellings({ profiles, tokens, busy, onChange }: MissingSpellingsProps) {
  const id = useId();
  const [typed, setTyped] = useState('');
  const [error, setError] = useState<string | null>(null);
  const spelled = new Map(missingSpellingCells(profiles).map((c) => [c.spelling, c]));
  const cellsOf = (token: string): number => spelled.get(token)?.cells ?? 0;
  const outnumbering = spellingsOutnumberingValues(profiles);
  const usual = sameMissingTokens(tokens, DEFAULT_MISSING_TOKENS);
  // The spellings met, most cells first (a stable sort keeps the list's order between equals).
  const met = tokens.filter((t) => cellsOf(t) > 0).sort((a, b) => cellsOf(b) - cellsOf(a));
  const unmet = tokens.filter((t) => cellsOf(t) === 0);
  const drop = (token: string) => onChange(tokens.filter((t) => t !== token));

  const add = (event: FormEvent) => {
    event.preventDefault();
    const spelling = typed.trim();
    if (spelling === '') return setError('Type the spelling the file uses for a missing value, such as -999 or unknown.');
    if (tokens.includes(spelling)) return setError(`“${spelling}” is read as missing already.`);
    setError(null);
    setTyped('');
    onChange([...tokens, spelling]);
  };

  return (
    <section className="lw-panel lw-missing" aria-labelledby={`${id}-title`}>
      <h3 className="lw-panel__title" id={`${id}-title`}>
        Missing values
      </h3>
      <p className="lw-field__hint">
        A cell is missing when it is empty, or when, spaces around it aside, it is spelled like one of these. Case counts: “NA” is missing, “Na” may be sodium. Every
        column reads the same list; what its missing cells become is decided column by column.
      </p>
      {outnumbering.length > 0 ? (
        <div className="lw-missing__doubts" role="note">
          {outnumbering.slice(0, SHOWN_DOUBTS).map((o) => (
            <p key={`${o.column}\u0000${o.spelling}`}>
              “{o.spelling}” fills {countOf(o.cells, 'cell', 'cells')} of <strong>{o.column}</strong>, more than all of its values together ({formatCount(o.valueCells)}): it may be
              a value there.
            </p>
          ))}
          {outnumbering.length > SHOWN_DOUBTS ? <p>… and {countOf(outnumbering.length - SHOWN_DOUBTS, 'more such column', 'more such columns')}.</p> : null}
        </div>
      ) : null}
      <ul className="lw-missing__list" aria-label="Missing spellings in this file">
        <li className="lw-missing__item">
          <span className="lw-missing__spelling lw-missing__spelling--empty">empty cell</span>
          <span className="lw-missing__cells">{whereText(spelled.get(''))}</span>
          <span className="lw-missing__fixed">always missing</span>
        </li>
        {met.map((token) => (
          <li key={token} className="lw-missing__item">
            <code className="lw-missing__spelling">{token}</code>
            <span className="lw-missing__cells">{whereText(spelled.get(token))}</span>
            <button type="button" className="lw-button" disabled={busy} aria-label={`Read “${token}” as a value`} onClick={() => drop(token)}>
              Read as a value
            </button>
          </li>
        ))}
      </ul>
      {unmet.length > 0 ? (
        <div className="lw-missing__unmet">
          <span className="lw-field__label">Also missing, not met in this file:</span>
          <ul className="lw-missing__chips" aria-label="Missing spellings not met in this file">
            {unmet.map((token) => (
              <li key={token} className="lw-missing__chip">
                <code>{token}</code>
                <button type="button" className="lw-missing__remove" disabled={busy} aria-label={`Read “${token}” as a value`} title={`Read “${token}” as a value`} onClick={() => drop(token)}>
                  ×
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <form className="lw-missing__add" onSubmit={add} noValidate>
        <div className="lw-field">
          <label htmlFor={`${id}-add`} className="lw-field__label">
            Also read as missing
          </label>
          <input
            id={`${id}-add`}
            className="lw-field__input"
            type="text"
            placeholder="e.g. -999 or unknown"
            value={typed}
            aria-invalid={error !== null}
            aria-describedby={error !== null ? `${id}-error` : undefined}
            onChange={(event) => setTyped(event.target.value)}
          />
        </div>
        <button type="submit" className="lw-button lw-button--primary" disabled={busy}>
          Read as missing
        </button>
      </form>
      {error !== null ? (
        <p className="lw-field__error" id={`${id}-error`} role="alert">
          {error}
        </p>
      ) : null}
      <p className="lw-field__hint">
        A change profiles the file again and makes your decisions again on the new proposal; the recipe keeps the list, so new files are read the same way.
      </p>
      {usual ? null : (
        <div>
          <button type="button" className="lw-button" disabled={busy} onClick={() => onChange(DEFAULT_MISSING_TOKENS)}>
            Back to the usual spellings
          </button>
        </div>
      )}
    </section>
  );
}

/** Spellings that may be values, named one by one before the rest are counted. */
const SHOWN_DOUBTS = 5;

/** Shown columns per spelling, before "and N more". */
const SHOWN_COLUMNS = 3;

/** "88 cells in satisfaction, comment" */
function whereText(met: SpellingCells | undefined): string {
  if (met === undefined || met.cells === 0) return 'none in this file';
  const shown = met.columns.slice(0, SHOWN_COLUMNS).join(', ');
  const more = met.columns.length > SHOWN_COLUMNS ? ` and ${countOf(met.columns.length - SHOWN_COLUMNS, 'more column', 'more columns')}` : '';
  return `${countOf(met.cells, 'cell', 'cells')} in ${shown}${more}`;
}
