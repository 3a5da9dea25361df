/**
 * encodeBatch works out each distinct text of a batch once (all of a small dictionary up front, or
 * only the codes a few rows use of a big one) and reads plain numbers without consulting the
 * plan's cache. Checked here against the plainest encoder, one cell at a time through the plan's
 * resolvers, on random tables, recipes and row ranges (fast-check); and the report must count the
 * same missing, unseen and invalid cells and reject the same rows whatever the batch size, and a
 * batch made in the arrays of the one before must be what new arrays give.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createApplyReport } from '../../src/core/apply-report.ts';
import { encodeBatch } from '../../src/core/apply.ts';
import { BatchArrays } from '../../src/core/batch-arrays.ts';
import { cellText, type Table } from '../../src/core/columns.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { tableFromRows } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type MeasurementLevel, type Recipe } from '../../src/core/recipe.ts';

const cell = fc.constantFrom('a', 'b', 'B ', 'c', 'NA', '', '7', '-3', '2.5', '1,5', '1e3', 'x7', '0', '12.50', 'zz');
const level = fc.constantFrom<MeasurementLevel>('continuous', 'nominal', 'ordinal', 'binary', 'identifier', 'excluded');

const scenario = fc.tuple(fc.integer({ min: 1, max: 25 }), fc.integer({ min: 1, max: 60 }), fc.integer({ min: 1, max: 3 })).chain(([fit, apply, columns]) =>
  fc.record({
    fitRows: fc.array(fc.array(cell, { minLength: columns, maxLength: columns }), { minLength: fit, maxLength: fit }),
    applyRows: fc.array(fc.array(cell, { minLength: columns, maxLength: columns }), { minLength: apply, maxLength: apply }),
    levels: fc.array(level, { minLength: columns, maxLength: columns }),
    strict: fc.boolean(),
    range: fc.tuple(fc.nat(), fc.nat()),
    batchRows: fc.integer({ min: 1, max: 60 }),
    dictionaryCap: fc.constantFrom(2, 4096),
  }),
);

function table(rows: readonly (readonly string[])[], dictionaryCap: number): Table {
  const header = (rows[0] ?? []).map((_, i) => `c${i}`);
  return tableFromRows([[...header, 'row'], ...rows.map((row, i) => [...row, String(i)])], { dictionaryCap }).table;
}

function recipeFor(fit: Table, levels: readonly MeasurementLevel[], strict: boolean): Recipe {
  const profiles = profileTable(fit, { missingTokens: DEFAULT_MISSING_TOKENS });
  let recipe = draftRecipe(profiles, { file: null, rows: fit.rowCount });
  const decisions = levels.flatMap((l, i): Decision[] => [
    { type: 'set-level', column: `c${i}`, level: l },
    { type: 'set-unseen', column: `c${i}`, unseen: strict ? 'error' : 'zeros' },
    { type: 'set-invalid', column: `c${i}`, invalid: strict ? 'error' : 'missing' },
  ]);
  for (const d of decisions) recipe = decide(recipe, d, profiles);
  return recipe;
}

type Scenario = typeof scenario extends fc.Arbitrary<infer T> ? T : never;

/** A scenario's recipe, fitted on its fitting rows, planned over the rows it applies to. */
function planned(s: Scenario): { source: Table; plan: ReturnType<typeof compilePlan> } {
  const recipe = recipeFor(table(s.fitRows, 4096), s.levels, s.strict);
  const source = table(s.applyRows, s.dictionaryCap);
  return { source, plan: compilePlan(recipe, source.names) };
}

describe('encodeBatch against one cell at a time', () => {
  it('levels, numbers, missing flags and rejections agree for any range of rows', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const { source, plan } = planned(s);
        const [a, b] = s.range.map((x) => x % (source.rowCount + 1)) as [number, number];
        const start = Math.min(a, b);
        const end = Math.max(a, b);
        const batch = encodeBatch(plan, source, start, end);
        for (let r = 0; r < end - start; r++) {
          let rejected = false;
          plan.columns.forEach((column, c) => {
            const from = source.columns[column.source];
            const text = from === undefined ? '' : cellText(from, start + r);
            const encoded = batch.columns[c]!;
            if (column.kind === 'categorical' && encoded.kind === 'levels') {
              const outcome = column.resolve(text);
              expect([encoded.level[r], encoded.missing[r]]).toEqual([outcome.level, outcome.missing ? 1 : 0]);
              rejected ||= outcome.reject !== null;
            } else if (column.kind === 'continuous' && encoded.kind === 'numbers') {
              const outcome = column.resolve(text);
              const { center, scale } = column.transform;
              expect([encoded.values[r], encoded.missing[r]]).toEqual([(outcome.value - center) / scale, outcome.missing ? 1 : 0]);
              rejected ||= outcome.reject !== null;
            }
          });
          expect(batch.rejected[r]).toBe(rejected ? 1 : 0);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('batches made in the arrays of the batch before (a streamed apply) are those made in new arrays', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const { source, plan } = planned(s);
        const arrays = new BatchArrays();
        // Batches of different sizes, in turn, so that a smaller one follows a larger one in the same arrays.
        for (let start = 0, k = 0; start < source.rowCount; k++) {
          const end = Math.min(source.rowCount, start + (k % 2 === 0 ? s.batchRows : 1 + (s.batchRows >> 1)));
          const reused = encodeBatch(plan, source, start, end, undefined, arrays);
          const fresh = encodeBatch(plan, source, start, end);
          expect(reused.rejected).toEqual(fresh.rejected);
          expect(reused.columns).toEqual(fresh.columns);
          start = end;
        }
      }),
      { numRuns: 100 },
    );
  });

  it('the report is the same whatever the batch size', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const { source, plan } = planned(s);
        const reportWith = (batchRows: number) => {
          const report = createApplyReport(plan);
          for (let start = 0; start < source.rowCount; start += batchRows) encodeBatch(plan, source, start, Math.min(source.rowCount, start + batchRows), report);
          return report.finish();
        };
        expect(reportWith(s.batchRows)).toEqual(reportWith(source.rowCount));
      }),
      { numRuns: 100 },
    );
  });
});

describe('the report lists rejected rows in file order', () => {
  it('even when a later column rejects an earlier row (columns are encoded one after the other)', () => {
    const fit = tableFromRows([['a', 'b'], ['1', '1'], ['2', '2']]).table;
    const profiles = profileTable(fit, { missingTokens: DEFAULT_MISSING_TOKENS });
    let recipe = draftRecipe(profiles, { file: null, rows: fit.rowCount });
    for (const column of ['a', 'b']) {
      recipe = decide(recipe, { type: 'set-level', column, level: 'continuous' }, profiles);
      recipe = decide(recipe, { type: 'set-invalid', column, invalid: 'error' }, profiles);
    }
    // Row 0 is rejected by b only, row 1 by a only, row 2 by both (a is named: the first column at fault).
    const source = tableFromRows([['a', 'b'], ['1', 'x'], ['y', '2'], ['z', 'w'], ['3', '4']]).table;
    const plan = compilePlan(recipe, source.names);
    const report = createApplyReport(plan);
    encodeBatch(plan, source, 0, source.rowCount, report);
    const done = report.finish();
    expect(done.rejected.map((r) => [r.row, r.line, r.column])).toEqual([[0, 2, 'b'], [1, 3, 'a'], [2, 4, 'a']]);
    expect([done.rowsRejected, done.rowsWritten]).toEqual([3, 1]);
  });
});
