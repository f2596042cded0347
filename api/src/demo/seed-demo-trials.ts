/**
 * Demo step: invented field trials for one result of the demo sweep, so a fresh start shows the
 * Field trials panel with data (issue 17, item 5). The logs are simulated runs of the result's plan
 * written as trial logs (solvers/trials/simulated-trial.ts), drawn with more noise than the sweep
 * simulated (timing jitter 0.15 and stalls: 3 % of actions held 1.5 s, seed 2026) under
 * dependency-gated execution; the notes say they are invented. Idempotent: once an upload with the
 * demo mark exists on a result of the demo sweep, nothing happens.
 *
 * The demo sweep's results are computed by the worker after start-up, so on a fresh start there is
 * no result yet when the seed runs: `followDemoTrials` (scripts/start.ts) repeats this step every few
 * seconds on its own connection until it has attached the trials or the demo sweep has ended without
 * a fitting result.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { INVENTED_TRIALS_MARK } from '@shared/field-trials';
import type { Logger } from 'pino';
import { createSequelize } from '../db/sequelize';
import { defineModels, type Models } from '../db/models';
import { DEMO_IDENTITIES } from '../dev/fake-oauth/demo-identities';
import { loadResultPlan } from '../executions/result-plan';
import { resultPlanView } from '../executions/result-plan-view';
import { checkTrials } from '../trials/check-trials';
import { inventedTrialLogs } from '../trials/invented-trials';
import { simulationSettings, storeUpload } from '../trials/trials.service';
import { DEMO_SWEEP_NAME } from './seed-demo-results';
import type { DemoSeedStep } from './seed-demo';

/** How the demo notes start (the step's identity for idempotence). */
export const DEMO_TRIALS_MARK = INVENTED_TRIALS_MARK;
/** The notes of the demo upload. */
export const DEMO_TRIALS_NOTES = `${DEMO_TRIALS_MARK}, not a field trial: 8 runs simulated from the demo robot profile with more noise than the sweep's `
  + '(timing jitter 0.15; 3 % of actions stalled 1.5 s; seed 2026) and written as trial logs. Floor: Kestrel Row depot (invented), robots: the demo profile.';
const DEMO_NOISE = { jitterCv: 0.15, stallProbability: 0.03, stallMs: 1500 } as const;

/** What one attempt did. */
export type DemoTrialsOutcome = 'attached' | 'present' | 'waiting' | 'no-result';

/** Attaches the invented trials when the demo sweep has a fitting result; says what it did. */
export async function attachDemoTrials(sequelize: Sequelize, models: Models): Promise<DemoTrialsOutcome> {
  const [sweep] = await sequelize.query<{ id: number; status: string }>(
    'SELECT id, status FROM sweeps WHERE name = :name ORDER BY id LIMIT 1', { type: QueryTypes.SELECT, replacements: { name: DEMO_SWEEP_NAME } },
  );
  if (!sweep) return 'no-result';
  const present = await sequelize.query(
    `SELECT u.id FROM trial_uploads u JOIN results r ON r.id = u.result_id WHERE r.sweep_id = :sweepId AND u.notes LIKE :mark LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { sweepId: sweep.id, mark: `${DEMO_TRIALS_MARK}%` } },
  );
  if (present.length > 0) return 'present';
  // A classic result with 4 robots that the sweep replayed under dependency-gated execution.
  const [result] = await sequelize.query<{ id: number }>(
    `SELECT r.id FROM results r
      WHERE r.sweep_id = :sweepId AND r.status = 'solved' AND r.model = 'classic' AND r.agents = 4
        AND COALESCE(r.params -> 'model' ->> 'following', 'allowed') <> 'forbidden'
        AND EXISTS (SELECT 1 FROM executions e WHERE e.result_id = r.id AND e.policy = 'dependency-gated')
      ORDER BY r.id LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { sweepId: sweep.id } },
  );
  if (!result) return ['finished', 'failed', 'cancelled'].includes(sweep.status) ? 'no-result' : 'waiting';
  const identity = DEMO_IDENTITIES.find((d) => d.demoRole === 'researcher') ?? DEMO_IDENTITIES[0];
  const uploader = await models.User.findOne({ where: { provider: 'fake', providerId: identity.id } });
  if (!uploader) return 'no-result';
  // The demo seed sees what a curator sees; the upload is the demo researcher's.
  const viewer = { id: uploader.id, role: 'admin' } as Express.User;
  const stored = await loadResultPlan(models, viewer, result.id);
  const view = resultPlanView(stored);
  const plan = { timeline: view.plan.timeline, schedule: view.plan.schedule };
  const logs = inventedTrialLogs(stored.loaded.instance, plan, stored.profile, {
    policy: 'dependency-gated', noise: DEMO_NOISE, seed: 2026, runs: 8, prefix: 'kestrel-row-demo-run',
  });
  let cells = '';
  for (const v of stored.loaded.instance.grid.passable) cells += v === 1 ? '1' : '0';
  const inst = stored.loaded.instance;
  const outcome = await checkTrials({
    instance: { width: inst.grid.width, height: inst.grid.height, cells, agents: inst.agents },
    plan, profile: stored.profile,
    files: logs.map((l) => ({ name: l.name, bytes: Buffer.from(l.text) })),
    simulation: await simulationSettings(models, viewer, result.id, 'dependency-gated', stored.profile.timingJitter),
  });
  if (outcome.kind !== 'checked') throw new Error(`the invented demo trial logs were refused: ${outcome.errors[0]?.message ?? outcome.code}`);
  await storeUpload(sequelize, { resultId: result.id, ownerId: uploader.id, policy: 'dependency-gated', notes: DEMO_TRIALS_NOTES }, outcome);
  return 'attached';
}

/** The seed step (a no-op until the demo sweep has a fitting result). */
export const seedDemoTrials: DemoSeedStep = async ({ sequelize, models }) => {
  await attachDemoTrials(sequelize, models);
};

/**
 * Repeats the step every `everyMs` on a connection of its own until the trials are attached (or
 * present, or the demo sweep ended without a fitting result); `stop()` ends it (shutdown).
 */
export function followDemoTrials(databaseUrl: string, logger: Logger, everyMs = 5000): { stop(): Promise<void> } {
  const sequelize = createSequelize(databaseUrl, { poolMax: 1 });
  const models = defineModels(sequelize);
  let timer: NodeJS.Timeout | undefined;
  let isStopped = false;
  let running: Promise<void> = Promise.resolve();
  const finish = async () => {
    isStopped = true;
    if (timer) clearTimeout(timer);
    await running;
    await sequelize.close().catch(() => undefined);
  };
  const attempt = async () => {
    try {
      const outcome = await attachDemoTrials(sequelize, models);
      if (outcome === 'attached') logger.info('invented demo field trials attached to a result of the demo sweep');
      if (outcome !== 'waiting') {
        void finish();
        return;
      }
    } catch (err) {
      logger.warn({ err }, 'attaching the invented demo field trials failed; trying again');
    }
    if (!isStopped) timer = setTimeout(() => { running = attempt(); }, everyMs);
  };
  running = attempt();
  return { stop: finish };
}
