/**
 * The demo seed's invented field trials (issue 17, item 5): once the demo sweep has a classic
 * 4-robot result replayed under dependency-gated execution, the step attaches 8 invented runs to it
 * (notes say they are invented), their figures equal to compareTrialToPlan's, and never twice.
 * The demo sweep's classic runs are solved by the real runPlanTask inline (as in
 * leaderboard-demo-seed.spec.ts) and written by the sweep worker's recorder.
 */
import { performance } from 'node:perf_hooks';
import type { Sequelize } from 'sequelize';
import pino from 'pino';
import { parseTrialLog } from '@shared/trial-log';
import { runPlanTask } from '@solvers/run/run-plan-task';
import type { PlanTask } from '@solvers/run/plan-task';
import { compareTrialToPlan } from '@solvers/trials/compare-to-plan';
import { gunzipSync } from 'node:zlib';
import { defineModels } from '../../api/src/db/models';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { attachDemoTrials, DEMO_TRIALS_MARK } from '../../api/src/demo/seed-demo-trials';
import { loadResultPlan } from '../../api/src/executions/result-plan';
import { resultPlanView } from '../../api/src/executions/result-plan-view';
import { processRun } from '../../api/src/workers/process-run';
import type { PlanPool } from '../../api/src/workers/plan-pool';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('invented demo field trials', () => {
  let db: TestDatabase;
  let sequelize: Sequelize;

  beforeAll(async () => {
    db = await createTestDatabase();
    sequelize = createSequelize(db.url, { poolMax: 3 });
    await seedDemo(sequelize);
  }, 120_000);
  afterAll(async () => {
    await sequelize?.close();
    await db?.drop();
  });

  it('waits for the demo sweep, then attaches 8 invented runs to one result, once', async () => {
    const models = defineModels(sequelize);
    expect(await attachDemoTrials(sequelize, models)).toBe('waiting');
    const pool = { run: async (task: PlanTask) => ({ kind: 'done', result: runPlanTask(task, { now: () => performance.now() }) }) } as unknown as PlanPool;
    const [runs] = await sequelize.query("SELECT id, sweep_id FROM runs WHERE model = 'classic' AND agents = 4 ORDER BY id");
    expect(runs.length).toBeGreaterThan(0);
    for (const r of runs as { id: number; sweep_id: number }[]) {
      await processRun({
        sequelize, models, pool, logger: pino({ level: 'silent' }), workerName: 'test',
        build: { version: '0.1.0', commit: 'test', node: process.version, cpuModel: 'test', threads: 1 },
        signalFor: () => new AbortController().signal, isStopping: () => false,
      }, { runId: r.id, sweepId: r.sweep_id });
    }
    expect(await attachDemoTrials(sequelize, models)).toBe('attached');
    await seedDemo(sequelize);
    expect(await attachDemoTrials(sequelize, models)).toBe('present');

    const [uploads] = await sequelize.query('SELECT id, result_id, policy, notes FROM trial_uploads');
    expect(uploads).toHaveLength(1);
    const upload = uploads[0] as { id: number; result_id: number; policy: string; notes: string };
    expect(upload.policy).toBe('dependency-gated');
    expect(upload.notes.startsWith(DEMO_TRIALS_MARK)).toBe(true);
    // Each stored run's figures are compareTrialToPlan's on the stored log.
    const stored = await loadResultPlan(models, { id: 0, role: 'admin' } as Express.User, upload.result_id);
    const view = resultPlanView(stored);
    const [rows] = await sequelize.query('SELECT file_name, figures, log_gz FROM trial_runs WHERE upload_id = :id ORDER BY id', { replacements: { id: upload.id } });
    let compared = 0;
    for (const row of rows as { file_name: string; figures: { realisedMakespanMs: number; waitingMs: number }; log_gz: Buffer }[]) {
      const parsed = parseTrialLog(row.file_name, gunzipSync(row.log_gz).toString('utf8'));
      if (parsed.kind !== 'parsed') throw new Error('stored log does not parse');
      const c = compareTrialToPlan(stored.loaded.instance, view.plan, stored.profile, parsed.log);
      if (c.kind !== 'matches') throw new Error('stored log diverges');
      expect(row.figures).toMatchObject({ realisedMakespanMs: c.figures.realisedMakespanMs, waitingMs: c.figures.waitingMs, perRobot: c.figures.perRobot });
      compared++;
    }
    expect(compared).toBe(8);
  }, 300_000);
});
