/**
 * Everything that can be decided about one column. The level comes first; the options that belong
 * to that level appear beside it, and the levels themselves (with their cleaning) and the output
 * names follow. The editor holds no recipe state: every change is a Decision handed to the parent,
 * which re-renders it with the new recipe column.
 */
import { memo, useId } from 'react';
import type { Decision } from '../../core/decisions.ts';
import { sensitiveAttributeCaution } from '../../core/infer.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { LEVELS, type ColumnRecipe, type MeasurementLevel } from '../../core/recipe.ts';
import { BinaryOptions } from './BinaryOptions.tsx';
import { CategoricalPolicies } from './CategoricalPolicies.tsx';
import { CodeTable } from './CodeTable.tsx';
import { ContinuousOptions } from './ContinuousOptions.tsx';
import { ChoiceGroup, Panel } from './fields.tsx';
import { formatCount, isCategorical, LEVEL_HINTS, LEVEL_LABELS } from './labels.ts';
import { LevelBadge } from './LevelBadge.tsx';
import { LevelCleaning } from './LevelCleaning.tsx';
import { NominalOptions } from './NominalOptions.tsx';
import { OrdinalOptions } from './OrdinalOptions.tsx';
import { OutputNames } from './OutputNames.tsx';
import './ColumnEditor.css';

export interface ColumnEditorProps {
  profile: ColumnProfile;
  column: ColumnRecipe;
  onDecide(d: Decision): void;
}

/** Drawn again only when its column, profile or callback changes: not when the worker's preview comes back. */
export const ColumnEditor = memo(function ColumnEditor({ profile, column, onDecide }: ColumnEditorProps) {
  const headingId = useId();
  return (
    <section className="lw-editor" aria-labelledby={headingId} data-column={column.name}>
      <header className="lw-editor__head">
        <div className="lw-editor__title-row">
          <h2 className="lw-editor__title" id={headingId}>
            {column.name}
          </h2>
          <LevelBadge level={column.level} />
        </div>
        <p className="lw-editor__reason">
          <span className="lw-editor__reason-label">Why: </span>
          {column.reason}
        </p>
        <SensitiveCaution name={column.name} />
        <ProfileFacts profile={profile} />
      </header>

      <LevelPicker profile={profile} column={column} onDecide={onDecide} />

      {/* Keyed by column, so half-typed drafts (scores, rules, merge picks) never carry over to another column. */}
      <div className="lw-editor__body" key={column.name}>
        <div className="lw-editor__options">
          <LevelOptions profile={profile} column={column} onDecide={onDecide} />
        </div>
        {isCategorical(column) ? (
          <div className="lw-editor__levels">
            <LevelCleaning column={column} onDecide={onDecide} />
          </div>
        ) : null}
      </div>

      <Panel title="Output" className="lw-editor__output">
        <OutputNames column={column} />
        {isCategorical(column) ? <CodeTable column={column} /> : null}
      </Panel>
    </section>
  );
});

/** The usual caution, shown where the decision is made, when the column's name suggests data about people. */
function SensitiveCaution({ name }: { readonly name: string }) {
  const caution = sensitiveAttributeCaution(name);
  if (caution === null) return null;
  return (
    <p className="lw-editor__caution" role="note">
      <strong>Take care: </strong>
      {caution}.
    </p>
  );
}

function ProfileFacts({ profile }: { readonly profile: ColumnProfile }) {
  const filled = profile.count - profile.missing;
  return (
    <ul className="lw-editor__facts" aria-label="In this file">
      <li>{formatCount(profile.count)} rows</li>
      <li>{formatCount(profile.missing)} missing</li>
      <li>{formatCount(profile.distinct)} distinct</li>
      {profile.numeric ? (
        <li>
          {formatCount(profile.numeric.count)} of {formatCount(filled)} read as numbers
        </li>
      ) : null}
    </ul>
  );
}

function LevelPicker({ profile, column, onDecide }: ColumnEditorProps) {
  const noNumbers = profile.numeric === null;
  return (
    <ChoiceGroup<MeasurementLevel>
      legend="Level of measurement"
      value={column.level}
      onChange={(level) => onDecide({ type: 'set-level', column: column.name, level })}
      choices={LEVELS.map((level) => ({
        value: level,
        label: LEVEL_LABELS[level],
        hint: level === 'continuous' && noNumbers ? 'no value here reads as a number' : LEVEL_HINTS[level],
        disabled: level === 'continuous' && noNumbers && column.level !== 'continuous',
      }))}
    />
  );
}

function LevelOptions({ profile, column, onDecide }: ColumnEditorProps) {
  switch (column.level) {
    case 'continuous':
      return <ContinuousOptions profile={profile} column={column} onDecide={onDecide} />;
    case 'nominal':
      return (
        <>
          <NominalOptions column={column} onDecide={onDecide} />
          <CategoricalPolicies profile={profile} column={column} onDecide={onDecide} />
        </>
      );
    case 'ordinal':
      return (
        <>
          <OrdinalOptions column={column} onDecide={onDecide} />
          <CategoricalPolicies profile={profile} column={column} onDecide={onDecide} />
        </>
      );
    case 'binary':
      return (
        <>
          <BinaryOptions column={column} onDecide={onDecide} />
          <CategoricalPolicies profile={profile} column={column} onDecide={onDecide} />
        </>
      );
    case 'identifier':
      return (
        <Panel title="Kept as is">
          <p className="lw-note">
            The values are copied to the output unchanged and not encoded, so rows can be matched back to their source. A
            model should not use this column as a feature.
          </p>
        </Panel>
      );
    case 'excluded':
      return (
        <Panel title="Left out">
          <p className="lw-note">This column is not part of the output. Choose another level above to bring it back.</p>
        </Panel>
      );
  }
}
