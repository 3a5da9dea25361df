import { describe, expect, it } from 'vitest';
import { dateShape, looksLikeDate } from '../../src/core/dates.ts';

describe('looksLikeDate: dates', () => {
  it.each([
    '2024-03-01',
    ' 2024-03-01 ',
    '2024/03/01',
    '2024-02-29', // 2024 is a leap year
    '2000-02-29', // divisible by 400: a leap year
    '01/03/2024',
    '13/03/2024', // day first
    '03/13/2024', // month first
    '3/1/24',
    '01.03.2024',
    '01-03-2024',
    '3 Mar 2024',
    '03-Mar-2024',
    '3-mar-24',
    '3rd March 2024',
    '1 Sept 2024',
    'Mar 3, 2024',
    'March 3 2024',
    'Sunday, 3 March 2024',
  ])('%j is a date', (text) => expect(dateShape(text)).toBe('date'));

  it('the Year column of vega-datasets cars.json is written "1970-01-01"', () => expect(looksLikeDate('1970-01-01')).toBe(true));
});

describe('looksLikeDate: timestamps', () => {
  it.each([
    '2024-03-01T10:00:00Z',
    '2024-03-01T10:00',
    '2024-03-01 10:00:00',
    '2024-03-01T10:00:00.123+01:00',
    '01/03/2024 14:30',
    '3/1/2024 2:30 PM',
    '3 Mar 2024 10:00',
  ])('%j is a timestamp', (text) => expect(dateShape(text)).toBe('timestamp'));

  it.each([
    '1985-04-12T23:20:50.52Z',
    '1996-12-19T16:39:57-08:00',
    '1990-12-31T23:59:60Z',
    '1937-01-01T12:00:27.87+00:20',
  ])('RFC 3339 §5.8 example %j is a timestamp (examples quoted from memory)', (text) =>
    expect(dateShape(text)).toBe('timestamp'));

  it('the RFC 5322 §3.3 date-time form "Fri, 21 Nov 1997 09:55:06 -0600" is a timestamp (example from memory)', () =>
    expect(dateShape('Fri, 21 Nov 1997 09:55:06 -0600')).toBe('timestamp'));
});

describe('looksLikeDate: not dates', () => {
  it.each([
    ['2023-02-29', 'no 29 February in 2023'],
    ['1900-02-29', 'divisible by 100 but not by 400: no leap year'],
    ['2024-13-01', 'no month 13'],
    ['2024-04-31', 'April has 30 days'],
    ['2024-00-10', 'no month 0'],
    ['13/13/2024', 'neither reading is a date'],
    ['32/01/2024', 'no day 32'],
    ['2024-03-01T25:00', 'no hour 25'],
    ['2024-03-01 10:61', 'no minute 61'],
    ['3/1/2024 13:00 PM', 'no 13 PM'],
    ['2024', 'a bare number'],
    ['20240301', 'a bare number'],
    ['1.2.24', 'a version number'],
    ['1-2-24', 'a code'],
    ['12:30', 'a time of day only'],
    ['Mar 2024', 'a month, not a date'],
    ['3 Marz 2024', 'not an English month name'],
    ['31 Feb 2024', 'no 31 February'],
    ['18-24', 'an age band'],
    ['1,234.5', 'a number'],
    ['yes', 'a word'],
    ['', 'empty'],
  ])('%j is not a date (%s)', (text) => expect(looksLikeDate(text)).toBe(false));
});
