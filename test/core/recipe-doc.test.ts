/** docs/recipe.md must stay true: its full example loads, and the row it explains encodes as it says. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import { parseRecipe } from '../../src/core/recipe-io.ts';

const doc = readFileSync(join(import.meta.dirname, '../../docs/recipe.md'), 'utf8');
const example = /```json\n([\s\S]*?)```/.exec(doc)?.[1] ?? '';

describe('docs/recipe.md', () => {
  it('its full example is a valid recipe', () => {
    const parsed = parseRecipe(example);
    expect(parsed.ok ? [] : parsed.errors).toEqual([]);
  });

  it('the example row encodes to the numbers the document gives', () => {
    const parsed = parseRecipe(example);
    if (!parsed.ok) throw new Error(parsed.errors.join('\n'));
    const input = 'household_id,heating,satisfaction,smart_meter,annual_kwh\nHH-000007,oil, Satisfied,Y,4200\n';
    const { bytes } = encodeToCsv(parsed.recipe, readTable(new TextEncoder().encode(input)).table);
    const [, row] = new TextDecoder().decode(bytes).split('\r\n');
    expect(row).toBe('HH-000007,0,0,1,4,0,1,0.4563034276703462,0');
  });
});
