/**
 * GET /api/exports?format=csv|latex|markdown|json&<view>: the rows and columns of a board view
 * (same parameters as GET /api/leaderboards/rows) as a downloadable file. Without start/end the
 * whole view is exported, up to MAX_EXPORT_ROWS rows (LaTeX: up to MAX_LATEX_CELLS cells). Every
 * file carries the provenance of its results (issue 14, item 9).
 */
import { Router } from 'express';
import { EXPORT_FORMATS, type ExportFormat } from '@shared/exports-table';
import { AppError } from '../errors/app-error';
import { attachmentDisposition } from '../http/content-disposition';
import type { LeaderboardsService } from '../leaderboards/leaderboards.service';
import { flatQuery, scopeOf, viewOf, windowOf } from '../leaderboards/view-request';
import { MAX_LATEX_CELLS } from '@shared/exports-latex';
import { buildExport, exportTable } from './build-export';
import { withPaperColumns } from './paper-columns';
import { exportedResults, type ProvenanceReader } from './export-provenance';

/** Largest export in rows. */
export const MAX_EXPORT_ROWS = 10_000;

const FILE_TYPES: Record<ExportFormat, { readonly ext: string; readonly type: string }> = {
  csv: { ext: 'csv', type: 'text/csv; charset=utf-8' },
  latex: { ext: 'tex', type: 'application/x-tex; charset=utf-8' },
  markdown: { ext: 'md', type: 'text/markdown; charset=utf-8' },
  json: { ext: 'json', type: 'application/json; charset=utf-8' },
};

/** Export routes over the leaderboard service. */
export function exportsRouter(boards: LeaderboardsService, provenanceOf: ProvenanceReader): Router {
  const r = Router();
  r.get('/', async (req, res) => {
    const params = flatQuery(req.query);
    const format = (params['format'] ?? '') as ExportFormat;
    if (!EXPORT_FORMATS.includes(format)) {
      throw new AppError('VALIDATION_FAILED', 400, `Query parameter "format" must be one of ${EXPORT_FORMATS.join(', ')}`, [{ param: 'format' }]);
    }
    // LaTeX of the default board columns gets the paper columns (paper-columns.ts); a chosen set is kept.
    const view = withPaperColumns(viewOf(params), format, params['latexColumns'] === 'shown');
    const hasWindow = params['start'] !== undefined || params['end'] !== undefined;
    const window = hasWindow ? windowOf(params, MAX_EXPORT_ROWS) : { start: 0, end: MAX_EXPORT_ROWS };
    const page = await boards.page(view, req.user ?? null, scopeOf(params), window);
    if (!hasWindow && page.rowCount > MAX_EXPORT_ROWS) {
      throw new AppError('VALIDATION_FAILED', 400, `This view has ${page.rowCount} rows; exports hold at most ${MAX_EXPORT_ROWS}. Narrow it with a filter or pass start and end.`, [{ param: 'format' }]);
    }
    // The columns as written: exportTable adds a Robot profile column when the rows mix profiles.
    const columnCount = exportTable(view, page).columns.length;
    const cells = page.rows.length * columnCount;
    if (format === 'latex' && cells > MAX_LATEX_CELLS) {
      throw new AppError('VALIDATION_FAILED', 400, `This LaTeX table would hold ${cells} cells (${page.rows.length} rows × ${columnCount} columns); LaTeX exports hold at most ${MAX_LATEX_CELLS}, so that pdflatex compiles them within its default memory. Choose fewer columns, narrow the rows with a filter or start and end, or export CSV.`, [{ param: 'format' }]);
    }
    // Only the exported results are looked up, after the page: the board itself never pays for it.
    const provenance = await provenanceOf(exportedResults(view, page));
    const file = FILE_TYPES[format];
    res.setHeader('content-type', file.type);
    res.setHeader('content-disposition', attachmentDisposition(`quarterturn-leaderboard.${file.ext}`));
    res.send(buildExport(format, view, page, provenance));
  });
  return r;
}
