import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  CANDIDATE_NUMBER_FORMATS,
  detectNumberFormat,
  formatFromExample,
  formatNumber,
  numberFormatExample,
  hasLeadingZero,
  parseNumber,
  PLAIN_NUMBER_FORMAT,
} from '../../src/core/numbers.ts';
import type { NumberFormat } from '../../src/core/recipe.ts';

const PLAIN: NumberFormat = { decimal: '.', group: '' };
const COMMA_GROUPS: NumberFormat = { decimal: '.', group: ',' };
const SPACE_GROUPS: NumberFormat = { decimal: '.', group: ' ' };
const DECIMAL_COMMA: NumberFormat = { decimal: ',', group: '' };
const DECIMAL_COMMA_DOT_GROUPS: NumberFormat = { decimal: ',', group: '.' };
const DECIMAL_COMMA_SPACE_GROUPS: NumberFormat = { decimal: ',', group: ' ' };

const once = (...values: string[]) => values.map((value) => ({ value, count: 1 }));

describe('parseNumber, plain format', () => {
  it.each([
    ['12', 12],
    [' 3.5 ', 3.5],
    ['\t-0.25\n', -0.25],
    ['+4', 4],
    ['.5', 0.5],
    ['-.5', -0.5],
    ['1.50', 1.5],
    ['007', 7],
    ['1e3', 1000],
    ['1.5E-3', 0.0015],
    ['1.7976931348623157e308', Number.MAX_VALUE],
  ])('reads %j as %d', (text, expected) => expect(parseNumber(text, PLAIN)).toBe(expected));

  it('reads "-0" as negative zero, so nothing about the cell is lost', () => expect(Object.is(parseNumber('-0', PLAIN), -0)).toBe(true));

  it.each([
    '$12',
    '45%',
    '12 kg',
    'n/a',
    '',
    '   ',
    'Infinity',
    '-Infinity',
    'NaN',
    '0x1F',
    '0b101',
    '1_000',
    '1.2.3',
    '5.',
    '--1',
    '1e',
    '1,234',
    '12,5',
  ])('does not read %j', (text) => expect(parseNumber(text, PLAIN)).toBeNaN());

  it('does not accept numbers that overflow to infinity: "1e309" and "-1e309"', () => {
    expect(parseNumber('1e309', PLAIN)).toBeNaN();
    expect(parseNumber('-1e309', PLAIN)).toBeNaN();
  });
});

describe('parseNumber, grouped and decimal-comma formats', () => {
  it('reads comma groups with a point decimal, and ungrouped numbers in the same format', () => {
    expect(parseNumber('1,234.5', COMMA_GROUPS)).toBe(1234.5);
    expect(parseNumber('1,234,567', COMMA_GROUPS)).toBe(1234567);
    expect(parseNumber('-12,000', COMMA_GROUPS)).toBe(-12000);
    expect(parseNumber('1234.5', COMMA_GROUPS)).toBe(1234.5);
  });

  it('rejects badly formed groups rather than guessing: "1,5", "12,34", "1,2345"', () => {
    expect(parseNumber('1,5', COMMA_GROUPS)).toBeNaN();
    expect(parseNumber('12,34', COMMA_GROUPS)).toBeNaN();
    expect(parseNumber('1,2345', COMMA_GROUPS)).toBeNaN();
    expect(parseNumber('1234,567', COMMA_GROUPS)).toBeNaN();
  });

  it('reads a decimal comma', () => {
    expect(parseNumber('12,5', DECIMAL_COMMA)).toBe(12.5);
    expect(parseNumber(' -0,75 ', DECIMAL_COMMA)).toBe(-0.75);
    expect(parseNumber('3', DECIMAL_COMMA)).toBe(3);
    expect(parseNumber('3.5', DECIMAL_COMMA)).toBeNaN();
    expect(parseNumber('1.234,5', DECIMAL_COMMA)).toBeNaN();
  });

  it('reads point groups with a decimal comma ("1.234,5")', () => {
    expect(parseNumber('1.234,5', DECIMAL_COMMA_DOT_GROUPS)).toBe(1234.5);
    expect(parseNumber('1.234.567', DECIMAL_COMMA_DOT_GROUPS)).toBe(1234567);
    expect(parseNumber('1.5', DECIMAL_COMMA_DOT_GROUPS)).toBeNaN();
  });

  it('reads space groups, including the no-break spaces some locales write', () => {
    expect(parseNumber('1 234', SPACE_GROUPS)).toBe(1234);
    expect(parseNumber('1 234 567.5', SPACE_GROUPS)).toBe(1234567.5);
    expect(parseNumber('1\u00A0234,5', DECIMAL_COMMA_SPACE_GROUPS)).toBe(1234.5);
    expect(parseNumber('1\u202F234', DECIMAL_COMMA_SPACE_GROUPS)).toBe(1234);
    expect(parseNumber('1 23', SPACE_GROUPS)).toBeNaN();
    expect(parseNumber('1  234', SPACE_GROUPS)).toBeNaN();
  });

  it('keeps rejecting currency, percent and words in every format', () => {
    for (const format of CANDIDATE_NUMBER_FORMATS) {
      for (const text of ['$12', '45%', 'n/a', '1e309', 'Infinity']) expect(parseNumber(text, format)).toBeNaN();
    }
  });
});

const EURO_BEFORE: NumberFormat = { decimal: ',', group: '.', symbol: { text: '€', side: 'before' } };
const PERCENT: NumberFormat = { decimal: '.', group: '', symbol: { text: '%', side: 'after' } };
const FRANCS: NumberFormat = { decimal: '.', group: ',', symbol: { text: 'CHF', side: 'before' } };
const KILOGRAMS: NumberFormat = { decimal: '.', group: '', symbol: { text: 'kg', side: 'after' } };
/** The formats with a symbol the tests go through, beside the six without. */
const SYMBOL_FORMATS: readonly NumberFormat[] = [
  EURO_BEFORE,
  PERCENT,
  FRANCS,
  { decimal: ',', group: ' ', symbol: { text: '€', side: 'after' } },
  { decimal: '.', group: ',', symbol: { text: 'US$', side: 'before' } },
];

describe('parseNumber, formats with a symbol', () => {
  it.each([
    ['€ 1.234,50', 1234.5],
    ['€1.234,50', 1234.5],
    [`€\u00a012`, 12],
    ['  € 5  ', 5],
    ['-€5', -5],
    ['€-5', -5],
    ['€ -5', -5],
    ['+€ 5', 5],
    ['7,25', 7.25],
  ])('with "€" before: reads %j as %d', (text, expected) => expect(parseNumber(text, EURO_BEFORE)).toBe(expected));

  it.each(['5 €', '€', '€ ', '--€5', '-€-5', '- €5', 'EUR 5', '€€5', '€ 1,234.50', '€ 5 %'])('with "€" before: does not read %j', (text) =>
    expect(parseNumber(text, EURO_BEFORE)).toBeNaN());

  it('with "%" after: the number as written ("12%" is 12, not 0.12), with or without the sign, spaces allowed', () => {
    expect(parseNumber('12%', PERCENT)).toBe(12);
    expect(parseNumber('12.5 %', PERCENT)).toBe(12.5);
    expect(parseNumber(`-0.5\u202f%`, PERCENT)).toBe(-0.5);
    expect(parseNumber('40', PERCENT)).toBe(40);
    for (const text of ['%12', '12%%', '12 %%', '%', '12‰', '12 percent']) expect(parseNumber(text, PERCENT)).toBeNaN();
  });

  it('a letter symbol is matched as written, case and all, and any unit a recipe names is read the same way', () => {
    expect(parseNumber('CHF 1,250.75', FRANCS)).toBe(1250.75);
    expect(parseNumber('-CHF 3', FRANCS)).toBe(-3);
    expect(parseNumber('chf 3', FRANCS)).toBeNaN();
    expect(parseNumber('12.5 kg', KILOGRAMS)).toBe(12.5);
    expect(parseNumber('12.5kg', KILOGRAMS)).toBe(12.5);
    expect(parseNumber('12.5 g', KILOGRAMS)).toBeNaN();
  });
});

describe('parseNumber, negatives in parentheses or with a trailing minus', () => {
  const ACCOUNTS: NumberFormat = { decimal: '.', group: ',', negative: 'parentheses' };
  const TRAILING: NumberFormat = { decimal: ',', group: '.', negative: 'trailing' };

  it.each([
    ['(1,234.50)', -1234.5],
    ['( 5 )', -5],
    ['(0)', -0],
    ['1,234.50', 1234.5],
    ['-7', -7],
  ])('in parentheses: reads %j as %d', (text, expected) => expect(Object.is(parseNumber(text, ACCOUNTS), expected)).toBe(true));

  it.each(['(-5)', '((5))', '()', '(5', '5)', '5-'])('in parentheses: does not read %j', (text) => expect(parseNumber(text, ACCOUNTS)).toBeNaN());

  it('with a trailing minus, as some business systems export: "1.234,50-" is −1234.5', () => {
    expect(parseNumber('1.234,50-', TRAILING)).toBe(-1234.5);
    expect(parseNumber('7 -', TRAILING)).toBe(-7);
    expect(parseNumber('-7', TRAILING)).toBe(-7);
    for (const text of ['-7-', '7--', '(7)', '-']) expect(parseNumber(text, TRAILING)).toBeNaN();
  });

  it('around a symbol: "(€ 1.234,50)", "(12 %)", "€ 5-"', () => {
    expect(parseNumber('(€ 1.234,50)', { ...EURO_BEFORE, negative: 'parentheses' })).toBe(-1234.5);
    expect(parseNumber('(12 %)', { ...PERCENT, negative: 'parentheses' })).toBe(-12);
    expect(parseNumber('€ 5-', { ...EURO_BEFORE, negative: 'trailing' })).toBe(-5);
    // The parentheses stand outside the symbol, not between it and the number.
    expect(parseNumber('€ (5)', { ...EURO_BEFORE, negative: 'parentheses' })).toBeNaN();
  });

  it('are not read in a format without the notation', () => {
    expect(parseNumber('(5)', PLAIN)).toBeNaN();
    expect(parseNumber('5-', PLAIN)).toBeNaN();
  });
});

describe('detectNumberFormat', () => {
  it('defaults to plain numbers', () => {
    expect(detectNumberFormat(once('1.5', '2', '-3.25'))).toEqual(PLAIN);
    expect(detectNumberFormat(once('red', 'green'))).toEqual(PLAIN_NUMBER_FORMAT);
    expect(detectNumberFormat([])).toEqual(PLAIN);
  });

  it('chooses a decimal comma when the column is written that way', () =>
    expect(detectNumberFormat(once('12,5', '3,75', '1,234', '7'))).toEqual(DECIMAL_COMMA));

  it('reads "1,234" alone as a thousands group, not as a decimal comma (ties go to the point)', () =>
    expect(detectNumberFormat(once('1,234', '5,678', '12'))).toEqual(COMMA_GROUPS));

  it('chooses comma groups when some values carry them', () =>
    expect(detectNumberFormat(once('1,234.5', '3.2', '18'))).toEqual(COMMA_GROUPS));

  it('chooses point groups with a decimal comma for "1.234,5"', () =>
    expect(detectNumberFormat(once('1.234,5', '12,5', '3'))).toEqual(DECIMAL_COMMA_DOT_GROUPS));

  it('chooses space groups for "1 234", a point decimal when nothing says otherwise', () => {
    expect(detectNumberFormat(once('1 234', '56'))).toEqual(SPACE_GROUPS);
    expect(detectNumberFormat(once('1 234,5', '56'))).toEqual(DECIMAL_COMMA_SPACE_GROUPS);
  });

  it('weighs values by their counts', () => {
    expect(detectNumberFormat([{ value: '1,5', count: 10 }, { value: '1,234.5', count: 3 }])).toEqual(DECIMAL_COMMA);
    expect(detectNumberFormat([{ value: '1,5', count: 2 }, { value: '1,234.5', count: 3 }])).toEqual(COMMA_GROUPS);
  });

  it('takes a currency or percent sign when the column is written with it', () => {
    expect(detectNumberFormat(once('€ 1.234,50', '€ 2,00', '€ 5', '7,5'))).toEqual(EURO_BEFORE);
    expect(detectNumberFormat(once('12%', '5.5%', '100%', '0'))).toEqual(PERCENT);
    expect(detectNumberFormat(once('CHF 1,250.75', 'CHF 3', '-CHF 12'))).toEqual(FRANCS);
    expect(detectNumberFormat(once('US$5', 'US$ 1,200.50'))).toEqual({ decimal: '.', group: ',', symbol: { text: 'US$', side: 'before' } });
    expect(detectNumberFormat(once('99,90 €', '1 299,00 €'))).toEqual({ decimal: ',', group: ' ', symbol: { text: '€', side: 'after' } });
  });

  it('leaves a symbol out when only a few cells carry it: one "$12" among numbers stays a stray cell', () => {
    expect(detectNumberFormat(once('1.5', '2', '3.25', '$12'))).toEqual(PLAIN);
    // Carried by exactly half the cells it would read: not the column's way of writing.
    expect(detectNumberFormat(once('1', '2', '3%', '4%'))).toEqual(PLAIN);
    expect(detectNumberFormat(once('1', '2%', '3%', '4%'))).toEqual({ ...PLAIN, symbol: { text: '%', side: 'after' } });
  });

  it('finds a unit after the number by its shape ("12 kg", "21 °C", "5 km/h"), any other sign before it only from its list', () => {
    expect(detectNumberFormat(once('12 kg', '3.5 kg', '7'))).toEqual(KILOGRAMS);
    expect(detectNumberFormat(once('21,5 °C', '19 °C'))).toEqual({ decimal: ',', group: '', symbol: { text: '°C', side: 'after' } });
    expect(detectNumberFormat(once('5 km/h', '30 km/h'))).toEqual({ ...PLAIN, symbol: { text: 'km/h', side: 'after' } });
    expect(detectNumberFormat(once('3 m²', '12.5 m²'))).toEqual({ ...PLAIN, symbol: { text: 'm²', side: 'after' } });
    expect(detectNumberFormat(once('≈12', '≈3.5'))).toEqual(PLAIN);
    // An exponent's "e" is no unit; a unit too long, or a text before the digits, is none either.
    expect(detectNumberFormat(once('1e', '2e', '3'))).toEqual(PLAIN);
    expect(detectNumberFormat(once('3 kilograms', '4 kilograms'))).toEqual(PLAIN);
    expect(detectNumberFormat(once('user12ab', 'user13ab'))).toEqual(PLAIN);
    // Postcodes: letters after digits, each pair its own; no unit is carried by most of them.
    expect(detectNumberFormat(once('1011 AB', '1012 CD', '1011 AB', '3511 EF', '2512 GH'))).toEqual(PLAIN);
  });

  it('takes parentheses or a trailing minus for negatives when some cells are written so', () => {
    expect(detectNumberFormat(once('1,234.50', '(250.00)', '99.90'))).toEqual({ ...COMMA_GROUPS, negative: 'parentheses' });
    expect(detectNumberFormat(once('1.234,50-', '250,00', '99,90'))).toEqual({ ...DECIMAL_COMMA_DOT_GROUPS, negative: 'trailing' });
    expect(detectNumberFormat(once('€ 1.234,50', '(€ 250,00)', '€ 99,90'))).toEqual({ ...EURO_BEFORE, negative: 'parentheses' });
    expect(detectNumberFormat(once('12', '-5', '(see note)'))).toEqual(PLAIN);
  });

  it('ignores values with a zero count and empty texts', () =>
    expect(detectNumberFormat([{ value: '12,5', count: 0 }, { value: '', count: 9 }, { value: '3.5', count: 1 }])).toEqual(PLAIN));
});

describe('formatNumber', () => {
  it('writes groups and the decimal separator of the format', () => {
    expect(formatNumber(1234567.891, COMMA_GROUPS)).toBe('1,234,567.891');
    expect(formatNumber(-1234.5, DECIMAL_COMMA_DOT_GROUPS)).toBe('-1.234,5');
    expect(formatNumber(1234.5, SPACE_GROUPS)).toBe('1 234.5');
    expect(formatNumber(999, COMMA_GROUPS)).toBe('999');
    expect(formatNumber(0.5, DECIMAL_COMMA)).toBe('0,5');
  });

  it('keeps the exponent form JavaScript uses for very large and very small numbers', () => {
    expect(formatNumber(1e21, COMMA_GROUPS)).toBe('1e+21');
    expect(formatNumber(1.5e-7, DECIMAL_COMMA)).toBe('1,5e-7');
  });

  it('refuses NaN and infinities', () => {
    expect(() => formatNumber(NaN, PLAIN)).toThrow(RangeError);
    expect(() => formatNumber(Infinity, PLAIN)).toThrow(RangeError);
  });

  it('property: for any finite number and any format, writing then reading gives the same number back', () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        fc.constantFrom(...CANDIDATE_NUMBER_FORMATS),
        fc.constantFrom('', ' ', '  \t'),
        (value, format, padding) => {
          const text = padding + formatNumber(value, format) + padding;
          expect(Object.is(parseNumber(text, format), value)).toBe(true);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('writes the symbol on its side, a letter symbol apart from the number', () => {
    expect(formatNumber(1234.5, EURO_BEFORE)).toBe('€1.234,5');
    expect(formatNumber(12.5, PERCENT)).toBe('12.5%');
    expect(formatNumber(-1250.75, FRANCS)).toBe('-CHF 1,250.75');
    expect(formatNumber(-5, EURO_BEFORE)).toBe('-€5');
    expect(formatNumber(3, KILOGRAMS)).toBe('3 kg');
    expect(formatNumber(-1234.5, { ...EURO_BEFORE, negative: 'parentheses' })).toBe('(€1.234,5)');
    expect(formatNumber(-3, { ...KILOGRAMS, negative: 'trailing' })).toBe('3 kg-');
  });

  it('shows a format to people by one number, and a negative when written otherwise; nothing for plain numbers', () => {
    expect(numberFormatExample(PLAIN)).toBeNull();
    expect(numberFormatExample(EURO_BEFORE)).toBe('€1.234,5');
    expect(numberFormatExample({ ...COMMA_GROUPS, negative: 'parentheses' })).toBe('1,234.5 and (1,234.5)');
  });

  it('property: with a symbol too, writing then reading gives the same number back', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(...SYMBOL_FORMATS, KILOGRAMS), fc.constantFrom(undefined, 'parentheses', 'trailing'), (value, symbolFormat, negative) => {
        const format: NumberFormat = negative === undefined ? symbolFormat : { ...symbolFormat, negative };
        expect(Object.is(parseNumber(formatNumber(value, format), format), value)).toBe(true);
        // The symbol is optional in each cell: the bare number reads the same.
        expect(Object.is(parseNumber(formatNumber(value, { decimal: format.decimal, group: format.group }), format), value)).toBe(true);
        // And a leading minus always reads, whatever other notation the format allows.
        if (negative !== undefined) expect(Object.is(parseNumber(formatNumber(value, symbolFormat), format), value)).toBe(true);
      }),
      { numRuns: 1000 },
    );
  });

  it('property: whole numbers written with groups are detected as that format when a group shows', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1000, max: 1e9 }), { minLength: 1, maxLength: 20 }),
        fc.constantFrom(COMMA_GROUPS, SPACE_GROUPS, DECIMAL_COMMA_SPACE_GROUPS),
        (values, format) => {
          const texts = values.map((v) => formatNumber(v, format));
          const detected = detectNumberFormat(once(...texts));
          // Whole numbers never show their decimal separator, so either separator reads them alike.
          expect(detected.group).toBe(format.group);
          for (let i = 0; i < values.length; i++) expect(parseNumber(texts[i] ?? '', detected)).toBe(values[i]);
        },
      ),
    );
  });

  it('property: in the plain format, the text JavaScript writes for a number reads back as it', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (value) => {
        expect(parseNumber(String(value), PLAIN)).toBe(Object.is(value, -0) ? 0 : value);
      }),
    );
  });
});

describe('hasLeadingZero', () => {
  it('spots codes written with leading zeros', () => {
    expect(hasLeadingZero('007')).toBe(true);
    expect(hasLeadingZero(' -01')).toBe(true);
    expect(hasLeadingZero('0')).toBe(false);
    expect(hasLeadingZero('0.5')).toBe(false);
    expect(hasLeadingZero('10')).toBe(false);
  });
});

describe('formatFromExample: a person writes 1234.5 the way the column does', () => {
  it.each([
    ['1234.5', PLAIN],
    ['1,234.5', COMMA_GROUPS],
    ['1 234.5', SPACE_GROUPS],
    [`1\u202f234,5`, DECIMAL_COMMA_SPACE_GROUPS],
    ['1234,50', DECIMAL_COMMA],
    ['1.234,5', DECIMAL_COMMA_DOT_GROUPS],
    ['€ 1.234,50', EURO_BEFORE],
    ['1234.5%', PERCENT],
    ['CHF 1,234.5', FRANCS],
    ['1234.5 kg', KILOGRAMS],
    ['(1,234.5)', { ...COMMA_GROUPS, negative: 'parentheses' }],
    ['1.234,50-', { ...DECIMAL_COMMA_DOT_GROUPS, negative: 'trailing' }],
    ['(€ 1.234,5)', { ...EURO_BEFORE, negative: 'parentheses' }],
  ])('%j', (example, format) => expect(formatFromExample(example)).toEqual(format));

  it.each(['12,5', '1234', '1.234.5', '1,234,5', '€ 1234.5 %', '1234.5 5', 'kg', '', '1 2345', '(-1234.5)', '-1234.5-', '()'])('refuses %j', (example) =>
    expect(formatFromExample(example)).toBeNull());

  it('property: the example formatNumber writes for 1234.5 gives its format back, in every format', () => {
    for (const format of [...CANDIDATE_NUMBER_FORMATS, ...SYMBOL_FORMATS, KILOGRAMS]) expect(formatFromExample(formatNumber(1234.5, format))).toEqual(format);
  });
});
