/**
 * A stored sweep result as an execution input: the row (visible only to those who may see its
 * instance set), its plan decompressed from `plan_gz`, its instance rebuilt from the stored
 * files, and the model, model options and robot profile of the run that produced it.
 */
import { gunzipSync } from 'node:zlib';
import type { PlanModel, RobotProfile, Heading, CellXY } from '@shared/plan';
import { isPlanModel, type ModelSpec } from '@shared/sweeps';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { isSetVisible, type Viewer } from '../instance-sets/instance-set-access';
import { loadInstance, type LoadedInstance } from '../instance-sets/load-instance';
import type { Result } from '../sweeps/result.model';
import type { ExecutionTaskPlan } from './execution-task';

/** Everything an execution of a stored result needs. */
export interface ResultPlan {
  readonly result: Result;
  readonly loaded: LoadedInstance;
  readonly model: PlanModel;
  readonly modelOptions: { readonly startHeading: Heading | 'free'; readonly k?: number; readonly following?: 'forbidden' };
  readonly profile: RobotProfile;
  /** Cells as [x, y], like a plan sent in a request body. */
  readonly plan: ExecutionTaskPlan;
}

/** The plan as the worker stored it (cells of paths are y * width + x; schedules are already [x, y]). */
type StoredTaskPlan =
  | { readonly kind: 'paths'; readonly paths: readonly (readonly number[])[] }
  | { readonly kind: 'schedule'; readonly schedule: Extract<ExecutionTaskPlan, { kind: 'schedule' }>['schedule'] };

/**
 * Loads result `resultId` for `viewer` (null: a visitor, who sees results of public sets). Throws 404 RESULT_NOT_FOUND for an unknown result or one
 * of a set the viewer may not see, and 409 RESULT_NOT_SOLVED for a result without a plan.
 */
export async function loadResultPlan(models: Models, viewer: Viewer, resultId: number): Promise<ResultPlan> {
  const notFound = () => new AppError('RESULT_NOT_FOUND', 404, `No result ${resultId}`);
  const result = await models.Result.findByPk(resultId);
  if (!result) throw notFound();
  const set = await models.InstanceSet.findByPk(result.instanceSetId, { attributes: ['ownerId', 'visibility'] });
  if (!set || !isSetVisible(set, viewer)) throw notFound();
  if (result.status !== 'solved' || !result.planGz) {
    const why = result.reason ? ` (${result.reason})` : '';
    throw new AppError('RESULT_NOT_SOLVED', 409,
      `Result ${resultId} ended ${result.status}${why} and has no plan to execute; pick a solved result of the sweep.`);
  }
  const loaded = await loadInstance(models, result.scenarioId, result.agents);
  return storedResultPlan(result, result.planGz, loaded);
}

/**
 * A solved result's plan with its instance already loaded: the stored plan decompressed, cells
 * as [x, y], and the model options of the run that produced it. For readers that load instances
 * themselves (the sweep plans archive loads each scenario once).
 */
export function storedResultPlan(result: Result, planGz: Buffer, loaded: LoadedInstance): ResultPlan {
  if (!isPlanModel(result.model)) throw new Error(`result ${result.id} has an unknown plan model ${result.model}`);
  const stored = JSON.parse(gunzipSync(planGz).toString('utf8')) as StoredTaskPlan;
  const width = loaded.instance.grid.width;
  const plan: ExecutionTaskPlan = stored.kind === 'paths'
    ? { kind: 'paths', paths: stored.paths.map((p) => p.map((c): CellXY => [c % width, Math.floor(c / width)])) }
    : { kind: 'schedule', schedule: stored.schedule };
  const spec = (result.params as { model?: ModelSpec }).model;
  const startHeading = spec?.startHeading ?? 'free';
  // A spec solved with following forbidden keeps the rule, so the re-check applies it and the viewer says so.
  const following = spec && 'following' in spec && spec.following === 'forbidden' ? { following: 'forbidden' as const } : {};
  const modelOptions = spec?.model === 'k-robust' ? { startHeading, k: spec.k } : { startHeading, ...following };
  return { result, loaded, model: result.model, modelOptions, profile: result.robotProfile, plan };
}
