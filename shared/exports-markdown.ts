/** Markdown export: a pipe table (GitHub Flavored Markdown), every cell and the caption escaped, best values in bold. */
import { foldControlCharacters } from './control-characters';
import { provenanceLines } from './exports-provenance';
import { bestCells, COLLISION_MARK, displayWithInterval, headerOf, isCollidingCell, withShortProfiles, type ExportTable } from './exports-table';

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

/**
 * One line inside an HTML comment: control characters folded, and every "--" broken up (the
 * second hyphen as the entity &#45;, which a comment shows literally), so no name can close the
 * comment ("-->", "--!>") and turn the rest into markup (HTML Living Standard, "Comments": the
 * text must not contain "-->" or "--!>"; with no "--" at all none can occur).
 */
export function markdownCommentLine(text: string): string {
  return foldControlCharacters(text).replace(/--/g, '-&#45;');
}

/**
 * The table as Markdown: the provenance as an HTML comment (hidden when rendered), the caption as
 * a paragraph above the table and the caution of execution figures as a paragraph below it.
 * With mixed robot profiles the profile column shows only the parameters that differ.
 */
export function toMarkdown(exported: ExportTable): string {
  const table = withShortProfiles(exported);
  const best = bestCells(table);
  const line = (cells: readonly string[]) => `| ${cells.join(' | ')} |`;
  return [
    ...(table.provenance ? ['<!--', ...provenanceLines(table.provenance).map(markdownCommentLine), '-->', ''] : []),
    markdownCell(table.caption),
    '',
    line(table.columns.map((c) => markdownCell(headerOf(c)))),
    line(table.columns.map((c) => (c.kind === 'number' ? '---:' : ':---'))),
    ...table.rows.map((r, i) => line(r.map((v, j) => {
      const text = markdownCell(displayWithInterval(table, i, j));
      const shown = best[i].has(j) ? `**${text}**` : text;
      return v !== null && isCollidingCell(table, i, table.columns[j].id) ? `${shown} ${COLLISION_MARK}` : shown;
    }))),
    ...(table.caution ? ['', `*${markdownCell(table.caution)}*`] : []),
    '',
  ].join('\n');
}
