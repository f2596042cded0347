/** CSV export (RFC 4180: CRLF line ends, fields with comma, quote or line break quoted, quotes doubled). */
import { headerOf, type ExportCell, type ExportTable } from './exports-table';

/** One field, quoted when RFC 4180 requires it. */
export function csvField(value: ExportCell): string {
  if (value === null) return '';
  const text = typeof value === 'number' ? String(value) : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The table as CSV: a header row of labels with units, then the rows; numbers at full precision. */
export function toCsv(table: ExportTable): string {
  const lines = [table.columns.map((c) => csvField(headerOf(c))), ...table.rows.map((r) => r.map(csvField))];
  return lines.map((l) => l.join(',')).join('\r\n') + '\r\n';
}
