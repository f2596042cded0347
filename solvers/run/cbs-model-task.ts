/**
 * Orientation-split and k-robust runs on the model-generic CBS engine: solve, check the plan with
 * the model's own independent validator (orientation-split: states with headings; k-robust: the
 * k-delay window rule), then replay the model's schedule on the steps timeline.
 */
import type { CbsSwitches } from '../search/cbs-types';
import { solveKRobust } from '../models/k-robust';
import { solveOrientationSplit } from '../models/orientation-split';
import { validateKRobustPlan } from '../validate/k-robust';
import { validateOrientationPlan } from '../validate/orientation-split';
import type { PlanCheck } from '../validate/plan-check';
import type { MapfInstance } from '../instance';
import type { Schedule } from '@shared/plan';
import type { RunLimits } from './limits';
import type { PlanTask, PlanTaskResult, TaskPlan } from './plan-task';
import { replayPlan } from './replay-plan';
import { boundViolation, suboptimalityOf } from './task-suboptimality';

/** Runs an orientation-split or k-robust task. */
export function runCbsModelTask(task: PlanTask, instance: MapfInstance, limits: RunLimits): PlanTaskResult {
  const spec = task.model;
  const common = {
    timeLimitMs: task.timeLimitMs, memoryLimitMb: task.memoryLimitMb, signal: limits.signal, now: limits.now,
    profile: task.profile, startHeading: spec.model === 'weighted-split' ? undefined : spec.startHeading,
    suboptimality: suboptimalityOf(spec),
  };
  let out;
  let check: () => PlanCheck;
  let plan: () => TaskPlan;
  if (spec.model === 'orientation-split') {
    // Definitions stored before the following rule existed lack the field: the classic rule.
    const following = spec.following ?? 'allowed';
    const r = solveOrientationSplit(instance, { ...common, switches: spec.switches as Partial<CbsSwitches>, following });
    out = r;
    check = () => validateOrientationPlan(instance, r.states, spec.startHeading, { following });
    plan = () => ({ kind: 'schedule', schedule: r.schedule });
  } else if (spec.model === 'k-robust') {
    const r = solveKRobust(instance, { ...common, k: spec.k, switches: spec.switches as Partial<CbsSwitches> });
    out = r;
    check = () => validateKRobustPlan(instance, r.paths, spec.k);
    plan = () => ({ kind: 'paths', paths: r.paths });
  } else {
    throw new Error(`runCbsModelTask: model ${spec.model} is not a CBS-engine model`);
  }
  const base = {
    runtimeMs: out.runtimeMs, nodesGenerated: out.nodesGenerated, nodesExpanded: out.nodesExpanded,
    soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null, plan: null, executions: [],
  };
  if (out.status === 'timeout') {
    return { ...base, status: out.reason?.startsWith('memory') ? 'memory' : 'timeout', reason: out.reason, lowerBound: out.lowerBound };
  }
  if (out.status !== 'solved') return { ...base, status: out.status, reason: out.reason, lowerBound: out.lowerBound };
  const verdict = check();
  // A refused plan's search has just shown itself wrong: its lower bound is not stored either, so it never
  // marks another result of the instance proven optimal on the board (the best bound is taken over all runs).
  if (!verdict.ok) {
    return { ...base, status: 'error', reason: `the solver's plan failed the ${spec.model} validator: ${verdict.violation?.message ?? 'unknown violation'}`, lowerBound: null };
  }
  if (verdict.soc !== out.soc) {
    return { ...base, status: 'error', reason: `the solver reported sum-of-costs ${out.soc} but the validator recomputed ${verdict.soc}`, lowerBound: null };
  }
  const outOfBound = boundViolation(verdict.soc, out.lowerBound, common.suboptimality);
  if (outOfBound !== null) return { ...base, status: 'error', reason: outOfBound, lowerBound: null };
  const schedule: Schedule = out.schedule;
  const executions = replayPlan(instance, { timeline: 'steps', schedule }, task.profile, task.execution, task.seed, limits.signal);
  return {
    ...base,
    status: 'solved',
    soc: verdict.soc,
    makespan: verdict.makespan,
    turnInclusiveSocMs: out.turnInclusiveSocMs,
    turnInclusiveMakespanMs: out.turnInclusiveMakespanMs,
    turns: out.turns,
    lowerBound: out.lowerBound,
    plan: plan(),
    executions,
  };
}
