/**
 * The rows of a preview window as a small table of their own.
 *
 * Core's encodeBatch resolves every distinct value of a text column once per call: right for the
 * command line's batches, but a 60-row preview of a million-row file then resolved ~100,000
 * values (annual_kwh, monthly_bill_eur, supplier … in the benchmark file) each time a decision made
 * a new plan — 40–110 ms of the time between a click and the preview showing its result
 * (bench/README.md, "In the page"). Cut down to the window, a text column holds only the values
 * its rows use. Cell texts, numbers and lines are those of the whole table, row for row.
 */
import { valueText, type Column, type NumberColumn, type Table, type TextColumn } from '../core/columns.ts';

/** Rows [from, to) of `table` as a table whose row 0 is row `from`. */
export function windowTable(table: Table, from: number, to: number): Table {
  return {
    // The same header array: core matches plan columns to a table's by identity first.
    names: table.names,
    columns: table.columns.map((column) => windowColumn(column, from, to)),
    rowCount: to - from,
    lineOfRow: table.lineOfRow.subarray(from, to),
    // Structural problems are the whole file's business, not a window's.
    rowIssues: [],
    headerIssues: table.headerIssues,
  };
}

function windowColumn(column: Column, from: number, to: number): Column {
  switch (column.kind) {
    case 'text':
      return textWindow(column, from, to);
    case 'number':
      return numberWindow(column, from, to);
  }
}

/** The window's codes renumbered over the values they use, in order of first use. */
function textWindow(column: TextColumn, from: number, to: number): TextColumn {
  const codes = new Uint32Array(to - from);
  const values: string[] = [];
  const counts: number[] = [];
  const renumbered = new Map<number, number>();
  for (let row = from; row < to; row++) {
    const code = column.codes[row] ?? 0;
    let local = renumbered.get(code);
    if (local === undefined) {
      local = values.length;
      renumbered.set(code, local);
      values.push(valueText(column, code)); // only the window's values, even of a packed identifier
      counts.push(0);
    }
    counts[local]! += 1;
    codes[row - from] = local;
  }
  return { kind: 'text', name: column.name, length: to - from, codes, values, counts };
}

function numberWindow(column: NumberColumn, from: number, to: number): NumberColumn {
  const exceptions = new Map<number, string>();
  for (let row = from; row < to; row++) {
    const raw = column.exceptions.get(row);
    if (raw !== undefined) exceptions.set(row - from, raw);
  }
  const fixedDigits = column.fixedDigits === null ? null : column.fixedDigits.subarray(from, to);
  return { kind: 'number', name: column.name, length: to - from, values: column.values.subarray(from, to), exceptions, fixedDigits };
}
