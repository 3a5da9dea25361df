/** The open file in one line: its name, size and shape, how it was read; the demo is marked invented. */
import type { OpenedTable } from '../../worker/protocol.ts';
import { delimiterWords, formatBytes, formatCount } from './format.ts';

export interface FileSummaryProps {
  readonly table: OpenedTable | null;
  readonly isDemo: boolean;
  readonly demoNote: string;
  onSheet(sheet: string): void;
}

export function FileSummary({ table, isDemo, demoNote, onSheet }: FileSummaryProps) {
  if (table === null) {
    return (
      <div className="file-summary">
        <span className="file-name muted">No file open</span>
        <span className="file-meta">Drop a CSV, TSV or XLSX file anywhere on the page.</span>
      </div>
    );
  }
  const { format } = table;
  const how =
    format.kind === 'text'
      ? `${delimiterWords(format.delimiter)}, ${format.encoding.toUpperCase()}${format.compressed === 'gzip' ? ', gzip-compressed' : ''}`
      : `sheet “${format.sheet}”`;
  return (
    <div className="file-summary" data-testid="file-summary" data-scanner={format.kind === 'text' ? format.scanner : undefined}>
      <span className="file-name" title={table.fileName}>
        {isDemo ? (
          <span className="badge badge-invented" title={demoNote}>
            Invented demo
          </span>
        ) : null}
        {table.fileName}
      </span>
      <span className="file-meta">
        {formatCount(table.rowCount)} rows · {formatCount(table.names.length)} columns · {how}
        {table.byteSize > 0 ? ` · ${formatBytes(table.byteSize)}` : ''}
        {isDemo ? <span className="visually-hidden">. {demoNote}</span> : null}
      </span>
      {format.kind === 'sheet' && format.sheets.length > 1 ? (
        <label className="sheet-picker">
          <span>Sheet</span>
          <select value={format.sheet} onChange={(e) => onSheet(e.target.value)}>
            {format.sheets.map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
      ) : null}
    </div>
  );
}
