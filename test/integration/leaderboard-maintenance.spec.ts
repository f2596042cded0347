/**
 * The leaderboard's derived tables (`leaderboard_entries`, `leaderboard_compare`,
 * `leaderboard_counts`, `leaderboard_group_counts`) kept up by triggers must equal a from-scratch `leaderboard_rebuild()` after every kind of change: bulk
 * result inserts and deletes, executions inserted, updated and deleted, submitted plans added,
 * renamed and removed, a scenario deleted, and a set's visibility or owner changed. Each step
 * compares the trigger-kept tables with a rebuild run inside a transaction that is rolled back,
 * so later steps keep building on the incremental state, never on a repaired one.
 */
import { Client } from 'pg';
import { createRng } from '@solvers/random';
import * as nominalMigration from '../../api/src/db/migrations/0405-executable-at-nominal';
import * as boundedMigration from '../../api/src/db/migrations/0407-bounded-suboptimal';
import * as externalMigration from '../../api/src/db/migrations/0411-external-solvers';
import { createSequelize } from '../../api/src/db/sequelize';
import { parameterHash } from '../../api/src/sweeps/parameter-hash';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

const PROFILES = [
  { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.1 },
  { forwardMs: 800, quarterTurnMs: 900, waitMs: 800, cellPitchMm: 1200, robotDiameterMm: 600, timingJitter: 0 },
];
/** Model parameters: the plain variants, a fixed start heading, and k-robust at two k. */
const MODELS = [
  { model: 'classic', startHeading: 'free' },
  { model: 'uniform-duration', startHeading: 'free' },
  { model: 'orientation-split', startHeading: 'free' },
  { model: 'orientation-split', startHeading: 'north' },
  { model: 'weighted-split', startHeading: 'free' },
  { model: 'k-robust', k: 1, startHeading: 'free' },
  { model: 'k-robust', k: 2, startHeading: 'free' },
  // The following rule forbidden is its own variant (migration 0405).
  { model: 'classic', startHeading: 'free', following: 'forbidden' },
  // Bounded-suboptimal search at w > 1 is its own variant (migration 0407).
  { model: 'classic', startHeading: 'free', suboptimality: 1.5 },
  { model: 'k-robust', k: 1, startHeading: 'free', suboptimality: 2 },
];
const STATUSES = ['solved', 'solved', 'solved', 'infeasible', 'timeout', 'memory', 'error'];

interface Snapshot {
  readonly entries: Record<string, unknown>[];
  readonly compare: Record<string, unknown>[];
  readonly counts: Record<string, unknown>[];
  readonly groupCounts: Record<string, unknown>[];
}

describe('leaderboard tables kept by triggers equal a rebuild', () => {
  let db: TestDatabase;
  let c: Client;
  let scenarios: number[];
  let privateSet: number;
  const rng = createRng(8_2026);
  let seed = 0;

  const rows = async <T = Record<string, unknown>>(sql: string, values: unknown[] = []): Promise<T[]> => (await c.query(sql, values)).rows as T[];

  /** The tables in key order, without the serial id and timestamp (which a rebuild renews). */
  async function snapshot(): Promise<Snapshot> {
    const entries = await rows('SELECT * FROM leaderboard_entries ORDER BY scenario_id, agents, model, variant, robot_profile_hash');
    for (const e of entries) {
      delete e['id'];
      delete e['updated_at'];
    }
    const compare = await rows('SELECT * FROM leaderboard_compare ORDER BY scenario_id, agents, robot_profile_hash');
    const counts = await rows('SELECT * FROM leaderboard_counts ORDER BY instance_set_id, map_id, robot_profile_hash');
    const groupCounts = await rows(`SELECT * FROM leaderboard_group_counts
      ORDER BY map_id, robot_profile_hash, is_public, owner_id, model, variant, status, source, solver, profile_label`);
    return { entries, compare, counts, groupCounts };
  }

  async function rebuilt(): Promise<Snapshot> {
    await c.query('BEGIN');
    try {
      await c.query('SELECT leaderboard_rebuild()');
      return await snapshot();
    } finally {
      await c.query('ROLLBACK');
    }
  }

  /** Runs `act`, checks it changed the tables, and that they now equal a rebuild. */
  async function expectRebuildEqualAfter(act: () => Promise<unknown>): Promise<Snapshot> {
    const before = await snapshot();
    await act();
    const after = await snapshot();
    expect(after).not.toEqual(before);
    expect(after).toEqual(await rebuilt());
    return after;
  }

  /** Inserts `n` random results in one statement (as a sweep batch does); submissions when given. */
  async function insertResults(n: number, submissionIds: readonly number[] = []): Promise<number[]> {
    const batch = Array.from({ length: n }, (_, i) => {
      const spec = MODELS[rng.int(MODELS.length)];
      const p = rng.int(PROFILES.length);
      const status = submissionIds.length ? 'solved' : STATUSES[rng.int(STATUSES.length)];
      // Small value ranges on purpose, so ties on every sort key occur and the tie-breaks matter.
      const soc = status === 'solved' ? 4 + rng.int(4) : null;
      const params = { model: spec, robotProfile: PROFILES[p], timeLimitMs: 1000 };
      return {
        scenario_id: scenarios[rng.int(scenarios.length)], agents: 1 + rng.int(3), model: spec.model, params, param_hash: parameterHash(params),
        seed: seed++, status, soc, ti: soc === null ? null : soc * 600 + rng.int(3) * 100,
        lb: status === 'error' || submissionIds.length ? null : 3 + rng.int(2), runtime: submissionIds.length ? null : rng.int(4) * 10,
        profile: PROFILES[p], hash: parameterHash(PROFILES[p]), submission_id: submissionIds.length ? submissionIds[i % submissionIds.length] : null,
        // Executable at nominal times (migration 0405): checked either way, or not checked.
        nominal: status === 'solved' ? [true, false, null][rng.int(3)] : null,
      };
    });
    const inserted = await rows<{ id: number }>(
      `INSERT INTO results (submission_id, instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, soc, makespan,
         turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
         solver_version, solver_commit, node_version, cpu_model, thread_count, executable_at_nominal, nominal_collisions)
       SELECT r.submission_id, s.instance_set_id, s.map_id, s.id, r.agents, r.model, r.params, r.param_hash, r.seed, r.status, r.soc, r.soc,
         r.ti, r.ti, r.lb, r.runtime, 1, r.profile, r.hash, '0.1.0', 'test', 'v20', 'test cpu', 1, r.nominal, CASE r.nominal WHEN true THEN 0 WHEN false THEN 1 END
       FROM jsonb_to_recordset($1::jsonb) AS r(submission_id int, scenario_id int, agents int, model text, params jsonb, param_hash text,
         seed int, status text, soc float8, ti float8, lb float8, runtime float8, profile jsonb, hash text, nominal boolean)
       JOIN scenarios s ON s.id = r.scenario_id RETURNING id`,
      [JSON.stringify(batch)],
    );
    return inserted.map((r) => r.id);
  }

  beforeAll(async () => {
    db = await createTestDatabase();
    c = new Client({ connectionString: db.url });
    await c.connect();
    await c.query(`INSERT INTO users (provider, provider_id, login, display_name, role)
      VALUES ('fake', 'm1', 'maint-a', 'A', 'researcher'), ('fake', 'm2', 'maint-b', 'B', 'researcher')`);
    const sets = await rows<{ id: number }>(`INSERT INTO instance_sets (owner_id, name, visibility)
      VALUES (1, 'public one', 'public'), (1, 'public two', 'public'), (2, 'private', 'private') RETURNING id`);
    privateSet = sets[2].id;
    await c.query(`INSERT INTO maps (instance_set_id, name, type, width, height, passable_count, cells, checksum, byte_size, original)
      SELECT s.id, 'map-' || s.id || '.map', 'octile', 8, 8, 64, '', repeat('0', 64), 0, ''::bytea FROM instance_sets s`);
    const scen = await rows<{ id: number }>(`INSERT INTO scenarios (instance_set_id, map_id, name, rows, row_count, max_agents, checksum, byte_size, original)
      SELECT m.instance_set_id, m.id, 'scen-' || m.id || '-' || g || '.scen', '[]', 3, 3, repeat('0', 64), 0, ''::bytea
      FROM maps m CROSS JOIN generate_series(1, 2) g RETURNING id`);
    scenarios = scen.map((r) => r.id);
  });

  afterAll(async () => {
    await c?.end();
    await db?.drop();
  });

  it('after bulk result inserts in a few statements', async () => {
    const after = await expectRebuildEqualAfter(async () => {
      for (let i = 0; i < 3; i++) await insertResults(150);
    });
    // Every instance × profile with a result has exactly one comparison row, and the counts add up to the entries.
    const [{ n }] = await rows<{ n: number }>('SELECT count(*)::int AS n FROM (SELECT DISTINCT scenario_id, agents, robot_profile_hash FROM results) k');
    expect(after.compare).toHaveLength(n);
    expect(after.counts.reduce((sum, r) => sum + (r['entries'] as number), 0)).toBe(after.entries.length);
    expect(after.groupCounts.reduce((sum, r) => sum + (r['entries'] as number), 0)).toBe(after.entries.length);
  });

  it('after executions are inserted, updated and deleted', async () => {
    await expectRebuildEqualAfter(() => c.query(`INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean,
        realised_makespan_mean_ms, realised_makespan_p95_ms, finish_spread_mean_ms, metrics)
      SELECT r.id, p.policy, '{}', 10, (abs(hashint4(r.id)) % 11) / 10.0, 0, r.turn_inclusive_makespan_ms * 1.1, r.turn_inclusive_makespan_ms * 1.2,
        abs(hashint4(r.id)) % 900,
        -- Half with the stored interval of the mean realised makespan (as sweeps store it since issue 12), half without.
        CASE WHEN r.id % 2 = 0 THEN jsonb_build_object('ci95', jsonb_build_object(
          'realisedMakespanMs', jsonb_build_array(r.turn_inclusive_makespan_ms, r.turn_inclusive_makespan_ms * 1.2),
          'finishSpreadMs', jsonb_build_array(10, 20 + abs(hashint4(r.id)) % 50))) ELSE '{}' END
      FROM results r CROSS JOIN (VALUES ('open-loop'), ('lockstep')) p(policy) WHERE r.status = 'solved'`));
    await expectRebuildEqualAfter(() => c.query("UPDATE executions SET success_rate = 1 - success_rate, finish_spread_mean_ms = finish_spread_mean_ms + 7 WHERE id % 3 = 0"));
    await expectRebuildEqualAfter(() => c.query("DELETE FROM executions WHERE id % 4 = 1 OR policy = 'lockstep' AND id % 2 = 0"));
  });

  it('after submitted plans are added, renamed and removed', async () => {
    const subs = await rows<{ id: number }>(`INSERT INTO submissions (uploader_id, instance_set_id, scenario_id, agents, model, params, solver_name, solver_version, format)
      SELECT 1, s.instance_set_id, s.id, 1, 'classic', '{}', 'Outside solver ' || g, '2.' || g, 'json'
      FROM scenarios s CROSS JOIN generate_series(1, 2) g RETURNING id`);
    const ids = subs.map((s) => s.id);
    const resultIds: number[] = [];
    await expectRebuildEqualAfter(async () => resultIds.push(...await insertResults(40, ids)));
    await expectRebuildEqualAfter(() => c.query("UPDATE submissions SET solver_name = solver_name || ' (renamed)' WHERE id = ANY($1)", [ids.slice(0, 3)]));
    await expectRebuildEqualAfter(async () => {
      await c.query('DELETE FROM results WHERE id = ANY($1)', [resultIds.slice(0, 20)]);
      await c.query('DELETE FROM submissions WHERE id = ANY($1)', [ids.slice(0, 2)]);
    });
  });

  it('after results are deleted: best ones, whole keys and a whole scenario', async () => {
    await expectRebuildEqualAfter(() => c.query(`DELETE FROM results r USING leaderboard_entries e
      WHERE r.id = e.result_id AND e.id % 3 = 0`));
    await expectRebuildEqualAfter(() => c.query(`DELETE FROM results r USING leaderboard_entries e
      WHERE e.id % 5 = 0 AND r.scenario_id = e.scenario_id AND r.agents = e.agents AND r.model = e.model
        AND leaderboard_variant(r.params) = e.variant AND r.robot_profile_hash = e.robot_profile_hash`));
    await expectRebuildEqualAfter(() => c.query('DELETE FROM scenarios WHERE id = $1', [scenarios[1]]));
  });

  it('after results are backfilled with the check at nominal times (an UPDATE of results)', async () => {
    const after = await expectRebuildEqualAfter(() => c.query(`UPDATE results SET executable_at_nominal = NOT coalesce(executable_at_nominal, true),
      nominal_collisions = CASE WHEN coalesce(executable_at_nominal, true) THEN 1 ELSE 0 END WHERE status = 'solved' AND id % 3 = 0`));
    expect(after.entries.some((e) => e['executable_at_nominal'] === false)).toBe(true);
    expect(after.entries.some((e) => e['variant'] === 'following forbidden')).toBe(true);
    expect(after.entries.some((e) => e['realised_lo_open_loop'] !== null && e['spread_hi_open_loop'] !== null)).toBe(true);
  });

  it('keeps bounded-suboptimal variants apart and marks proven optima (migration 0407)', async () => {
    const entries = (await snapshot()).entries;
    const bounded = entries.filter((e) => e['variant'] === 'w=1.5');
    expect(bounded.length).toBeGreaterThan(0);
    expect(bounded.every((e) => e['suboptimality'] === 1.5 && e['model'] === 'classic')).toBe(true);
    expect(entries.filter((e) => e['variant'] === 'k=1 w=2').every((e) => e['suboptimality'] === 2)).toBe(true);
    expect(entries.filter((e) => e['variant'] === '' || e['variant'] === 'k=1').every((e) => e['suboptimality'] === 1)).toBe(true);
    // Each solved entry: proven optimal exactly when soc equals the best proven lower bound; otherwise bounded (w > 1) or unproven.
    let compared = 0;
    for (const e of entries) {
      const expected = e['status'] !== 'solved' ? null
        : e['lower_bound'] !== null && (e['soc'] as number) <= (e['lower_bound'] as number) ? 'proven optimal'
          : (e['suboptimality'] as number) > 1 ? 'bounded' : 'unproven';
      expect(e['optimality']).toBe(expected);
      compared++;
    }
    expect(compared).toBe(entries.length);
    for (const value of ['proven optimal', 'bounded', 'unproven']) expect(entries.some((e) => e['optimality'] === value)).toBe(true);
    // results.gap follows the stored figures.
    const gaps = await rows<{ soc: number; lower_bound: number; gap: number }>(
      "SELECT soc, lower_bound, gap FROM results WHERE status = 'solved' AND lower_bound > 0");
    expect(gaps.length).toBeGreaterThan(0);
    for (const g of gaps) expect(g.gap).toBeCloseTo(Math.max(0, (g.soc - g.lower_bound) / g.lower_bound), 12);
  });

  it('after a set turns public and changes owner', async () => {
    const after = await expectRebuildEqualAfter(() => c.query("UPDATE instance_sets SET visibility = 'public', owner_id = 1 WHERE id = $1", [privateSet]));
    expect(after.compare.filter((r) => r['instance_set_id'] === privateSet).every((r) => r['is_public'] === true && r['owner_id'] === 1)).toBe(true);
  });

  it('undoing and redoing migration 0407 leaves the same tables; undone, bounded results join the exact variant', async () => {
    const before = await snapshot();
    const sequelize = createSequelize(db.url, { poolMax: 1 });
    try {
      const context = sequelize.getQueryInterface();
      // 0411 re-installs 0405's function bodies and 0407's variant with the external solver's name: it goes first and comes back last.
      await externalMigration.down({ context, name: '0411-external-solvers' } as Parameters<typeof externalMigration.down>[0]);
      await boundedMigration.down({ context, name: '0407-bounded-suboptimal' } as Parameters<typeof boundedMigration.down>[0]);
      const undone = await snapshot();
      expect(undone.entries.some((e) => String(e['variant']).includes('w='))).toBe(false);
      expect(Object.keys(undone.entries[0])).not.toContain('optimality');
      expect(undone.entries.length).toBeLessThan(before.entries.length);
      await boundedMigration.up({ context, name: '0407-bounded-suboptimal' } as Parameters<typeof boundedMigration.up>[0]);
      await externalMigration.up({ context, name: '0411-external-solvers' } as Parameters<typeof externalMigration.up>[0]);
    } finally {
      await sequelize.close();
    }
    expect(await snapshot()).toEqual(before);
    expect(before).toEqual(await rebuilt());
  });

  it('undoing and redoing migration 0405 leaves the same tables', async () => {
    // Down drops the stored checks (the column goes), so compare against tables whose results were never checked.
    await c.query('UPDATE results SET executable_at_nominal = NULL, nominal_collisions = NULL');
    const before = await snapshot();
    expect(before).toEqual(await rebuilt());
    expect(before.entries.length).toBeGreaterThan(0);
    const sequelize = createSequelize(db.url, { poolMax: 1 });
    try {
      const context = sequelize.getQueryInterface();
      // 0407 builds on 0405's variant, so it goes first and comes back last (after 0411, which builds on both).
      await externalMigration.down({ context, name: '0411-external-solvers' } as Parameters<typeof externalMigration.down>[0]);
      await boundedMigration.down({ context, name: '0407-bounded-suboptimal' } as Parameters<typeof boundedMigration.down>[0]);
      await nominalMigration.down({ context, name: '0405-executable-at-nominal' } as Parameters<typeof nominalMigration.down>[0]);
      const undone = await snapshot();
      // 0401's variant knows no following rule: those results join the plain classic variant again.
      const forbidden = before.entries.filter((e) => e['variant'] === 'following forbidden').length;
      expect(forbidden).toBeGreaterThan(0);
      expect(undone.entries.length).toBeLessThan(before.entries.length);
      expect(undone.entries.some((e) => e['variant'] === 'following forbidden')).toBe(false);
      expect(Object.keys(undone.entries[0])).not.toContain('executable_at_nominal');
      await nominalMigration.up({ context, name: '0405-executable-at-nominal' } as Parameters<typeof nominalMigration.up>[0]);
      await boundedMigration.up({ context, name: '0407-bounded-suboptimal' } as Parameters<typeof boundedMigration.up>[0]);
      await externalMigration.up({ context, name: '0411-external-solvers' } as Parameters<typeof externalMigration.up>[0]);
    } finally {
      await sequelize.close();
    }
    expect(await snapshot()).toEqual(before);
  });
});
