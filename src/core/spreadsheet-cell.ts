/**
 * A spreadsheet cell as the text a CSV export would hold, so a sheet read from an XLSX workbook
 * goes through the same path as a CSV file. Dates become ISO 8601 (a date alone when the time is
 * midnight); booleans TRUE/FALSE as spreadsheets print them; non-finite numbers are empty.
 */
export function spreadsheetCellText(cell: unknown): string {
  if (cell === null || cell === undefined) return '';
  if (typeof cell === 'string') return cell;
  if (typeof cell === 'number') return Number.isFinite(cell) ? String(cell) : '';
  if (typeof cell === 'boolean') return cell ? 'TRUE' : 'FALSE';
  if (cell instanceof Date) {
    const iso = cell.toISOString();
    return iso.endsWith('T00:00:00.000Z') ? iso.slice(0, 10) : iso.replace('.000Z', 'Z');
  }
  return String(cell);
}
