import { readFileSync } from 'node:fs';
import { ColumnBuilder } from '../../src/core/columns-builder.ts';
import { parseRecords } from '../../src/core/parse.ts';
const text = readFileSync('bench/data/household-1000000.csv', 'utf8').slice(0, 40_000_000);
const { records } = parseRecords(text);
const header = records[0]!;
const rows = records.slice(1, -1);
console.log('rows', rows.length);
for (let c = 0; c < header.length; c++) {
  const cells = rows.map((r) => r[c] ?? '');
  for (let rep = 0; rep < 2; rep++) {
    const b = new ColumnBuilder(header[c]!);
    const t0 = performance.now();
    for (const cell of cells) b.push(cell);
    const t1 = performance.now();
    const col = b.build();
    const m = new Map<string, number>();
    const t2 = performance.now();
    let k = 0;
    for (const cell of cells) { const v = m.get(cell); if (v === undefined) m.set(cell, k++); }
    const t3 = performance.now();
    if (rep === 1) console.log(header[c]!.padEnd(20), col.kind.padEnd(7), String(col.kind === 'text' ? col.values.length : col.exceptions.size).padStart(8), ((t1 - t0) * 1e6 / cells.length).toFixed(0).padStart(5), 'ns/cell builder', ((t3 - t2) * 1e6 / cells.length).toFixed(0).padStart(5), 'ns/cell bare Map');
  }
}
