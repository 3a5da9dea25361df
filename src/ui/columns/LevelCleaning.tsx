/**
 * The levels of a categorical column as the recipe has them now, with their counts, and the
 * cleaning that produced them: trimming, case-folding and explicit merges. Tick two or more
 * levels, name the result and merge; every merge can be undone on its own.
 */
import { useId, useState } from 'react';
import type { Decision } from '../../core/decisions.ts';
import { MISSING_LEVEL } from '../../core/fit.ts';
import type { CategoricalColumn, FittedLevel } from '../../core/recipe.ts';
import { Panel, ToggleField } from './fields.tsx';
import { countOf, formatCount, formatShare } from './labels.ts';
import './LevelCleaning.css';

export interface LevelCleaningProps {
  readonly column: CategoricalColumn;
  readonly onDecide: (d: Decision) => void;
}

export function LevelCleaning({ column, onDecide }: LevelCleaningProps) {
  const { name, cleaning } = column;
  return (
    <Panel title="Levels and cleaning" className="lw-cleaning">
      <div className="lw-cleaning__toggles">
        <ToggleField
          label="Trim spaces"
          checked={cleaning.trim}
          onChange={(trim) => onDecide({ type: 'set-cleaning', column: name, trim })}
          hint="“ yes ” and “yes” become one level."
        />
        <ToggleField
          label="Ignore upper and lower case"
          checked={cleaning.caseFold}
          onChange={(caseFold) => onDecide({ type: 'set-cleaning', column: name, caseFold })}
          hint="“Yes” and “yes” become one level (written in lower case)."
        />
      </div>
      <MergeForm key={column.levels.map((l) => l.value).join('\u0000')} column={column} onDecide={onDecide} />
      {cleaning.merges.length > 0 ? (
        <div className="lw-cleaning__merges">
          <h4 className="lw-cleaning__subtitle">Merges</h4>
          <ul className="lw-cleaning__merge-list">
            {cleaning.merges.map((merge) => (
              <li key={merge.into} className="lw-cleaning__merge">
                <span>
                  {merge.from.map((f) => `“${f}”`).join(', ')} → <strong>“{merge.into}”</strong>
                </span>
                <button
                  type="button"
                  className="lw-button"
                  aria-label={`Undo the merge into “${merge.into}”`}
                  onClick={() => onDecide({ type: 'undo-merge', column: name, into: merge.into })}
                >
                  Undo
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </Panel>
  );
}

/**
 * Rows of the level table drawn at once. Past this the table would slow the page while telling
 * nothing a person can take in; the rest are counted below it, and every level stays in the recipe.
 */
export const LEVELS_LISTED = 200;

/** Levels that stand for no written value cannot be merged: the missing level and the rare-level group. */
function mergeable(column: CategoricalColumn, level: FittedLevel): boolean {
  if (level.value === MISSING_LEVEL) return false;
  return !(level.value === column.otherLabel && column.grouped.length > 0);
}

function MergeForm({ column, onDecide }: LevelCleaningProps) {
  const id = useId();
  const [picked, setPicked] = useState<readonly string[]>([]);
  const [typedName, setTypedName] = useState<string | null>(null);
  const chosen = column.levels.filter((l) => picked.includes(l.value));
  // Until the person types a name, the merged level is called after the most frequent one picked.
  const suggested = [...chosen].sort((a, b) => b.count - a.count)[0]?.value ?? '';
  const into = (typedName ?? suggested).trim();
  const canMerge = chosen.length >= 2 && into !== '';
  const total = column.fittedRows > 0 ? column.fittedRows : column.levels.reduce((s, l) => s + l.count, 0);
  const largest = Math.max(1, ...column.levels.map((l) => l.count));

  const toggle = (value: string, on: boolean) => setPicked(on ? [...picked, value] : picked.filter((v) => v !== value));

  const merge = () => {
    if (!canMerge) return;
    onDecide({ type: 'merge-levels', column: column.name, from: chosen.map((l) => l.value), into });
    setPicked([]);
    setTypedName(null);
  };

  return (
    <div className="lw-cleaning__levels">
      <div className="lw-cleaning__scroll">
        <table className="lw-cleaning__table">
          <caption className="lw-cleaning__caption">{countOf(column.levels.length, 'level', 'levels')} after cleaning</caption>
          <thead>
            <tr>
              <th scope="col">
                <span className="lw-cleaning__sr">Pick to merge</span>
              </th>
              <th scope="col">Level</th>
              <th scope="col" className="lw-cleaning__num">
                Rows
              </th>
              <th scope="col" className="lw-cleaning__num">
                Share
              </th>
            </tr>
          </thead>
          <tbody>
            {column.levels.slice(0, LEVELS_LISTED).map((level, i) => {
              const share = total > 0 ? level.count / total : 0;
              const canPick = mergeable(column, level);
              return (
                <tr key={level.value} data-level={level.value}>
                  <td>
                    <input
                      id={`${id}-pick-${i}`}
                      type="checkbox"
                      className="lw-toggle__input"
                      checked={picked.includes(level.value)}
                      disabled={!canPick}
                      aria-label={`Pick “${level.value}” to merge`}
                      onChange={(event) => toggle(level.value, event.target.checked)}
                    />
                  </td>
                  <td>
                    <label htmlFor={`${id}-pick-${i}`} className="lw-cleaning__value">
                      {level.value === '' ? <em>(empty text)</em> : level.value}
                    </label>
                  </td>
                  <td className="lw-cleaning__num" data-count={level.count}>
                    {formatCount(level.count)}
                  </td>
                  <td className="lw-cleaning__num">
                    <span className="lw-cleaning__bar" aria-hidden="true" style={{ width: `${(level.count / largest) * 3}rem` }} />
                    {formatShare(share)}
                  </td>
                </tr>
              );
            })}
          </tbody>
          {column.levels.length > LEVELS_LISTED ? (
            <tfoot>
              <tr>
                <td colSpan={4} className="lw-cleaning__more" data-testid="levels-more">
                  … and {countOf(column.levels.length - LEVELS_LISTED, 'more level', 'more levels')} (
                  {formatCount(column.levels.slice(LEVELS_LISTED).reduce((n, l) => n + l.count, 0))} rows), less frequent than those
                  above. Group rare levels to fold them into one.
                </td>
              </tr>
            </tfoot>
          ) : null}
        </table>
      </div>
      <div className="lw-cleaning__merge-form">
        <div className="lw-field">
          <label htmlFor={`${id}-into`} className="lw-field__label">
            Name of the merged level
          </label>
          <input
            id={`${id}-into`}
            type="text"
            className="lw-field__input"
            value={typedName ?? suggested}
            placeholder="pick two or more levels"
            onChange={(event) => setTypedName(event.target.value)}
            onKeyDown={(event) => {
              if (event.key === 'Enter') {
                event.preventDefault();
                merge();
              }
            }}
          />
        </div>
        <button type="button" className="lw-button lw-button--primary" disabled={!canMerge} onClick={merge} aria-describedby={`${id}-status`}>
          Merge picked levels
        </button>
        <p className="lw-field__hint" id={`${id}-status`} aria-live="polite">
          {chosen.length < 2 ? `${countOf(chosen.length, 'level', 'levels')} picked; pick at least two.` : `${countOf(chosen.length, 'level', 'levels')} picked.`}
        </p>
      </div>
    </div>
  );
}
