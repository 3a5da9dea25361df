/**
 * Tables crossing to another thread (columns.ts crossingTable → structured cloning with the
 * buffers transferred → arrivedTable) arrive as they left: every cell, counts as an array again,
 * packed values still bytes until read.
 */
import { describe, expect, it } from 'vitest';
import { arrivedTable, cellText, crossingTable, tableBuffers, withPackedValues, type Table } from '../../src/core/columns.ts';

function sampleTable(): Table {
  const ids = ['HH-01', 'HH-02', 'HH-03'];
  const starts = Int32Array.from([0, 5, 10, 15]);
  const packed = withPackedValues(
    { kind: 'text', name: 'id', length: 3, codes: Uint32Array.from([0, 1, 2]), counts: [1, 1, 1] },
    { bytes: new TextEncoder().encode(ids.join('')), starts, ascending: true },
  );
  return {
    names: ['id', 'colour', 'kwh'],
    columns: [
      packed,
      { kind: 'text', name: 'colour', length: 3, codes: Uint32Array.from([0, 1, 0]), values: ['red', 'blue'], counts: [2, 1] },
      { kind: 'number', name: 'kwh', length: 3, values: Float64Array.from([1.5, NaN, 3]), exceptions: new Map([[1, 'NA']]), fixedDigits: null },
    ],
    rowCount: 3,
    lineOfRow: Uint32Array.from([2, 3, 4]),
    rowIssues: [],
    headerIssues: [],
  };
}

const cells = (table: Table) => table.columns.map((column) => [0, 1, 2].map((row) => cellText(column, row)));

describe('a table crossing to another thread', () => {
  it('arrives with the same cells and counts, its typed arrays (counts included) transferred, not copied', () => {
    const crossing = crossingTable(sampleTable());
    const transfer = tableBuffers(crossing);
    // Codes of both text columns, their counts (typed while crossing), the packed bytes and starts, the numbers, the lines.
    expect(transfer).toHaveLength(8);
    const arrived = arrivedTable(structuredClone(crossing, { transfer }));
    expect(cells(arrived)).toEqual([['HH-01', 'HH-02', 'HH-03'], ['red', 'blue', 'red'], ['1.5', 'NA', '3']]);
    for (const column of arrived.columns) if (column.kind === 'text') expect(Array.isArray(column.counts)).toBe(true);
    expect(arrived.columns.map((column) => (column.kind === 'text' ? column.counts : null))).toEqual([[1, 1, 1], [2, 1], null]);
    const id = arrived.columns[0]!;
    expect(id.kind === 'text' && id.packed?.ascending).toBe(true);
    // Sent, the buffers are gone from this side.
    expect(transfer.every((buffer) => buffer.byteLength === 0)).toBe(true);
  });
});
