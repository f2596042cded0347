/** Turns one page of a board view into the text of an export format. */
import { toCsv } from '@shared/exports-csv';
import { toJsonExport } from '@shared/exports-json';
import { toLatex } from '@shared/exports-latex';
import { toMarkdown } from '@shared/exports-markdown';
import type { ExportProvenance } from '@shared/exports-provenance';
import { PROFILE_COLUMN, type ExportFormat, type ExportTable } from '@shared/exports-table';
import { ENTRY_COLUMNS, type LeaderboardColumn, type LeaderboardPage, type LeaderboardView } from '@shared/leaderboards';
import { exportCaption, exportCaution } from './export-caption';

/** The columns that identify a row; an added robot profile column goes after the last of them shown. */
const KEY_COLUMNS = ['map', 'scenario', 'agents'];

/**
 * The export table of a page: exactly its columns, in order, and its rows. When the rows mix robot
 * profiles and the view shows no profile column, a Robot profile column is added after the
 * instance columns, so each row names its own (issue 14, item 8).
 */
export function exportTable(view: LeaderboardView, page: LeaderboardPage, provenance?: ExportProvenance): ExportTable {
  const notExecutable = page.rows.map((r) => Object.entries(r.isExecutableAtNominalByColumn ?? {}).filter(([, ok]) => ok === false).map(([id]) => id));
  const isMarked = notExecutable.some((ids, i) => ids.some((id) => page.rows[i].cells[id] !== null && page.rows[i].cells[id] !== undefined));
  const profileOf = (hash: string) => page.profiles[hash] ?? '';
  const isMixed = new Set(page.rows.map((r) => r.profileHash)).size > 1;
  let columns: readonly LeaderboardColumn[] = page.columns;
  let cellsOf = (r: LeaderboardPage['rows'][number]) => page.columns.map((c) => r.cells[c.id] ?? null);
  if (isMixed && !columns.some((c) => c.id === PROFILE_COLUMN)) {
    const at = Math.max(-1, ...KEY_COLUMNS.map((id) => columns.findIndex((c) => c.id === id))) + 1;
    const profile = ENTRY_COLUMNS.find((c) => c.id === PROFILE_COLUMN) as LeaderboardColumn;
    columns = [...columns.slice(0, at), profile, ...columns.slice(at)];
    const base = cellsOf;
    cellsOf = (r) => { const cells = base(r); return [...cells.slice(0, at), profileOf(r.profileHash), ...cells.slice(at)]; };
  }
  const caution = exportCaution(view);
  return {
    caption: exportCaption(view, page.rows.map((r) => profileOf(r.profileHash)), isMarked),
    columns,
    rows: page.rows.map(cellsOf),
    compareColumns: view.layout === 'compare' ? page.columns.filter((c) => c.id.startsWith('m_')).map((c) => c.id) : [],
    // Plans that collide at nominal times are marked, and never the bold best unless the view asks for all plans.
    notExecutable,
    bestAmong: view.bestAmong,
    // Comparison of an execution figure: each model value with its 95 % interval (issue 12, item 5).
    ...(view.layout === 'compare' && page.rows.some((r) => r.intervalsByColumn) ? { intervals: page.rows.map((r) => r.intervalsByColumn ?? {}) } : {}),
    ...(caution ? { caution } : {}),
    ...(provenance ? { provenance } : {}),
  };
}

/** The file text of `page` in `format`, with the provenance of its results when given. */
export function buildExport(format: ExportFormat, view: LeaderboardView, page: LeaderboardPage, provenance?: ExportProvenance): string {
  const table = exportTable(view, page, withBoundNote(view, provenance));
  switch (format) {
    case 'csv': return toCsv(table);
    case 'latex': return toLatex(table);
    case 'markdown': return toMarkdown(table);
    case 'json': return toJsonExport(table);
  }
}

/** Said in the provenance when a lower bound, gap or optimality is exported: that bound may come from another run. */
export const BOUND_SOURCE_NOTE = 'lower bound, gap and optimality use the largest lower bound proven by any sweep run of the same instance, plan model variant and robot profile, which may be a run other than the results listed here';

/** `provenance` with BOUND_SOURCE_NOTE when the view shows a lower bound, gap or optimality column. */
function withBoundNote(view: LeaderboardView, provenance: ExportProvenance | undefined): ExportProvenance | undefined {
  if (!provenance || view.layout !== 'entries' || !view.columns.some((id) => /^(lowerBound|gap$|optimality$)/.test(id))) return provenance;
  return { ...provenance, notes: [...(provenance.notes ?? []), BOUND_SOURCE_NOTE] };
}
