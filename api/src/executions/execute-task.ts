/**
 * The body of an execution job, run inside a pool thread (workers/plan-thread.ts, through the
 * interactive pool): solve when no plan is given (through the sweeps' `runPlanTask`, which
 * solves and checks the plan with the model's independent validator), derive the turn-inclusive
 * schedule, check a given plan with the model's validator, then simulate the fleet with
 * solvers/execute. Never called from a request handler: it blocks its thread for up to
 * EXECUTION_LIMITS.solveTimeLimitMs plus the simulation.
 */
import { performance } from 'node:perf_hooks';
import { summaryView, type PlanFigures } from '@shared/executions';
import { FOLLOWING_MODELS, type FollowingRule, type PlanModel, type Schedule } from '@shared/plan';
import { simulateExecution, type ExecutionSummary } from '@solvers/execute';
import type { MapfInstance } from '@solvers/instance';
import type { TurnSchedule } from '@solvers/models/turn-schedule';
import { isModelAvailable, runPlanTask } from '@solvers/run/run-plan-task';
import { validateClassicPlan } from '@solvers/validate/classic';
import { validateKRobustPlan } from '@solvers/validate/k-robust';
import { validateSchedule } from '@solvers/validate/schedule';
import type { ModelSpec } from '@shared/sweeps';
import type { ExecutionTask, ExecutionTaskInstance, ExecutionTaskOutcome } from './execution-task';
import { arrivalFigures, pathsSchedule } from './result-schedule';

/** Models whose plans are unit-step cell paths (and whose schedules count abstract steps). */
const PATH_MODELS: readonly PlanModel[] = ['classic', 'uniform-duration', 'k-robust'];

/** Heap limit handed to the solver's memory guard, MB (the interactive pool's thread heap limit is larger). */
const SOLVE_MEMORY_MB = 512;

/** Runs one execution task to its outcome (plans that do not fit become `refused`, never a throw). */
export function executeTask(task: ExecutionTask): ExecutionTaskOutcome {
  const instance = toInstance(task.instance);
  let planned: Planned | Refusal;
  try {
    planned = task.plan ? givenPlan(task, instance) : solvedPlan(task, instance);
  } catch (err) {
    // scheduleFromPaths and the validators throw on plans that do not fit the instance at all.
    return refuse(400, 'PLAN_REJECTED', `The plan does not fit the instance: ${messageOf(err)}`);
  }
  if ('kind' in planned) return planned;
  let summary: ExecutionSummary;
  try {
    summary = simulateExecution(instance, { timeline: planned.timeline, schedule: planned.schedule }, task.profile, {
      policy: task.simulation.policy,
      noise: task.simulation.noise,
      seed: task.simulation.seed,
      runs: task.simulation.runs,
      onCollision: task.simulation.onCollision,
    });
  } catch (err) {
    // preparePlan names agent, action and field ("plan: agent 2, action 5, field "from": ...").
    return refuse(400, 'PLAN_REJECTED', `The simulator refused the plan: ${messageOf(err)}`);
  }
  return {
    kind: 'done',
    plan: { origin: task.plan ? (task.planOrigin ?? 'given') : 'solved', timeline: planned.timeline, schedule: planned.schedule },
    figures: planned.figures,
    summary: summaryView(summary),
  };
}

interface Planned {
  readonly timeline: 'steps' | 'ms';
  readonly schedule: Schedule;
  readonly figures: PlanFigures;
}
type Refusal = Extract<ExecutionTaskOutcome, { kind: 'refused' }>;

/** The request's following rule (ModelOptionsSchema `following`; absent = allowed). */
function followingOf(task: ExecutionTask): FollowingRule {
  return task.modelOptions.following ?? 'allowed';
}

/** A refusal when the request asks for a following rule its model does not take (k-robust, weighted-split). */
function followingRefusal(task: ExecutionTask): Refusal | null {
  if (followingOf(task) === 'allowed' || (FOLLOWING_MODELS as readonly PlanModel[]).includes(task.model)) return null;
  return refuse(400, 'PLAN_REJECTED', `modelOptions.following applies to ${FOLLOWING_MODELS.join(', ')} only, not ${task.model}`
    + (task.model === 'k-robust' ? ' (k-robust with k ≥ 1 already forbids following).' : ' (its plans run on a continuous ms timeline).'));
}

function solvedPlan(task: ExecutionTask, instance: MapfInstance): Planned | Refusal {
  const badFollowing = followingRefusal(task);
  if (badFollowing) return badFollowing;
  if (!isModelAvailable(task.model)) {
    return refuse(501, 'MODEL_UNAVAILABLE', `The server cannot solve the ${task.model} model yet; send a plan for it in the body.`);
  }
  const result = runPlanTask({
    model: modelSpec(task),
    instance: { width: instance.grid.width, height: instance.grid.height, cells: task.instance.cells, agents: instance.agents },
    profile: task.profile,
    timeLimitMs: task.solveTimeLimitMs,
    memoryLimitMb: SOLVE_MEMORY_MB,
    seed: task.simulation.seed,
    // The replay happens below with the full per-run list, so the task replays nothing itself.
    execution: { policies: [], stallProbability: 0, stallMs: 0, runs: 1 },
  }, { now: () => performance.now() });
  if (result.status !== 'solved' || !result.plan) {
    const why = result.reason ? ` (${result.reason})` : '';
    return refuse(422, 'PLAN_NOT_SOLVED', `The ${task.model} solve ended ${result.status}${why} within ${task.solveTimeLimitMs} ms; send a plan or choose fewer agents.`);
  }
  const unit = task.model === 'weighted-split' ? 'ms' : 'steps';
  const validator = task.model === 'weighted-split' ? 'schedule' : 'classic';
  const base = {
    soc: result.soc, makespan: result.makespan, unit, lowerBound: result.lowerBound, solveTimeMs: result.runtimeMs,
    isValid: true, validation: `optimal plan; passed the independent ${validator} validator`,
  } as const;
  if (result.plan.kind === 'schedule') {
    return { timeline: 'ms', schedule: result.plan.schedule, figures: { ...base, ...arrivalFigures(result.plan.schedule) } };
  }
  const turned = turnSchedule(task, instance, result.plan.paths);
  return { timeline: 'steps', schedule: turned.schedule, figures: { ...base, ...turnFigures(turned) } };
}

function givenPlan(task: ExecutionTask, instance: MapfInstance): Planned | Refusal {
  const plan = task.plan!;
  const width = instance.grid.width;
  if (plan.kind === 'paths') {
    if (!PATH_MODELS.includes(task.model)) {
      return refuse(400, 'PLAN_REJECTED', `A ${task.model} plan is sent as a schedule; paths of cells are for ${PATH_MODELS.join(', ')}.`);
    }
    if (task.model === 'k-robust' && task.modelOptions.k === undefined) {
      return refuse(400, 'PLAN_REJECTED', 'modelOptions.k: a k-robust plan needs k.');
    }
    const paths = plan.paths.map((p) => p.map(([x, y]) => y * width + x));
    const badFollowing = followingRefusal(task);
    if (badFollowing) return badFollowing;
    const check = task.model === 'k-robust'
      ? validateKRobustPlan(instance, paths, task.modelOptions.k!)
      : validateClassicPlan(instance, paths, { following: followingOf(task) });
    const turned = turnSchedule(task, instance, paths);
    return {
      timeline: 'steps',
      schedule: turned.schedule,
      figures: {
        soc: check.soc, makespan: check.makespan, unit: 'steps', lowerBound: null, solveTimeMs: null,
        isValid: check.ok,
        validation: check.ok ? `passed the independent ${task.model === 'k-robust' ? 'k-robust' : 'classic'} validator` : (check.violation?.message ?? 'rejected'),
        ...turnFigures(turned),
      },
    };
  }
  const timeline = task.model === 'weighted-split' ? 'ms' : 'steps';
  let isValid: boolean | null = null;
  let validation = `no validator checks a ${task.model} plan sent as a schedule; the simulation shows how it runs`;
  let soc: number | null = null;
  let makespan: number | null = null;
  if (task.model === 'weighted-split') {
    const check = validateSchedule(instance, plan.schedule, task.profile, { startHeading: task.modelOptions.startHeading });
    isValid = check.ok;
    validation = check.ok ? 'passed the independent schedule validator' : (check.violation?.message ?? 'rejected');
    soc = check.soc;
    makespan = check.makespan;
  }
  return {
    timeline,
    schedule: plan.schedule,
    figures: { soc, makespan, unit: timeline, lowerBound: null, solveTimeMs: null, isValid, validation, ...arrivalFigures(plan.schedule) },
  };
}

function modelSpec(task: ExecutionTask): ModelSpec {
  const startHeading = task.modelOptions.startHeading;
  switch (task.model) {
    case 'weighted-split': return { model: 'weighted-split', startHeading };
    case 'k-robust': return { model: 'k-robust', k: task.modelOptions.k ?? 1, startHeading, switches: {} };
    default: return { model: task.model, startHeading, switches: {}, following: followingOf(task) };
  }
}

function turnSchedule(task: ExecutionTask, instance: MapfInstance, paths: readonly (readonly number[])[]): TurnSchedule {
  return pathsSchedule(task.model, task.modelOptions.startHeading, instance, paths, task.profile);
}

function turnFigures(t: TurnSchedule): Pick<PlanFigures, 'turnInclusiveSocMs' | 'turnInclusiveMakespanMs'> {
  return { turnInclusiveSocMs: t.turnInclusiveSocMs, turnInclusiveMakespanMs: t.turnInclusiveMakespanMs };
}

function toInstance(t: ExecutionTaskInstance): MapfInstance {
  const passable = new Uint8Array(t.width * t.height);
  for (let i = 0; i < passable.length; i++) passable[i] = t.cells.charCodeAt(i) === 49 ? 1 : 0;
  return { grid: { width: t.width, height: t.height, passable }, agents: t.agents };
}

function refuse(status: number, code: Refusal['code'], message: string): Refusal {
  return { kind: 'refused', status, code, message };
}

function messageOf(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

