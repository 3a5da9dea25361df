/**
 * The main job checked against published data: draft a recipe, apply it, and compare column sums
 * with the counts the datasets' publishers give.
 */
import { describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { encodeWindow } from '../../src/core/apply.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS } from '../../src/core/recipe.ts';
import { vegaDatasetCsv } from '../helpers/datasets.ts';

function fitAndEncode(bytes: Uint8Array) {
  const { table } = readTable(bytes);
  const profiles = profileTable(table, { missingTokens: DEFAULT_MISSING_TOKENS });
  const recipe = draftRecipe(profiles, { file: null, rows: table.rowCount });
  return { table, profiles, recipe };
}

/** Sums of each output column over all rows, by output name. */
function columnSums(recipe: ReturnType<typeof draftRecipe>, table: ReturnType<typeof readTable>['table']): Map<string, number> {
  const plan = compilePlan(recipe, table.names);
  const { values } = encodeWindow(plan, table, 0, table.rowCount);
  const sums = new Map<string, number>();
  plan.outputs.forEach((name, j) => {
    let sum = 0;
    for (let r = 0; r < table.rowCount; r++) sum += values[r * plan.outputs.length + j] ?? 0;
    sums.set(name, sum);
  });
  return sums;
}

describe('Palmer penguins (vega-datasets penguins.json; Gorman, Williams & Fraser 2014; palmerpenguins documentation)', () => {
  const { table, profiles, recipe } = fitAndEncode(vegaDatasetCsv('penguins'));

  it('has the published 344 rows', () => expect(table.rowCount).toBe(344));

  it('one-hot sums equal the published species and island counts', () => {
    const sums = columnSums(recipe, table);
    expect(sums.get('Species=Adelie')).toBe(152);
    expect(sums.get('Species=Chinstrap')).toBe(68);
    expect(sums.get('Species=Gentoo')).toBe(124);
    expect(sums.get('Island=Biscoe')).toBe(168);
    expect(sums.get('Island=Dream')).toBe(124);
    expect(sums.get('Island=Torgersen')).toBe(52);
  });

  it('finds the Sex column’s missing entries: 10 null and 1 "."', () => {
    const sex = profiles.find((p) => p.name === 'Sex')!;
    expect(sex.missing).toBe(11);
    expect(Object.fromEntries(sex.missingSpellings.map((s) => [s.value, s.count]))).toEqual({ '': 10, '.': 1 });
  });

  it('a z-scored column has mean 0 and standard deviation 1 within 1e-9', () => {
    const scaled = decide(recipe, { type: 'set-scaling', column: 'Body Mass (g)', scaling: 'z-score' }, profiles);
    const withoutFill = decide(scaled, { type: 'set-continuous-missing', column: 'Body Mass (g)', missing: { policy: 'mean', indicator: false } }, profiles);
    const plan = compilePlan(withoutFill, table.names);
    const { values } = encodeWindow(plan, table, 0, table.rowCount);
    const j = plan.outputs.indexOf('Body Mass (g)');
    const column = plan.columns.find((c) => c.recipe.name === 'Body Mass (g)')!;
    // Rows filled with the mean score exactly 0 and would shrink the sd: take the measured rows only.
    const measured: number[] = [];
    const source = table.columns[column.source]!;
    for (let r = 0; r < table.rowCount; r++) {
      const raw = source.kind === 'text' ? source.values[source.codes[r]!] : String(source.values[r]);
      if (raw !== '' && raw !== 'NaN') measured.push(values[r * plan.outputs.length + j]!);
    }
    expect(measured.length).toBe(342); // 2 penguins have no body mass in the published data
    const mean = measured.reduce((a, b) => a + b, 0) / measured.length;
    const sd = Math.sqrt(measured.reduce((a, b) => a + (b - mean) ** 2, 0) / (measured.length - 1));
    expect(Math.abs(mean)).toBeLessThan(1e-9);
    expect(Math.abs(sd - 1)).toBeLessThan(1e-9);
  });

  it('dummy coding with a chosen reference drops that column; every row sums to at most 1', () => {
    const dummy = decide(recipe, { type: 'set-nominal-coding', column: 'Species', coding: 'dummy' }, profiles);
    const withRef = decide(dummy, { type: 'set-reference', column: 'Species', reference: 'Gentoo' }, profiles);
    const species = withRef.columns.find((c) => c.name === 'Species')!;
    expect(species.outputs).toEqual(['Species=Adelie', 'Species=Chinstrap']);
    const sums = columnSums(withRef, table);
    expect(sums.get('Species=Adelie')).toBe(152);
    expect(sums.get('Species=Chinstrap')).toBe(68);
    expect(sums.has('Species=Gentoo')).toBe(false);
  });
});

describe('cars (vega-datasets cars.json; origin counts as that file publishes them; its source, the StatLib auto data, is from memory)', () => {
  const { table, recipe } = fitAndEncode(vegaDatasetCsv('cars'));

  it('has 406 rows and the published origin counts', () => {
    expect(table.rowCount).toBe(406);
    const sums = columnSums(recipe, table);
    expect(sums.get('Origin=USA')).toBe(254);
    expect(sums.get('Origin=Europe')).toBe(73);
    expect(sums.get('Origin=Japan')).toBe(79);
  });

  it('keeps every row in the CSV output', () => {
    const { bytes, report } = encodeToCsv(recipe, table);
    const lines = new TextDecoder().decode(bytes).split('\r\n').filter((l) => l !== '');
    expect(lines.length).toBe(407);
    expect(report.rowsWritten).toBe(406);
  });
});
