/**
 * The report on the seeded demo set: the demo sweep's runs solved by the real runPlanTask (inline
 * instead of worker threads) and recorded by the worker's own code, then the report read for each
 * policy. It must cover every candidate variant on every demo instance and answer the question.
 */
import { performance } from 'node:perf_hooks';
import pino from 'pino';
import { runPlanTask } from '@solvers/run/run-plan-task';
import type { PlanTask } from '@solvers/run/plan-task';
import { defineModels } from '../db/models';
import { createSequelize } from '../db/sequelize';
import { seedDemo } from '../demo/seed-demo';
import { processRun } from '../workers/process-run';
import type { PlanPool } from '../workers/plan-pool';
import { createTestDatabase, type TestDatabase } from '../../../test/support/test-database';
import { createReportsService } from './reports.service';
import { reportToMarkdown } from './report-export';
import { clearlyBelow } from './report-summary';
import { DEMO_ROBOT_PROFILE } from '../demo/seed-demo-results';
import type { Sequelize } from 'sequelize';

describe('model comparison report on the demo set', () => {
  let db: TestDatabase;
  let sequelize: Sequelize;

  beforeAll(async () => {
    db = await createTestDatabase();
    sequelize = createSequelize(db.url, { poolMax: 3 });
    await seedDemo(sequelize);
    const models = defineModels(sequelize);
    const pool = { run: async (task: PlanTask) => ({ kind: 'done', result: runPlanTask(task, { now: () => performance.now() }) }) } as unknown as PlanPool;
    const [runs] = await sequelize.query('SELECT id, sweep_id FROM runs ORDER BY id');
    for (const r of runs as { id: number; sweep_id: number }[]) {
      await processRun({
        sequelize, models, pool, logger: pino({ level: 'silent' }), workerName: 'test',
        build: { version: '0.1.0', commit: 'test', node: process.version, cpuModel: 'test', threads: 1 },
        signalFor: () => new AbortController().signal, isStopping: () => false,
      }, { runId: r.id, sweepId: r.sweep_id });
    }
  }, 600_000);

  afterAll(async () => {
    await sequelize?.close();
    await db?.drop();
  });

  it.each(['open-loop', 'lockstep', 'dependency-gated'] as const)('covers every demo variant and instance under %s and answers which plan model', async (policy) => {
    const svc = createReportsService({ sequelize, models: defineModels(sequelize) });
    const set = (await svc.choices(null)).sets.find((s) => s.name === 'Kestrel Row parcel depot');
    if (!set) throw new Error('the demo set has no results');
    const report = await svc.modelComparison(null, { setId: set.id, policy });
    expect(report.profile.value).toEqual(DEMO_ROBOT_PROFILE);
    expect(report.variants.map((v) => v.label)).toEqual([
      'classic', 'classic (following forbidden)', 'uniform-duration', 'orientation-split', 'orientation-split (following forbidden)', 'weighted-split', 'k-robust (k=1)',
    ]);
    // Two scenarios at 2, 4, 6 and 8 agents (seed-demo-results.ts).
    expect(report.instances).toBe(8);
    for (const v of report.variants) {
      expect(v.instances).toBe(8);
      expect(v.executedInstances).toBe(v.solved);
    }
    expect(report.summary.filter((s) => s.startsWith(`Which plan model for these robots under ${policy}: `))).toHaveLength(1);
    expect(reportToMarkdown(report)).toContain('Simulation is no safety assessment');
    // Every variant solved and replayed all 8 instances, so all are compared on the 8.
    expect(report.comparison?.instances).toBe(8);
    expect(report.comparison?.variants).toHaveLength(report.variants.length);
    // Intervals that overlap never yield a winner; the demo's 8 instances give wide ones.
    const cmp = report.comparison!;
    const best = [...cmp.variants].sort((a, b) => b.success - a.success)[0];
    const leading = cmp.variants.filter((v) => v === best || !clearlyBelow(v.successCi95!, best.successCi95!));
    const choice = report.summary.find((s) => s.startsWith(`Which plan model for these robots under ${policy}: `))!;
    if (leading.length > 1) expect(choice).not.toContain('has the highest');
    // The leading variants seen colliding at nominal times are named as such.
    const colliding = report.variants.filter((v) => v.nominalChecked > v.nominalExecutable && leading.some((l) => l.label === v.label));
    expect(colliding.length).toBeGreaterThan(0); // demo robots of 760 mm on a 1000 mm pitch exceed pitch/√2, so classic's right-angle following collides at nominal times
    const setAside = /of these, (.*) collided at nominal times/.exec(choice)?.[1] ?? '';
    for (const v of colliding) expect(setAside).toContain(v.label);
  });
});
