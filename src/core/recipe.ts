/**
 * The recipe: one versioned JSON document holding every decision a person made about a table and
 * everything learned from the data it was made from. Applying it to a new file needs nothing else.
 *
 * This module is the single definition. Its types are inferred from the zod schema, the JSON Schema
 * in public/recipe.schema.json is generated from it (scripts/write-schema.ts), and docs/recipe.md
 * explains every field. The `describe()` texts double as schema documentation.
 */
import { z } from 'zod';
import { SYMBOL_MAX_LENGTH, SYMBOL_TEXT } from './number-symbols.ts';

export const RECIPE_KIND = 'levelwise.recipe';
export const RECIPE_VERSION = 1;

export const LEVELS = ['continuous', 'nominal', 'ordinal', 'binary', 'identifier', 'excluded'] as const;
export const MeasurementLevel = z.enum(LEVELS).describe('Level of measurement chosen for the column.');
export type MeasurementLevel = z.infer<typeof MeasurementLevel>;

export const NumberSymbol = z
  .object({
    text: z
      .string()
      .min(1)
      .max(SYMBOL_MAX_LENGTH)
      .regex(SYMBOL_TEXT, 'a symbol holds no digit, and neither starts nor ends with white space, a sign, a point or a comma')
      .describe('The symbol exactly as written, case and all: "€", "%", "US$", "CHF".'),
    side: z.enum(['before', 'after']).describe('before: "€ 12" and "-€12"; after: "12 %" and "12,50 €".'),
  })
  .strict()
  .describe(
    'A currency sign, percent sign or unit written beside the numbers. It is optional in each cell; spaces may ' +
      'separate it from the number; the number is read as written ("12%" is 12).',
  );
export type NumberSymbol = z.infer<typeof NumberSymbol>;

export const NumberFormat = z
  .object({
    decimal: z.enum(['.', ',']).describe('Decimal separator the column is written with.'),
    group: z.enum(['', ',', '.', ' ']).describe("Digit-group separator accepted and ignored; '' for none."),
    symbol: NumberSymbol.optional(),
    negative: z
      .enum(['parentheses', 'trailing'])
      .optional()
      .describe(
        'How negative numbers may also be written, besides a leading minus: parentheses "(1,234.50)", as accounts do, ' +
          'or a trailing minus "1.234,50-", as some business systems export them. Absent: a leading minus only.',
      ),
  })
  .strict()
  .describe('How the numbers of a column are written, e.g. "1,234.5", "12,5" or "12,50 €".');
export type NumberFormat = z.infer<typeof NumberFormat>;

export const Merge = z
  .object({
    into: z.string().describe('The level the values become.'),
    from: z.array(z.string()).min(1).describe('Values (after trimming and case-folding) that become `into`.'),
  })
  .strict();
export type Merge = z.infer<typeof Merge>;

export const Cleaning = z
  .object({
    trim: z.boolean().describe('Remove leading and trailing white space before matching levels.'),
    caseFold: z.boolean().describe('Compare levels in lower case ("Yes" and "yes" are one level).'),
    merges: z.array(Merge).describe('Explicit merges, applied after trimming and case-folding.'),
  })
  .strict()
  .describe('How raw cell text becomes a level. Applied in order: trim, case-fold, merges.');
export type Cleaning = z.infer<typeof Cleaning>;

export const RareGrouping = z
  .object({
    minCount: z.number().int().min(0).nullable().describe('Levels seen fewer times than this join the other level.'),
    minShare: z.number().min(0).max(1).nullable().describe('Levels below this share of rows join the other level.'),
    keepTop: z.number().int().min(1).nullable().describe('Only the N most frequent levels are kept; the rest join the other level.'),
  })
  .strict()
  .describe('Rules that merge rare levels into one other level before encoding. null switches a rule off.');
export type RareGrouping = z.infer<typeof RareGrouping>;

export const CategoricalMissing = z
  .object({
    policy: z
      .enum(['level', 'most-frequent', 'zeros', 'error'])
      .describe(
        'level: missing is a level of its own; most-frequent: encoded as the most frequent level; ' +
          'zeros: every output column of the row is 0; error: the row is rejected and reported.',
      ),
    indicator: z.boolean().describe('Add a 0/1 column that is 1 where the value was missing.'),
  })
  .strict();
export type CategoricalMissing = z.infer<typeof CategoricalMissing>;

export const ContinuousMissing = z
  .object({
    policy: z
      .enum(['mean', 'median', 'zero', 'error'])
      .describe('Value used where the cell is missing: the fitted mean or median, 0, or reject the row.'),
    indicator: z.boolean().describe('Add a 0/1 column that is 1 where the value was missing.'),
  })
  .strict();
export type ContinuousMissing = z.infer<typeof ContinuousMissing>;

export const UnseenPolicy = z
  .enum(['zeros', 'other', 'error'])
  .describe(
    'What a level never seen in the fitting data becomes: zeros (all output columns 0), ' +
      'other (the other level), or error (the row is rejected and reported).',
  );
export type UnseenPolicy = z.infer<typeof UnseenPolicy>;

export const FittedLevel = z
  .object({
    value: z.string().describe('The level as it appears after cleaning, merging and grouping.'),
    count: z.number().int().min(0).describe('Rows holding this level in the fitting data.'),
  })
  .strict();
export type FittedLevel = z.infer<typeof FittedLevel>;

const columnBase = {
  name: z.string().describe('Header of the source column this entry reads.'),
  reason: z.string().describe('Why this level was chosen, in words (inferred or "set by hand").'),
  outputs: z
    .array(z.string())
    .describe('Names of the output columns this column produces, in order; unique across the recipe.'),
};

const categoricalBase = {
  cleaning: Cleaning,
  missing: CategoricalMissing,
  unseen: UnseenPolicy,
  otherLabel: z.string().describe('Name of the level that rare and (optionally) unseen values join.'),
  levels: z
    .array(FittedLevel)
    .describe('The levels after cleaning and grouping, in output order, with their fitted counts.'),
  grouped: z.array(z.string()).describe('Cleaned values merged into the other level because they were rare.'),
  fittedRows: z.number().int().min(0).describe('Rows in the fitting data (the denominator of shares).'),
};

export const ContinuousColumn = z
  .object({
    ...columnBase,
    level: z.literal('continuous'),
    scaling: z
      .enum(['none', 'z-score', 'min-max'])
      .describe('none: as is; z-score: (x − mean) / sd; min-max: (x − min) / (max − min).'),
    format: NumberFormat,
    invalid: z.enum(['missing', 'error']).describe('Cells that do not read as numbers: treated as missing, or rejected.'),
    missing: ContinuousMissing,
    fitted: z
      .object({
        count: z.number().int().min(0).describe('Numbers read in the fitting data.'),
        mean: z.number(),
        sd: z.number().min(0).describe('Sample standard deviation (n − 1).'),
        min: z.number(),
        max: z.number(),
        median: z.number(),
      })
      .strict()
      .describe('Statistics learned from the fitting data; used for scaling and filling.'),
  })
  .strict();

export const NominalColumn = z
  .object({
    ...columnBase,
    level: z.literal('nominal'),
    coding: z
      .enum(['one-hot', 'dummy', 'effect', 'frequency'])
      .describe(
        'one-hot: k columns; dummy: k − 1 columns, reference level all 0; effect: k − 1 columns, ' +
          'reference level −1 in all; frequency: one column holding the level’s share of fitting rows.',
      ),
    reference: z.string().nullable().describe('Reference level for dummy and effect coding.'),
    rare: RareGrouping,
    ...categoricalBase,
  })
  .strict();

export const OrdinalColumn = z
  .object({
    ...columnBase,
    level: z.literal('ordinal'),
    coding: z
      .enum(['rank', 'scores', 'cumulative'])
      .describe('rank: position in the order; scores: a number per level; cumulative: k − 1 columns "at least level j".'),
    start: z.union([z.literal(0), z.literal(1)]).describe('Rank of the first level in the order.'),
    scores: z.array(z.number()).nullable().describe('For scores coding: one number per level, parallel to `levels`.'),
    ...categoricalBase,
  })
  .strict()
  .describe('`levels` is the order, lowest first.');

export const BinaryColumn = z
  .object({
    ...columnBase,
    level: z.literal('binary'),
    positive: z.string().describe('The level coded 1; the other level is coded 0.'),
    ...categoricalBase,
  })
  .strict();

export const IdentifierColumn = z
  .object({ ...columnBase, level: z.literal('identifier') })
  .strict()
  .describe('Passed through unchanged, not encoded.');

export const ExcludedColumn = z.object({ ...columnBase, level: z.literal('excluded') }).strict().describe('Left out of the output.');

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

export const Recipe = z
  .object({
    kind: z.literal(RECIPE_KIND).describe('Marks the document as a Levelwise recipe.'),
    version: z.literal(RECIPE_VERSION).describe('Format version of this document.'),
    source: z
      .object({
        file: z.string().nullable().describe('Name of the file the recipe was fitted on, if known.'),
        rows: z.number().int().min(0).describe('Data rows in that file.'),
        columns: z.array(z.string()).describe('Its header, in order.'),
      })
      .strict()
      .describe('The data the recipe was made from.'),
    reading: z
      .object({
        delimiter: z.enum([',', '\t', ';', '|']).nullable().describe('Field delimiter; null to detect it.'),
        missingTokens: z
          .array(z.string())
          .describe('Cell texts (after trimming) that mean "missing"; an empty cell is always missing.'),
      })
      .strict(),
    naming: z
      .enum(['readable', 'safe'])
      .describe('readable: "heating=heat pump"; safe: identifier-friendly "heating__heat_pump".'),
    columns: z.array(ColumnRecipe).describe('One entry per source column, in file order.'),
  })
  .strict();
export type Recipe = z.infer<typeof Recipe>;

// Defined with the missing-value test (missing.ts), which needs no schema: the reading threads load it without zod.
export { DEFAULT_MISSING_TOKENS } from './missing.ts';
