/** Turns one page of a board view into the text of an export format. */
import { toCsv } from '@shared/exports-csv';
import { toJsonExport } from '@shared/exports-json';
import { toLatex } from '@shared/exports-latex';
import { toMarkdown } from '@shared/exports-markdown';
import type { ExportFormat, ExportTable } from '@shared/exports-table';
import type { LeaderboardPage, LeaderboardView } from '@shared/leaderboards';
import { exportCaption } from './export-caption';

/** The export table of a page: exactly its columns, in order, and its rows. */
export function exportTable(view: LeaderboardView, page: LeaderboardPage): ExportTable {
  const notExecutable = page.rows.map((r) => Object.entries(r.isExecutableAtNominalByColumn ?? {}).filter(([, ok]) => ok === false).map(([id]) => id));
  const isMarked = notExecutable.some((ids, i) => ids.some((id) => page.rows[i].cells[id] !== null && page.rows[i].cells[id] !== undefined));
  return {
    caption: exportCaption(view, page.rows.map((r) => page.profiles[r.profileHash] ?? ''), isMarked),
    columns: page.columns,
    rows: page.rows.map((r) => page.columns.map((c) => r.cells[c.id] ?? null)),
    compareColumns: view.layout === 'compare' ? page.columns.filter((c) => c.id.startsWith('m_')).map((c) => c.id) : [],
    // Plans that collide at nominal times are marked, and never the bold best unless the view asks for all plans.
    notExecutable,
    bestAmong: view.bestAmong,
    // Comparison of an execution figure: each model value with its 95 % interval (issue 12, item 5).
    ...(view.layout === 'compare' && page.rows.some((r) => r.intervalsByColumn) ? { intervals: page.rows.map((r) => r.intervalsByColumn ?? {}) } : {}),
  };
}

/** The file text of `page` in `format`. */
export function buildExport(format: ExportFormat, view: LeaderboardView, page: LeaderboardPage): string {
  const table = exportTable(view, page);
  switch (format) {
    case 'csv': return toCsv(table);
    case 'latex': return toLatex(table);
    case 'markdown': return toMarkdown(table);
    case 'json': return toJsonExport(table);
  }
}
