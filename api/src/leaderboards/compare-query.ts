/**
 * The comparison layout ("models side by side"): `leaderboard_compare` holds one row per instance
 * and robot profile with a column per plan model and figure (migration 0402); k-robust at another
 * k joins that variant's entry.
 */
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { modelColumnId, type LeaderboardView } from '@shared/leaderboards';
import type { Viewer } from '../instance-sets/instance-set-access';
import { COMPARE_TABLE_K, compareColumn, figureColumn, intervalSource } from './entry-sql';
import { baseWhere, fewValuesFilter, filterCondition, whereSql, type RowWindow, type SqlQuery, type ViewScope } from './view-sql';

/** SQL of a comparison column on `c` (leaderboard_compare), or `x` (the k-robust entry) for another k. */
function compareSql(view: LeaderboardView, column: string): string {
  const keySql: Record<string, string> = { map: 'c.map_name', scenario: 'c.scenario_name', agents: 'c.agents', profile: 'c.profile_label' };
  if (column in keySql) return keySql[column];
  const model = PLAN_MODELS.find((m) => modelColumnId(m) === column) as PlanModel;
  return model === 'k-robust' && view.k !== COMPARE_TABLE_K ? `x.${figureColumn(view.metric)}` : `c.${compareColumn(model, view.metric)}`;
}

/** SQL of one model's executable-at-nominal flag (migration 0405), beside its figure. */
function executableSql(view: LeaderboardView, model: PlanModel): string {
  return model === 'k-robust' && view.k !== COMPARE_TABLE_K ? 'x.executable_at_nominal' : `c.${model.replace('-', '_')}_executable`;
}

/** The entry variant each plan model column of `leaderboard_compare` holds (migration 0405's COMPARE_MODELS). */
const COMPARE_VARIANT: Readonly<Record<PlanModel, string>> = {
  classic: '', 'uniform-duration': '', 'orientation-split': '', 'weighted-split': '', 'k-robust': `k=${COMPARE_TABLE_K}`,
};

/**
 * The interval sources of an execution figure (issue 12, item 5): per plan model, its entry's
 * runs as `__runs_<col>` (a rate: the service computes Wilson for the page's rows from rate ×
 * runs) or its stored interval bounds as `__lo_<col>` / `__hi_<col>` (a mean).
 * `leaderboard_compare` keeps no runs or bounds, so the page's rows (never the whole view) look up
 * their entries by the entries' unique key.
 */
function intervalSql(view: LeaderboardView): { joins: string; select: string } | null {
  const source = intervalSource(view.metric);
  if (source === null) return null;
  const joins: string[] = [];
  const select: string[] = [];
  for (const m of PLAN_MODELS) {
    const col = modelColumnId(m);
    let alias = 'x';
    if (!(m === 'k-robust' && view.k !== COMPARE_TABLE_K)) {
      alias = `i_${col}`;
      joins.push(`LEFT JOIN leaderboard_entries ${alias} ON ${alias}.scenario_id = c.scenario_id AND ${alias}.agents = c.agents
        AND ${alias}.model = '${m}' AND ${alias}.variant = '${COMPARE_VARIANT[m]}' AND ${alias}.robot_profile_hash = c.robot_profile_hash`);
    }
    if (source.kind === 'rate') select.push(`${alias}.${source.runs} AS "__runs_${col}"`);
    else select.push(`${alias}.${source.lo} AS "__lo_${col}"`, `${alias}.${source.hi} AS "__hi_${col}"`);
  }
  return { joins: joins.join('\n    '), select: select.join(', ') };
}

/** The page query and the count query of a comparison view. */
export function compareQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  const repl: Record<string, unknown> = {};
  // The table holds k-robust at one k; another k joins that variant's entry by the entries' unique key.
  let from = 'leaderboard_compare c';
  if (view.k !== COMPARE_TABLE_K) {
    repl['kVariant'] = `k=${view.k}`;
    from += ` LEFT JOIN leaderboard_entries x ON x.scenario_id = c.scenario_id AND x.agents = c.agents
      AND x.model = 'k-robust' AND x.variant = :kVariant AND x.robot_profile_hash = c.robot_profile_hash`;
  }
  const where = baseWhere(viewer, scope, repl, 'c');
  for (const f of view.filters) where.push(fewValuesFilter(f, 'leaderboard_compare', 'c', repl) ?? filterCondition(f, compareSql(view, f.column), repl));
  const order = [
    ...view.sort.map((s) => `${compareSql(view, s.column)} ${s.direction.toUpperCase()}`),
    'c.map_name', 'c.scenario_name', 'c.agents', 'c.scenario_id', 'c.robot_profile_hash',
  ].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  // As in the entries layout: the window is found on keys first (index-only for deep offsets), then its rows are read.
  const intervals = intervalSql(view);
  const page = `WITH w AS (SELECT c.scenario_id, c.agents, c.robot_profile_hash FROM ${from} ${whereSql(where)} ORDER BY ${order} LIMIT :limit OFFSET :offset)
    SELECT c.scenario_id, c.agents, c.robot_profile_hash, c.profile_label,
      ${PLAN_MODELS.map((m) => `${executableSql(view, m)} AS "__nominal_${modelColumnId(m)}"`).join(', ')},${intervals ? `\n      ${intervals.select},` : ''}
      ${view.columns.map((col) => `${compareSql(view, col)} AS "${col}"`).join(', ')}
    FROM w JOIN ${from.replace('leaderboard_compare c', 'leaderboard_compare c ON c.scenario_id = w.scenario_id AND c.agents = w.agents AND c.robot_profile_hash = w.robot_profile_hash')}
    ${intervals?.joins ?? ''}
    ORDER BY ${order}`;
  const count = `SELECT count(*)::int AS n FROM ${from} ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}
