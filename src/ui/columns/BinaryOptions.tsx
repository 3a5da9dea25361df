/** Options of a binary column: which of its two levels is coded 1. */
import type { Decision } from '../../core/decisions.ts';
import type { BinaryColumn } from '../../core/recipe.ts';
import { Panel, SelectField } from './fields.tsx';
import { formatCount } from './labels.ts';

export interface BinaryOptionsProps {
  readonly column: BinaryColumn;
  readonly onDecide: (d: Decision) => void;
}

export function BinaryOptions({ column, onDecide }: BinaryOptionsProps) {
  const values = column.levels.map((l) => l.value);
  const others = values.filter((v) => v !== column.positive);
  return (
    <Panel title="Coding">
      <SelectField
        label="Coded 1 (positive class)"
        value={column.positive}
        onChange={(positive) => onDecide({ type: 'set-positive', column: column.name, positive })}
        hint={others.length > 0 ? `Coded 0: ${others.map((v) => `“${v}”`).join(', ')}.` : undefined}
        choices={values.map((v) => ({ value: v, label: v }))}
      />
      {values.length !== 2 ? (
        <p className="lw-warning" role="status">
          After cleaning this column has {formatCount(values.length)} levels, but binary coding needs exactly two. Merge levels
          below, or choose another level of measurement.
        </p>
      ) : null}
    </Panel>
  );
}
