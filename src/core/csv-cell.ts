/**
 * One CSV cell as text: RFC 4180 quoting (RFC 4180 §2.6–2.7), and neutralising of text that a
 * spreadsheet would run as a formula (OWASP "CSV Injection"). Numbers are never touched: "-3" is
 * a number and stays one.
 */

/** OWASP "CSV Injection": =, +, -, @, tab and CR; and LF, so no cell opens with a line break before a formula (common practice). */
const FORMULA_START = /^[=+\-@\t\r\n]/;
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const NEEDS_QUOTES = /[",\r\n]/;

/** Text that starts like a formula gets a leading apostrophe, unless it is a plain number. */
export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) && !PLAIN_NUMBER.test(text) ? `'${text}` : text;
}

/** Quotes a cell when it holds a quote, comma, CR or LF; quotes inside are doubled. */
export function quoteCell(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A text cell ready for our CSV output. */
export function textCell(text: string): string {
  return quoteCell(neutraliseFormula(text));
}

/** Shortest text that reads back as the same double; -0 is written as 0. */
export function numberCell(value: number): string {
  return Object.is(value, -0) ? '0' : String(value);
}
