/**
 * Demo step: one small sweep over the invented Kestrel Row parcel depot set, launched through the
 * sweeps service as the demo maintainer, so the embedded worker of `npm start` computes real
 * results for the leaderboard (nothing here writes a figure itself). Launched once: a sweep of
 * this name, in any state, is left alone. Only plan models with a solver in this build are asked for.
 */
import pino from 'pino';
import { STARTER_PROFILE } from '@shared/executions-constants';
import type { SweepDefinitionInput } from '@shared/sweeps';
import { isModelAvailable } from '@solvers/run/run-plan-task';
import { DEMO_IDENTITIES } from '../dev/fake-oauth/demo-identities';
import { createSweepsService } from '../sweeps/sweeps.service';
import { createBoss } from '../workers/sweep-queue';
import { toAccount } from '../users/account';
import type { DemoSeedStep } from './seed-demo';

/** Name of the demo sweep (its identity for idempotence). */
export const DEMO_SWEEP_NAME = 'Kestrel Row turn study (demo)';
/** The demo set it runs on (see seed-demo-instances.ts). */
const DEMO_SET_NAME = 'Kestrel Row parcel depot';

/**
 * The plan models compared, with following forbidden (Stern et al., SoCS 2019) as a variant of
 * the two models whose plans may follow at a right angle, so the model comparison report can say
 * what forbidding it costs and buys on these robots. Input type: the schema fills the defaults.
 */
const CANDIDATE_MODELS: SweepDefinitionInput['models'] = [
  { model: 'classic', startHeading: 'free', switches: {} },
  { model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden' },
  { model: 'uniform-duration', startHeading: 'free', switches: {} },
  { model: 'orientation-split', startHeading: 'free', switches: {} },
  { model: 'orientation-split', startHeading: 'free', switches: {}, following: 'forbidden' },
  { model: 'weighted-split', startHeading: 'free' },
  { model: 'k-robust', k: 1, startHeading: 'free', switches: {} },
];

/**
 * The demo robots: the starter profile with a 760 mm diameter on the 1000 mm pitch. That exceeds
 * pitch/√2 ≈ 707 mm, so two robots in right-angle following touch at any timing (issue 12, item 3):
 * the demo shows a case where the plan model matters for execution (invented figures).
 */
export const DEMO_ROBOT_PROFILE = { ...STARTER_PROFILE, robotDiameterMm: 760 };

/** The URL of the connection `sequelize` was opened on. */
function urlOf(config: { username?: string; password?: string; host?: string; port?: string | number; database?: string }): string {
  const auth = config.password ? `${encodeURIComponent(config.username ?? '')}:${encodeURIComponent(config.password)}` : encodeURIComponent(config.username ?? '');
  return `postgres://${auth}@${config.host ?? '127.0.0.1'}:${config.port ?? 5432}/${config.database ?? ''}`;
}

/** Launches the demo sweep once. */
export const seedDemoResults: DemoSeedStep = async ({ sequelize, models }) => {
  const identity = DEMO_IDENTITIES.find((d) => d.demoRole === 'maintainer');
  const owner = identity && (await models.User.findOne({ where: { provider: 'fake', providerId: identity.id } }));
  const set = owner && (await models.InstanceSet.findOne({ where: { ownerId: owner.id, name: DEMO_SET_NAME } }));
  if (!owner || !set) return;
  const [existing] = await sequelize.query('SELECT id FROM sweeps WHERE name = :name LIMIT 1', { replacements: { name: DEMO_SWEEP_NAME } });
  if (existing.length > 0) return;
  const scenarios = await models.ScenarioFile.findAll({ where: { instanceSetId: set.id }, attributes: ['id'], order: [['id', 'ASC']], limit: 2 });
  if (scenarios.length === 0) return;
  const definition: SweepDefinitionInput = {
    name: DEMO_SWEEP_NAME,
    instances: { instanceSetId: set.id, scenarioIds: scenarios.map((s) => s.id) },
    agentCounts: { kind: 'list', values: [2, 4, 6, 8] },
    models: CANDIDATE_MODELS.filter((m) => isModelAvailable(m.model)),
    robotProfile: DEMO_ROBOT_PROFILE,
    timeLimitMs: 10_000,
    memoryLimitMb: 512,
    execution: { policies: ['open-loop', 'lockstep', 'dependency-gated'], stallProbability: 0, stallMs: 0, runs: 20 },
    seeds: [1],
  };
  const url = urlOf(sequelize.config as unknown as Parameters<typeof urlOf>[0]);
  const boss = await createBoss(url, { logger: pino({ level: 'warn' }), isSupervisor: false, max: 1 });
  try {
    const svc = createSweepsService({ sequelize, models, boss: async () => boss, jobExpiryMarginSeconds: 60 });
    await svc.launch({ ...toAccount(owner), role: 'maintainer' } as Express.User, definition);
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
};
