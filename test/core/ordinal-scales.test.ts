/**
 * The scales themselves are common practice in survey and retail data (no single source); the
 * tests check that shuffled levels come back in the scale's order, spelled as given.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { matchOrdinalScale, readBand, scaleKey, suggestOrder } from '../../src/core/ordinal-scales.ts';

describe('word scales', () => {
  it.each([
    [['high', 'low', 'medium'], ['low', 'medium', 'high']],
    [['very high', 'low', 'very low', 'high', 'medium'], ['very low', 'low', 'medium', 'high', 'very high']],
    [['often', 'never', 'always', 'rarely', 'sometimes'], ['never', 'rarely', 'sometimes', 'often', 'always']],
    [
      ['agree', 'strongly disagree', 'neither agree nor disagree', 'strongly agree', 'disagree'],
      ['strongly disagree', 'disagree', 'neither agree nor disagree', 'agree', 'strongly agree'],
    ],
    [
      ['satisfied', 'very dissatisfied', 'neutral', 'very satisfied', 'dissatisfied'],
      ['very dissatisfied', 'dissatisfied', 'neutral', 'satisfied', 'very satisfied'],
    ],
    [['good', 'excellent', 'poor', 'very good', 'fair'], ['poor', 'fair', 'good', 'very good', 'excellent']],
    [['XL', 'S', 'M', 'L', 'XS', 'XXL'], ['XS', 'S', 'M', 'L', 'XL', 'XXL']],
    [['large', 'small', 'medium'], ['small', 'medium', 'large']],
    [['third', 'first', 'second'], ['first', 'second', 'third']],
    [['premium', 'basic', 'standard'], ['basic', 'standard', 'premium']],
    [['Gold', 'Bronze', 'Platinum', 'Silver'], ['Bronze', 'Silver', 'Gold', 'Platinum']],
  ])('%j → %j', (levels, order) => expect(suggestOrder(levels)).toEqual(order));

  it('names the scale it matched', () => {
    expect(matchOrdinalScale(['Agree', 'Disagree', 'Neutral'])).toEqual({
      scale: 'agreement',
      order: ['Disagree', 'Neutral', 'Agree'],
    });
    expect(matchOrdinalScale(['Premium', 'Basic'])?.scale).toBe('service tier');
  });

  it('ignores case and surrounding spaces, and returns the levels spelled as given', () =>
    expect(suggestOrder([' High', 'LOW', 'Medium '])).toEqual(['LOW', 'Medium ', ' High']));

  it('treats "_" and "-" between words as spaces', () => {
    expect(scaleKey('  Very_High ')).toBe('very high');
    expect(suggestOrder(['very-high', 'Very_Low', 'medium'])).toEqual(['Very_Low', 'medium', 'very-high']);
  });

  it('accepts part of a scale', () =>
    expect(suggestOrder(['Somewhat agree', 'Strongly disagree', 'Neutral'])).toEqual([
      'Strongly disagree',
      'Neutral',
      'Somewhat agree',
    ]));

  it('gives no order when two levels are spellings of the same step', () =>
    expect(suggestOrder(['often', 'frequently', 'never'])).toBeNull());

  it('gives no order for levels outside every scale, or for a single level', () => {
    expect(suggestOrder(['Adelie', 'Gentoo', 'Chinstrap'])).toBeNull(); // penguin species: nominal
    expect(suggestOrder(['low', 'medium', 'banana'])).toBeNull();
    expect(suggestOrder(['high'])).toBeNull();
    expect(suggestOrder([])).toBeNull();
    expect(suggestOrder(['M', 'F'])).toBeNull();
  });

  it('property: any shuffle of a scale’s levels gives the same order', () => {
    const scale = ['strongly disagree', 'disagree', 'neutral', 'agree', 'strongly agree'];
    fc.assert(
      fc.property(fc.shuffledSubarray(scale, { minLength: scale.length, maxLength: scale.length }), (shuffled) => {
        expect(suggestOrder(shuffled)).toEqual(scale);
      }),
    );
  });
});

describe('numbered positions', () => {
  it('orders 1st, 2nd, 3rd, … by number', () =>
    expect(suggestOrder(['12th', '2nd', '1st', '3rd', '11th', '21st'])).toEqual(['1st', '2nd', '3rd', '11th', '12th', '21st']));

  it('rejects wrong suffixes like "2th" and "11st"', () => {
    expect(suggestOrder(['1st', '2th'])).toBeNull();
    expect(suggestOrder(['1st', '11st'])).toBeNull();
  });
});

describe('numbered bands', () => {
  it('orders age bands by their lower bound, open ends first and last', () =>
    expect(suggestOrder(['25-34', '18-24', '65+', '<18', '35-44', '55-64', '45-54'])).toEqual([
      '<18',
      '18-24',
      '25-34',
      '35-44',
      '45-54',
      '55-64',
      '65+',
    ]));

  it('reads bands written in words', () =>
    expect(suggestOrder(['65 and over', 'under 18', '18 to 24', '25 to 64'])).toEqual([
      'under 18',
      '18 to 24',
      '25 to 64',
      '65 and over',
    ]));

  it('reads money bands with currency signs and k multipliers', () =>
    expect(suggestOrder(['$20k-$50k', '$10k-$20k', '$50k+', 'Under $10k'])).toEqual([
      'Under $10k',
      '$10k-$20k',
      '$20k-$50k',
      '$50k+',
    ]));

  it('reads grouped digits, en dashes and units', () =>
    expect(suggestOrder(['1,000–4,999', '5,000 or more', '0–999'])).toEqual(['0–999', '1,000–4,999', '5,000 or more']));

  it('accepts plain numbers among bands (household sizes "1", "2-3", "4+")', () =>
    expect(suggestOrder(['4+', '1', '2-3'])).toEqual(['1', '2-3', '4+']));

  it('leaves plain numbers alone: ordering numbers is not a band question', () =>
    expect(suggestOrder(['3', '1', '2'])).toBeNull());

  it('gives no order for identical bands or for a band next to a word', () => {
    expect(suggestOrder(['18-24', '18 to 24'])).toBeNull();
    expect(suggestOrder(['18-24', 'apples'])).toBeNull();
  });

  it('readBand gives the bounds', () => {
    expect(readBand('18-24')).toEqual({ lower: 18, upper: 24, single: false });
    expect(readBand('65+')).toEqual({ lower: 65, upper: Infinity, single: false });
    expect(readBand('under 18')).toEqual({ lower: -Infinity, upper: 18, single: false });
    expect(readBand('$10k-$20k')).toEqual({ lower: 10000, upper: 20000, single: false });
    expect(readBand('18-24 years')).toEqual({ lower: 18, upper: 24, single: false });
    expect(readBand('24-18')).toBeNull();
    expect(readBand('2024-03-01')).toBeNull();
  });
});
