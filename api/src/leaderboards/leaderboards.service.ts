/**
 * Leaderboard reads: pages of a view, the per-model summary (with a per-map drill-down) and the
 * chart data, all aggregated in SQL over `leaderboard_entries` and limited to the instance sets
 * the viewer may see.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { studentT975, wilsonFromRate, type Interval95 } from '@shared/confidence-interval';
import {
  columnsOf, compareIntervalKind, LEADERBOARD_POLICIES, modelColumnId, profileLabel, SUCCESS_INTERVAL_COLUMNS, type BestAmong, type ChartSeries, type LeaderboardCharts, type LeaderboardPage,
  type CompareMetric, type LeaderboardRow, type LeaderboardSummary, type LeaderboardView, type ModelSummary, type ProfileOption,
} from '@shared/leaderboards';
import { PLAN_MODELS, type PlanModel, type RobotProfile } from '@shared/plan';
import type { Viewer } from '../instance-sets/instance-set-access';
import { groupCountsQuery, sortGroupsQuery, type GroupCount } from './grouped-sort';
import { buildViewQueries, REVERSE_FROM_ROW, unfilteredCountQuery } from './leaderboard-query';
import type { RowWindow, SqlQuery, ViewScope } from './view-sql';
import { scopedEntries } from './scoped-entries';

/** The leaderboard read service. */
export interface LeaderboardsService {
  /** One page of `view` (rows [start, end)) and, unless `isCounted` is false, the view's row count. */
  page(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow, isCounted?: boolean): Promise<LeaderboardPage>;
  /** Per-model summary, optionally for one map; `bestAmong` = executable leaves out plans that collide at nominal times. */
  summary(viewer: Viewer, scope: ViewScope, bestAmong?: BestAmong): Promise<LeaderboardSummary>;
  /** Chart data for one robot profile (default: the one with most rows) and one execution policy. */
  charts(viewer: Viewer, scope: ViewScope, policy: string): Promise<LeaderboardCharts>;
}

type Row = Record<string, unknown>;

const modelOrder = (m: string): number => PLAN_MODELS.indexOf(m as PlanModel);

/**
 * The leaderboards service on one connection. `reverseFromRow` and `groupsFromRow` (tests only)
 * lower the depth from which a page may be read from the far end of its view, or group by group.
 */
export function createLeaderboardsService(deps: { readonly sequelize: Sequelize; readonly reverseFromRow?: number; readonly groupsFromRow?: number }): LeaderboardsService {
  const { sequelize, reverseFromRow = REVERSE_FROM_ROW, groupsFromRow } = deps;
  const select = <T extends object = Row>(q: SqlQuery): Promise<T[]> => sequelize.query<T>(q.sql, { type: QueryTypes.SELECT, replacements: q.replacements });

  async function profiles(viewer: Viewer, scope: ViewScope): Promise<ProfileOption[]> {
    const v = scopedEntries(viewer, { mapId: scope.mapId });
    const rows = await select<{ hash: string; profile: RobotProfile; entries: number }>({
      sql: `WITH v AS (${v.sql}) SELECT robot_profile_hash AS hash, (array_agg(robot_profile))[1] AS profile, count(*)::int AS entries
            FROM v GROUP BY robot_profile_hash ORDER BY entries DESC, hash`,
      replacements: v.replacements,
    });
    return rows.map((r) => ({ hash: r.hash, label: profileLabel(r.profile), entries: r.entries }));
  }

  return {
    async page(view, viewer, scope, window, isCounted = true) {
      // Small look-ups that shape the page query: a deep page of an unfiltered view needs its
      // size (read from the far end when nearer), a sort led by a few-valued column its values
      // (near the top) or its rows per value (deeper; they also add up to the row count).
      const grouped = groupCountsQuery(view, viewer, scope, window, groupsFromRow);
      const groupCounts = grouped ? await select<GroupCount>(grouped) : undefined;
      const sized = !grouped && window.start >= reverseFromRow ? unfilteredCountQuery(view, viewer, scope) : null;
      const total = sized ? (await select<{ n: number }>(sized))[0].n : groupCounts?.reduce((sum, g) => sum + g.n, 0);
      const groups = sortGroupsQuery(view, window);
      const groupValues = groups ? (await select<{ v: string }>(groups)).map((g) => g.v) : undefined;
      const { page, count } = buildViewQueries(view, viewer, scope, window, { groupValues, groupCounts, total, reverseFromRow });
      // Counting a large view costs as much as the page itself, so a grid asks for it once.
      const counted = !isCounted ? Promise.resolve([{ n: -1 }]) : total !== undefined ? Promise.resolve([{ n: total }]) : select<{ n: number }>(count);
      const [rows, [{ n }]] = await Promise.all([select(page), counted]);
      const profileLabels: Record<string, string> = {};
      const out: LeaderboardRow[] = rows.map((r) => {
        profileLabels[String(r['robot_profile_hash'])] = view.layout === 'entries' ? profileLabel(r['robot_profile'] as RobotProfile) : String(r['profile_label']);
        const cells: Record<string, string | number | null> = {};
        for (const c of view.columns) {
          cells[c] = c === 'profile' && view.layout === 'entries'
            ? profileLabel(r['robot_profile'] as RobotProfile)
            : (r[c] as string | number | null) ?? null;
        }
        const scenarioId = Number(r['scenario_id']);
        const agents = Number(r['agents']);
        const profileHash = String(r['robot_profile_hash']);
        if (view.layout === 'compare') {
          const isExecutableAtNominalByColumn = Object.fromEntries(PLAN_MODELS.map((m) => [modelColumnId(m), (r[`__nominal_${modelColumnId(m)}`] as boolean | null) ?? null]));
          const intervalsByColumn = compareIntervals(view.metric, cells, r);
          return { id: `${scenarioId}:${agents}:${profileHash}`, scenarioId, agents, profileHash, cells, isExecutableAtNominalByColumn, ...(intervalsByColumn ? { intervalsByColumn } : {}) };
        }
        fillSuccessIntervals(cells, r);
        return {
          id: String(r['id']), scenarioId, agents, profileHash, resultId: Number(r['result_id']), cells,
          // The row's key for its history (GET /api/history), whether or not those columns are shown.
          model: r['__model'] as PlanModel, variant: String(r['__variant']),
          hasPlan: r['__status'] === 'solved',
          fieldRuns: Number(r['__field_runs'] ?? 0),
          isExecutableAtNominal: (r['__nominal'] as boolean | null) ?? null,
        };
      });
      const visible = new Set(view.columns);
      return { rows: out, rowCount: n, profiles: profileLabels, columns: columnsOf(view).filter((c) => visible.has(c.id)).sort((a, b) => view.columns.indexOf(a.id) - view.columns.indexOf(b.id)) };
    },

    async summary(viewer, scope, bestAmong = 'executable') {
      const v = scopedEntries(viewer, scope);
      // Rows whose plan collides at nominal times take no part in the ratio and mean execution success rate unless asked.
      const usable = (alias: string) => (bestAmong === 'executable' ? ` AND ${alias}.executable_at_nominal IS NOT FALSE` : '');
      const all = scopedEntries(viewer, { profileHash: scope.profileHash });
      const withV = (sql: string): SqlQuery => ({ sql: `WITH v AS (${v.sql}) ${sql}`, replacements: v.replacements });
      // Per policy the mean over solved instances, its sample standard deviation and n (for the t interval, MEAN_SUCCESS_METHOD).
      const successCols = LEADERBOARD_POLICIES.map((p) => {
        const c = `success_${p.policy.replace('-', '_')}`;
        const solved = `FILTER (WHERE status = 'solved' AND ${c} IS NOT NULL)`;
        return `avg(${c}) ${solved} AS "${p.policy}", stddev_samp(${c}) ${solved} AS "sd:${p.policy}", (count(${c}) ${solved})::int AS "n:${p.policy}"`;
      }).join(', ');
      const [byAgents, ratios, success, maps, profileList] = await Promise.all([
        select<{ model: string; variant: string; agents: number; instances: number; solved: number; executable: number; colliding: number; proven: number; w: number }>(withV(
          `SELECT model, variant, agents, count(*)::int AS instances, (count(*) FILTER (WHERE status = 'solved'))::int AS solved,
             (count(*) FILTER (WHERE optimality = 'proven optimal'))::int AS proven, max(suboptimality) AS w,
             (count(*) FILTER (WHERE status = 'solved' AND executable_at_nominal))::int AS executable,
             (count(*) FILTER (WHERE status = 'solved' AND NOT executable_at_nominal))::int AS colliding
           FROM v GROUP BY model, variant, agents ORDER BY model, variant, agents`)),
        // Same instance and robot profile, both solved: the model's turn-inclusive makespan over classic's.
        select<{ model: string; variant: string; ratio: number; pairs: number }>(withV(
          `SELECT e.model, e.variant, avg(e.ti_makespan_ms / c.ti_makespan_ms) AS ratio, count(*)::int AS pairs
           FROM v e JOIN v c ON c.scenario_id = e.scenario_id AND c.agents = e.agents
             AND c.robot_profile_hash = e.robot_profile_hash AND c.model = 'classic' AND c.variant = ''
           WHERE e.status = 'solved' AND c.status = 'solved' AND c.ti_makespan_ms > 0 AND e.ti_makespan_ms IS NOT NULL${usable('e')}${usable('c')}
           GROUP BY e.model, e.variant`)),
        select<Row>(withV(`SELECT model, variant, ${successCols} FROM v ${bestAmong === 'executable' ? 'WHERE executable_at_nominal IS NOT FALSE' : ''} GROUP BY model, variant`)),
        select<{ id: number; name: string; entries: number }>({
          sql: `WITH v AS (${all.sql}) SELECT map_id AS id, min(map_name) AS name, count(*)::int AS entries FROM v GROUP BY map_id ORDER BY name, id`,
          replacements: all.replacements,
        }),
        profiles(viewer, scope),
      ]);
      const key = (m: string, variant: string) => `${m}\u0000${variant}`;
      const models = new Map<string, ModelSummary & { byAgents: { agents: number; instances: number; solved: number }[] }>();
      for (const r of byAgents) {
        const k = key(r.model, r.variant);
        let s = models.get(k);
        if (!s) {
          s = {
            model: r.model as PlanModel, variant: r.variant, suboptimality: Number(r.w ?? 1), provenOptimal: 0, instances: 0, solved: 0, byAgents: [], meanTiMakespanVsClassic: null, pairedWithClassic: 0,
            meanSuccess: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, null])),
            meanSuccessCi95: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, null])),
            meanSuccessInstances: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, 0])),
            executableAtNominal: 0, notExecutableAtNominal: 0,
          };
          models.set(k, s);
        }
        s.byAgents.push({ agents: r.agents, instances: r.instances, solved: r.solved });
        Object.assign(s, {
          instances: s.instances + r.instances, solved: s.solved + r.solved, provenOptimal: s.provenOptimal + r.proven,
          executableAtNominal: s.executableAtNominal + r.executable, notExecutableAtNominal: s.notExecutableAtNominal + r.colliding,
        });
      }
      for (const r of ratios) {
        const s = models.get(key(r.model, r.variant));
        if (s) Object.assign(s, { meanTiMakespanVsClassic: r.ratio, pairedWithClassic: r.pairs });
      }
      for (const r of success) {
        const s = models.get(key(String(r['model']), String(r['variant'])));
        if (!s) continue;
        const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
        Object.assign(s, {
          meanSuccess: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, num(r[p.policy])])),
          meanSuccessCi95: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, meanRateInterval(num(r[p.policy]), num(r[`sd:${p.policy}`]), Number(r[`n:${p.policy}`] ?? 0))])),
          meanSuccessInstances: Object.fromEntries(LEADERBOARD_POLICIES.map((p) => [p.policy, Number(r[`n:${p.policy}`] ?? 0)])),
        });
      }
      const map = scope.mapId === undefined ? null : maps.find((m) => m.id === scope.mapId) ?? null;
      return {
        bestAmong,
        models: [...models.values()].sort((a, b) => modelOrder(a.model) - modelOrder(b.model) || a.variant.localeCompare(b.variant)),
        map: map && { id: map.id, name: map.name },
        maps,
        profiles: profileList,
      };
    },

    async charts(viewer, scope, policy) {
      const list = await profiles(viewer, scope);
      const profile = (scope.profileHash ? list.find((p) => p.hash === scope.profileHash) : list[0]) ?? null;
      // The policy becomes part of a column name, so it must be one of the fixed list.
      if (!LEADERBOARD_POLICIES.some((p) => p.policy === policy)) throw new Error(`charts: unknown policy ${policy}`);
      const col = policy.replace('-', '_');
      const empty: LeaderboardCharts = {
        profile, policy, successByAgents: [], executionSuccessByAgents: [], cactus: [], computedVsRealised: [], spreadHistogram: [], spreadBinMs: 0,
      };
      if (!profile) return empty;
      const v = scopedEntries(viewer, { ...scope, profileHash: profile.hash });
      const withV = (sql: string, extra: Record<string, unknown> = {}): SqlQuery => ({ sql: `WITH v AS (${v.sql}) ${sql}`, replacements: { ...v.replacements, ...extra } });
      type Point = { model: string; variant: string; x: number; y: number };
      const [success, execution, cactus, scatter, maxSpread] = await Promise.all([
        select<Point>(withV(`SELECT model, variant, agents AS x, avg((status = 'solved')::int)::float8 AS y FROM v GROUP BY model, variant, agents ORDER BY model, variant, x`)),
        select<Point & { sd: number | null; n: number }>(withV(`SELECT model, variant, agents AS x, avg(success_${col})::float8 AS y,
            stddev_samp(success_${col})::float8 AS sd, count(*)::int AS n FROM v WHERE status = 'solved' AND success_${col} IS NOT NULL
          GROUP BY model, variant, agents ORDER BY model, variant, x`)),
        // Cactus: the i-th fastest solve time against i, thinned to about 200 points per model.
        select<Point>(withV(`SELECT model, variant, x, y FROM (
            SELECT model, variant, runtime_ms AS x, row_number() OVER w AS y, count(*) OVER (PARTITION BY model, variant) AS n
            FROM v WHERE status = 'solved' AND runtime_ms IS NOT NULL WINDOW w AS (PARTITION BY model, variant ORDER BY runtime_ms, id)) t
          WHERE y = n OR y % greatest(1, n / 200) = 0 ORDER BY model, variant, y`)),
        // A deterministic sample (every j-th by id) of at most about 500 points per model.
        select<Point>(withV(`SELECT model, variant, x, y FROM (
            SELECT model, variant, ti_makespan_ms AS x, realised_${col} AS y, row_number() OVER (PARTITION BY model, variant ORDER BY id) AS i,
              count(*) OVER (PARTITION BY model, variant) AS n
            FROM v WHERE ti_makespan_ms IS NOT NULL AND realised_${col} IS NOT NULL) t
          WHERE i % greatest(1, ceil(n / 500.0)::int) = 0 ORDER BY model, variant, x`)),
        select<{ m: number | null }>(withV(`SELECT max(spread_${col}) AS m FROM v WHERE status = 'solved'`)),
      ]);
      const bin = niceBin(maxSpread[0]?.m ?? 0);
      const histogram = bin === 0 ? [] : await select<Point>(withV(
        `SELECT model, variant, floor(spread_${col} / :bin) * :bin AS x, count(*)::int AS y FROM v
         WHERE status = 'solved' AND spread_${col} IS NOT NULL GROUP BY model, variant, x ORDER BY model, variant, x`, { bin }));
      return {
        ...empty,
        successByAgents: toSeries(success),
        // Each point carries the t interval of its mean over instances (MEAN_SUCCESS_METHOD), drawn as a band.
        executionSuccessByAgents: toSeries(execution).map((series) => ({
          ...series,
          intervals: execution.filter((p) => p.model === series.model && p.variant === series.variant).map((p) => meanRateInterval(p.y, p.sd, p.n)),
        })),
        cactus: toSeries(cactus),
        computedVsRealised: toSeries(scatter),
        spreadHistogram: toSeries(histogram),
        spreadBinMs: bin,
      };
    },
  };
}

/**
 * The Wilson 95 % interval cells of each policy's execution success rate (shared/confidence-interval.ts),
 * recomputed from the stored rate × runs, which the page query read into `__success_*` / `__runs_*`
 * (the interval columns themselves come out of it empty).
 */
function fillSuccessIntervals(cells: Record<string, string | number | null>, r: Row): void {
  for (const [lo, hi, , suffix] of SUCCESS_INTERVAL_COLUMNS) {
    if (!(lo in cells) && !(hi in cells)) continue;
    const rate = r[`__success_${suffix}`] as number | null;
    const runs = r[`__runs_${suffix}`] as number | null;
    const ci = rate === null || runs === null || runs <= 0 ? null : wilsonFromRate(rate, runs);
    if (lo in cells) cells[lo] = ci ? ci[0] : null;
    if (hi in cells) cells[hi] = ci ? ci[1] : null;
  }
}

/**
 * The 95 % interval of each plan model cell of a comparison row with an execution figure (issue
 * 12, item 5), from what the page query read from the cells' entries: a rate gets Wilson from
 * rate × runs (`__runs_*`), a mean its stored bounds (`__lo_*` / `__hi_*`). Null for a cell
 * without a value or without an interval; undefined for plan figures (no interval).
 */
function compareIntervals(metric: CompareMetric, cells: Readonly<Record<string, string | number | null>>, r: Row): Record<string, Interval95 | null> | undefined {
  const kind = compareIntervalKind(metric);
  if (kind === null) return undefined;
  const out: Record<string, Interval95 | null> = {};
  for (const m of PLAN_MODELS) {
    const col = modelColumnId(m);
    if (!(col in cells)) continue;
    const value = cells[col];
    if (typeof value !== 'number') {
      out[col] = null;
    } else if (kind === 'rate') {
      const runs = r[`__runs_${col}`] as number | null;
      out[col] = runs !== null && runs > 0 ? wilsonFromRate(value, runs) : null;
    } else {
      const lo = r[`__lo_${col}`] as number | null;
      const hi = r[`__hi_${col}`] as number | null;
      out[col] = lo === null || hi === null ? null : [Number(lo), Number(hi)];
    }
  }
  return out;
}

/**
 * The Student t 95 % interval of a mean of rates from its aggregates (mean, sample standard
 * deviation, n), cut to [0, 1] since a rate's mean cannot leave it; null below 2 values.
 * Same formula as meanInterval (shared/confidence-interval.ts), which needs the values themselves.
 */
export function meanRateInterval(mean: number | null, sd: number | null, n: number): Interval95 | null {
  if (mean === null || sd === null || n < 2) return null;
  const half = (studentT975(n - 1) * sd) / Math.sqrt(n);
  return [Math.max(0, mean - half), Math.min(1, mean + half)];
}

/** A bin width giving about 20 bins up to `max`, rounded to 1, 2 or 5 × 10^n ms. */
export function niceBin(max: number): number {
  if (!(max > 0)) return 0;
  const raw = max / 20;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p;
}

/** Groups points into one series per model and variant, in model order. */
function toSeries(points: readonly { model: string; variant: string; x: number; y: number }[]): ChartSeries[] {
  const out = new Map<string, { model: PlanModel; variant: string; points: [number, number][] }>();
  for (const p of points) {
    const k = `${p.model}\u0000${p.variant}`;
    let s = out.get(k);
    if (!s) {
      s = { model: p.model as PlanModel, variant: p.variant, points: [] };
      out.set(k, s);
    }
    s.points.push([Number(p.x), Number(p.y)]);
  }
  return [...out.values()].sort((a, b) => modelOrder(a.model) - modelOrder(b.model) || a.variant.localeCompare(b.variant));
}
