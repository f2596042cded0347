/**
 * Provenance of an export (issue 14, item 9): one query over the exported results only (the board
 * page itself never runs it), gathering their sweeps, seeds, robot profiles and the stored
 * SHA-256 checksums of their map and scenario files.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { ExportProvenance, ProvenanceFile } from '@shared/exports-provenance';
import { modelColumnId, profileLabel, type LeaderboardPage, type LeaderboardView } from '@shared/leaderboards';
import { PLAN_MODELS, type RobotProfile } from '@shared/plan';
import { APP_VERSION, appCommit } from '../version';

/** A leaderboard entry's key: one best result per instance, model, variant and robot profile. */
export interface EntryKey {
  readonly scenarioId: number;
  readonly agents: number;
  readonly model: string;
  readonly variant: string;
  readonly profileHash: string;
}

/** Which results an export holds: stored result ids, and entries to look their best results up by. */
export interface ExportedResults {
  readonly resultIds: readonly number[];
  readonly entries: readonly EntryKey[];
}

/**
 * The results of a board page: the row's result in the entries layout; in the comparison layout
 * the entry behind each shown plan model cell that holds a value (k-robust at the view's k, the
 * other models without variant, as the comparison table holds them).
 */
export function exportedResults(view: LeaderboardView, page: LeaderboardPage): ExportedResults {
  if (view.layout === 'entries') return { resultIds: page.rows.flatMap((r) => (r.resultId !== undefined ? [r.resultId] : [])), entries: [] };
  const shown = PLAN_MODELS.filter((m) => view.columns.includes(modelColumnId(m)));
  const entries = page.rows.flatMap((r) => shown
    .filter((m) => r.cells[modelColumnId(m)] !== null && r.cells[modelColumnId(m)] !== undefined)
    .map((m): EntryKey => ({ scenarioId: r.scenarioId, agents: r.agents, model: m, variant: m === 'k-robust' ? `k=${view.k}` : '', profileHash: r.profileHash })));
  return { resultIds: [], entries };
}

interface ProvenanceRow {
  results: number;
  sweeps: number[] | null;
  submissions: number[] | null;
  seeds: string[] | null;
  profiles: { hash: string; profile: RobotProfile }[] | null;
  maps: ProvenanceFile[] | null;
  scenarios: ProvenanceFile[] | null;
}

/** Reads the provenance of exported results; `now` is the export time. */
export type ProvenanceReader = (results: ExportedResults, now?: Date) => Promise<ExportProvenance>;

/** The provenance reader on one connection. */
export function createProvenanceReader(sequelize: Sequelize): ProvenanceReader {
  return async (exported, now = new Date()) => {
    const repl: Record<string, unknown> = {};
    const sources: string[] = [];
    if (exported.resultIds.length > 0) {
      repl['ids'] = exported.resultIds;
      sources.push('SELECT unnest(ARRAY[:ids]::int[]) AS id');
    }
    if (exported.entries.length > 0) {
      const e = exported.entries;
      Object.assign(repl, {
        kScenario: e.map((k) => k.scenarioId), kAgents: e.map((k) => k.agents), kModel: e.map((k) => k.model),
        kVariant: e.map((k) => k.variant), kHash: e.map((k) => k.profileHash),
      });
      sources.push(`SELECT e.result_id AS id
        FROM unnest(ARRAY[:kScenario]::int[], ARRAY[:kAgents]::int[], ARRAY[:kModel]::text[], ARRAY[:kVariant]::text[], ARRAY[:kHash]::text[])
          AS k(scenario_id, agents, model, variant, hash)
        JOIN leaderboard_entries e ON e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.model = k.model
          AND e.variant = k.variant AND e.robot_profile_hash = k.hash`);
    }
    const ids = sources.length > 0 ? sources.join(' UNION ') : 'SELECT NULL::int AS id WHERE false';
    const [row] = await sequelize.query<ProvenanceRow>(
      `WITH ids AS (${ids}),
       r AS (SELECT id, sweep_id, submission_id, seed, robot_profile_hash, robot_profile, map_id, scenario_id FROM results WHERE id IN (SELECT id FROM ids))
       SELECT
         (SELECT count(*)::int FROM r) AS results,
         (SELECT array_agg(DISTINCT sweep_id ORDER BY sweep_id) FROM r WHERE sweep_id IS NOT NULL) AS sweeps,
         (SELECT array_agg(DISTINCT submission_id ORDER BY submission_id) FROM r WHERE submission_id IS NOT NULL) AS submissions,
         (SELECT array_agg(DISTINCT seed ORDER BY seed) FROM r WHERE sweep_id IS NOT NULL) AS seeds,
         (SELECT json_agg(json_build_object('hash', hash, 'profile', profile) ORDER BY hash)
            FROM (SELECT robot_profile_hash AS hash, (array_agg(robot_profile))[1] AS profile FROM r GROUP BY robot_profile_hash) p) AS profiles,
         (SELECT json_agg(json_build_object('set', s.name, 'name', m.name, 'sha256', m.checksum) ORDER BY s.name, m.name)
            FROM maps m JOIN instance_sets s ON s.id = m.instance_set_id WHERE m.id IN (SELECT map_id FROM r)) AS maps,
         (SELECT json_agg(json_build_object('set', s.name, 'name', sc.name, 'sha256', sc.checksum) ORDER BY s.name, sc.name)
            FROM scenarios sc JOIN instance_sets s ON s.id = sc.instance_set_id WHERE sc.id IN (SELECT scenario_id FROM r)) AS scenarios`,
      { type: QueryTypes.SELECT, replacements: repl },
    );
    return {
      hub: { version: APP_VERSION, commit: appCommit() },
      exportedAt: now.toISOString(),
      results: row.results,
      sweeps: row.sweeps ?? [],
      submissions: row.submissions ?? [],
      // bigint arrives as text; seeds are whole numbers far below 2^53.
      seeds: (row.seeds ?? []).map(Number),
      profiles: (row.profiles ?? []).map((p) => ({ hash: p.hash, label: profileLabel(p.profile), parameters: p.profile as unknown as Record<string, number> })),
      maps: row.maps ?? [],
      scenarios: row.scenarios ?? [],
    };
  };
}
