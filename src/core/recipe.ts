/**
 * The recipe: one versioned JSON document holding every decision a person made about a table and
 * everything learned from the data it was made from. Applying it to a new file needs nothing else.
 *
 * This module is the single definition. Its types are inferred from the zod schema, the JSON Schema
 * in public/recipe.schema.json is generated from it (scripts/write-schema.ts), and docs/recipe.md
 * explains every field. The `z.describe()` texts double as schema documentation.
 *
 * Written with zod's functional build (`zod/mini`): the same validation and JSON Schema as the
 * method-chaining one, but the command line's bundle went from 1.18 MB to 0.49 MB and loads in
 * ~55 ms against 70–100 ms, paid by every run.
 */
import * as z from 'zod/mini';
import { en } from 'zod/locales';
import { SYMBOL_MAX_LENGTH, SYMBOL_TEXT } from './number-symbols.ts';

// Before any schema is made (zod decides then): no parsers compiled with `new Function`. zod probes
// for it as the schemas are made, and the page's Content-Security-Policy (no 'unsafe-eval') refused
// and reported the probe on every load (test/e2e/robustness.test.ts); and a command-line run parses
// one recipe, where compiling cost 20–30 ms more than it saved (a 160 kB recipe: 40–60 ms cold,
// 12–27 ms without). The functional build loads no messages of its own: `en()` gives the ones a
// recipe's problems are told in.
z.config({ ...en(), jitless: true });

export const RECIPE_KIND = 'levelwise.recipe';
export const RECIPE_VERSION = 1;

export const LEVELS = ['continuous', 'nominal', 'ordinal', 'binary', 'identifier', 'excluded'] as const;
export const MeasurementLevel = z.enum(LEVELS).check(z.describe('Level of measurement chosen for the column.'));
export type MeasurementLevel = z.infer<typeof MeasurementLevel>;

export const NumberSymbol = z
  .strictObject({
    text: z
      .string()
      .check(
        z.minLength(1),
        z.maxLength(SYMBOL_MAX_LENGTH),
        z.regex(SYMBOL_TEXT, 'a symbol holds no digit, and neither starts nor ends with white space, a sign, a point or a comma'),
        z.describe('The symbol exactly as written, case and all: "€", "%", "US$", "CHF".'),
      ),
    side: z.enum(['before', 'after']).check(z.describe('before: "€ 12" and "-€12"; after: "12 %" and "12,50 €".')),
  })
  .check(
    z.describe(
      'A currency sign, percent sign or unit written beside the numbers. It is optional in each cell; spaces may ' +
        'separate it from the number; the number is read as written ("12%" is 12).',
    ),
  );
export type NumberSymbol = z.infer<typeof NumberSymbol>;

export const NumberFormat = z
  .strictObject({
    decimal: z.enum(['.', ',']).check(z.describe('Decimal separator the column is written with.')),
    group: z.enum(['', ',', '.', ' ']).check(z.describe("Digit-group separator accepted and ignored; '' for none.")),
    symbol: z.optional(NumberSymbol),
    negative: z.optional(z.enum(['parentheses', 'trailing'])).check(
      z.describe(
        'How negative numbers may also be written, besides a leading minus: parentheses "(1,234.50)", as accounts do, ' +
          'or a trailing minus "1.234,50-", as some business systems export them. Absent: a leading minus only.',
      ),
    ),
  })
  .check(z.describe('How the numbers of a column are written, e.g. "1,234.5", "12,5" or "12,50 €".'));
export type NumberFormat = z.infer<typeof NumberFormat>;

export const Merge = z.strictObject({
  into: z.string().check(z.describe('The level the values become.')),
  from: z.array(z.string()).check(z.minLength(1), z.describe('Values (after trimming and case-folding) that become `into`.')),
});
export type Merge = z.infer<typeof Merge>;

export const Cleaning = z
  .strictObject({
    trim: z.boolean().check(z.describe('Remove leading and trailing white space before matching levels.')),
    caseFold: z.boolean().check(z.describe('Compare levels in lower case ("Yes" and "yes" are one level).')),
    merges: z.array(Merge).check(z.describe('Explicit merges, applied after trimming and case-folding.')),
  })
  .check(z.describe('How raw cell text becomes a level. Applied in order: trim, case-fold, merges.'));
export type Cleaning = z.infer<typeof Cleaning>;

export const RareGrouping = z
  .strictObject({
    minCount: z.nullable(z.int().check(z.minimum(0))).check(z.describe('Levels seen fewer times than this join the other level.')),
    minShare: z.nullable(z.number().check(z.minimum(0), z.maximum(1))).check(z.describe('Levels below this share of rows join the other level.')),
    keepTop: z.nullable(z.int().check(z.minimum(1))).check(z.describe('Only the N most frequent levels are kept; the rest join the other level.')),
  })
  .check(z.describe('Rules that merge rare levels into one other level before encoding. null switches a rule off.'));
export type RareGrouping = z.infer<typeof RareGrouping>;

export const CategoricalMissing = z.strictObject({
  policy: z
    .enum(['level', 'most-frequent', 'zeros', 'error'])
    .check(
      z.describe(
        'level: missing is a level of its own; most-frequent: encoded as the most frequent level; ' +
          'zeros: every output column of the row is 0; error: the row is rejected and reported.',
      ),
    ),
  indicator: z.boolean().check(z.describe('Add a 0/1 column that is 1 where the value was missing.')),
});
export type CategoricalMissing = z.infer<typeof CategoricalMissing>;

export const ContinuousMissing = z.strictObject({
  policy: z
    .enum(['mean', 'median', 'zero', 'error'])
    .check(z.describe('Value used where the cell is missing: the fitted mean or median, 0, or reject the row.')),
  indicator: z.boolean().check(z.describe('Add a 0/1 column that is 1 where the value was missing.')),
});
export type ContinuousMissing = z.infer<typeof ContinuousMissing>;

export const UnseenPolicy = z
  .enum(['zeros', 'other', 'error'])
  .check(
    z.describe(
      'What a level never seen in the fitting data becomes: zeros (all output columns 0), ' +
        'other (the other level), or error (the row is rejected and reported).',
    ),
  );
export type UnseenPolicy = z.infer<typeof UnseenPolicy>;

export const FittedLevel = z.strictObject({
  value: z.string().check(z.describe('The level as it appears after cleaning, merging and grouping.')),
  count: z.int().check(z.minimum(0), z.describe('Rows holding this level in the fitting data.')),
});
export type FittedLevel = z.infer<typeof FittedLevel>;

const columnBase = {
  name: z.string().check(z.describe('Header of the source column this entry reads.')),
  reason: z.string().check(z.describe('Why this level was chosen, in words (inferred or "set by hand").')),
  outputs: z
    .array(z.string())
    .check(z.describe('Names of the output columns this column produces, in order; unique across the recipe.')),
};

const categoricalBase = {
  cleaning: Cleaning,
  missing: CategoricalMissing,
  unseen: UnseenPolicy,
  otherLabel: z.string().check(z.describe('Name of the level that rare and (optionally) unseen values join.')),
  levels: z
    .array(FittedLevel)
    .check(z.describe('The levels after cleaning and grouping, in output order, with their fitted counts.')),
  grouped: z.array(z.string()).check(z.describe('Cleaned values merged into the other level because they were rare.')),
  fittedRows: z.int().check(z.minimum(0), z.describe('Rows in the fitting data (the denominator of shares).')),
};

export const ContinuousColumn = z.strictObject({
  ...columnBase,
  level: z.literal('continuous'),
  scaling: z
    .enum(['none', 'z-score', 'min-max'])
    .check(z.describe('none: as is; z-score: (x − mean) / sd; min-max: (x − min) / (max − min).')),
  format: NumberFormat,
  invalid: z.enum(['missing', 'error']).check(z.describe('Cells that do not read as numbers: treated as missing, or rejected.')),
  missing: ContinuousMissing,
  fitted: z
    .strictObject({
      count: z.int().check(z.minimum(0), z.describe('Numbers read in the fitting data.')),
      mean: z.number(),
      sd: z.number().check(z.minimum(0), z.describe('Sample standard deviation (n − 1).')),
      min: z.number(),
      max: z.number(),
      median: z.number(),
    })
    .check(z.describe('Statistics learned from the fitting data; used for scaling and filling.')),
});

export const NominalColumn = z.strictObject({
  ...columnBase,
  level: z.literal('nominal'),
  coding: z
    .enum(['one-hot', 'dummy', 'effect', 'frequency'])
    .check(
      z.describe(
        'one-hot: k columns; dummy: k − 1 columns, reference level all 0; effect: k − 1 columns, ' +
          'reference level −1 in all; frequency: one column holding the level’s share of fitting rows.',
      ),
    ),
  reference: z.nullable(z.string()).check(z.describe('Reference level for dummy and effect coding.')),
  rare: RareGrouping,
  ...categoricalBase,
});

export const OrdinalColumn = z
  .strictObject({
    ...columnBase,
    level: z.literal('ordinal'),
    coding: z
      .enum(['rank', 'scores', 'cumulative'])
      .check(z.describe('rank: position in the order; scores: a number per level; cumulative: k − 1 columns "at least level j".')),
    start: z.union([z.literal(0), z.literal(1)]).check(z.describe('Rank of the first level in the order.')),
    scores: z.nullable(z.array(z.number())).check(z.describe('For scores coding: one number per level, parallel to `levels`.')),
    ...categoricalBase,
  })
  .check(z.describe('`levels` is the order, lowest first.'));

export const BinaryColumn = z.strictObject({
  ...columnBase,
  level: z.literal('binary'),
  positive: z.string().check(z.describe('The level coded 1; the other level is coded 0.')),
  ...categoricalBase,
});

export const IdentifierColumn = z
  .strictObject({ ...columnBase, level: z.literal('identifier') })
  .check(z.describe('Passed through unchanged, not encoded.'));

export const ExcludedColumn = z.strictObject({ ...columnBase, level: z.literal('excluded') }).check(z.describe('Left out of the output.'));

export const ColumnRecipe = z.discriminatedUnion('level', [
  ContinuousColumn,
  NominalColumn,
  OrdinalColumn,
  BinaryColumn,
  IdentifierColumn,
  ExcludedColumn,
]);
export type ColumnRecipe = z.infer<typeof ColumnRecipe>;
export type ContinuousColumn = z.infer<typeof ContinuousColumn>;
export type NominalColumn = z.infer<typeof NominalColumn>;
export type OrdinalColumn = z.infer<typeof OrdinalColumn>;
export type BinaryColumn = z.infer<typeof BinaryColumn>;
export type CategoricalColumn = NominalColumn | OrdinalColumn | BinaryColumn;

export const Recipe = z.strictObject({
  kind: z.literal(RECIPE_KIND).check(z.describe('Marks the document as a Levelwise recipe.')),
  version: z.literal(RECIPE_VERSION).check(z.describe('Format version of this document.')),
  source: z
    .strictObject({
      file: z.nullable(z.string()).check(z.describe('Name of the file the recipe was fitted on, if known.')),
      rows: z.int().check(z.minimum(0), z.describe('Data rows in that file.')),
      columns: z.array(z.string()).check(z.describe('Its header, in order.')),
    })
    .check(z.describe('The data the recipe was made from.')),
  reading: z.strictObject({
    delimiter: z.nullable(z.enum([',', '\t', ';', '|'])).check(z.describe('Field delimiter; null to detect it.')),
    missingTokens: z
      .array(z.string())
      .check(z.describe('Cell texts (after trimming) that mean "missing"; an empty cell is always missing.')),
  }),
  naming: z
    .enum(['readable', 'safe'])
    .check(z.describe('readable: "heating=heat pump"; safe: identifier-friendly "heating__heat_pump".')),
  columns: z.array(ColumnRecipe).check(z.describe('One entry per source column, in file order.')),
});
export type Recipe = z.infer<typeof Recipe>;

// Defined with the missing-value test (missing.ts), which needs no schema: the reading threads load it without zod.
export { DEFAULT_MISSING_TOKENS } from './missing.ts';
