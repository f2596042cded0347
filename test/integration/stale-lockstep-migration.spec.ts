/**
 * Migration 0406 deletes exactly the lockstep replays of weighted-split results computed with the
 * superseded lockstep rule (metrics without "seed"), keeps every other execution row, marks the
 * finish spread and waiting of seedless lockstep rows of other models "not stored" (null), and leaves
 * the leaderboard's derived tables equal to a from-scratch rebuild (compared as in
 * leaderboard-maintenance.spec.ts: the rebuild runs in a transaction that is rolled back).
 */
import { Client } from 'pg';
import * as staleLockstep from '../../api/src/db/migrations/0406-stale-lockstep-figures';
import { createSequelize } from '../../api/src/db/sequelize';
import { parameterHash } from '../../api/src/sweeps/parameter-hash';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

const PROFILE = { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.1 };

describe('migration 0406: stale lockstep replays of weighted-split results', () => {
  let db: TestDatabase;
  let c: Client;

  const rows = async <T = Record<string, unknown>>(sql: string, values: unknown[] = []): Promise<T[]> => (await c.query(sql, values)).rows as T[];

  /** The derived tables in key order, without serial ids and timestamps (a rebuild renews them). */
  async function snapshot(): Promise<Record<string, Record<string, unknown>[]>> {
    const entries = await rows('SELECT * FROM leaderboard_entries ORDER BY scenario_id, agents, model, variant, robot_profile_hash');
    for (const e of entries) {
      delete e['id'];
      delete e['updated_at'];
    }
    return {
      entries,
      compare: await rows('SELECT * FROM leaderboard_compare ORDER BY scenario_id, agents, robot_profile_hash'),
      counts: await rows('SELECT * FROM leaderboard_counts ORDER BY instance_set_id, map_id, robot_profile_hash'),
      groupCounts: await rows(`SELECT * FROM leaderboard_group_counts
        ORDER BY map_id, robot_profile_hash, is_public, owner_id, model, variant, status, source, solver, profile_label`),
    };
  }

  async function rebuilt(): Promise<Record<string, Record<string, unknown>[]>> {
    await c.query('BEGIN');
    try {
      await c.query('SELECT leaderboard_rebuild()');
      return await snapshot();
    } finally {
      await c.query('ROLLBACK');
    }
  }

  async function insertResult(model: string, agents: number, scenarioId: number): Promise<number> {
    const params = { model: { model, startHeading: 'free' }, robotProfile: PROFILE, timeLimitMs: 1000 };
    const [r] = await rows<{ id: number }>(
      `INSERT INTO results (instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, soc, makespan,
         turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
         solver_version, solver_commit, node_version, cpu_model, thread_count)
       SELECT s.instance_set_id, s.map_id, s.id, $1, $2, $3, $4, 7, 'solved', 4000, 2000, 4000, 2000, 4000, 5, 1, $5, $6,
         '0.1.0', 'test', 'v20', 'test cpu', 1 FROM scenarios s WHERE s.id = $7 RETURNING id`,
      [agents, model, JSON.stringify(params), parameterHash(params), JSON.stringify(PROFILE), parameterHash(PROFILE), scenarioId],
    );
    return r.id;
  }

  /** One stored replay; `withSeed` = stored since e4f5ddf (metrics record the batch seed). */
  async function insertExecution(resultId: number, policy: string, withSeed: boolean, success: number): Promise<number> {
    const figures = {
      finishSpreadMs: { mean: 400, p95: 500, count: 20 }, waitingMs: { mean: 900, p95: 1200, count: 20 },
      waitingPerRobotMs: { mean: { mean: 450, p95: 600, count: 20 }, max: { mean: 700, p95: 900, count: 20 } },
    };
    const metrics = withSeed
      ? { seed: 7, onCollision: 'count', successRateCi95: [0.5, 0.9], ci95: { successRate: [0.5, 0.9], finishSpreadMs: [300, 500] }, ...figures }
      : { collisions: { mean: 0.2, p95: 1, total: 4 }, ...figures };
    const [e] = await rows<{ id: number }>(
      `INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean, realised_makespan_mean_ms,
         realised_makespan_p95_ms, finish_spread_mean_ms, metrics)
       VALUES ($1, $2, '{"jitterCv":0.1}', 20, $3, 0.2, 2600, 3100, 400, $4) RETURNING id`,
      [resultId, policy, success, JSON.stringify(metrics)],
    );
    return e.id;
  }

  beforeAll(async () => {
    db = await createTestDatabase();
    c = new Client({ connectionString: db.url });
    await c.connect();
    await c.query(`INSERT INTO users (provider, provider_id, login, display_name, role) VALUES ('fake', 'm1', 'maint-a', 'A', 'researcher')`);
    await c.query(`INSERT INTO instance_sets (owner_id, name, visibility) VALUES (1, 'public one', 'public')`);
    await c.query(`INSERT INTO maps (instance_set_id, name, type, width, height, passable_count, cells, checksum, byte_size, original)
      SELECT s.id, 'map-' || s.id || '.map', 'octile', 8, 8, 64, '', repeat('0', 64), 0, ''::bytea FROM instance_sets s`);
    await c.query(`INSERT INTO scenarios (instance_set_id, map_id, name, rows, row_count, max_agents, checksum, byte_size, original)
      SELECT m.instance_set_id, m.id, 'scen-' || g || '.scen', '[]', 3, 3, repeat('0', 64), 0, ''::bytea
      FROM maps m CROSS JOIN generate_series(1, 2) g`);
  });

  afterAll(async () => {
    await c?.end();
    await db?.drop();
  });

  it('deletes the seedless lockstep rows of weighted-split results only, and the board equals a rebuild after it', async () => {
    const scenarios = (await rows<{ id: number }>('SELECT id FROM scenarios ORDER BY id')).map((r) => r.id);
    expect(scenarios).toHaveLength(2);
    const weighted = await insertResult('weighted-split', 2, scenarios[0]);
    const weightedNew = await insertResult('weighted-split', 3, scenarios[0]);
    const classic = await insertResult('classic', 2, scenarios[1]);
    const orientation = await insertResult('orientation-split', 2, scenarios[1]);

    const stale = [await insertExecution(weighted, 'lockstep', false, 0.35)];
    const kept = [
      await insertExecution(weighted, 'open-loop', false, 0.8), // another policy of the same result, stored before e4f5ddf
      await insertExecution(weighted, 'dependency-gated', false, 0.9),
      await insertExecution(weightedNew, 'lockstep', true, 0.95), // lockstep of weighted-split with a seed: the current rule
      await insertExecution(classic, 'lockstep', false, 0.6), // lockstep of another model, stored before e4f5ddf
      await insertExecution(orientation, 'lockstep', false, 0.55),
    ];
    // The stale row is on the board (lockstep figures of its entry) before the migration.
    const before = await snapshot();
    expect(before).toEqual(await rebuilt());
    const entryOf = (s: Record<string, Record<string, unknown>[]>, resultId: number) => s['entries'].find((e) => e['result_id'] === resultId);
    expect(entryOf(before, weighted)?.['success_lockstep']).toBe(0.35);
    expect(before['compare'].find((r) => r['scenario_id'] === scenarios[0] && r['agents'] === 2)?.['weighted_split_success_lockstep']).toBe(0.35);

    const sequelize = createSequelize(db.url, { poolMax: 1 });
    try {
      await staleLockstep.up({ context: sequelize.getQueryInterface(), name: '0406-stale-lockstep-figures' } as Parameters<typeof staleLockstep.up>[0]);
    } finally {
      await sequelize.close();
    }

    const remaining = (await rows<{ id: number }>('SELECT id FROM executions ORDER BY id')).map((r) => r.id);
    expect(remaining).toEqual([...kept].sort((a, b) => a - b));
    expect(remaining).not.toContain(stale[0]);

    const after = await snapshot();
    expect(after).toEqual(await rebuilt());
    // The entry shows no lockstep replay now, its other policies unchanged; the other entries keep theirs.
    expect(entryOf(after, weighted)?.['success_lockstep']).toBeNull();
    expect(entryOf(after, weighted)?.['success_open_loop']).toBe(0.8);
    expect(entryOf(after, weighted)?.['success_dependency_gated']).toBe(0.9);
    expect(entryOf(after, weightedNew)?.['success_lockstep']).toBe(0.95);
    expect(entryOf(after, classic)?.['success_lockstep']).toBe(0.6);
    expect(entryOf(after, orientation)?.['success_lockstep']).toBe(0.55);
    expect(after['compare'].find((r) => r['scenario_id'] === scenarios[0] && r['agents'] === 2)?.['weighted_split_success_lockstep']).toBeNull();

    // Spread and waiting: nulled on the seedless lockstep rows of other models only; other figures kept.
    const stored = async (id: number) => (await rows<{ spread: number | null; success: number; metrics: Record<string, unknown> }>(
      'SELECT finish_spread_mean_ms AS spread, success_rate AS success, metrics FROM executions WHERE id = $1', [id]))[0];
    const [openLoop, gated, lockstepNew, classicLockstep, orientationLockstep] = kept;
    let nulled = 0;
    for (const id of [classicLockstep, orientationLockstep]) {
      const row = await stored(id);
      expect(row.spread).toBeNull();
      expect(row.metrics['finishSpreadMs']).toBeNull();
      expect(row.metrics['waitingMs']).toBeNull();
      expect(row.metrics['waitingPerRobotMs']).toBeNull();
      expect(row.metrics['collisions']).toEqual({ mean: 0.2, p95: 1, total: 4 });
      expect(row.success).toBeGreaterThan(0.5);
      nulled++;
    }
    expect(nulled).toBe(2);
    let untouched = 0;
    for (const id of [openLoop, gated, lockstepNew]) {
      const row = await stored(id);
      expect(row.spread).toBe(400);
      expect(row.metrics['finishSpreadMs']).toEqual({ mean: 400, p95: 500, count: 20 });
      expect(row.metrics['waitingMs']).toEqual({ mean: 900, p95: 1200, count: 20 });
      untouched++;
    }
    expect(untouched).toBe(3);
    expect((await stored(lockstepNew)).metrics['ci95']).toEqual({ successRate: [0.5, 0.9], finishSpreadMs: [300, 500] });
    expect(entryOf(after, classic)?.['spread_lockstep']).toBeNull();
    expect(entryOf(before, classic)?.['spread_lockstep']).toBe(400);
    expect(entryOf(after, weightedNew)?.['spread_lockstep']).toBe(400);
  });
});
