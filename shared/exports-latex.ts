/**
 * LaTeX export: a booktabs table (\toprule, \midrule, \bottomrule; needs \usepackage{booktabs})
 * with the best value per row among the plan model columns in \textbf{}. Every text cell and
 * the caption are escaped, so names such as "room_32 %5 & #2" or "\input{x}" typeset literally.
 */
import { foldControlCharacters } from './control-characters';
import { bestCells, displayWithInterval, headerOf, isCollidingCell, type ExportTable } from './exports-table';

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

/** The table as a LaTeX `table` float with a booktabs `tabular`. */
export function toLatex(table: ExportTable): string {
  const best = bestCells(table);
  const align = table.columns.map((c) => (c.kind === 'number' ? 'r' : 'l')).join('');
  const row = (cells: readonly string[]) => `${cells.join(' & ')} \\\\`;
  const body = table.rows.map((r, i) => row(r.map((v, j) => {
    const text = latexEscape(displayWithInterval(table, i, j));
    const shown = best[i].has(j) ? `\\textbf{${text}}` : text;
    // The dagger of the caption: this plan collides at nominal times.
    return v !== null && isCollidingCell(table, i, table.columns[j].id) ? `${shown}\\textsuperscript{\\dag}` : shown;
  })));
  return [
    '% Exported from Quarterturn; needs \\usepackage{booktabs}.',
    '\\begin{table}[htbp]',
    '\\centering',
    `\\caption{${latexEscape(table.caption)}}`,
    `\\begin{tabular}{${align}}`,
    '\\toprule',
    row(table.columns.map((c) => latexEscape(headerOf(c)))),
    '\\midrule',
    ...body,
    '\\bottomrule',
    '\\end{tabular}',
    '\\end{table}',
    '',
  ].join('\n');
}
