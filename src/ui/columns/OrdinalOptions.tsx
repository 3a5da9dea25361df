/** Options of an ordinal column: the coding, where ranks start, custom scores, and the order itself. */
import type { Decision } from '../../core/decisions.ts';
import type { OrdinalColumn } from '../../core/recipe.ts';
import { ChoiceGroup, Panel } from './fields.tsx';
import { countOf, formatValue } from './labels.ts';
import { OrdinalOrderList } from './OrdinalOrderList.tsx';
import { ScoresForm } from './ScoresForm.tsx';

export interface OrdinalOptionsProps {
  readonly column: OrdinalColumn;
  readonly onDecide: (d: Decision) => void;
}

export function OrdinalOptions({ column, onDecide }: OrdinalOptionsProps) {
  const { name } = column;
  const k = column.levels.length;
  return (
    <>
      <Panel title="Coding">
        <ChoiceGroup
          legend="Turn the order into"
          value={column.coding}
          onChange={(coding) => onDecide({ type: 'set-ordinal-coding', column: name, coding })}
          choices={[
            { value: 'rank', label: 'ranks', hint: `1 column: the place in the order, from ${column.start}` },
            { value: 'scores', label: 'custom scores', hint: '1 column: a number you give each level' },
            {
              value: 'cumulative',
              label: 'cumulative',
              hint: `${countOf(Math.max(0, k - 1), 'column', 'columns')}: 1 when “at least” each level above the lowest`,
            },
          ]}
        />
        {column.coding === 'rank' ? (
          <ChoiceGroup
            legend="The lowest level is ranked"
            columns={2}
            value={column.start}
            onChange={(start) => onDecide({ type: 'set-start', column: name, start })}
            choices={[
              { value: 0, label: '0', hint: 'ranks 0, 1, 2, …' },
              { value: 1, label: '1', hint: 'ranks 1, 2, 3, …' },
            ]}
          />
        ) : null}
        {column.coding === 'scores' ? (
          <ScoresForm key={JSON.stringify([column.levels.map((l) => l.value), column.scores])} column={column} onDecide={onDecide} />
        ) : null}
      </Panel>
      <Panel title="Order, lowest first">
        <OrdinalOrderList column={name} levels={column.levels} codes={codesShown(column)} onDecide={onDecide} />
      </Panel>
    </>
  );
}

/** The number each level becomes, shown beside it in the order list (cumulative has several). */
function codesShown(column: OrdinalColumn): readonly string[] | undefined {
  if (column.coding === 'rank') return column.levels.map((_, i) => String(i + column.start));
  if (column.coding === 'scores') return column.levels.map((_, i) => formatValue(column.scores?.[i] ?? i + column.start));
  return undefined;
}
