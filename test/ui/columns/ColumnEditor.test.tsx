// @vitest-environment jsdom
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { decide, type Decision } from '../../../src/core/decisions.ts';
import type { ColumnRecipe } from '../../../src/core/recipe.ts';
import { ColumnEditor } from '../../../src/ui/columns/ColumnEditor.tsx';
import {
  evColumn,
  heatingColumn,
  insulationColumn,
  kwhColumn,
  profileNamed,
  regionColumn,
  smartMeterColumn,
  surveyProfiles,
  surveyRecipe,
} from '../fixtures.ts';

afterEach(cleanup);

function renderEditor(column: ColumnRecipe) {
  const onDecide = vi.fn<(d: Decision) => void>();
  const view = render(<ColumnEditor profile={profileNamed(column.name)} column={column} onDecide={onDecide} />);
  return { onDecide, view, user: userEvent.setup() };
}

/** The editor inside a parent that applies each decision with the real core, as the page does. */
function Workbench({ name, onDecide }: { name: string; onDecide: (d: Decision) => void }) {
  const [recipe, setRecipe] = useState(surveyRecipe);
  const column = recipe.columns.find((c) => c.name === name);
  if (!column) throw new Error(name);
  return (
    <ColumnEditor
      profile={profileNamed(name)}
      column={column}
      onDecide={(d) => {
        onDecide(d);
        setRecipe((r) => decide(r, d, surveyProfiles));
      }}
    />
  );
}

function renderWorkbench(name: string) {
  const onDecide = vi.fn<(d: Decision) => void>();
  render(<Workbench name={name} onDecide={onDecide} />);
  return { onDecide, user: userEvent.setup() };
}

/** Level → [rows, share] as the levels table shows them. */
function levelRows(): Record<string, string> {
  const table = screen.getByRole('table', { name: /levels after cleaning/ });
  const rows = within(table).getAllByRole('row').slice(1);
  return Object.fromEntries(rows.map((r) => [r.dataset['level'] ?? '', r.querySelector('[data-count]')?.textContent ?? '']));
}

/** Level → its codes, as the "What each level becomes" table shows them. */
function codeRows(): Record<string, string[]> {
  const table = screen.getByRole('table', { name: 'What each level becomes' });
  const rows = within(table).getAllByRole('row').slice(1);
  return Object.fromEntries(
    rows.map((r) => [within(r).getByRole('rowheader').textContent ?? '', within(r).getAllByRole('cell').map((c) => c.textContent ?? '')]),
  );
}

describe('ColumnEditor: the level', () => {
  it('shows the column, why it got its level and what the file holds', () => {
    renderEditor(heatingColumn);
    expect(screen.getByRole('heading', { level: 2, name: 'heating' })).toBeTruthy();
    expect(screen.getByText('6 distinct values with no order among them')).toBeTruthy();
    const facts = screen.getByRole('list', { name: 'In this file' });
    expect(within(facts).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['1,240 rows', '17 missing', '6 distinct']);
  });

  it('changes the level with one control, with our words for identifier and excluded', async () => {
    const { onDecide, user } = renderEditor(heatingColumn);
    const group = screen.getByRole('group', { name: 'Level of measurement' });
    expect(within(group).getAllByRole('radio').map((r) => r.getAttribute('aria-labelledby') && document.getElementById(r.getAttribute('aria-labelledby') ?? '')?.textContent)).toEqual([
      'continuous',
      'nominal',
      'ordinal',
      'binary',
      'identifier (kept as is)',
      'left out',
    ]);
    expect((screen.getByRole('radio', { name: 'nominal' }) as HTMLInputElement).checked).toBe(true);
    // No cell of "heating" reads as a number, so it cannot become continuous.
    expect((screen.getByRole('radio', { name: 'continuous' }) as HTMLInputElement).disabled).toBe(true);

    await user.click(screen.getByRole('radio', { name: 'left out' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-level', column: 'heating', level: 'excluded' });
    await user.click(screen.getByRole('radio', { name: 'identifier (kept as is)' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-level', column: 'heating', level: 'identifier' });
    await user.click(screen.getByRole('radio', { name: 'ordinal' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-level', column: 'heating', level: 'ordinal' });
  });

  it('lists the output names of the column', () => {
    renderEditor(heatingColumn);
    const outputs = screen.getByRole('list', { name: 'Output columns of heating' });
    expect(within(outputs).getAllByRole('listitem').map((li) => li.textContent)).toEqual(heatingColumn.outputs);
    expect(screen.getByText('7 output columns')).toBeTruthy();
  });

  it('explains identifier and left-out columns', () => {
    renderEditor({ name: 'household_id', level: 'identifier', reason: '1,240 distinct values in 1,240 rows', outputs: ['household_id'] });
    expect(screen.getByText(/copied to the output unchanged and not encoded/)).toBeTruthy();
    cleanup();
    renderEditor({ name: 'comments', level: 'excluded', reason: 'long free text, mostly distinct', outputs: [] });
    expect(screen.getByText('This column is left out, so it makes no output column.')).toBeTruthy();
  });
});

describe('ColumnEditor: nominal', () => {
  it('emits dummy coding, then a reference level', async () => {
    const { onDecide, user, view } = renderEditor(heatingColumn);
    const reference = screen.getByLabelText('Reference level') as HTMLSelectElement;
    expect(reference.disabled).toBe(true); // one-hot has no reference level
    await user.click(screen.getByRole('radio', { name: 'dummy' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-nominal-coding', column: 'heating', coding: 'dummy' });

    view.rerender(<ColumnEditor profile={profileNamed('heating')} column={{ ...heatingColumn, coding: 'dummy' }} onDecide={onDecide} />);
    expect(reference.disabled).toBe(false);
    expect(reference.value).toBe('gas boiler');
    await user.selectOptions(reference, 'heat pump');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-reference', column: 'heating', reference: 'heat pump' });
  });

  it('shows what each level becomes under dummy and effect coding (applied by the core)', async () => {
    const { user } = renderWorkbench('heating');
    await user.click(screen.getByRole('radio', { name: 'dummy' }));
    await user.selectOptions(screen.getByLabelText('Reference level'), 'heat pump');
    // Dummy (treatment) coding, reference "heat pump": k − 1 = 6 columns; the reference row is all 0
    // and every other level has a single 1 in its own column (common practice; hand-written here).
    let codes = codeRows();
    expect(codes['heat pump']).toEqual(['0', '0', '0', '0', '0', '0']);
    expect(codes['gas boiler']).toEqual(['1', '0', '0', '0', '0', '0']);
    expect(codes['oil boiler']).toEqual(['0', '1', '0', '0', '0', '0']);
    expect(codes['(missing)']).toEqual(['0', '0', '0', '0', '0', '1']);
    expect(screen.getByText('6 output columns')).toBeTruthy();

    await user.click(screen.getByRole('radio', { name: 'effect' }));
    // Effect (deviation) coding: the same, but the reference row is −1 in every column (common practice).
    codes = codeRows();
    expect(codes['heat pump']).toEqual(['−1', '−1', '−1', '−1', '−1', '−1']);
    expect(codes['district heat']).toEqual(['0', '0', '0', '0', '1', '0']);
  });

  it('emits rare-level grouping typed as a whole, with shares typed in per cent', async () => {
    const { onDecide, user } = renderEditor(regionColumn);
    await user.type(screen.getByLabelText('Keep only the'), '20');
    await user.type(screen.getByLabelText('Group levels with less than'), '0.5');
    expect(onDecide).not.toHaveBeenCalled();
    await user.click(screen.getByRole('button', { name: 'Apply grouping' }));
    expect(onDecide).toHaveBeenCalledTimes(1);
    expect(onDecide).toHaveBeenCalledWith({ type: 'set-rare', column: 'region_code', rare: { minCount: null, minShare: 0.005, keepTop: 20 } });
  });

  it('refuses a rule that is not a number it can use, and says why', async () => {
    const { onDecide, user } = renderEditor(regionColumn);
    await user.type(screen.getByLabelText('Keep only the'), '0');
    await user.click(screen.getByRole('button', { name: 'Apply grouping' }));
    expect(screen.getByRole('alert').textContent).toBe('The number of levels to keep must be a whole number, 1 or more.');
    expect(screen.getByLabelText('Keep only the').getAttribute('aria-invalid')).toBe('true');
    expect(onDecide).not.toHaveBeenCalled();
  });

  it('reports which levels were grouped once the core has applied the rule', async () => {
    const { user } = renderWorkbench('region_code');
    await user.type(screen.getByLabelText('Keep only the'), '20');
    await user.click(screen.getByRole('button', { name: 'Apply grouping' }));
    // 48 regions, top 20 kept: R21…R48 (28 levels) are grouped. Their rows: 1,221 answered −
    // 1,038 in the top 20 = 183 (hand-added from the fixture counts).
    expect(screen.getByText(/^28 levels \(183 rows\) grouped into “\(other\)”: R21, R22/)).toBeTruthy();
    expect(levelRows()['(other)']).toBe('183');
    // 20 kept + (other) + (missing) = 22 one-hot columns.
    expect(screen.getByText('22 output columns')).toBeTruthy();
  });

  it('emits missing and unseen policies', async () => {
    const { onDecide, user } = renderEditor(heatingColumn);
    await user.selectOptions(screen.getByLabelText('A missing cell becomes'), 'zeros');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-categorical-missing', column: 'heating', missing: { policy: 'zeros', indicator: false } });
    await user.click(screen.getByRole('checkbox', { name: 'Add a missing-value indicator column' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-categorical-missing', column: 'heating', missing: { policy: 'level', indicator: true } });
    await user.selectOptions(screen.getByLabelText('A value this file does not have becomes'), 'error');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-unseen', column: 'heating', unseen: 'error' });
    // The most frequent level is named where it matters.
    expect(screen.getByRole('option', { name: 'the most frequent level, “gas boiler”' })).toBeTruthy();
  });
});

describe('ColumnEditor: cleaning and merging', () => {
  it('emits trim and case-fold toggles', async () => {
    const { onDecide, user } = renderEditor(smartMeterColumn);
    await user.click(screen.getByRole('checkbox', { name: 'Ignore upper and lower case' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-cleaning', column: 'smart_meter', caseFold: true });
    await user.click(screen.getByRole('checkbox', { name: 'Trim spaces' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-cleaning', column: 'smart_meter', trim: false });
  });

  it('merges "Y" and "yes" into "yes", counts follow, and the merge can be undone', async () => {
    const { onDecide, user } = renderWorkbench('smart_meter');
    expect(levelRows()).toEqual({ yes: '655', no: '480', Y: '62', N: '31', '(missing)': '12' });
    const merge = screen.getByRole('button', { name: 'Merge picked levels' }) as HTMLButtonElement;
    expect(merge.disabled).toBe(true);

    await user.click(screen.getByRole('checkbox', { name: 'Pick “yes” to merge' }));
    await user.click(screen.getByRole('checkbox', { name: 'Pick “Y” to merge' }));
    // The merged level is named after the most frequent level picked until a name is typed.
    expect((screen.getByLabelText('Name of the merged level') as HTMLInputElement).value).toBe('yes');
    expect(merge.disabled).toBe(false);
    await user.click(merge);
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'merge-levels', column: 'smart_meter', from: ['yes', 'Y'], into: 'yes' });

    // 655 + 62 = 717 rows now answer "yes".
    expect(levelRows()).toEqual({ yes: '717', no: '480', N: '31', '(missing)': '12' });
    expect(screen.getByText('4 output columns')).toBeTruthy();

    await user.click(screen.getByRole('button', { name: 'Undo the merge into “yes”' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'undo-merge', column: 'smart_meter', into: 'yes' });
    expect(levelRows()).toEqual({ yes: '655', no: '480', Y: '62', N: '31', '(missing)': '12' });
  });

  it('merges under a typed name and never offers the missing level for merging', async () => {
    const { onDecide, user } = renderEditor(smartMeterColumn);
    expect((screen.getByRole('checkbox', { name: 'Pick “(missing)” to merge' }) as HTMLInputElement).disabled).toBe(true);
    await user.click(screen.getByRole('checkbox', { name: 'Pick “no” to merge' }));
    await user.click(screen.getByRole('checkbox', { name: 'Pick “N” to merge' }));
    const name = screen.getByLabelText('Name of the merged level');
    await user.clear(name);
    await user.type(name, 'no meter{Enter}');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'merge-levels', column: 'smart_meter', from: ['no', 'N'], into: 'no meter' });
  });
});

describe('ColumnEditor: continuous', () => {
  it('emits scaling, missing fill, indicator and invalid-text policy', async () => {
    const { onDecide, user } = renderEditor(kwhColumn);
    // The z-score is spelled out with the fitted mean and standard deviation.
    expect(screen.getByText('(x − 4,630.5) / 2,875.2')).toBeTruthy();
    expect(screen.getByText('(x − 812) / 20,638, so 0 to 1')).toBeTruthy();
    await user.click(screen.getByRole('radio', { name: 'min–max' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-scaling', column: 'annual_kwh', scaling: 'min-max' });
    await user.selectOptions(screen.getByLabelText('Fill a missing cell with'), 'median');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-continuous-missing', column: 'annual_kwh', missing: { policy: 'median', indicator: true } });
    await user.click(screen.getByRole('checkbox', { name: 'Add a missing-value indicator column' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-continuous-missing', column: 'annual_kwh', missing: { policy: 'mean', indicator: false } });
    await user.selectOptions(screen.getByLabelText('Text that does not read as a number'), 'error');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-invalid', column: 'annual_kwh', invalid: 'error' });
  });

  it('names the cells that are not numbers, with 1-based rows', () => {
    renderEditor(kwhColumn);
    expect(
      screen.getByText('4 cells do not read as numbers here, e.g. “about 3000” (row 58), “unknown” (row 312), “see notes” (row 803).'),
    ).toBeTruthy();
    expect(screen.getByRole('option', { name: 'the median (3,980)' })).toBeTruthy();
  });
});

describe('ColumnEditor: ordinal and binary', () => {
  it('emits rank start, coding and custom scores', async () => {
    const { onDecide, user, view } = renderEditor(insulationColumn);
    await user.click(screen.getByRole('radio', { name: '0' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-start', column: 'insulation', start: 0 });
    await user.click(screen.getByRole('radio', { name: 'cumulative' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-ordinal-coding', column: 'insulation', coding: 'cumulative' });

    view.rerender(
      <ColumnEditor profile={profileNamed('insulation')} column={{ ...insulationColumn, coding: 'scores', scores: [1, 2, 3, 4] }} onDecide={onDecide} />,
    );
    const scores = ['poor', 'fair', 'good', 'very good'].map((l) => screen.getByLabelText(`Score for “${l}”`));
    for (const [i, value] of ['-2', '-1', '1', '2'].entries()) {
      const input = scores[i];
      if (!input) throw new Error('missing score input');
      await user.clear(input);
      await user.type(input, value);
    }
    await user.click(screen.getByRole('button', { name: 'Apply scores' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-scores', column: 'insulation', scores: [-2, -1, 1, 2] });
  });

  it('shows cumulative codes "at least" each level (applied by the core)', async () => {
    const { user } = renderWorkbench('insulation');
    await user.click(screen.getByRole('radio', { name: 'cumulative' }));
    // k − 1 = 3 columns: ≥ fair, ≥ good, ≥ very good; the lowest level is 0 in all (common practice; hand-written).
    const codes = codeRows();
    expect(codes).toEqual({
      poor: ['0', '0', '0'],
      fair: ['1', '0', '0'],
      good: ['1', '1', '0'],
      'very good': ['1', '1', '1'],
    });
  });

  it('reverses the order through the core and the ranks follow', async () => {
    const { onDecide, user } = renderWorkbench('insulation');
    await user.click(screen.getByRole('button', { name: 'Reverse the order' }));
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'reverse-order', column: 'insulation' });
    expect(codeRows()).toEqual({ 'very good': ['1'], good: ['2'], fair: ['3'], poor: ['4'] });
  });

  it('emits the positive class of a binary column', async () => {
    const { onDecide, user } = renderEditor(evColumn);
    expect(screen.getByText('Coded 0: “no”.')).toBeTruthy();
    await user.selectOptions(screen.getByLabelText('Coded 1 (positive class)'), 'no');
    expect(onDecide).toHaveBeenLastCalledWith({ type: 'set-positive', column: 'owns_ev', positive: 'no' });
    // A binary column has no "other" level for unseen values.
    expect((screen.getByRole('option', { name: 'the “(other)” level' }) as HTMLOptionElement).disabled).toBe(true);
  });

  it('warns when a binary column does not have exactly two levels', () => {
    renderEditor({ ...evColumn, levels: [...evColumn.levels, { value: 'maybe', count: 3 }] });
    expect(screen.getByRole('status').textContent).toMatch(/has 3 levels, but binary coding needs exactly two/);
  });
});

describe('ColumnEditor caution for data about people', () => {
  it('shows the caution when the column name suggests a sensitive attribute, and not otherwise', () => {
    const profile = surveyProfiles.find((p) => p.name === heatingColumn.name)!;
    render(<ColumnEditor profile={{ ...profile, name: 'occupant_age_band' }} column={{ ...heatingColumn, name: 'occupant_age_band' }} onDecide={() => {}} />);
    expect(screen.getByRole('note').textContent).toMatch(/sensitive attribute of people.*check local law and have the use reviewed/);
    cleanup();
    render(<ColumnEditor profile={profile} column={heatingColumn} onDecide={() => {}} />);
    expect(screen.queryByRole('note')).toBeNull();
  });
});
