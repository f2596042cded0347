/** Markdown export: a pipe table (GitHub Flavored Markdown), pipes and backslashes in cells escaped, best values in bold. */
import { bestCells, displayCell, headerOf, type ExportTable } from './exports-table';

/** One cell: `|` and `\` escaped with a backslash, line breaks as spaces (a table row is one line). */
export function markdownCell(text: string): string {
  return text.replace(/\\/g, '\\\\').replace(/\|/g, '\\|').replace(/\*/g, '\\*').replace(/\r?\n/g, ' ');
}

/** The table as Markdown, with the caption as a paragraph above it. */
export function toMarkdown(table: ExportTable): string {
  const best = bestCells(table);
  const line = (cells: readonly string[]) => `| ${cells.join(' | ')} |`;
  return [
    markdownCell(table.caption),
    '',
    line(table.columns.map((c) => markdownCell(headerOf(c)))),
    line(table.columns.map((c) => (c.kind === 'number' ? '---:' : ':---'))),
    ...table.rows.map((r, i) => line(r.map((v, j) => {
      const text = markdownCell(displayCell(v, table.columns[j]));
      return best[i].has(j) ? `**${text}**` : text;
    }))),
    '',
  ].join('\n');
}
