/**
 * The demo sweep: seeded once through the sweeps service, its runs solved by the real
 * runPlanTask (inline here instead of the worker threads) and written by the sweep worker's own
 * recorder, after which the public leaderboard shows real, validated results to visitors.
 */
import { performance } from 'node:perf_hooks';
import type { Sequelize } from 'sequelize';
import pino from 'pino';
import { runPlanTask } from '@solvers/run/run-plan-task';
import type { PlanTask } from '@solvers/run/plan-task';
import { defineModels } from '../../api/src/db/models';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { DEMO_SWEEP_NAME } from '../../api/src/demo/seed-demo-results';
import { createLeaderboardsService } from '../../api/src/leaderboards/leaderboards.service';
import { processRun } from '../../api/src/workers/process-run';
import type { PlanPool } from '../../api/src/workers/plan-pool';
import { parseView } from '@shared/leaderboards';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('demo results', () => {
  let db: TestDatabase;
  let sequelize: Sequelize;

  beforeAll(async () => {
    db = await createTestDatabase();
    sequelize = createSequelize(db.url, { poolMax: 3 });
    await seedDemo(sequelize);
    await seedDemo(sequelize);
  }, 120_000);
  afterAll(async () => {
    await sequelize?.close();
    await db?.drop();
  });

  it('launches the demo sweep once, as the demo maintainer, over the demo depot set', async () => {
    const [rows] = await sequelize.query(
      `SELECT s.name, u.login, s.run_count, (SELECT count(*)::int FROM runs r WHERE r.sweep_id = s.id) AS runs
       FROM sweeps s JOIN users u ON u.id = s.owner_id`,
    );
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ name: DEMO_SWEEP_NAME, login: 'tobiah-venkat' });
    expect((rows[0] as { runs: number }).runs).toBeGreaterThan(0);
  });

  it('fills the public board with solved, validated results once the runs are processed', async () => {
    const models = defineModels(sequelize);
    // The worker's own claim-and-record path, with the pool replaced by an inline call of the same task function.
    const pool = { run: async (task: PlanTask) => ({ kind: 'done', result: runPlanTask(task, { now: () => performance.now() }) }) } as unknown as PlanPool;
    const [runs] = await sequelize.query('SELECT id, sweep_id FROM runs ORDER BY id');
    for (const r of runs as { id: number; sweep_id: number }[]) {
      await processRun({
        sequelize, models, pool, logger: pino({ level: 'silent' }), workerName: 'test',
        build: { version: '0.1.0', commit: 'test', node: process.version, cpuModel: 'test', threads: 1 },
        signalFor: () => new AbortController().signal, isStopping: () => false,
      }, { runId: r.id, sweepId: r.sweep_id });
    }
    const board = createLeaderboardsService({ sequelize });
    const page = await board.page(parseView({ cols: 'model,agents,status,executableAtNominal,socSteps,socMs,lowerBoundSteps,lowerBoundMs,gap,successOpenLoop,source' }), null, {}, { start: 0, end: 500 });
    expect(page.rowCount).toBe(runs.length);
    const solved = page.rows.filter((r) => r.cells['status'] === 'solved');
    expect(solved.length).toBeGreaterThan(0);
    for (const r of solved) {
      expect(r.cells['source']).toBe('sweep');
      // Optimal CBS proves its own sum-of-costs, so the board's gap is zero for every solved row.
      expect(r.cells['gap']).toBe(0);
      expect(typeof r.cells['successOpenLoop']).toBe('number');
      // The worker replays every solved plan open-loop at zero noise (executable at nominal times): checked, never null.
      expect(typeof r.isExecutableAtNominal).toBe('boolean');
      expect(r.cells['executableAtNominal']).toBe(r.isExecutableAtNominal ? 'yes' : 'no');
    }
  }, 240_000);
});
