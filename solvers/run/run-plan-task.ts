/**
 * The one function a worker thread calls: dispatch a run by plan model to the model's solver,
 * validate the plan with the model's independent validator (a plan that fails is `error`, never
 * solved), derive the turn-inclusive schedule and replay it under each requested policy.
 * Pure and deterministic for a task and clock; never throws (bad input becomes `error`).
 */
import type { PlanModel } from '@shared/plan';
import type { MapfInstance } from '../instance';
import type { RunLimits } from './limits';
import type { PlanTask, PlanTaskResult } from './plan-task';
import { runCbsModelTask } from './cbs-model-task';
import { checkAtNominal, executablePlanOf } from './nominal-check';
import { fromTaskInstance } from './task-instance';
import { runUnitStepTask } from './unit-step-task';
import { runWeightedSplitTask } from './weighted-split-task';

type TaskRunner = (task: PlanTask, instance: MapfInstance, limits: RunLimits) => PlanTaskResult;

/** Runners of the models that have a solver today. */
const RUNNERS: Partial<Record<PlanModel, TaskRunner>> = {
  'classic': runUnitStepTask,
  'uniform-duration': runUnitStepTask,
  'weighted-split': runWeightedSplitTask,
  'orientation-split': runCbsModelTask,
  'k-robust': runCbsModelTask,
};

/** Whether runPlanTask can solve `model` in this build. */
export function isModelAvailable(model: PlanModel): boolean {
  return RUNNERS[model] !== undefined;
}

/** A result carrying only a status and its reason. */
export function bareResult(status: PlanTaskResult['status'], reason: string, lowerBound: number | null = null, runtimeMs = 0): PlanTaskResult {
  return {
    status, reason, soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null,
    lowerBound, runtimeMs, nodesGenerated: 0, nodesExpanded: 0, turns: null, plan: null, executions: [],
  };
}

/** Runs one task to its result. */
export function runPlanTask(task: PlanTask, limits: RunLimits = {}): PlanTaskResult {
  const runner = RUNNERS[task.model.model];
  if (!runner) return bareResult('error', `plan model ${task.model.model} has no solver in this build yet`);
  try {
    const instance = fromTaskInstance(task.instance);
    return withNominalCheck(task, instance, runner(task, instance, limits));
  } catch (err) {
    return bareResult('error', err instanceof Error ? err.message : String(err));
  }
}

/**
 * Adds the executable-at-nominal check to a solved result (issue 12, item 4); a check the
 * simulator refuses leaves the flag unset rather than failing the solve.
 */
function withNominalCheck(task: PlanTask, instance: MapfInstance, result: PlanTaskResult): PlanTaskResult {
  if (result.status !== 'solved' || result.plan === null) return result;
  try {
    const plan = executablePlanOf(task.model.model, result.plan, instance, task.profile, task.model.startHeading);
    return { ...result, atNominal: checkAtNominal(instance, plan, task.profile) };
  } catch {
    return result;
  }
}
