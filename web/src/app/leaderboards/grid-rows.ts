/** The grid rows of a board page, with the best value per comparison row marked as the exports mark it. */
import { bestCells } from '@shared/exports-table';
import type { LeaderboardPage, LeaderboardRow, LeaderboardView } from '@shared/leaderboards';
import type { GridRow } from './leaderboard-columns';

/**
 * Grid rows of a page. Comparison rows get the columns holding the row's best value (the rule of
 * the exports' bold, shared/exports-table.ts bestCells) and the columns whose plan collides at
 * nominal times, which are never best unless the view asks for all plans.
 */
export function gridRows(page: LeaderboardPage, view: LeaderboardView): GridRow[] {
  // A row without a plan (time limit, memory, error, infeasible) gets no result id, so no Replay link.
  if (view.layout !== 'compare') {
    return page.rows.map((r) => ({
      ...r.cells, __id: r.id, __resultId: r.hasPlan === false ? undefined : r.resultId, ...(r.fieldRuns ? { __fieldRuns: r.fieldRuns } : {}),
      ...(r.model !== undefined ? { __history: historyQuery(r) } : {}),
    }) as GridRow);
  }
  const colliding = page.rows.map((r) => Object.entries(r.isExecutableAtNominalByColumn ?? {}).filter(([, ok]) => ok === false).map(([id]) => id));
  const best = bestCells({
    caption: '', columns: page.columns, rows: page.rows.map((r) => page.columns.map((c) => r.cells[c.id] ?? null)),
    compareColumns: page.columns.filter((c) => c.id.startsWith('m_')).map((c) => c.id),
    notExecutable: colliding, bestAmong: view.bestAmong,
  });
  return page.rows.map((r, i) => ({
    ...r.cells, __id: r.id,
    __best: [...best[i]].map((j) => page.columns[j].id).join(','),
    __colliding: colliding[i].join(','),
    ...intervalFields(r.intervalsByColumn),
  }) as GridRow);
}

/**
 * The 95 % interval of each model cell as `<column>__lo` / `<column>__hi` (null: not stored), and
 * `__intervals` = 'yes' when the row's figure carries intervals at all (issue 12, item 5).
 */
function intervalFields(intervals: LeaderboardRow['intervalsByColumn']): Record<string, string | number | null> {
  if (!intervals) return {};
  const out: Record<string, string | number | null> = { __intervals: 'yes' };
  for (const [id, ci] of Object.entries(intervals)) {
    out[`${id}__lo`] = ci ? ci[0] : null;
    out[`${id}__hi`] = ci ? ci[1] : null;
  }
  return out;
}

/** The query string of an entries row's history page (GET /api/history takes the same parameters). */
export function historyQuery(r: LeaderboardRow): string {
  return new URLSearchParams({ scenarioId: String(r.scenarioId), agents: String(r.agents), model: r.model ?? '', variant: r.variant ?? '', profile: r.profileHash }).toString();
}
