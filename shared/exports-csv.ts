/**
 * CSV export (RFC 4180: CRLF line ends, fields with comma, quote or line break quoted, quotes
 * doubled), with text cells neutralised against formula injection.
 */
import type { ColumnKind } from './leaderboards';
import { foldControlCharacters } from './control-characters';
import { provenanceLines } from './exports-provenance';
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
  // Quoted also at a semicolon: spreadsheets in locales that list with semicolons split there.
  return /[",;\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * A `#` comment line (not part of RFC 4180; readers skip it when told, e.g. pandas
 * `read_csv(comment='#')`, R `read.csv(comment.char = '#')`). Line breaks and control characters
 * are folded to spaces, so a name cannot end the line early. A spreadsheet that opens the file
 * splits the line at commas (at semicolons where the locale lists with them), so a piece starting
 * with a formula character or a quote gets a leading single quote, as cells do (OWASP, as above).
 */
export function csvComment(text: string): string {
  return `# ${foldControlCharacters(text)}`.replace(/[,;\t](?=[=+\-@"])/g, "$&'");
}

/**
 * The table as CSV: `#` comment lines first (provenance, caption, caution), then a header row of
 * labels with units and the rows; numbers at full precision; intervals in their own low / high columns.
 */
export function toCsv(exported: ExportTable): string {
  const table = withIntervalColumns(exported);
  const comments = [
    ...(table.provenance ? provenanceLines(table.provenance) : []),
    ...(table.caption ? [`caption: ${table.caption}`] : []),
    ...(table.caution ? [`caution: ${table.caution}`] : []),
  ].map(csvComment);
  const lines = [
    ...comments.map((c) => [c]),
    table.columns.map((c) => csvField(headerOf(c))),
    ...table.rows.map((r) => r.map((v, i) => csvField(v, table.columns[i]?.kind))),
  ];
  return lines.map((l) => l.join(',')).join('\r\n') + '\r\n';
}
