/**
 * The replays a sweep stored with a result (table `executions`, one row per policy), as the exact
 * settings that reproduce them and their stored figures. The plan viewer replays a stored result
 * with these settings, so it shows the leaderboard's numbers instead of its own defaults.
 *
 * Rows written before the settings were recorded in `metrics` lack the seed and collision mode;
 * the sweep then used the run's seed (results.seed, solvers/run/replay-plan.ts) and the
 * simulator's default 'count' (sweeps never passed another mode).
 */
import { EXECUTION_POLICY_NAMES, type CollisionModeName, type ExecutionPolicyName } from '@shared/executions-constants';
import { isPlanModel } from '@shared/sweeps';
import type {
  StoredExecutionFigures, StoredMetric, StoredPolicyExecution, StoredResultExecutionsView,
} from '@shared/stored-executions';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { isSetVisible, type Viewer } from '../instance-sets/instance-set-access';
import type { Execution } from '../sweeps/result.model';

/** The stored replays of result `resultId`; 404 RESULT_NOT_FOUND when unknown or of a set `viewer` may not see. */
export async function loadStoredExecutions(
  models: Pick<Models, 'Result' | 'Execution' | 'InstanceSet'>,
  viewer: Viewer,
  resultId: number,
): Promise<StoredResultExecutionsView> {
  const notFound = () => new AppError('RESULT_NOT_FOUND', 404, `No result ${resultId}`);
  const result = await models.Result.findByPk(resultId, { attributes: ['id', 'sweepId', 'instanceSetId', 'model', 'seed', 'robotProfile'] });
  if (!result) throw notFound();
  const set = await models.InstanceSet.findByPk(result.instanceSetId, { attributes: ['ownerId', 'visibility'] });
  if (!set || !isSetVisible(set, viewer)) throw notFound();
  if (!isPlanModel(result.model)) throw new Error(`result ${resultId} has an unknown plan model ${result.model}`);
  const rows = await models.Execution.findAll({ where: { resultId } });
  const order = (p: string) => EXECUTION_POLICY_NAMES.indexOf(p as ExecutionPolicyName);
  const executions = rows
    .filter((row) => order(row.policy) >= 0)
    .sort((a, b) => order(a.policy) - order(b.policy))
    .map((row) => storedExecution(row, Number(result.seed)));
  return { resultId: result.id, sweepId: result.sweepId, model: result.model, profile: result.robotProfile, executions };
}

/** One row as settings and figures (the metrics JSON is the worker's TaskExecutionSummary). */
function storedExecution(row: Execution, resultSeed: number): StoredPolicyExecution {
  const m = row.metrics as Record<string, unknown>;
  const noise = row.noise as { jitterCv?: number; stallProbability?: number; stallMs?: number };
  const hasSeed = typeof m['seed'] === 'number';
  const hasMode = m['onCollision'] === 'count' || m['onCollision'] === 'stop';
  const metric = (key: string): StoredMetric => (m[key] as StoredMetric | undefined) ?? { mean: null, p95: null };
  const figures: StoredExecutionFigures = {
    successRate: row.successRate,
    // Rows without the collisions object stored only the mean (its own column): the rest is not stored, not 0.
    collisions: (m['collisions'] as StoredExecutionFigures['collisions'] | undefined) ?? { mean: row.collisionsMean, p95: null, total: null },
    realisedMakespanMs: metric('realisedMakespanMs'),
    realisedSocMs: metric('realisedSocMs'),
    finishSpreadMs: metric('finishSpreadMs'),
    waitingMs: metric('waitingMs'),
    ...(Array.isArray(m['successRateCi95']) ? { successRateCi95: m['successRateCi95'] as unknown as StoredExecutionFigures['successRateCi95'] } : {}),
    ...(m['waitingPerRobotMs'] ? { waitingPerRobotMs: m['waitingPerRobotMs'] as StoredExecutionFigures['waitingPerRobotMs'] } : {}),
  };
  return {
    settings: {
      policy: row.policy as ExecutionPolicyName,
      noise: { jitterCv: noise.jitterCv ?? 0, stallProbability: noise.stallProbability ?? 0, stallMs: noise.stallMs ?? 0 },
      runs: row.runs,
      seed: hasSeed ? (m['seed'] as number) : resultSeed,
      onCollision: hasMode ? (m['onCollision'] as CollisionModeName) : 'count',
    },
    figures,
    recorded: { seed: hasSeed, onCollision: hasMode },
    error: typeof m['error'] === 'string' ? m['error'] : null,
  };
}
