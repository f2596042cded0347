/**
 * LaTeX export: a booktabs table (\toprule, \midrule, \bottomrule) that fits the text width (see
 * toLatex for the layout), with the best value per row among the plan model columns in \textbf{}. Every text cell and
 * the caption are escaped, so names such as "room_32 %5 & #2" or "\input{x}" typeset literally.
 */
import { foldControlCharacters } from './control-characters';
import { provenanceLines } from './exports-provenance';
import { bestCells, displayWithInterval, isCollidingCell, withShortProfiles, type ExportTable } from './exports-table';

const LATEX_SPECIALS: Readonly<Record<string, string>> = {
  '\\': '\\textbackslash{}',
  '_': '\\_',
  '%': '\\%',
  '&': '\\&',
  '#': '\\#',
  '$': '\\$',
  '{': '\\{',
  '}': '\\}',
  '~': '\\textasciitilde{}',
  '^': '\\textasciicircum{}',
  // Not special, but `\\` at a row end reads a following `*` or `[` as its own (star form, space
  // argument), so a cell starting with one would lose it or fail (common practice: brace them).
  '[': '{[}',
  ']': '{]}',
  '*': '{*}',
  // Math signs of the interval method texts (CI95_METHOD) that pdflatex's utf8 input encoding
  // does not know ("Unicode character − (U+2212) not set up for use with LaTeX"; checked with
  // pdflatex, TeX Live): written as math. ±, ·, ×, ÷, † and – it knows.
  '−': '$-$',
  '√': '$\\surd$',
  '≥': '$\\geq$',
  '≤': '$\\leq$',
  '≈': '$\\approx$',
  '≠': '$\\neq$',
};

/**
 * Escapes LaTeX's ten special characters (LaTeX2e unofficial reference manual, "Reserved
 * characters": # $ % & ~ _ ^ \ { }), brackets, stars and the math signs above in one pass (so the braces a
 * replacement adds are never escaped again), after folding control characters and line breaks
 * to spaces: a blank line would end a \caption{} or a table cell with "Paragraph ended before …
 * was complete".
 */
export function latexEscape(text: string): string {
  return foldControlCharacters(text).replace(/[\\_%&#${}~^[\]*−√≥≤≈≠]/g, (c) => LATEX_SPECIALS[c]);
}

/**
 * Most cells (rows × columns) of a LaTeX export. A longtable's rows are measured in one box
 * before they are set, so the whole table is in pdflatex's memory once; with TeX Live's default
 * main memory (5,000,000 words) 2,000 rows × 21 board columns compiled and 4,000 × 21 did not
 * (measured with TeX Live 2022); this limit keeps a margin for long names.
 */
export const MAX_LATEX_CELLS = 30_000;

/** Above this many rows a table is a `longtable` (breaks across pages, header repeated); up to it a `table` float. */
export const LONG_TABLE_ROWS = 30;

/** Characters per header line before a header wraps (common practice for narrow figure columns). */
const HEADER_LINE_CHARS = 10;

/**
 * A header cell: the label with its unit, wrapped at spaces into lines of about HEADER_LINE_CHARS
 * characters (a "95 %" stays together) and stacked in a nested tabular (plain LaTeX, no package),
 * so long labels do not set the width of a column of short numbers.
 */
export function latexHeader(label: string, unit: string | undefined, isNumber: boolean): string {
  // A hyphenated word longer than a line ("Sum-of-costs", "Turn-inclusive") may break after a hyphen.
  const words = label.replace(/(\d) %/g, '$1\u00a0%').split(' ').flatMap((w) => (w.length > HEADER_LINE_CHARS - 4 && w.includes('-') ? w.split(/(?<=-)/) : [w]));
  if (unit) words.push(`(${unit})`);
  const lines: string[] = [];
  for (const word of words) {
    const last = lines.length - 1;
    const glue = last >= 0 && lines[last].endsWith('-') ? '' : ' ';
    if (last >= 0 && lines[last].length + glue.length + word.length <= HEADER_LINE_CHARS) lines[last] += `${glue}${word}`;
    else lines.push(word);
  }
  const escaped = lines.map((l) => latexEscape(l.replace(/\u00a0/g, ' ')));
  if (escaped.length === 1) return escaped[0];
  return `\\begin{tabular}[b]{@{}${isNumber ? 'r' : 'l'}@{}}${escaped.join('\\\\')}\\end{tabular}`;
}

/** A `%` comment line: after the `%` TeX ignores the rest of the line, so only line breaks need folding. */
const comment = (text: string): string => `% ${foldControlCharacters(text)}`;

/**
 * A log line with the table's natural width and the line width, so an author (and the export
 * tests) can see how far a wide table was scaled down: scale = line width ÷ natural width.
 */
const TYPEOUT_WIDTHS = '\\typeout{Quarterturn table: natural width \\the\\wd\\QTTable, line width \\the\\linewidth}%';

/**
 * The table as LaTeX that fits the text width (issue 14, item 8). Needs booktabs, graphicx and,
 * over LONG_TABLE_ROWS rows, longtable and array (all in TeX Live's latex-base and
 * latex-recommended collections); the first line says so.
 *
 * Layout, and why: the cells keep their natural width (a figure column is never squeezed into a
 * fixed width that could break a number, and a name is never cut) and header labels wrap onto
 * stacked lines. The table is then measured by TeX itself, which knows the fonts of the paper:
 * - up to LONG_TABLE_ROWS rows: a `table` float whose tabular is scaled down to \linewidth with
 *   \resizebox only when it is wider (a narrow table keeps the paper's font size);
 * - longer: a `longtable` (header repeated on every page, caption inside). A longtable cannot
 *   be boxed and scaled, so its rows are kept once in a macro, measured in a box, and when wider
 *   than \linewidth each cell and the column gaps are scaled by the same factor (array's >{}/<{}
 *   collect a cell, \scalebox scales it): the columns then add up to just under \linewidth.
 * A tabular* or tabularx layout was not chosen: it spreads or wraps columns but cannot shrink a
 * row of numbers wider than the page, which is exactly the case of a fifteen-column board.
 * Very wide tables end up small; choosing fewer columns on the board gives a larger font. In a
 * two-column paper the table float fits the column (\linewidth); longtable itself works in
 * one-column mode only, so a long table goes in a one-column part (or export fewer rows).
 *
 * The caution of execution figures and the provenance are `%` comment lines, not caption text.
 * With mixed robot profiles the profile column shows only the parameters that differ.
 */
export function toLatex(exported: ExportTable): string {
  const table = withShortProfiles(exported);
  const best = bestCells(table);
  const isLong = table.rows.length > LONG_TABLE_ROWS;
  const align = table.columns.map((c) => (c.kind === 'number' ? 'r' : 'l'));
  const row = (cells: readonly string[]) => `${cells.join(' & ')} \\\\`;
  const head = row(table.columns.map((c) => latexHeader(c.label, c.unit, c.kind === 'number')));
  const body = table.rows.map((r, i) => row(r.map((v, j) => {
    const text = latexEscape(displayWithInterval(table, i, j));
    const shown = best[i].has(j) ? `\\textbf{${text}}` : text;
    // The dagger of the caption: this plan collides at nominal times.
    return v !== null && isCollidingCell(table, i, table.columns[j].id) ? `${shown}\\textsuperscript{\\dag}` : shown;
  })));
  const packages = isLong ? 'booktabs,longtable,array,graphicx' : 'booktabs,graphicx';
  const preface = [
    `% Exported from Quarterturn; needs \\usepackage{${packages}} in the preamble.`,
    ...(table.caution ? [comment(`Caution: ${table.caution}`)] : []),
    ...(table.provenance ? provenanceLines(table.provenance).map(comment) : []),
  ];
  const caption = `\\caption{${latexEscape(table.caption)}}`;
  const allocate = '\\ifdefined\\QTTable\\else\\newsavebox\\QTTable\\newsavebox\\QTCell\\fi';
  if (!isLong) {
    return [
      ...preface,
      '\\begin{table}[htbp]',
      '\\centering',
      caption,
      '\\small',
      '\\setlength\\tabcolsep{4pt}%',
      '% Natural width; scaled down to \\linewidth only when wider.',
      allocate,
      '\\sbox\\QTTable{%',
      `\\begin{tabular}{${align.join('')}}`,
      '\\toprule',
      head,
      '\\midrule',
      ...body,
      '\\bottomrule',
      '\\end{tabular}}%',
      TYPEOUT_WIDTHS,
      '\\ifdim\\wd\\QTTable>\\linewidth\\resizebox{\\linewidth}{!}{\\usebox\\QTTable}\\else\\usebox\\QTTable\\fi',
      '\\end{table}',
      '',
    ].join('\n');
  }
  return [
    ...preface,
    `% ${table.rows.length} rows: a longtable over several pages, header repeated. The rows are kept once in \\QTRows,`,
    '% measured, and when wider than \\linewidth every cell and column gap is scaled by one factor.',
    '\\begingroup',
    '\\small',
    '\\setlength\\tabcolsep{4pt}%',
    allocate,
    '\\newcommand\\QTHead{%',
    head,
    '}',
    '\\newcommand\\QTRows{%',
    ...body,
    '}',
    `\\sbox\\QTTable{\\begin{tabular}{${align.join('')}}\\QTHead\\QTRows\\end{tabular}}%`,
    TYPEOUT_WIDTHS,
    '\\ifdim\\wd\\QTTable>\\linewidth',
    '  \\edef\\QTScale{\\csname strip@pt\\endcsname\\dimexpr\\linewidth*65000/\\wd\\QTTable\\relax}%',
    '\\else',
    '  \\def\\QTScale{1}%',
    '\\fi',
    '\\sbox\\QTTable{}%',
    '\\setlength\\tabcolsep{\\QTScale\\tabcolsep}%',
    '\\renewcommand\\arraystretch{\\QTScale}%',
    '\\setlength\\LTcapwidth{\\linewidth}%',
    '\\newcommand\\QTCellStart{\\begin{lrbox}{\\QTCell}}%',
    '\\newcommand\\QTCellEnd{\\end{lrbox}\\scalebox{\\QTScale}{\\usebox\\QTCell}}%',
    `\\begin{longtable}{${align.map((a) => `>{\\QTCellStart}${a}<{\\QTCellEnd}`).join('')}}`,
    `${caption}\\\\`,
    '\\toprule',
    '\\QTHead',
    '\\midrule',
    '\\endfirsthead',
    '\\toprule',
    '\\QTHead',
    '\\midrule',
    '\\endhead',
    '\\bottomrule',
    '\\endlastfoot',
    '\\QTRows',
    '\\end{longtable}',
    '\\endgroup',
    '',
  ].join('\n');
}
