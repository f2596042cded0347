/**
 * The model comparison report as Markdown or LaTeX: the provenance of its results as a header
 * comment (issue 14, item 9), title with set, robot profile and policy, the generated sentences,
 * the table (units in headers), the methods and the safety note. Text is escaped with the
 * leaderboard exports' escapers, so set names typeset literally.
 */
import { foldControlCharacters } from '@shared/control-characters';
import { latexEscape } from '@shared/exports-latex';
import { markdownCell, markdownCommentLine } from '@shared/exports-markdown';
import { provenanceLines, type ExportProvenance } from '@shared/exports-provenance';
import { REPORT_TABLE_HEADERS, reportTableRows, type ModelComparisonReport } from '@shared/reports';

const titleOf = (r: ModelComparisonReport): string =>
  `Plan model comparison: instance set "${r.set.name}", robot profile ${r.profile.label}, ${r.policy} execution`;

/** GitHub Flavored Markdown, with the provenance as an HTML comment when given. */
export function reportToMarkdown(r: ModelComparisonReport, provenance?: ExportProvenance): string {
  const line = (cells: readonly string[]) => `| ${cells.map(markdownCell).join(' | ')} |`;
  return [
    ...(provenance ? ['<!--', ...provenanceLines(provenance).map(markdownCommentLine), '-->', ''] : []),
    `## ${markdownCell(titleOf(r))}`,
    '',
    ...r.summary.flatMap((s) => [markdownCell(s), '']),
    line(REPORT_TABLE_HEADERS),
    line(REPORT_TABLE_HEADERS.map((_, i) => (i === 0 ? ':---' : '---:'))),
    ...reportTableRows(r).map(line),
    '',
    'Methods:',
    '',
    ...r.methods.map((m) => `- ${markdownCell(m)}`),
    '',
    `**${markdownCell(r.safetyNote)}**`,
    '',
  ].join('\n');
}

/** A LaTeX fragment: provenance `%` lines when given, a subsection, the sentences, a booktabs table (needs \usepackage{booktabs}), the methods and the note. */
export function reportToLatex(r: ModelComparisonReport, provenance?: ExportProvenance): string {
  const row = (cells: readonly string[]) => `${cells.map(latexEscape).join(' & ')} \\\\`;
  return [
    '% Exported from Quarterturn; needs \\usepackage{booktabs}.',
    ...(provenance ? provenanceLines(provenance).map((l) => `% ${foldControlCharacters(l)}`) : []),
    `\\subsection*{${latexEscape(titleOf(r))}}`,
    '',
    ...r.summary.flatMap((s) => [latexEscape(s), '']),
    '\\begin{table}[htbp]',
    '\\centering\\small',
    `\\caption{${latexEscape(titleOf(r))}}`,
    `\\begin{tabular}{l${'r'.repeat(REPORT_TABLE_HEADERS.length - 1)}}`,
    '\\toprule',
    row(REPORT_TABLE_HEADERS),
    '\\midrule',
    ...reportTableRows(r).map(row),
    '\\bottomrule',
    '\\end{tabular}',
    '\\end{table}',
    '',
    '\\begin{itemize}',
    ...r.methods.map((m) => `\\item ${latexEscape(m)}`),
    '\\end{itemize}',
    '',
    `\\textbf{${latexEscape(r.safetyNote)}}`,
    '',
  ].join('\n');
}
