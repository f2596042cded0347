/**
 * Weighted-split runs: optimal CBS over real action durations (solveWeightedSplit), the schedule
 * checked by the independent schedule validator at nominal times, then replayed on the ms timeline.
 */
import { solveWeightedSplit } from '../models/weighted-split';
import { validateSchedule } from '../validate/schedule';
import type { MapfInstance } from '../instance';
import type { RunLimits } from './limits';
import type { PlanTask, PlanTaskResult } from './plan-task';
import { replayPlan } from './replay-plan';
import { boundViolation, suboptimalityOf } from './task-suboptimality';

/** Runs a weighted-split task. */
export function runWeightedSplitTask(task: PlanTask, instance: MapfInstance, limits: RunLimits): PlanTaskResult {
  const spec = task.model;
  if (spec.model !== 'weighted-split') throw new Error(`runWeightedSplitTask: model ${spec.model} is not weighted-split`);
  const w = suboptimalityOf(spec);
  // Without an injected clock the solver would read performance.now itself; pass an unbounded limit then.
  const out = solveWeightedSplit(instance, {
    profile: task.profile,
    startHeading: spec.startHeading,
    timeLimitMs: limits.now ? task.timeLimitMs : undefined,
    signal: limits.signal,
    now: limits.now,
    suboptimality: w,
  });
  const base = {
    runtimeMs: out.runtimeMs, nodesGenerated: out.nodes.generated, nodesExpanded: out.nodes.expanded,
    soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null, plan: null, executions: [],
  };
  if (out.status === 'timeout' || out.status === 'aborted') {
    return { ...base, status: 'timeout', reason: out.status === 'aborted' ? 'aborted' : 'time limit reached', lowerBound: out.lowerBoundMs };
  }
  if (out.status === 'infeasible') return { ...base, status: 'infeasible', reason: out.infeasibleReason ?? 'no plan exists', lowerBound: null };

  const check = validateSchedule(instance, out.schedule, task.profile, { startHeading: spec.startHeading });
  // A refused plan's search has just shown itself wrong: its lower bound is not stored either, so it never
  // marks another result of the instance proven optimal on the board (the best bound is taken over all runs).
  if (!check.ok) {
    return { ...base, status: 'error', reason: `the solver's schedule failed the schedule validator: ${check.violation?.message ?? 'unknown violation'}`, lowerBound: null };
  }
  if (check.soc !== out.socMs) {
    return { ...base, status: 'error', reason: `the solver reported sum-of-costs ${out.socMs} ms but the validator recomputed ${check.soc} ms`, lowerBound: null };
  }
  const outOfBound = boundViolation(check.soc, out.lowerBoundMs, w);
  if (outOfBound !== null) return { ...base, status: 'error', reason: outOfBound, lowerBound: null };
  const executions = replayPlan(instance, { timeline: 'ms', schedule: out.schedule }, task.profile, task.execution, task.seed, limits.signal);
  return {
    ...base,
    status: 'solved',
    soc: check.soc,
    makespan: check.makespan,
    turnInclusiveSocMs: check.soc,
    turnInclusiveMakespanMs: check.makespan,
    turns: out.turns,
    lowerBound: out.lowerBoundMs,
    plan: { kind: 'schedule', schedule: out.schedule },
    executions,
  };
}
