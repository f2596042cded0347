/**
 * CSV export (RFC 4180: CRLF line ends, fields with comma, quote or line break quoted, quotes
 * doubled), with text cells neutralised against formula injection.
 */
import type { ColumnKind } from './leaderboards';
import { headerOf, withIntervalColumns, type ExportCell, type ExportTable } from './exports-table';

/**
 * First characters that make a spreadsheet read a cell as a formula. Source: OWASP, "CSV
 * Injection" (https://owasp.org/www-community/attacks/CSV_Injection): = + - @ tab and carriage return.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

/** A plain decimal number as a number column may carry it in text (e.g. "-12.5"). */
const NUMBER_TEXT = /^-?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * One field, quoted when RFC 4180 requires it. Numbers, and number-like text in a number column,
 * are written as they are; any other text starting with a formula character gets a leading
 * single quote (OWASP, as above) so a spreadsheet shows it as text.
 */
export function csvField(value: ExportCell, kind: ColumnKind = 'text'): string {
  if (value === null) return '';
  let text = typeof value === 'number' ? String(value) : value;
  const isNumber = typeof value === 'number' || (kind === 'number' && NUMBER_TEXT.test(text));
  if (!isNumber && FORMULA_START.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The table as CSV: a header row of labels with units, then the rows; numbers at full precision; intervals in their own low / high columns. */
export function toCsv(exported: ExportTable): string {
  const table = withIntervalColumns(exported);
  const lines = [
    table.columns.map((c) => csvField(headerOf(c))),
    ...table.rows.map((r) => r.map((v, i) => csvField(v, table.columns[i]?.kind))),
  ];
  return lines.map((l) => l.join(',')).join('\r\n') + '\r\n';
}
