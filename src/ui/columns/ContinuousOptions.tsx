/** Options of a continuous column: scaling, what fills a missing cell, what happens to text that is not a number. */
import type { Decision } from '../../core/decisions.ts';
import type { ColumnProfile } from '../../core/profile.ts';
import { formatNumber } from '../../core/numbers.ts';
import type { ContinuousColumn } from '../../core/recipe.ts';
import { ChoiceGroup, Panel, SelectField, ToggleField } from './fields.tsx';
import { formatCount, formatValue } from './labels.ts';
import { NumberFormatForm } from './NumberFormatForm.tsx';

export interface ContinuousOptionsProps {
  readonly profile: ColumnProfile;
  readonly column: ContinuousColumn;
  readonly onDecide: (d: Decision) => void;
}

export function ContinuousOptions({ profile, column, onDecide }: ContinuousOptionsProps) {
  const { name, fitted } = column;
  const range = fitted.max - fitted.min;
  return (
    <>
      <Panel title="Scaling">
        <ChoiceGroup
          legend="Scale the numbers"
          value={column.scaling}
          onChange={(scaling) => onDecide({ type: 'set-scaling', column: name, scaling })}
          choices={[
            { value: 'none', label: 'as is', hint: 'the number as read' },
            { value: 'z-score', label: 'z-score', hint: `(x − ${formatValue(fitted.mean)}) / ${formatValue(fitted.sd)}` },
            { value: 'min-max', label: 'min–max', hint: `(x − ${formatValue(fitted.min)}) / ${formatValue(range)}, so 0 to 1` },
          ]}
        />
        <dl className="lw-stats" aria-label="Learned from this file">
          <Stat term="numbers read" value={formatCount(fitted.count)} />
          {/* The number format detected decides what reads as a number ("1 234" or "12,5"), so it is shown. */}
          <Stat term="written like" value={formatNumber(1234.5, column.format)} />
          <Stat term="mean" value={formatValue(fitted.mean)} />
          <Stat term="standard deviation" value={formatValue(fitted.sd)} />
          <Stat term="minimum" value={formatValue(fitted.min)} />
          <Stat term="median" value={formatValue(fitted.median)} />
          <Stat term="maximum" value={formatValue(fitted.max)} />
        </dl>
      </Panel>
      <Panel title="Number format">
        {/* Keyed by the format, so an undo or another column starts the form from the recipe again. */}
        <NumberFormatForm key={`${name} ${JSON.stringify(column.format)}`} profile={profile} column={column} onDecide={onDecide} />
      </Panel>
      <Panel title="Missing and unreadable cells">
        <SelectField
          label="Fill a missing cell with"
          value={column.missing.policy}
          onChange={(policy) => onDecide({ type: 'set-continuous-missing', column: name, missing: { ...column.missing, policy } })}
          hint={`${formatCount(profile.missing)} of ${formatCount(profile.count)} cells are missing in this file.`}
          choices={[
            { value: 'mean', label: `the mean (${formatValue(fitted.mean)})` },
            { value: 'median', label: `the median (${formatValue(fitted.median)})` },
            { value: 'zero', label: 'zero' },
            { value: 'error', label: 'nothing: reject the row and report it' },
          ]}
        />
        <ToggleField
          label="Add a missing-value indicator column"
          checked={column.missing.indicator}
          onChange={(indicator) => onDecide({ type: 'set-continuous-missing', column: name, missing: { ...column.missing, indicator } })}
          hint="A 0/1 column that is 1 where the cell was missing, so a filled value can be told apart."
        />
        <SelectField
          label="Text that does not read as a number"
          value={column.invalid}
          onChange={(invalid) => onDecide({ type: 'set-invalid', column: name, invalid })}
          hint={invalidHint(profile)}
          choices={[
            { value: 'missing', label: 'treat it as missing' },
            { value: 'error', label: 'reject the row and report it' },
          ]}
        />
      </Panel>
    </>
  );
}

function Stat({ term, value }: { readonly term: string; readonly value: string }) {
  return (
    <div>
      <dt>{term}</dt>
      <dd>{value}</dd>
    </div>
  );
}

function invalidHint(profile: ColumnProfile): string {
  const numeric = profile.numeric;
  if (!numeric || numeric.invalidCount === 0) return 'Every filled cell of this file reads as a number.';
  const examples = numeric.invalidExamples
    .slice(0, 3)
    .map((e) => `“${e.text}”${placeOf(e)}`)
    .join(', ');
  const cells = numeric.invalidCount === 1 ? 'cell does' : 'cells do';
  return `${formatCount(numeric.invalidCount)} ${cells} not read as numbers here, e.g. ${examples}.`;
}

/** " (line 12)", or " (row 12)" for a lone column; nothing when read again in another format (no rows known). */
function placeOf(example: { readonly row?: number; readonly line?: number }): string {
  if (example.line !== undefined) return ` (line ${formatCount(example.line)})`;
  return example.row === undefined ? '' : ` (row ${formatCount(example.row + 1)})`;
}
