/**
 * Recipes that are not what they should be: not JSON, another format version, unknown or missing
 * fields, made for another file, keys that try to reach JavaScript's object prototype, far too
 * large. Each is refused with a message that says what is wrong, where (the field, or the line and
 * column of the JSON), and what to do — and loading one never changes anything global. JSON's
 * grammar is RFC 8259; prototype pollution is OWASP's "Prototype Pollution Prevention Cheat Sheet".
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compilePlan } from '../../src/core/plan.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { jsonErrorPosition } from '../../src/core/json-position.ts';
import { MAX_RECIPE_BYTES, parseRecipe, recipeTooLargeMessage, stringifyRecipe } from '../../src/core/recipe-io.ts';
import { readTable } from '../../src/core/read-table.ts';
import { otherFileProblem } from '../../src/ui/reuse/report-model.ts';
import { pipeline, utf8 } from './helpers.ts';

// An invented ticket list; the draft: colour one-hot (red 3, blue 2, green 1), amount continuous.
const TICKETS = 'ticket,colour,amount\nT-01,red,10\nT-02,blue,20.5\nT-03,red,12\nT-04,green,40\nT-05,red,50\nT-06,blue,12\nT-07,red,9\nT-08,blue,31\nT-09,red,7\nT-10,red,16\nT-11,blue,3\nT-12,red,18\n';
const base = pipeline(utf8(TICKETS), 'tickets.csv');
const TEXT = stringifyRecipe(base.recipe);

function errorsOf(text: string): readonly string[] {
  const parsed = parseRecipe(text);
  if (parsed.ok) throw new Error('expected the recipe to be refused');
  return parsed.errors;
}

/** The recipe as plain data, changed by `edit`, as text again. */
function edited(edit: (data: Record<string, unknown> & { columns: Record<string, unknown>[] }) => void): string {
  const data = JSON.parse(TEXT) as Record<string, unknown> & { columns: Record<string, unknown>[] };
  edit(data);
  return JSON.stringify(data, null, 2);
}

describe('many problems', () => {
  it('lists the first twenty and counts the rest apart, for the page and the command line to say', () => {
    const text = edited((d) => {
      d.columns = Array.from({ length: 25 }, (_, i) => ({ ...d.columns[0], name: `c${i + 1}`, level: 'measured' }));
    });
    const parsed = parseRecipe(text);
    if (parsed.ok) throw new Error('expected the recipe to be refused');
    expect(parsed.errors).toHaveLength(20);
    expect(parsed.errors.every((e) => !e.startsWith('…'))).toBe(true);
    expect(parsed.unlisted).toBe(5);
  });
});

describe('text that is not JSON', () => {
  it.each([
    { label: 'a missing comma', text: '{\n  "kind": "levelwise.recipe"\n  "version": 1\n}', line: 3, column: 3 },
    { label: 'a trailing comma', text: '{\n  "kind": "levelwise.recipe",\n}', line: 3, column: 1 },
    // Cut off after 23 characters of line 2: the text ends at column 24.
    { label: 'a cut-off file', text: '{\n  "kind": "levelwise.re', line: 2, column: 24 },
    { label: 'a bad escape', text: '{"kind": "a\\qb"}', line: 1, column: 12 },
    { label: 'single quotes', text: "{'kind': 1}", line: 1, column: 2 },
  ])('$label: says it is not JSON, and where (line $line, column $column)', ({ text, line, column }) => {
    const [message] = errorsOf(text);
    expect(message).toMatch(new RegExp(`^The recipe is not valid JSON at line ${line}, column ${column}: .+\\. Open it in a text editor and fix it there, or make the recipe again\\.$`));
  });

  it('an empty file says it is empty', () => {
    expect(errorsOf('')).toEqual(['The recipe file is empty. Choose the .json file Levelwise saved, or make the recipe again.']);
  });

  it('a byte order mark before the JSON (as some editors save it) is no obstacle', () => {
    expect(parseRecipe(`\ufeff${TEXT}`).ok).toBe(true);
  });

  it('property: the position is given exactly when JSON.parse fails, and lies within the text', () => {
    const validJson = fc.jsonValue().map((v) => JSON.stringify(v, null, 1));
    // Valid JSON with one character deleted, inserted or replaced: mostly broken, sometimes still valid.
    const mangled = fc.tuple(validJson, fc.nat(), fc.constantFrom('', '"', ',', '}', ']', ':', '\\', 'x', '\n', ' ', '0', '-', '.')).map(
      ([text, at, ch]) => {
        const i = text.length === 0 ? 0 : at % text.length;
        return at % 2 === 0 ? text.slice(0, i) + ch + text.slice(i + 1) : text.slice(0, i) + ch + text.slice(i);
      },
    );
    fc.assert(
      fc.property(fc.oneof(validJson, mangled, fc.string()), (text) => {
        let valid = true;
        try {
          JSON.parse(text);
        } catch {
          valid = false;
        }
        const position = jsonErrorPosition(text);
        expect(position === null).toBe(valid);
        if (position !== null) expect(position.offset).toBeLessThanOrEqual(text.length);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('another format version', () => {
  it('a newer version says it was made by a newer Levelwise', () => {
    expect(errorsOf(edited((d) => (d['version'] = 2)))).toEqual([
      'This recipe has format version 2 ("version"); this Levelwise reads version 1. It was made by a newer Levelwise: use that one, or make the recipe again with this version.',
    ]);
  });

  it('a version written as text, or none, is named as such', () => {
    expect(errorsOf(edited((d) => (d['version'] = '1')))[0]).toBe(
      'This recipe has format version "1" ("version"); this Levelwise reads version 1. Make the recipe again with this version.',
    );
    expect(errorsOf(edited((d) => delete d['version']))[0]).toBe(
      'This recipe has no "version" field; this Levelwise reads version 1. Make the recipe again with this version.',
    );
  });

  it('a JSON document that is not a recipe at all says so', () => {
    expect(errorsOf('[1, 2, 3]')).toEqual(['A recipe is a JSON object; this file holds something else.']);
    expect(errorsOf('{"name": "levelwise", "version": "0.1.0"}')).toEqual(['This is not a Levelwise recipe: "kind" should be "levelwise.recipe", found nothing.']);
  });
});

describe('unknown and missing fields', () => {
  it('names each unknown field by its path and says to remove it', () => {
    const text = edited((d) => {
      d['comment'] = 'mine';
      d.columns[1]!['colour'] = 'blue';
    });
    expect([...errorsOf(text)].sort()).toEqual([
      'The recipe: unknown field "comment"; remove it.',
      'columns[1] ("colour"): unknown field "colour"; remove it.',
    ]);
  });

  it('a number or list out of its bounds says which bound', () => {
    const text = edited((d) => {
      (d['source'] as Record<string, unknown>)['rows'] = -1;
      (d.columns[1]!['cleaning'] as Record<string, unknown>)['merges'] = [{ into: 'red', from: [] }];
    });
    expect(errorsOf(text)).toEqual([
      'source.rows: Too small: expected number to be >=0.',
      'columns[1] ("colour").cleaning.merges[0].from: Too small: expected array to have >=1 items.',
    ]);
  });

  it('names each missing field by its path and what was expected', () => {
    const text = edited((d) => {
      delete d['naming'];
      delete (d['source'] as Record<string, unknown>)['rows'];
      delete d.columns[2]!['scaling'];
    });
    expect(errorsOf(text)).toEqual([
      'source.rows: missing; expected number.',
      'naming: missing; expected one of "readable", "safe".',
      'columns[2] ("amount").scaling: missing; expected one of "none", "z-score", "min-max".',
    ]);
  });

  it('names a value of the wrong kind, and an unknown level of measurement', () => {
    const text = edited((d) => {
      (d['source'] as Record<string, unknown>)['rows'] = 'twelve';
      d.columns[0]!['level'] = 'interval';
    });
    expect(errorsOf(text)).toEqual([
      'source.rows: expected number, found "twelve".',
      'columns[0] ("ticket").level: expected one of "continuous", "nominal", "ordinal", "binary", "identifier", "excluded", found "interval".',
    ]);
  });

  it('a number symbol that would eat into the number (a digit, a sign, a separator, a space at its end) is refused', () => {
    const amount = (symbol: unknown) =>
      edited((d) => {
        const column = d.columns.find((c) => c['name'] === 'amount')!;
        column['format'] = { decimal: '.', group: '', symbol };
      });
    expect(parseRecipe(amount({ text: '€', side: 'before' })).ok).toBe(true);
    expect(parseRecipe(amount({ text: 'US$', side: 'after' })).ok).toBe(true);
    for (const text of ['', '5', 'EUR1', '-', '€ ', ' %', '.', 'kg,', 'much too long']) {
      expect(parseRecipe(amount({ text, side: 'after' })).ok, text).toBe(false);
    }
    expect(errorsOf(amount({ text: '€', side: 'left' }))).toEqual([
      'columns[2] ("amount").format.symbol.side: expected one of "before", "after", found "left".',
    ]);
  });
});

describe('a recipe made for another file', () => {
  const other = readTable(utf8('sensor,reading\nA,1\nB,2\n'));

  it('shares no column with it: the re-use step says so, with both sets of names, before encoding anything', () => {
    expect(otherFileProblem(base.recipe, other.table.names, 'sensors.csv')).toBe(
      'None of the recipe’s 3 columns (“ticket”, “colour”, “amount”) is in “sensors.csv”, whose columns are “sensor”, “reading”. ' +
        'It was made for “tickets.csv”. Choose the file the recipe was made for, or open this file on the workbench and make a recipe for it.',
    );
  });

  it('applied anyway, every column is reported missing and the file said not to fit', () => {
    const { report } = encodeToCsv(base.recipe, other.table);
    expect(report.missingColumns).toEqual(['ticket', 'colour', 'amount']);
    expect(report.extraColumns).toEqual(['sensor', 'reading']);
    expect(report.fits).toBe(false);
  });

  it('sharing some columns is the re-use report’s business, not a refusal', () => {
    expect(otherFileProblem(base.recipe, ['ticket', 'region'], 'part.csv')).toBeNull();
  });
});

describe('keys that reach for the object prototype', () => {
  const prototypeNames = () => Object.getOwnPropertyNames(Object.prototype).sort();
  const before = prototypeNames();

  const attempts: [string, string][] = [
    ['top level', TEXT.replace('{', '{"__proto__": {"polluted": "yes"}, ')],
    ['constructor.prototype', TEXT.replace('{', '{"constructor": {"prototype": {"polluted": "yes"}}, ')],
    ['in a column', TEXT.replace('"name": "colour",', '"name": "colour", "__proto__": {"polluted": "yes"},')],
    ['in source', TEXT.replace('"source": {', '"source": {"__proto__": {"polluted": "yes"}, ')],
    ['in a level', TEXT.replace('"value": "red",', '"value": "red", "__proto__": {"polluted": "yes"},')],
    ['in cleaning', TEXT.replace('"cleaning": {', '"cleaning": {"constructor": {"prototype": {"polluted": "yes"}}, ')],
  ];

  it.each(attempts)('%s: refused as an unknown field, and nothing global changes', (_where, text) => {
    const parsed = parseRecipe(text);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.errors.join(' ')).toMatch(/unknown field "(__proto__|constructor)"; remove it\./);
    expect(({} as Record<string, unknown>)['polluted']).toBeUndefined();
    expect(Object.prototype).not.toHaveProperty('polluted');
    expect(prototypeNames()).toEqual(before);
  });

  it('as level values and column names they are only text, and the recipe works', () => {
    const run = pipeline(utf8('__proto__,constructor\nprototype,a\n__proto__,b\nprototype,a\n'));
    const parsed = parseRecipe(stringifyRecipe(run.recipe));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.recipe.columns[0]?.outputs).toEqual(['__proto__=__proto__']);
    expect(compilePlan(parsed.recipe, run.read.table.names).missingColumns).toEqual([]);
    expect(({} as Record<string, unknown>)['polluted']).toBeUndefined();
    expect(prototypeNames()).toEqual(before);
  });
});

describe('very large recipes', () => {
  it('a recipe of 50 MB (1.2 million grouped values, as a column with a million rare levels gives) is read', () => {
    const big = JSON.parse(TEXT) as { columns: { grouped?: string[] }[] };
    const colour = big.columns[1]!;
    colour.grouped = Array.from({ length: 1_200_000 }, (_, i) => `a rare value, number ${i.toString().padStart(12, '0')}`);
    const text = JSON.stringify(big, null, 2);
    expect(text.length).toBeGreaterThan(50e6);
    expect(text.length).toBeLessThan(MAX_RECIPE_BYTES);
    const parsed = parseRecipe(text);
    expect(parsed.ok && parsed.recipe.columns[1]?.level === 'nominal' && parsed.recipe.columns[1].grouped.length).toBe(1_200_000);
  });

  it('a file over the limit is refused by its size before it is parsed, with both sizes', () => {
    const over = `${' '.repeat(MAX_RECIPE_BYTES)}not even JSON`;
    expect(errorsOf(over)).toEqual([recipeTooLargeMessage(over.length)]);
    expect(recipeTooLargeMessage(70 * 2 ** 20)).toBe(
      'The recipe file is 70 MB; a recipe is at most 64 MB. Is this the right file? A recipe is the .json file Levelwise saved.',
    );
  });

  it('a column of 100,000 levels is refused by the level limit, not by running out of memory', () => {
    const text = edited((d) => {
      const colour = d.columns[1]!;
      colour['levels'] = Array.from({ length: 100_000 }, (_, i) => ({ value: `L${i}`, count: 1 }));
      colour['outputs'] = Array.from({ length: 100_000 }, (_, i) => `colour=L${i}`);
    });
    expect(errorsOf(text)).toEqual([
      'columns[1] ("colour").levels: 100,000 levels; a column can be encoded with at most 1,000. Group its rare levels (keep the most frequent) in the workbench, or with "levelwise draft --keep-top".',
    ]);
  });
});
