/**
 * Classic and uniform-duration runs: optimal CBS on unit steps (solveClassic), the plan checked
 * by the independent classic validator, then the turn-inclusive schedule (back to back for
 * classic, stretched steps for uniform-duration) and its replay.
 */
import type { CbsSwitches } from '../search/cbs-types';
import { solveClassic } from '../models/classic';
import { scheduleFromPaths } from '../models/turn-schedule';
import { validateClassicPlan } from '../validate/classic';
import type { MapfInstance } from '../instance';
import type { RunLimits } from './limits';
import type { PlanTask, PlanTaskResult } from './plan-task';
import { replayPlan } from './replay-plan';
import { boundViolation, suboptimalityOf } from './task-suboptimality';

/** Runs a classic or uniform-duration task. */
export function runUnitStepTask(task: PlanTask, instance: MapfInstance, limits: RunLimits): PlanTaskResult {
  const spec = task.model;
  if (spec.model !== 'classic' && spec.model !== 'uniform-duration') throw new Error(`runUnitStepTask: model ${spec.model} is not a unit-step model`);
  // Definitions stored before the following rule existed lack the field: the classic rule.
  const following = spec.following ?? 'allowed';
  const w = suboptimalityOf(spec);
  const out = solveClassic(instance, {
    timeLimitMs: task.timeLimitMs,
    memoryLimitMb: task.memoryLimitMb,
    signal: limits.signal,
    now: limits.now,
    switches: spec.switches as Partial<CbsSwitches>,
    following,
    suboptimality: w,
  });
  const base = {
    runtimeMs: out.runtimeMs, nodesGenerated: out.nodesGenerated, nodesExpanded: out.nodesExpanded,
    soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null, plan: null, executions: [],
  };
  if (out.status === 'timeout') {
    // The CBS budget reports which limit stopped it; its own memory guard counts as the memory limit.
    const isMemory = out.reason?.startsWith('memory') ?? false;
    return { ...base, status: isMemory ? 'memory' : 'timeout', reason: out.reason, lowerBound: out.lowerBound };
  }
  if (out.status !== 'solved') return { ...base, status: out.status, reason: out.reason, lowerBound: out.lowerBound };

  const check = validateClassicPlan(instance, out.paths, { following });
  // A refused plan's search has just shown itself wrong: its lower bound is not stored either, so it never
  // marks another result of the instance proven optimal on the board (the best bound is taken over all runs).
  if (!check.ok) {
    return { ...base, status: 'error', reason: `the solver's plan failed the classic validator: ${check.violation?.message ?? 'unknown violation'}`, lowerBound: null };
  }
  if (check.soc !== out.soc) {
    return { ...base, status: 'error', reason: `the solver reported sum-of-costs ${out.soc} but the validator recomputed ${check.soc}`, lowerBound: null };
  }
  const outOfBound = boundViolation(check.soc, out.lowerBound, w);
  if (outOfBound !== null) return { ...base, status: 'error', reason: outOfBound, lowerBound: null };
  const turned = scheduleFromPaths(instance, out.paths, task.profile, {
    startHeading: spec.startHeading,
    stretch: spec.model === 'uniform-duration' ? 'uniform' : 'none',
  });
  const executions = replayPlan(instance, { timeline: 'steps', schedule: turned.schedule }, task.profile, task.execution, task.seed, limits.signal);
  return {
    ...base,
    status: 'solved',
    soc: check.soc,
    makespan: check.makespan,
    turnInclusiveSocMs: turned.turnInclusiveSocMs,
    turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs,
    turns: turned.turns,
    lowerBound: out.lowerBound,
    plan: { kind: 'paths', paths: out.paths },
    executions,
  };
}
