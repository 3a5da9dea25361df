/** Missing and unseen-level policies of a nominal, ordinal or binary column. */
import type { Decision } from '../../core/decisions.ts';
import { MISSING_LEVEL } from '../../core/fit.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import type { CategoricalColumn } from '../../core/recipe.ts';
import { Panel, SelectField, ToggleField } from './fields.tsx';
import { formatCount } from './labels.ts';

export interface CategoricalPoliciesProps {
  readonly profile: ColumnProfile;
  readonly column: CategoricalColumn;
  readonly onDecide: (d: Decision) => void;
}

export function CategoricalPolicies({ profile, column, onDecide }: CategoricalPoliciesProps) {
  const { name } = column;
  const mostFrequent = [...column.levels].filter((l) => l.value !== MISSING_LEVEL).sort((a, b) => b.count - a.count)[0]?.value;
  return (
    <Panel title="Missing and new values">
      <SelectField
        label="A missing cell becomes"
        value={column.missing.policy}
        onChange={(policy) => onDecide({ type: 'set-categorical-missing', column: name, missing: { ...column.missing, policy } })}
        hint={`${formatCount(profile.missing)} of ${formatCount(profile.count)} cells are missing in this file.`}
        choices={[
          { value: 'level', label: `a level of its own, “${MISSING_LEVEL}”` },
          { value: 'most-frequent', label: mostFrequent === undefined ? 'the most frequent level' : `the most frequent level, “${mostFrequent}”` },
          { value: 'zeros', label: 'all output columns 0' },
          { value: 'error', label: 'nothing: reject the row and report it' },
        ]}
      />
      <ToggleField
        label="Add a missing-value indicator column"
        checked={column.missing.indicator}
        onChange={(indicator) => onDecide({ type: 'set-categorical-missing', column: name, missing: { ...column.missing, indicator } })}
        hint="A 0/1 column that is 1 where the cell was missing."
      />
      <SelectField
        label="A value this file does not have becomes"
        value={column.unseen}
        onChange={(unseen) => onDecide({ type: 'set-unseen', column: name, unseen })}
        hint="Applies when the recipe meets new data with a level it was not fitted on."
        choices={[
          { value: 'zeros', label: 'all output columns 0' },
          // A binary column has only its two levels; there is no other level to join.
          { value: 'other', label: `the “${column.otherLabel}” level`, disabled: column.level === 'binary' },
          { value: 'error', label: 'nothing: reject the row and report it' },
        ]}
      />
    </Panel>
  );
}
