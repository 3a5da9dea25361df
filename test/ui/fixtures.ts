/**
 * Hand-built fixtures for the column panels: an invented household-energy survey of 1,240
 * households (no real people or places). Every count adds up: for each column,
 * sum of level counts + missing = 1,240 rows. Recipe columns are shaped the way the fitting code
 * in src/core/fit.ts shapes them (levels most frequent first, "(missing)" as a level when missing
 * values are kept as a level, readable output names).
 */
import type { ColumnProfile, LevelCount } from '../../src/core/profile.ts';
import type {
  BinaryColumn,
  ColumnRecipe,
  ContinuousColumn,
  NominalColumn,
  OrdinalColumn,
  Recipe,
} from '../../src/core/recipe.ts';
import type { WidthForecast } from '../../src/ui/width/types.ts';

export const ROWS = 1240;

const noFlags = { identifier: false, date: false, freeText: false, constant: false };

function sum(levels: readonly LevelCount[]): number {
  return levels.reduce((total, l) => total + l.count, 0);
}

/** A profile of a text column; missing = rows − the level counts. */
function textProfile(name: string, index: number, levels: LevelCount[], missingSpellings: LevelCount[], flags = noFlags): ColumnProfile {
  return {
    name,
    index,
    count: ROWS,
    missing: ROWS - sum(levels),
    missingSpellings,
    distinct: levels.length,
    levels,
    numeric: null,
    flags,
  };
}

const householdIds: LevelCount[] = Array.from({ length: ROWS }, (_, i) => ({ value: `HH-${String(i + 1).padStart(5, '0')}`, count: 1 }));

const heatingLevels: LevelCount[] = [
  { value: 'gas boiler', count: 512 },
  { value: 'heat pump', count: 233 },
  { value: 'oil boiler', count: 181 },
  { value: 'electric storage', count: 142 },
  { value: 'wood stove', count: 97 },
  { value: 'district heat', count: 58 },
];

/** Most frequent first, as profiles list them. */
const insulationLevels: LevelCount[] = [
  { value: 'good', count: 455 },
  { value: 'fair', count: 402 },
  { value: 'very good', count: 171 },
  { value: 'poor', count: 164 },
];

/** Two spellings of each answer: the survey form changed half-way through (invented). */
const smartMeterLevels: LevelCount[] = [
  { value: 'yes', count: 655 },
  { value: 'no', count: 480 },
  { value: 'Y', count: 62 },
  { value: 'N', count: 31 },
];

const evLevels: LevelCount[] = [
  { value: 'no', count: 1037 },
  { value: 'yes', count: 203 },
];

/** 48 invented region codes, counts falling off like a long tail. */
const regionCounts = [
  107, 99, 92, 85, 79, 73, 68, 63, 48, 44, 40, 37, 34, 31, 28, 26, 24, 22, 20, 18, 17, 15, 14, 13, 12, 11, 10, 9, 8, 8, 7, 7,
  6, 6, 5, 5, 4, 4, 4, 3, 3, 3, 2, 2, 2, 1, 1, 1,
];
const regionLevels: LevelCount[] = regionCounts.map((count, i) => ({ value: `R${String(i + 1).padStart(2, '0')}`, count }));

/** 28 × "none" and 300 one-off remarks: 328 answered, 912 left empty. */
const commentLevels: LevelCount[] = [
  { value: 'none', count: 28 },
  ...Array.from({ length: 300 }, (_, i) => ({ value: `Remark ${i + 1}: draughty windows in winter`, count: 1 })),
];

export const KWH_HISTOGRAM = {
  edges: [812, 2875.8, 4939.6, 7003.4, 9067.2, 11131, 13194.8, 15258.6, 17322.4, 19386.2, 21450],
  counts: [306, 402, 228, 121, 66, 34, 18, 10, 6, 3],
} as const;

const kwhProfile: ColumnProfile = {
  name: 'annual_kwh',
  index: 5,
  count: ROWS,
  missing: 42,
  missingSpellings: [
    { value: '', count: 30 },
    { value: 'NA', count: 12 },
  ],
  distinct: 1131,
  levels: null,
  numeric: {
    count: 1194,
    share: 1194 / 1198,
    format: { decimal: '.', group: ',' },
    min: 812,
    max: 21450,
    mean: 4630.5,
    sd: 2875.2,
    median: 3980,
    invalidCount: 4,
    invalidExamples: [
      { row: 57, text: 'about 3000' },
      { row: 311, text: 'unknown' },
      { row: 802, text: 'see notes' },
      { row: 1019, text: '3.200,5' },
    ],
    histogram: KWH_HISTOGRAM,
  },
  flags: noFlags,
};

export const surveyProfiles: ColumnProfile[] = [
  { ...textProfile('household_id', 0, householdIds, []), flags: { ...noFlags, identifier: true } },
  textProfile('heating', 1, heatingLevels, [
    { value: '', count: 12 },
    { value: 'NA', count: 5 },
  ]),
  textProfile('insulation', 2, insulationLevels, [{ value: '', count: 48 }]),
  textProfile('smart_meter', 3, smartMeterLevels, [{ value: '', count: 12 }]),
  textProfile('owns_ev', 4, evLevels, []),
  kwhProfile,
  textProfile('region_code', 6, regionLevels, [{ value: '', count: 19 }]),
  { ...textProfile('comments', 7, commentLevels, [{ value: '', count: 912 }]), flags: { ...noFlags, freeText: true } },
];

const categorical = {
  unseen: 'zeros' as const,
  otherLabel: '(other)',
  grouped: [] as string[],
  fittedRows: ROWS,
};

const noRare = { minCount: null, minShare: null, keepTop: null };

export const heatingColumn: NominalColumn = {
  name: 'heating',
  level: 'nominal',
  reason: '6 distinct values with no order among them',
  coding: 'one-hot',
  reference: 'gas boiler',
  rare: noRare,
  cleaning: { trim: true, caseFold: true, merges: [] },
  missing: { policy: 'level', indicator: false },
  ...categorical,
  levels: [...heatingLevels, { value: '(missing)', count: 17 }],
  outputs: [
    'heating=gas boiler',
    'heating=heat pump',
    'heating=oil boiler',
    'heating=electric storage',
    'heating=wood stove',
    'heating=district heat',
    'heating=(missing)',
  ],
};

export const insulationColumn: OrdinalColumn = {
  name: 'insulation',
  level: 'ordinal',
  reason: 'values read as a scale: poor, fair, good, very good',
  coding: 'rank',
  start: 1,
  scores: null,
  cleaning: { trim: true, caseFold: true, merges: [] },
  missing: { policy: 'most-frequent', indicator: true },
  ...categorical,
  levels: [
    { value: 'poor', count: 164 },
    { value: 'fair', count: 402 },
    { value: 'good', count: 455 },
    { value: 'very good', count: 171 },
  ],
  outputs: ['insulation', 'insulation (missing)'],
};

export const smartMeterColumn: NominalColumn = {
  name: 'smart_meter',
  level: 'nominal',
  reason: '4 distinct values with no order among them',
  coding: 'one-hot',
  reference: 'yes',
  rare: noRare,
  cleaning: { trim: true, caseFold: false, merges: [] },
  missing: { policy: 'level', indicator: false },
  ...categorical,
  levels: [...smartMeterLevels, { value: '(missing)', count: 12 }],
  outputs: ['smart_meter=yes', 'smart_meter=no', 'smart_meter=Y', 'smart_meter=N', 'smart_meter=(missing)'],
};

/** smart_meter after "Y" and "yes" were merged into "yes": 655 + 62 = 717. */
export const smartMeterMerged: NominalColumn = {
  ...smartMeterColumn,
  cleaning: { trim: true, caseFold: false, merges: [{ into: 'yes', from: ['Y'] }] },
  levels: [
    { value: 'yes', count: 717 },
    { value: 'no', count: 480 },
    { value: 'N', count: 31 },
    { value: '(missing)', count: 12 },
  ],
  outputs: ['smart_meter=yes', 'smart_meter=no', 'smart_meter=N', 'smart_meter=(missing)'],
};

export const evColumn: BinaryColumn = {
  name: 'owns_ev',
  level: 'binary',
  reason: '2 distinct values (no, yes)',
  positive: 'yes',
  cleaning: { trim: true, caseFold: true, merges: [] },
  missing: { policy: 'zeros', indicator: false },
  ...categorical,
  levels: [...evLevels],
  outputs: ['owns_ev=yes'],
};

export const kwhColumn: ContinuousColumn = {
  name: 'annual_kwh',
  level: 'continuous',
  reason: '1,194 of 1,198 values read as numbers',
  scaling: 'z-score',
  format: { decimal: '.', group: ',' },
  invalid: 'missing',
  missing: { policy: 'mean', indicator: true },
  fitted: { count: 1194, mean: 4630.5, sd: 2875.2, min: 812, max: 21450, median: 3980 },
  outputs: ['annual_kwh', 'annual_kwh (missing)'],
};

export const regionColumn: NominalColumn = {
  name: 'region_code',
  level: 'nominal',
  reason: '48 distinct values with no order among them',
  coding: 'one-hot',
  reference: 'R01',
  rare: noRare,
  cleaning: { trim: true, caseFold: false, merges: [] },
  missing: { policy: 'level', indicator: false },
  ...categorical,
  levels: [...regionLevels, { value: '(missing)', count: 19 }],
  outputs: [...regionLevels.map((l) => `region_code=${l.value}`), 'region_code=(missing)'],
};

export const surveyColumns: ColumnRecipe[] = [
  { name: 'household_id', level: 'identifier', reason: '1,240 distinct values in 1,240 rows', outputs: ['household_id'] },
  heatingColumn,
  insulationColumn,
  smartMeterColumn,
  evColumn,
  kwhColumn,
  regionColumn,
  { name: 'comments', level: 'excluded', reason: 'long free text, mostly distinct', outputs: [] },
];

export const surveyRecipe: Recipe = {
  kind: 'levelwise.recipe',
  version: 1,
  source: { file: 'household-energy-survey.csv', rows: ROWS, columns: surveyProfiles.map((p) => p.name) },
  reading: { delimiter: ',', missingTokens: ['NA', 'N/A', 'NaN', 'null', 'NULL', 'None', '.', '?', '-'] },
  naming: 'readable',
  columns: surveyColumns,
};

/**
 * The width of the recipe above. Zero shares are hand-computed: a one-hot column with k outputs
 * has exactly one 1 per row (missing is a level), so (k − 1) / k of its cells are 0; owns_ev is 0
 * for the 1,037 "no" rows; a column with a missing indicator adds one column that is 0 on the
 * rows that are not missing.
 */
export const surveyForecast: WidthForecast = {
  perColumn: [
    { name: 'household_id', level: 'identifier', before: 1, after: 1, zeroShare: 0 },
    { name: 'heating', level: 'nominal', before: 1, after: 7, zeroShare: 6 / 7 },
    // rank 1…4 is never 0; the indicator is 0 on 1,192 of 1,240 rows: 1192 / 2480.
    { name: 'insulation', level: 'ordinal', before: 1, after: 2, zeroShare: 1192 / 2480 },
    { name: 'smart_meter', level: 'nominal', before: 1, after: 5, zeroShare: 4 / 5 },
    { name: 'owns_ev', level: 'binary', before: 1, after: 1, zeroShare: 1037 / 1240 },
    // z-scores are (almost surely) never exactly 0; the indicator is 0 on the 1,194 rows read.
    { name: 'annual_kwh', level: 'continuous', before: 1, after: 2, zeroShare: 1194 / 2480 },
    { name: 'region_code', level: 'nominal', before: 1, after: 49, zeroShare: 48 / 49 },
    { name: 'comments', level: 'excluded', before: 1, after: 0, zeroShare: 0 },
  ],
  // Σ zeroShare × after / 67 = (0 + 6 + 1192/1240 + 4 + 1037/1240 + 1194/1240 + 48 + 0) / 67.
  total: { before: 8, after: 67, zeroShare: (58 + (1192 + 1037 + 1194) / 1240) / 67 },
};

export function profileNamed(name: string): ColumnProfile {
  const profile = surveyProfiles.find((p) => p.name === name);
  if (!profile) throw new Error(`fixture has no profile "${name}"`);
  return profile;
}
