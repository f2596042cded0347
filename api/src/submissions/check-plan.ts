/**
 * Checks a submitted plan with the independent validator of its plan model and, when it passes,
 * computes what a sweep result carries: SOC and makespan recomputed from the plan, the
 * turn-inclusive figures under the robot profile, and execution replays under every policy.
 * Never a lower bound: bounds are only computed by our solvers.
 * It runs in a thread of the server's interactive pool (api/src/workers/interactive-pool.ts).
 */
import type { CellXY, Schedule } from '@shared/plan';
import { SWEEP_POLICIES } from '@shared/sweeps';
import type { SubmissionViolation } from '@shared/submissions';
import type { MapfInstance } from '@solvers/instance';
import { scheduleFromHeadingStates } from '@solvers/models/heading-schedule';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { checkAtNominal, type NominalCheck } from '@solvers/run/nominal-check';
import { replayPlan } from '@solvers/run/replay-plan';
import type { TaskExecution, TaskExecutionSummary, TaskPlan } from '@solvers/run/plan-task';
import { validateClassicPlan } from '@solvers/validate/classic';
import { validateKRobustPlan } from '@solvers/validate/k-robust';
import { validateOrientationPlan } from '@solvers/validate/orientation-split';
import type { PlanCheck } from '@solvers/validate/plan-check';
import { validateSchedule } from '@solvers/validate/schedule';
import type { ReadSubmission } from './read-plan-file';

/** Replay settings of a submitted plan: every policy, 20 Monte Carlo runs, the profile's jitter, seed 1. */
export const SUBMISSION_EXECUTION = { policies: SWEEP_POLICIES, stallProbability: 0, stallMs: 0, runs: 20 } as const;
/** Seed of a submission's replays, fixed so the same plan always gets the same figures. */
export const SUBMISSION_SEED = 1;

/** The verdict on a submitted plan. */
export type PlanVerdict =
  | { readonly ok: false; readonly violation: SubmissionViolation }
  | {
    readonly ok: true;
    readonly soc: number;
    readonly makespan: number;
    readonly turnInclusiveSocMs: number;
    readonly turnInclusiveMakespanMs: number;
    readonly turns: number | null;
    /** What the results table stores in plan_gz (the sweeps' TaskPlan shape). */
    readonly storedPlan: TaskPlan;
    readonly executions: readonly TaskExecutionSummary[];
    /** The plan replayed open-loop with zero noise under its profile (executable at nominal times). */
    readonly atNominal: NominalCheck;
  };

/** Cell index of [x, y], or -1 off the grid (so the validator reports it instead of wrapping to another row). */
function indexOf(instance: MapfInstance, [x, y]: CellXY): number {
  const { width, height } = instance.grid;
  return Number.isInteger(x) && Number.isInteger(y) && x >= 0 && y >= 0 && x < width && y < height ? y * width + x : -1;
}

/** The violation of a failed check, with an off-grid cell reported as the plan wrote it. */
function violationOf(check: PlanCheck, cellAt: (agent: number, time: number) => CellXY | undefined): SubmissionViolation {
  const v = check.violation;
  if (!v) throw new Error('a failed check carries a violation');
  const written = v.kind === 'off-grid' && v.agents.length === 1 ? cellAt(v.agents[0], v.time) : undefined;
  const cell = written ?? v.cell;
  return { kind: v.kind, agents: [...v.agents], time: v.time, cell: [cell[0], cell[1]], message: v.message };
}

/** How a checked plan is replayed: a submission's fixed settings, or a sweep's (an external solver's run, issue 16, item 4). */
export interface PlanReplaySettings {
  readonly execution: TaskExecution;
  readonly seed: number;
}

/** Validates `sub` against `instance` and, when it passes, computes its figures and replays (default: a submission's settings). */
export function checkPlan(instance: MapfInstance, sub: ReadSubmission, settings: PlanReplaySettings = { execution: SUBMISSION_EXECUTION, seed: SUBMISSION_SEED }): PlanVerdict {
  const profile = sub.robotProfile;
  const replay = (schedule: Schedule, timeline: 'steps' | 'ms') =>
    replayPlan(instance, { timeline, schedule }, profile, settings.execution, settings.seed);
  const nominal = (schedule: Schedule, timeline: 'steps' | 'ms') => checkAtNominal(instance, { timeline, schedule }, profile);
  const plan = sub.plan;

  if (plan.kind === 'paths') {
    const paths = plan.paths.map((p) => p.map((c) => indexOf(instance, c)));
    // uniform-duration plans are classic plans with stretched steps, so the classic rules apply.
    const check = sub.model === 'k-robust' ? validateKRobustPlan(instance, paths, sub.k ?? 0) : validateClassicPlan(instance, paths);
    if (!check.ok) return { ok: false, violation: violationOf(check, (a, t) => plan.paths[a]?.[t]) };
    const turned = scheduleFromPaths(instance, paths, profile, { startHeading: sub.startHeading, stretch: sub.model === 'uniform-duration' ? 'uniform' : 'none' });
    return {
      ok: true, soc: check.soc, makespan: check.makespan,
      turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs, turns: turned.turns,
      storedPlan: { kind: 'paths', paths }, executions: replay(turned.schedule, 'steps'), atNominal: nominal(turned.schedule, 'steps'),
    };
  }
  if (plan.kind === 'states') {
    const states = plan.states.map((s) => s.map(([x, y, heading]) => ({ cell: indexOf(instance, [x, y]), heading })));
    const check = validateOrientationPlan(instance, states, sub.startHeading);
    if (!check.ok) {
      return { ok: false, violation: violationOf(check, (a, t) => { const s = plan.states[a]?.[t]; return s && [s[0], s[1]]; }) };
    }
    const built = scheduleFromHeadingStates(instance, states, profile);
    return {
      ok: true, soc: check.soc, makespan: check.makespan,
      turnInclusiveSocMs: built.turnInclusiveSocMs, turnInclusiveMakespanMs: built.turnInclusiveMakespanMs, turns: built.turns,
      storedPlan: { kind: 'schedule', schedule: built.schedule }, executions: replay(built.schedule, 'steps'), atNominal: nominal(built.schedule, 'steps'),
    };
  }
  const check = validateSchedule(instance, plan.schedule, profile, { startHeading: sub.startHeading });
  if (!check.ok) return { ok: false, violation: violationOf(check, () => undefined) };
  const turns = plan.schedule.reduce((n, acts) => n + acts.filter((a) => a.action === 'turn-left' || a.action === 'turn-right').length, 0);
  return {
    ok: true, soc: check.soc, makespan: check.makespan, turnInclusiveSocMs: check.soc, turnInclusiveMakespanMs: check.makespan, turns,
    storedPlan: { kind: 'schedule', schedule: plan.schedule }, executions: replay(plan.schedule, 'ms'), atNominal: nominal(plan.schedule, 'ms'),
  };
}
