/** Options of a nominal column: the coding, its reference level, and rare-level grouping. */
import type { Decision } from '../../core/decisions.ts';
import type { NominalColumn } from '../../core/recipe.ts';
import { ChoiceGroup, Panel, SelectField } from './fields.tsx';
import { countOf } from './labels.ts';
import { RareGroupingForm } from './RareGroupingForm.tsx';

export interface NominalOptionsProps {
  readonly column: NominalColumn;
  readonly onDecide: (d: Decision) => void;
}

export function NominalOptions({ column, onDecide }: NominalOptionsProps) {
  const { name } = column;
  const k = column.levels.length;
  const values = column.levels.map((l) => l.value);
  const usesReference = column.coding === 'dummy' || column.coding === 'effect';
  const reference = column.reference ?? values[0] ?? '';
  return (
    <>
      <Panel title="Coding">
        <ChoiceGroup
          legend="Turn the levels into"
          columns={2}
          value={column.coding}
          onChange={(coding) => onDecide({ type: 'set-nominal-coding', column: name, coding })}
          choices={[
            { value: 'one-hot', label: 'one-hot', hint: `${countOf(k, 'column', 'columns')}, one per level` },
            { value: 'dummy', label: 'dummy', hint: `${countOf(Math.max(0, k - 1), 'column', 'columns')}; the reference level is 0 in all` },
            { value: 'effect', label: 'effect', hint: `${countOf(Math.max(0, k - 1), 'column', 'columns')}; the reference level is −1 in all` },
            { value: 'frequency', label: 'frequency', hint: '1 column: the level’s share of the rows' },
          ]}
        />
        <SelectField
          label="Reference level"
          value={reference}
          disabled={!usesReference}
          onChange={(chosen) => onDecide({ type: 'set-reference', column: name, reference: chosen })}
          hint={
            usesReference
              ? 'The baseline the other levels are compared with; it gets no column of its own.'
              : 'Used by dummy and effect coding only.'
          }
          choices={column.levels.map((l) => ({ value: l.value, label: l.value }))}
        />
      </Panel>
      <Panel title="Rare levels">
        <RareGroupingForm key={JSON.stringify([column.rare, column.otherLabel])} column={column} onDecide={onDecide} />
      </Panel>
    </>
  );
}
