// @vitest-environment jsdom
/**
 * Stray text in a column of numbers: "unknown", "12,5", "1 234", "$12", "45%", "1e309". Which rows hold
 * them (by file line), and what was done with each — read, treated as missing and filled, or the
 * row rejected — is said in the profile, in the page, in the re-use report and in the output.
 * Expected values are worked out by hand in the comments.
 */
import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { decide } from '../../src/core/decisions.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { readTable } from '../../src/core/read-table.ts';
import type { ContinuousColumn } from '../../src/core/recipe.ts';
import { ContinuousOptions } from '../../src/ui/columns/ContinuousOptions.tsx';
import { pipeline, utf8, windows1252 } from './helpers.ts';

afterEach(cleanup);

/** Data row (0-based) → stray text. The file line of data row r is r + 2 (line 1 is the header). */
const STRAYS = new Map<number, string>([
  [10, 'unknown'],
  [40, '12,5'],
  [80, '1 234'],
  [120, '$12'],
  [160, '45%'],
  [200, '1e309'],
]);
const ROWS = 206;
const lines = ['meter,kwh'];
// Cells are quoted where they hold the delimiter (RFC 4180 §2.6): "12,5" stays one cell.
for (let r = 0; r < ROWS; r++) lines.push(`m${r},${quoted(STRAYS.get(r) ?? String(r + 0.5))}`);

function quoted(cell: string): string {
  return cell.includes(',') ? `"${cell}"` : cell;
}
const run = pipeline(utf8(`${lines.join('\n')}\n`), 'meters.csv');
const kwh = run.recipe.columns[1] as ContinuousColumn;

// The other 200 cells hold their row number plus a half: 0.5 + 1.5 + … + 205.5 = 21,218, less the six
// stray rows (10.5 + 40.5 + 80.5 + 120.5 + 160.5 + 200.5 = 613) = 20,605. Their point decimals rule
// out the comma-decimal formats. "1 234" reads as 1234: the format that reads the most cells is "."
// decimals with space-grouped thousands (numbers.ts), and it reads every plain number too.
// So 201 numbers, summing to 21,839.
const MEAN = 21_839 / 201;

describe('a column of numbers with stray text', () => {
  it('is continuous; the format that reads the most cells is chosen and recorded in the recipe', () => {
    expect(kwh.level).toBe('continuous');
    expect(kwh.format).toEqual({ decimal: '.', group: ' ' });
    expect(kwh.fitted.count).toBe(201);
    expect(kwh.fitted.mean).toBe(MEAN);
    expect(kwh.fitted.max).toBe(1234);
    expect(kwh.reason).toBe('201 of 206 values read as numbers (97.6%), 201 distinct; 5 do not (e.g. "unknown")');
  });

  it('lists each cell that is not a number with its row and file line', () => {
    const numeric = run.profiles[1]?.numeric;
    expect(numeric?.invalidCount).toBe(5);
    expect(numeric?.invalidExamples).toEqual([
      { row: 10, text: 'unknown', line: 12 },
      { row: 40, text: '12,5', line: 42 },
      { row: 120, text: '$12', line: 122 },
      { row: 160, text: '45%', line: 162 },
      // 1e309 is beyond the largest double (about 1.8e308): it would be Infinity, so it is not read.
      { row: 200, text: '1e309', line: 202 },
    ]);
  });

  it('fills them with the fitted mean, says so in the report with their lines, and writes the mean', () => {
    const report = run.report.columns.find((c) => c.name === 'kwh');
    expect(report?.invalid).toEqual([
      { value: 'unknown', count: 1, lines: [12] },
      { value: '12,5', count: 1, lines: [42] },
      { value: '$12', count: 1, lines: [122] },
      { value: '45%', count: 1, lines: [162] },
      { value: '1e309', count: 1, lines: [202] },
    ]);
    expect(report?.invalidAction).toBe(`treated as missing (filled with the fitted mean ${MEAN})`);
    const out = run.csv.split('\r\n');
    expect(out[0]).toBe('meter,kwh');
    expect(out[1 + 10]).toBe(`m10,${MEAN}`);
    expect(out[1 + 80]).toBe('m80,1234');
    expect(out[1 + 81]).toBe('m81,81.5');
    expect(run.report.rowsWritten).toBe(ROWS);
  });

  it('with “reject the row”, leaves those rows out and lists each with line, column and reason', () => {
    const strict = decide(run.recipe, { type: 'set-invalid', column: 'kwh', invalid: 'error' }, run.profiles);
    const { report } = encodeToCsv(strict, run.read.table);
    expect(report.rowsWritten).toBe(ROWS - 5);
    expect(report.rejected.map((r) => [r.line, r.column, r.reason])).toEqual([
      [12, 'kwh', '"unknown" is not a number'],
      [42, 'kwh', '"12,5" is not a number'],
      [122, 'kwh', '"$12" is not a number'],
      [162, 'kwh', '"45%" is not a number'],
      [202, 'kwh', '"1e309" is not a number'],
    ]);
  });

  it('the page shows the format, the count and the first lines, beside the choice of what to do', () => {
    render(<ContinuousOptions profile={run.profiles[1]!} column={kwh} onDecide={() => undefined} />);
    expect(screen.getByText('5 cells do not read as numbers here, e.g. “unknown” (line 12), “12,5” (line 42), “$12” (line 122).')).toBeTruthy();
    expect(screen.getByText('written like').nextSibling?.textContent).toBe('1 234.5');
    expect((screen.getByLabelText('Text that does not read as a number') as HTMLSelectElement).value).toBe('missing');
  });
});

describe('a column written with decimal commas', () => {
  it('reads "12,5" as twelve and a half when the column is written that way, even in a one-column file', () => {
    const cells = ['12,5', '3,25', '7', '1,5', '0,75', '10', '2,5', '4', '8,125', '6,5', '9', '11,5'];
    const comma = pipeline(utf8(`x\n${cells.join('\n')}\n`));
    const column = comma.recipe.columns[0] as ContinuousColumn;
    expect(column.format).toEqual({ decimal: ',', group: '' });
    expect(comma.csv.split('\r\n').slice(1, 4)).toEqual(['12.5', '3.25', '7']);
  });
});

describe('a shop export with prices and discounts written with their signs', () => {
  // An invented order list, saved by a spreadsheet in Windows-1252 (its "€" is the byte 0x80):
  // prices with a euro sign before them, decimal commas and point groups; discounts with "%" after.
  const ORDERS = [
    'order;price;discount',
    'A-101;€ 1.234,50;10%',
    'A-102;€ 19,99;0%',
    'A-103;€ 5;12,5 %',
    'A-104;-€ 4,50;',
    'A-105;€ 250,00;5%',
    'A-106;€ 99,90;NA',
    'A-107;€ 12,00;20%',
    'A-108;€ 7,25;15%',
    'A-109;€ 1.000;0%',
    'A-110;€ 30;5%',
    'A-111;€ 45,10;7,5%',
    'A-112;€ 2,00;10%',
  ].join('\r\n');
  const shop = pipeline(windows1252(`${ORDERS}\r\n`), 'orders.csv');
  const price = shop.recipe.columns[1] as ContinuousColumn;
  // Seven distinct discounts in twelve rows draft as an ordered scale; a person would take them as numbers.
  const recipe = decide(shop.recipe, { type: 'set-level', column: 'discount', level: 'continuous' }, shop.profiles);
  const discount = recipe.columns[2] as ContinuousColumn;
  const csv = new TextDecoder().decode(encodeToCsv(recipe, shop.read.table).bytes);

  it('reads the prices as continuous in their own format, sign and all, and says so', () => {
    expect(price.level).toBe('continuous');
    expect(price.format).toEqual({ decimal: ',', group: '.', symbol: { text: '€', side: 'before' } });
    expect(price.reason).toBe('12 of 12 values read as numbers written with "€" (100%), 12 distinct');
  });

  it('orders the few discounts by their numbers, "%" and decimal comma read', () => {
    const drafted = shop.recipe.columns[2]!;
    expect(drafted.level).toBe('ordinal');
    expect(drafted.reason).toBe('7 distinct numbers from 0 to 20: read as an ordered scale');
    expect(drafted.level === 'ordinal' && drafted.levels.map((l) => l.value)).toEqual(['0%', '5%', '7,5%', '10%', '12,5 %', '15%', '20%']);
    expect(discount.format).toEqual({ decimal: ',', group: '', symbol: { text: '%', side: 'after' } });
  });

  it('fits on the amounts as written: prices sum to 2,701.24 with the refund, discounts to 85 (percent points)', () => {
    // 1234.5 + 19.99 + 5 − 4.5 + 250 + 99.9 + 12 + 7.25 + 1000 + 30 + 45.1 + 2 = 2,701.24 over 12 prices.
    expect(price.fitted.count).toBe(12);
    expect(price.fitted.mean).toBeCloseTo(2701.24 / 12, 10);
    expect(price.fitted.min).toBe(-4.5);
    expect(price.fitted.max).toBe(1234.5);
    // 10 + 0 + 12.5 + 5 + 20 + 15 + 0 + 5 + 7.5 + 10 = 85 over 10 discounts ("" and "NA" are missing).
    expect(discount.fitted.count).toBe(10);
    expect(discount.fitted.mean).toBe(8.5);
  });

  it('writes the numbers, not the signs; a missing discount is filled with the mean and flagged', () => {
    const out = csv.split('\r\n');
    expect(out[0]).toBe('order,price,discount,discount (missing)');
    expect(out[1]).toBe('A-101,1234.5,10,0');
    expect(out[3]).toBe('A-103,5,12.5,0');
    expect(out[4]).toBe('A-104,-4.5,8.5,1');
    expect(out[12]).toBe('A-112,2,10,0');
    expect(shop.report.rowsWritten).toBe(12);
  });

  it('a price in another spelling ("EUR 5") is a cell that does not read, reported with its line', () => {
    const bytes = windows1252(`${ORDERS}\r\nA-113;EUR 5;0%\r\n`);
    const { report } = encodeToCsv(recipe, readTable(bytes).table);
    expect(report.columns.find((c) => c.name === 'price')?.invalid).toEqual([{ value: 'EUR 5', count: 1, lines: [14] }]);
  });

  it('the page shows how the numbers are written, sign and all', () => {
    render(<ContinuousOptions profile={shop.profiles[1]!} column={price} onDecide={() => undefined} />);
    expect(screen.getByText('written like').nextSibling?.textContent).toBe('€1.234,5');
  });
});

describe('a ledger export with negatives in parentheses', () => {
  // An invented ledger: amounts with comma groups, credits in parentheses as accounts write them.
  const cells = ['1,250.00', '(300.00)', '75.50', '(1,000.00)', '420.00', '(12.25)', '980.00', '15.00', '(60.00)', '2,400.00', '310.75', '(5.00)'];
  const ledger = pipeline(utf8(`entry,amount\n${cells.map((c, i) => `E${i + 1},"${c}"`).join('\n')}\n`), 'ledger.csv');
  const amount = ledger.recipe.columns[1] as ContinuousColumn;

  it('reads them as negative numbers, in a format that says so', () => {
    expect(amount.level).toBe('continuous');
    expect(amount.format).toEqual({ decimal: '.', group: ',', negative: 'parentheses' });
    // 1250 − 300 + 75.5 − 1000 + 420 − 12.25 + 980 + 15 − 60 + 2400 + 310.75 − 5 = 4,074 over 12 entries.
    expect(amount.fitted.count).toBe(12);
    expect(amount.fitted.mean).toBeCloseTo(4074 / 12, 10);
    expect(amount.fitted.min).toBe(-1000);
    expect(ledger.csv.split('\r\n').slice(1, 3)).toEqual(['E1,1250', 'E2,-300']);
  });
});
