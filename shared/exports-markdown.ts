/** Markdown export: a pipe table (GitHub Flavored Markdown), every cell and the caption escaped, best values in bold. */
import { foldControlCharacters } from './control-characters';
import { bestCells, COLLISION_MARK, displayWithInterval, headerOf, isCollidingCell, type ExportTable } from './exports-table';

/**
 * What each markup character is written as. Backslash escapes (CommonMark 0.31, §2.4: any ASCII
 * punctuation may be escaped) for the escape itself, code spans, emphasis, GFM strikethrough,
 * links and images, GFM table cell ends and headings; entities (§2.5) for raw HTML and entity
 * references, so they show as text.
 */
const MARKDOWN_ESCAPES: Readonly<Record<string, string>> = {
  ...Object.fromEntries([...'\\`*_~[]|#'].map((c) => [c, `\\${c}`])),
  '<': '&lt;',
  '>': '&gt;',
  '&': '&amp;',
};

/**
 * One cell (or the caption) as literal text: control characters, CR and LF as spaces (a table
 * row is one line, and a line break could start a heading), then markup characters escaped in
 * one pass (so the `&` of an entity written here is never escaped again).
 */
export function markdownCell(text: string): string {
  return foldControlCharacters(text).replace(/[\\`*_~[\]|#<>&]/g, (c) => MARKDOWN_ESCAPES[c]);
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
      const text = markdownCell(displayWithInterval(table, i, j));
      const shown = best[i].has(j) ? `**${text}**` : text;
      return v !== null && isCollidingCell(table, i, table.columns[j].id) ? `${shown} ${COLLISION_MARK}` : shown;
    }))),
    '',
  ].join('\n');
}
