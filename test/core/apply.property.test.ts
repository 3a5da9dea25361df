/** Invariants of encoding, checked on random tables and random decisions (fast-check). */
import Ajv2020 from 'ajv/dist/2020.js';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { encodeWindow } from '../../src/core/apply.ts';
import { decide, type Decision } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { draftRecipe } from '../../src/core/fit.ts';
import { compilePlan } from '../../src/core/plan.ts';
import { profileTable } from '../../src/core/profile.ts';
import { readTable, tableFromRows } from '../../src/core/read-table.ts';
import { parseRecipe, stringifyRecipe } from '../../src/core/recipe-io.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../src/core/recipe.ts';

const LEVELS = ['a', 'b', 'c', 'd', 'e', ' A', 'NA', ''];
const cell = fc.constantFrom(...LEVELS);
const table = fc
  .tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 4 }))
  .chain(([rows, cols]) => fc.array(fc.array(cell, { minLength: cols, maxLength: cols }), { minLength: rows, maxLength: rows }));

function fitted(rows: string[][]) {
  const header = rows[0]!.map((_, i) => `c${i}`);
  const { table: t } = tableFromRows([header, ...rows]);
  const profiles = profileTable(t, { missingTokens: DEFAULT_MISSING_TOKENS });
  return { table: t, profiles, recipe: draftRecipe(profiles, { file: null, rows: t.rowCount }) };
}

function withAll(recipe: Recipe, profiles: Parameters<typeof decide>[2], decisions: (name: string) => Decision[]): Recipe {
  return recipe.columns.reduce((r, c) => decisions(c.name).reduce((acc, d) => decide(acc, d, profiles), r), recipe);
}

function rowSums(recipe: Recipe, t: ReturnType<typeof fitted>['table'], column: string): number[] {
  const plan = compilePlan(recipe, t.names);
  const { values } = encodeWindow(plan, t, 0, t.rowCount);
  const p = plan.columns.find((c) => c.recipe.name === column)!;
  const width = plan.outputs.length;
  return Array.from({ length: t.rowCount }, (_, r) => {
    let s = 0;
    for (let j = 0; j < p.width; j++) s += values[r * width + p.offset + j]!;
    return s;
  });
}

describe('encoding invariants', () => {
  it('output rows equal input rows', () => {
    fc.assert(
      fc.property(table, (rows) => {
        const { table: t, recipe } = fitted(rows);
        const { report, bytes } = encodeToCsv(recipe, t);
        const lines = new TextDecoder().decode(bytes).split('\r\n');
        expect(report.rowsWritten).toBe(rows.length);
        expect(lines.length).toBe(rows.length + 2); // header + rows + the empty string after the last CRLF
      }),
    );
  });

  it('one-hot rows sum to 1 when missing is a level; dummy rows sum to at most 1', () => {
    fc.assert(
      fc.property(table, (rows) => {
        const { table: t, profiles, recipe } = fitted(rows);
        const oneHot = withAll(recipe, profiles, (name) => [
          { type: 'set-level', column: name, level: 'nominal' },
          { type: 'set-categorical-missing', column: name, missing: { policy: 'level', indicator: false } },
        ]);
        for (const c of oneHot.columns) for (const s of rowSums(oneHot, t, c.name)) expect(s).toBe(1);
        const dummy = withAll(oneHot, profiles, (name) => [{ type: 'set-nominal-coding', column: name, coding: 'dummy' }]);
        for (const c of dummy.columns) for (const s of rowSums(dummy, t, c.name)) expect(s === 0 || s === 1).toBe(true);
      }),
    );
  });

  it('one-hot rows are all zero only where the missing policy says so', () => {
    fc.assert(
      fc.property(table, (rows) => {
        const { table: t, profiles, recipe } = fitted(rows);
        const zeros = withAll(recipe, profiles, (name) => [
          { type: 'set-level', column: name, level: 'nominal' },
          { type: 'set-categorical-missing', column: name, missing: { policy: 'zeros', indicator: false } },
        ]);
        zeros.columns.forEach((c, i) => {
          const sums = rowSums(zeros, t, c.name);
          rows.forEach((row, r) => {
            const missing = (row[i] ?? '').trim() === '' || DEFAULT_MISSING_TOKENS.includes((row[i] ?? '').trim());
            expect(sums[r]).toBe(missing ? 0 : 1);
          });
        });
      }),
    );
  });

  it('ordinal ranks keep the given order', () => {
    fc.assert(
      fc.property(table, fc.func(fc.integer()), (rows, key) => {
        const { table: t, profiles, recipe } = fitted(rows);
        const ordinal = withAll(recipe, profiles, (name) => [{ type: 'set-level', column: name, level: 'ordinal' }]);
        const shuffled = withAll(ordinal, profiles, (name) => {
          const col = ordinal.columns.find((c) => c.name === name)!;
          const order = 'levels' in col ? [...col.levels.map((l) => l.value)].sort((a, b) => key(a) - key(b) || a.localeCompare(b)) : [];
          return [{ type: 'set-order', column: name, order }];
        });
        const plan = compilePlan(shuffled, t.names);
        const { values } = encodeWindow(plan, t, 0, t.rowCount);
        shuffled.columns.forEach((col, i) => {
          if (col.level !== 'ordinal') return;
          const order = col.levels.map((l) => l.value);
          const p = plan.columns[i]!;
          rows.forEach((row, r) => {
            const raw = (row[i] ?? '').trim().toLowerCase();
            const level = order.indexOf(raw);
            if (level >= 0 && !(raw === '' || DEFAULT_MISSING_TOKENS.includes(raw))) {
              expect(values[r * plan.outputs.length + p.offset]).toBe(level + col.start);
            }
          });
        });
      }),
    );
  });
});

describe('recipe documents', () => {
  const schema = JSON.parse(readFileSync(join(import.meta.dirname, '../../public/recipe.schema.json'), 'utf8')) as object;
  const validate = new Ajv2020({ strict: false, allErrors: true }).compile(schema);
  const levels = fc.constantFrom('continuous', 'nominal', 'ordinal', 'binary', 'identifier', 'excluded' as const);

  it('recipe → JSON → recipe is the identity, and every recipe produced validates against public/recipe.schema.json', () => {
    fc.assert(
      fc.property(table, fc.array(levels, { minLength: 4, maxLength: 4 }), fc.constantFrom('readable', 'safe' as const), (rows, chosen, naming) => {
        const { profiles, recipe } = fitted(rows);
        let decided = withAll(recipe, profiles, (name) => [{ type: 'set-level', column: name, level: chosen[Number(name.slice(1))] ?? 'nominal' }]);
        decided = decide(decided, { type: 'set-naming', naming }, profiles);
        const text = stringifyRecipe(decided);
        const back = parseRecipe(text);
        if (!back.ok) throw new Error(back.errors.join('\n'));
        expect(back.recipe).toEqual(decided);
        expect(stringifyRecipe(back.recipe)).toBe(text);
        const valid = validate(JSON.parse(text));
        if (!valid) throw new Error(JSON.stringify(validate.errors));
      }),
    );
  });

  it('the committed JSON Schema is the one generated from the zod definition', async () => {
    const { recipeJsonSchemaText } = await import('../../src/core/recipe-schema.ts');
    expect(readFileSync(join(import.meta.dirname, '../../public/recipe.schema.json'), 'utf8')).toBe(recipeJsonSchemaText());
  });

  it('reading the same bytes twice with the same recipe gives identical output', () => {
    const bytes = new TextEncoder().encode('x,y\na,1\nb,2\n,3\n');
    const { table: t } = readTable(bytes);
    const recipe = draftRecipe(profileTable(t, { missingTokens: DEFAULT_MISSING_TOKENS }), { file: null, rows: t.rowCount });
    expect(encodeToCsv(recipe, readTable(bytes).table).bytes).toEqual(encodeToCsv(recipe, t).bytes);
  });
});
