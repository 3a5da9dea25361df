import { describe, expect, it } from 'vitest';
import { NO_CLEANING } from '../../src/core/cleaning.ts';
import {
  cleanLevels,
  INFERENCE_RULES,
  inferLevel,
  proposeCleaning,
  sensitiveAttributeCaution,
  type Inference,
} from '../../src/core/infer.ts';
import { profileColumn, profileTable, type ColumnProfile } from '../../src/core/profile.ts';
import { tableFromRows } from '../../src/core/read-table.ts';
import { columnTable, vegaTable } from './helpers/tables.ts';

/**
 * An invented household survey (not real people): 24 households, generated from fixed patterns
 * so every count below can be worked out by hand.
 */
const ROWS = 24;
const pick = <T,>(list: readonly T[], i: number): T => list[i % list.length] as T;

const OWNS_HOME = ['Yes', 'yes ', 'Y', 'N', 'no', 'Yes', 'No', 'Yes']; // per 8 rows: yes-side 5, no-side 3
const SATISFACTION = ['Satisfied', 'Very satisfied', 'Neutral', 'Dissatisfied', 'Satisfied', 'Very dissatisfied'];
const TIERS = ['Standard', 'Basic', 'Premium', 'Standard'];
const AGE_BANDS = ['35-44', '18-24', '65+', '25-34', '45-54', '55-64'];
const HEATING = ['gas boiler', 'heat pump', 'electric', 'wood stove', 'district', 'gas boiler'];
const BEDROOMS = ['2', '3', '1', '4', '5+', '3'];
const COMMENTS = [
  'The boiler is too loud at night',
  'Happy with the new windows overall',
  'Draughts in the back bedroom',
  'Meter readings are hard to reach',
  'Would like advice on solar panels',
  'No complaints this year',
  'Radiators heat up slowly in winter',
  'Bills went up after the tariff change',
  'Insulation work left a mess',
  'Thermostat is confusing to use',
  'Grateful for the quick repair',
  'Hot water runs out in the evening',
];

function surveyRows(): string[][] {
  const header = [
    'household_id', 'entry', 'owns_home', 'has_garden', 'heating', 'satisfaction', 'tier', 'age_band',
    'rating', 'annual_kwh', 'monthly_cost', 'comment', 'survey_date', 'country', 'notes', 'bedrooms', 'noise',
  ];
  const rows = Array.from({ length: ROWS }, (_, i) => [
    `H-${String(i + 1).padStart(4, '0')}`,
    String(i + 1),
    pick(OWNS_HOME, i),
    i % 3 === 0 ? 'FALSE' : 'TRUE',
    pick(HEATING, i),
    pick(SATISFACTION, i),
    pick(TIERS, i),
    pick(AGE_BANDS, i),
    String((i % 5) + 1),
    (2400 + ((i * 137) % 900) + 0.5).toFixed(1),
    `${60 + ((i * 7) % 40)},${String((i * 13) % 100).padStart(2, '0')}`,
    i % 2 === 0 ? pick(COMMENTS, i / 2) : '',
    `2024-03-${String((i % 28) + 1).padStart(2, '0')}`,
    'UK',
    '',
    pick(BEDROOMS, i),
    i % 4 === 0 ? 'high' : 'low',
  ]);
  return [header, ...rows];
}

const profiles = profileTable(tableFromRows(surveyRows()).table);
const inferred = new Map<string, Inference>(profiles.map((p) => [p.name, inferLevel(p)]));
const inference = (name: string): Inference => {
  const found = inferred.get(name);
  if (found === undefined) throw new Error(`no column ${name}`);
  return found;
};

describe('the rules', () => {
  it('are tried in this order, the last always matching', () =>
    expect(INFERENCE_RULES.map((r) => r.name)).toEqual([
      'all missing',
      'constant',
      'date',
      'binary',
      'ordinal scale',
      'identifier',
      'continuous',
      'free text',
      'numbered scale',
      'nominal',
    ]));

  it('every inference names the rule that decided', () => {
    expect(inference('owns_home').rule).toBe('binary');
    expect(inference('heating').rule).toBe('nominal');
  });
});

describe('an invented household survey', () => {
  it('household_id: text codes, all distinct → identifier', () => {
    const i = inference('household_id');
    expect(i.level).toBe('identifier');
    expect(i.reason).toBe('24 of 24 values distinct: looks like an identifier');
    expect(i.cleaning).toEqual(NO_CLEANING);
  });

  it('entry: whole numbers 1 to 24 → identifier (a row number)', () => {
    const i = inference('entry');
    expect(i.level).toBe('identifier');
    expect(i.reason).toBe('24 of 24 values distinct, whole numbers 1 to 24 without gaps: looks like a row number');
  });

  it('owns_home: "Yes", "yes ", "Y", "N", "no", "No" become two levels, "Yes" the positive class', () => {
    const i = inference('owns_home');
    expect(i.level).toBe('binary');
    expect(i.cleaning).toEqual({
      trim: true,
      caseFold: true,
      merges: [
        { into: 'yes', from: ['y'] },
        { into: 'no', from: ['n'] },
      ],
    });
    // Per 8 rows: Yes 3, "yes " 1, Y 1 → yes 5; N 1, no 1, No 1 → no 3. Over 24 rows: 15 and 9.
    expect(i.positive).toBe('yes');
    expect(i.reason).toBe('2 values after cleaning (6 spellings): "yes" (15) and "no" (9); "yes" is the positive class (it reads as yes)');
  });

  it('has_garden: TRUE / FALSE → binary with TRUE positive and no cleaning needed', () => {
    const i = inference('has_garden');
    expect(i.level).toBe('binary');
    expect(i.positive).toBe('TRUE');
    expect(i.cleaning).toEqual(NO_CLEANING);
  });

  it('noise: two steps of a scale are still binary; "high" (6) is the less frequent', () => {
    const i = inference('noise');
    expect(i.level).toBe('binary');
    expect(i.positive).toBe('high');
    expect(i.reason).toBe('2 values: "low" (18) and "high" (6); "high" is the positive class (the less frequent)');
  });

  it('satisfaction → ordinal in the satisfaction scale’s order', () => {
    const i = inference('satisfaction');
    expect(i.level).toBe('ordinal');
    expect(i.order).toEqual(['Very dissatisfied', 'Dissatisfied', 'Neutral', 'Satisfied', 'Very satisfied']);
    expect(i.reason).toBe(
      '5 values fit the satisfaction scale: Very dissatisfied < Dissatisfied < Neutral < Satisfied < Very satisfied',
    );
  });

  it('tier → ordinal Basic < Standard < Premium', () => {
    expect(inference('tier').level).toBe('ordinal');
    expect(inference('tier').order).toEqual(['Basic', 'Standard', 'Premium']);
  });

  it('age_band → ordinal by lower bound, with a caution about a sensitive attribute', () => {
    const i = inference('age_band');
    expect(i.level).toBe('ordinal');
    expect(i.order).toEqual(['18-24', '25-34', '35-44', '45-54', '55-64', '65+']);
    expect(i.caution).toMatch(/sensitive attribute/);
  });

  it('bedrooms: "1", "2", "3", "4", "5+" → ordinal bands', () =>
    expect(inference('bedrooms').order).toEqual(['1', '2', '3', '4', '5+']));

  it('rating: a 1–5 rating → ordinal in numeric order', () => {
    const i = inference('rating');
    expect(i.level).toBe('ordinal');
    expect(i.order).toEqual(['1', '2', '3', '4', '5']);
    expect(i.reason).toBe('5 distinct whole numbers from 1 to 5: read as an ordered scale');
  });

  it('annual_kwh: 24 distinct decimals → continuous', () => {
    const i = inference('annual_kwh');
    expect(i.level).toBe('continuous');
    expect(i.reason).toBe('24 of 24 values read as numbers (100%), 24 distinct');
  });

  it('monthly_cost: written with a decimal comma → continuous, read in that format', () => {
    expect(inference('monthly_cost').level).toBe('continuous');
    expect(profiles.find((p) => p.name === 'monthly_cost')?.numeric?.format).toEqual({ decimal: ',', group: '' });
  });

  it('comment: long distinct texts → excluded as free text', () => {
    const i = inference('comment');
    expect(i.level).toBe('excluded');
    // Lengths 31+34+28+32+33+23+34+37+27+30+29+33 = 371; 371 / 12 = 30.9 → 31.
    expect(i.reason).toBe('12 distinct texts in 12 values, 31 characters on average: free text is left out');
  });

  it('survey_date → excluded, dates are left out for now', () => {
    const i = inference('survey_date');
    expect(i.level).toBe('excluded');
    expect(i.reason).toBe('24 of 24 values look like dates (e.g. "2024-03-01"): dates are left out for now');
  });

  it('country: one value → excluded', () =>
    expect(inference('country')).toMatchObject({ level: 'excluded', reason: 'only one value: "UK" in 24 of 24 rows' }));

  it('notes: all empty → excluded', () =>
    expect(inference('notes')).toMatchObject({ level: 'excluded', reason: 'all 24 values are missing (empty 24)' }));

  it('heating: five unordered values → nominal', () =>
    expect(inference('heating')).toMatchObject({ level: 'nominal', reason: '5 distinct values with no order recognised' }));
});

describe('cleaning proposals', () => {
  const lv = (...pairs: [string, number][]) => pairs.map(([value, count]) => ({ value, count }));

  it('"Yes", "yes ", "Y", "N": trim, case-fold, merge y into yes', () => {
    const levels = lv(['Yes', 5], ['yes ', 3], ['Y', 2], ['N', 4]);
    const cleaning = proposeCleaning(levels);
    expect(cleaning).toEqual({ trim: true, caseFold: true, merges: [{ into: 'yes', from: ['y'] }] });
    expect(cleanLevels(levels, cleaning)).toEqual(lv(['yes', 10], ['n', 4]));
  });

  it('keeps the column’s own words: 1 / true / 0 merge into the more frequent spelling of each side', () => {
    const levels = lv(['1', 6], ['true', 2], ['0', 5], ['false', 1]);
    const cleaning = proposeCleaning(levels);
    expect(cleaning.merges).toEqual([
      { into: '1', from: ['true'] },
      { into: '0', from: ['false'] },
    ]);
    expect(cleaning.caseFold).toBe(false);
  });

  it('merges nothing when one level is not a yes/no spelling', () =>
    expect(proposeCleaning(lv(['yes', 3], ['y', 1], ['maybe', 2])).merges).toEqual([]));

  it('trims only when needed, case-folds only when two levels differ only by case', () => {
    expect(proposeCleaning(lv(['North', 3], ['South', 2]))).toEqual(NO_CLEANING);
    expect(proposeCleaning(lv([' North', 3], ['South', 2]))).toEqual({ trim: true, caseFold: false, merges: [] });
    expect(proposeCleaning(lv(['North', 3], ['NORTH', 2]))).toEqual({ trim: false, caseFold: true, merges: [] });
  });

  it('a column whose spellings all mean the same → excluded after cleaning', () => {
    const p = profileColumn(columnTable('agreed', ['Yes', 'yes', 'Y', 'yes']).columns[0]!, 0);
    expect(inferLevel(p)).toMatchObject({
      level: 'excluded',
      reason: 'only one value after cleaning (3 spellings): "yes" in 4 of 4 rows',
    });
  });

  it('spellings of one number merge for a numbered scale ("3" and "3.0")', () => {
    const p = profileColumn(columnTable('score', ['1', '2', '3', '3.0', '2', ' 1']).columns[0]!, 0);
    const i = inferLevel(p);
    expect(i.level).toBe('ordinal');
    expect(i.order).toEqual(['1', '2', '3']);
    expect(i.cleaning).toEqual({ trim: true, caseFold: false, merges: [{ into: '3', from: ['3.0'] }] });
  });
});

describe('positive class', () => {
  const binaryOf = (cells: string[]): Inference => inferLevel(profileColumn(columnTable('c', cells).columns[0]!, 0));

  it('0 / 1 → "1"', () => expect(binaryOf(['0', '1', '1', '0', '0']).positive).toBe('1'));
  it('absent / present → "present" even when more frequent', () =>
    expect(binaryOf(['present', 'present', 'absent']).positive).toBe('present'));
  it('no / other → the other', () => expect(binaryOf(['no', 'no', 'maybe', 'maybe', 'maybe']).positive).toBe('maybe'));
  it('neither reads as yes → the less frequent', () => expect(binaryOf(['red', 'red', 'blue']).positive).toBe('blue'));
  it.each([
    [['Ja', 'Ja', 'Nein'], 'Ja'],
    [['nee', 'nee', 'ja'], 'ja'],
    [['Oui', 'Non', 'Non'], 'Oui'],
    [['sí', 'no', 'no'], 'sí'],
    [['Não', 'Sim', 'Não'], 'Sim'],
    [['tak', 'nie', 'nie'], 'tak'],
    [['Nej', 'Nej', 'X'], 'X'],
  ])('yes and no in other languages (common practice): %j → %j', (cells, positive) => expect(binaryOf(cells).positive).toBe(positive));
  it('"Ja", "ja ", "J", "Nein", "n" become two levels, "ja" first (a survey export in German)', () => {
    const i = binaryOf(['Ja', 'ja ', 'J', 'Nein', 'n', 'Ja']);
    expect(i.reason).toBe('2 values after cleaning (5 spellings): "ja" (4) and "nein" (2); "ja" is the positive class (it reads as yes)');
  });
});

describe('published data', () => {
  const inferAll = (profilesOf: readonly ColumnProfile[]) => new Map(profilesOf.map((p) => [p.name, inferLevel(p)]));

  it('Palmer penguins (vega-datasets penguins.json): species and island nominal, measurements continuous, sex binary with a caution', () => {
    const found = inferAll(profileTable(vegaTable('penguins')));
    expect(found.get('Species')?.level).toBe('nominal');
    expect(found.get('Island')?.level).toBe('nominal');
    expect(found.get('Body Mass (g)')?.level).toBe('continuous');
    expect(found.get('Beak Length (mm)')?.reason).toBe('342 of 342 values read as numbers (100%), 164 distinct');
    const sex = found.get('Sex');
    expect(sex?.level).toBe('binary');
    // MALE 168, FEMALE 165 (published counts): neither reads as yes, so the less frequent.
    expect(sex?.positive).toBe('FEMALE');
    expect(sex?.caution).toMatch(/check local law/);
  });

  it('cars (vega-datasets cars.json): Year dates excluded, Cylinders 3 < 4 < 5 < 6 < 8, Origin nominal', () => {
    const found = inferAll(profileTable(vegaTable('cars')));
    expect(found.get('Year')?.level).toBe('excluded');
    expect(found.get('Cylinders')).toMatchObject({ level: 'ordinal', order: ['3', '4', '5', '6', '8'] });
    expect(found.get('Origin')?.level).toBe('nominal');
    expect(found.get('Horsepower')?.level).toBe('continuous');
  });
});

describe('sensitive attributes', () => {
  it.each(['Sex', 'gender', 'age_band', 'ageBand', 'Ethnicity', 'date of birth'])('%j gets a caution', (name) =>
    expect(sensitiveAttributeCaution(name)).not.toBeNull());
  it.each(['usage', 'page_count', 'heating', 'average'])('%j does not', (name) =>
    expect(sensitiveAttributeCaution(name)).toBeNull());
});

describe('numbers with currency or percent signs', () => {
  const profileOf = (cells: string[]): ColumnProfile => profileColumn(columnTable('c', cells).columns[0]!, 0, { missingTokens: ['NA'] });
  const inferOf = (cells: string[]): Inference => inferLevel(profileOf(cells));
  // Euros and cents: i + 1 euros and (7i mod 100) cents, for i = 0…39. The euros sum to 820; the
  // cents to 735 (i = 0…14) + 707 (i = 15…28, less a euro each) + 418 (i = 29…39, less two) = 1,860.
  const prices = Array.from({ length: 40 }, (_, i) => `€ ${i + 1},${String(i * 7 % 100).padStart(2, '0')}`);

  it('a column of amounts with a currency sign before them is continuous, read in its own format, not an identifier', () => {
    const profile = profileOf(prices);
    expect(profile.numeric?.format).toEqual({ decimal: ',', group: '', symbol: { text: '€', side: 'before' } });
    expect(profile.numeric?.count).toBe(40);
    expect(profile.numeric?.mean).toBeCloseTo(838.6 / 40, 12);
    expect(profile.numeric?.min).toBe(1);
    expect(profile.numeric?.max).toBe(40.73);
    expect(inferLevel(profile)).toMatchObject({
      level: 'continuous',
      reason: '40 of 40 values read as numbers written with "€" (100%), 40 distinct',
    });
  });

  it('signs after the number ("12%", "99,90 €") and "US$" before it too; a few missing or stray values are allowed', () => {
    const shares = [...Array.from({ length: 38 }, (_, i) => `${i / 2}%`), 'NA', 'about 5'];
    expect(inferOf(shares)).toMatchObject({
      level: 'continuous',
      reason: '38 of 39 values read as numbers written with "%" (97.4%), 38 distinct; 1 do not (e.g. "about 5")',
    });
    // "12%" is read as written: 12, not 0.12. The shares are 0, 0.5, …, 18.5.
    expect(profileOf(shares).numeric).toMatchObject({ min: 0, max: 18.5, format: { decimal: '.', group: '', symbol: { text: '%', side: 'after' } } });
    expect(profileOf(prices.map((p) => `${p.slice(2)} €`)).numeric?.format).toEqual({ decimal: ',', group: '', symbol: { text: '€', side: 'after' } });
    const dollars = profileOf(prices.map((p) => `US$${p.slice(2).replace(',', '.')}`)).numeric;
    expect(dollars).toMatchObject({ count: 40, max: 40.73, format: { decimal: '.', group: '', symbol: { text: 'US$', side: 'before' } } });
  });

  it('a sign before the symbol makes a negative amount: "-€5", "€-5" and "€ -5" are all −5', () => {
    const refunds = [...prices.slice(0, 30), '-€5', '€-5', '€ -5', '-€ 5,50'];
    const n = profileOf(refunds).numeric!;
    expect(n.count).toBe(34);
    expect(n.min).toBe(-5.5);
    expect(n.invalidCount).toBe(0);
  });

  it('leaves alone identifiers, codes with a sign inside, and numbers with only a stray signed value', () => {
    expect(inferOf(Array.from({ length: 40 }, (_, i) => `HH-${String(i).padStart(5, '0')}`)).level).toBe('identifier');
    expect(profileOf(Array.from({ length: 40 }, (_, i) => `$${i}-$${i + 10}`)).numeric).toBeNull();
    // One "$12" among plain numbers is a stray cell, reported, not a reason to read dollars.
    const stray = profileOf([...Array.from({ length: 39 }, (_, i) => String(i * 1.5)), '$12']);
    expect(inferLevel(stray).level).toBe('continuous');
    expect(stray.numeric).toMatchObject({ format: { decimal: '.', group: '' }, invalidCount: 1, invalidExamples: [{ row: 39, text: '$12' }] });
  });
});

describe('numbers with a stray word', () => {
  it('a 1–5 rating with one "unknown" stays nominal and says what would make it a scale', () => {
    const cells = [...Array.from({ length: 24 }, (_, i) => String((i % 5) + 1)), 'unknown'];
    const p = profileColumn(columnTable('rating', cells).columns[0]!, 0);
    expect(inferLevel(p)).toMatchObject({
      level: 'nominal',
      reason:
        '6 distinct values with no order recognised; all but 1 are numbers: marking "unknown" as missing would read them as an ordered scale',
    });
    const asMissing = profileColumn(columnTable('rating', cells).columns[0]!, 0, { missingTokens: ['unknown'] });
    expect(inferLevel(asMissing)).toMatchObject({ level: 'ordinal', order: ['1', '2', '3', '4', '5'] });
  });
});

describe('canned comments', () => {
  it('a comment column of repeated sentences is free text, left out, not a nominal column of sentences', () => {
    const sentences = ['Heat pump is noisy at night.', 'Wants a cheaper night rate please.', 'Prefers paper bills to the app.'];
    const cells = Array.from({ length: 60 }, (_, i) => (i % 4 === 0 ? sentences[i % 3]! : ''));
    const profile = profileColumn(columnTable('comment', cells).columns[0]!, 0);
    expect(profile.flags.freeText).toBe(true);
    expect(inferLevel(profile).level).toBe('excluded');
  });
});
