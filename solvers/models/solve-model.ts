/**
 * `solveModel`: one entry point for the five plan models, used by the solve CLI, the solver
 * benchmark and the plan-task runner. It solves optimally under the model, passes the plan
 * through the model's independent validator (solvers/validate; a plan that fails is `error`,
 * never `solved`), derives the executed schedule at nominal durations and reports one result
 * shape: the model with its parameters and robot profile, status, SOC / makespan / lower
 * bound in the model's own unit (steps; ms for weighted-split), turn-inclusive SOC and
 * makespan in ms, quarter turns, the schedule, runtime and node counts.
 */
import type { FollowingRule, PlanModel, RobotProfile, Schedule, StartHeading } from '@shared/plan';
import { FOLLOWING_MODELS, FOLLOWING_RULES, PLAN_MODELS } from '@shared/plan';
import type { MapfInstance } from '../instance';
import type { CbsOptions, CbsStatus, CbsSwitches } from '../search/cbs-types';
import { checkSuboptimality, gapOf, isWithinBound } from '../search/suboptimality';
import { validateClassicPlan } from '../validate/classic';
import { validateKRobustPlan } from '../validate/k-robust';
import { type OrientedState, validateOrientationPlan } from '../validate/orientation-split';
import type { PlanCheck } from '../validate/plan-check';
import { validateSchedule } from '../validate/schedule';
import { checkInstance, solveClassic } from './classic';
import { DEFAULT_ROBOT_PROFILE } from './heading-schedule';
import { solveKRobust } from './k-robust';
import { checkStartHeading } from './orientation-split-decode';
import { solveOrientationSplit } from './orientation-split';
import { scheduleFromPaths } from './turn-schedule';
import { solveWeightedSplit } from './weighted-split';

/** Options of `solveModel`: the CBS limits plus the model parameters. */
export interface ModelSolveOptions extends CbsOptions {
  /** Robot timing (default DEFAULT_ROBOT_PROFILE); forwardMs, quarterTurnMs and waitMs positive integers. */
  readonly profile?: RobotProfile;
  /** Start heading of agents whose task has none (default free). */
  readonly startHeading?: StartHeading;
  /** k-robust only: tolerated delay in steps (required there). */
  readonly k?: number;
  /**
   * Classic, uniform-duration and orientation-split only (default allowed): whether an agent may
   * enter at t + 1 a cell another agent occupies at t (following conflict, Stern et al., SoCS
   * 2019). Refused for k-robust (k ≥ 1 already forbids following) and weighted-split (ms times).
   */
  readonly following?: FollowingRule;
  /**
   * Suboptimality factor w (default 1 = optimal): a finite number from 1 to MAX_SUBOPTIMALITY
   * (solvers/search/suboptimality.ts). With w > 1 the search is bounded
   * (ECBS, Barer et al., SoCS 2014; EECBS, Li, Ruml, Koenig, AAAI 2021) and a plan is solved
   * only when its SOC ≤ w × the proven lower bound.
   */
  readonly suboptimality?: number;
}

/** The parameters a result was produced with. */
export interface ModelParameters {
  readonly startHeading: StartHeading;
  /** k-robust only. */
  readonly k?: number;
  /** Classic, uniform-duration and orientation-split only: the following rule the plan obeys. */
  readonly following?: FollowingRule;
  /** The CBS improvements in effect (unit-step models; weighted-split has its own search). */
  readonly switches?: CbsSwitches;
  /** Present only when w > 1, so exact results keep the parameters (and hashes) they always had. */
  readonly suboptimality?: number;
}

/** The plan in the model's own form. */
export type ModelPlan =
  | { readonly kind: 'paths'; readonly paths: readonly (readonly number[])[] }
  | { readonly kind: 'states'; readonly states: readonly (readonly OrientedState[])[] }
  | { readonly kind: 'schedule'; readonly schedule: Schedule };

/** One result shape for every plan model. Figures are null unless `status` is solved (lowerBound also on timeout). */
export interface ModelResult {
  readonly model: PlanModel;
  readonly parameters: ModelParameters;
  readonly profile: RobotProfile;
  readonly status: CbsStatus;
  /** Why, for every status but solved. */
  readonly reason?: string;
  /** The model's own unit of soc, makespan and lowerBound. */
  readonly units: 'steps' | 'ms';
  readonly soc: number | null;
  readonly makespan: number | null;
  /**
   * Proven lower bound on the optimal SOC: = soc when solved with w = 1; for a bounded solve
   * (w > 1) the bound the search proved (soc ≤ w × lowerBound), never the soc itself.
   */
  readonly lowerBound: number | null;
  /** (soc − lowerBound) / lowerBound: 0 for an exact solve, null unless solved. */
  readonly gap: number | null;
  readonly turnInclusiveSocMs: number | null;
  readonly turnInclusiveMakespanMs: number | null;
  /** Quarter turns in the schedule. */
  readonly turns: number | null;
  /** Executed actions at nominal times (ms); `step` counts on `timeline`. Empty unless solved. */
  readonly schedule: Schedule;
  /** What the schedule's `step` fields count: unit steps, or actions on the ms timeline (weighted-split). */
  readonly timeline: 'steps' | 'ms';
  /** Length of a padding wait step for the simulator (the uniform step for uniform-duration). */
  readonly waitStepMs: number;
  /** The plan in the model's own form; null unless solved. */
  readonly plan: ModelPlan | null;
  /** Whether the model's independent validator accepted the plan (and its SOC). */
  readonly isValidated: boolean;
  readonly runtimeMs: number;
  /** High-level (constraint tree) nodes generated. */
  readonly nodesGenerated: number;
  /** High-level nodes expanded. */
  readonly nodesExpanded: number;
  /** Low-level search expansions. */
  readonly lowLevelExpansions: number;
}

/** Whether `name` is one of the five plan models. */
export function isPlanModel(name: string): name is PlanModel {
  return (PLAN_MODELS as readonly string[]).includes(name);
}

/**
 * Solves `instance` under `model`. Throws a RangeError only for invalid options (unknown model,
 * bad profile field, start heading or k); an instance problem is a status (`error` for bad
 * cells, `infeasible` for shared starts or goals and unreachable goals).
 */
export function solveModel(model: PlanModel, instance: MapfInstance, options: ModelSolveOptions = {}): ModelResult {
  if (!isPlanModel(model)) throw new RangeError(`unknown plan model ${JSON.stringify(model)}; expected one of ${PLAN_MODELS.join(', ')}`);
  const profile = checkProfile(options.profile ?? DEFAULT_ROBOT_PROFILE);
  const startHeading = checkStartHeading(options.startHeading ?? 'free', model);
  if (model === 'k-robust' && options.k === undefined) throw new RangeError('k-robust: option k is required');
  const following = checkFollowing(options.following, model);
  const w = checkSuboptimality(options.suboptimality);
  const bounded = w > 1 ? { suboptimality: w } : {};
  const head = { model, profile, w };
  switch (model) {
    case 'classic':
    case 'uniform-duration': {
      const r = solveClassic(instance, { ...options, following, suboptimality: w });
      const parameters = { startHeading, following, switches: r.switches, ...bounded };
      if (r.status !== 'solved') return unsolved(head, parameters, 'steps', r);
      const turned = scheduleFromPaths(instance, r.paths, profile, { startHeading, stretch: model === 'classic' ? 'none' : 'uniform' });
      return finish(head, parameters, 'steps', r, validateClassicPlan(instance, r.paths, { following }), 'classic', {
        soc: r.soc, makespan: r.makespan, lowerBound: r.lowerBound, plan: { kind: 'paths', paths: r.paths },
        schedule: turned.schedule, timeline: 'steps', waitStepMs: turned.waitStepMs,
        turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs, turns: turned.turns,
      });
    }
    case 'k-robust': {
      const k = options.k as number;
      const r = solveKRobust(instance, { ...options, k, profile, startHeading, suboptimality: w });
      const parameters = { startHeading, k, switches: r.switches, ...bounded };
      if (r.status !== 'solved') return unsolved(head, parameters, 'steps', r);
      return finish(head, parameters, 'steps', r, validateKRobustPlan(instance, r.paths, k), 'k-robust', {
        soc: r.soc, makespan: r.makespan, lowerBound: r.lowerBound, plan: { kind: 'paths', paths: r.paths },
        schedule: r.schedule, timeline: 'steps', waitStepMs: profile.waitMs,
        turnInclusiveSocMs: r.turnInclusiveSocMs, turnInclusiveMakespanMs: r.turnInclusiveMakespanMs, turns: r.turns,
      });
    }
    case 'orientation-split': {
      const r = solveOrientationSplit(instance, { ...options, profile, startHeading, following, suboptimality: w });
      const parameters = { startHeading, following, switches: r.switches, ...bounded };
      if (r.status !== 'solved') return unsolved(head, parameters, 'steps', r);
      return finish(head, parameters, 'steps', r, validateOrientationPlan(instance, r.states, startHeading, { following }), 'orientation-split', {
        soc: r.soc, makespan: r.makespan, lowerBound: r.lowerBound, plan: { kind: 'states', states: r.states },
        schedule: r.schedule, timeline: 'steps', waitStepMs: profile.waitMs,
        turnInclusiveSocMs: r.turnInclusiveSocMs, turnInclusiveMakespanMs: r.turnInclusiveMakespanMs, turns: r.turns,
      });
    }
    case 'weighted-split':
      return solveWeighted(instance, options, profile, startHeading, w);
    default:
      throw new RangeError(`unknown plan model ${JSON.stringify(model)}`);
  }
}

/** Weighted-split: its own CCBS search in ms, the same instance pre-checks as the unit-step models. */
function solveWeighted(instance: MapfInstance, options: ModelSolveOptions, profile: RobotProfile, startHeading: StartHeading, w: number): ModelResult {
  const head = { model: 'weighted-split' as const, profile, w };
  const parameters = { startHeading, ...(w > 1 ? { suboptimality: w } : {}) };
  const noCounts = { runtimeMs: 0, nodesGenerated: 0, nodesExpanded: 0, lowLevelExpansions: 0, lowerBound: null };
  const problem = checkInstance(instance);
  if (problem !== null) return unsolved(head, parameters, 'ms', { ...noCounts, status: problem.status, reason: problem.reason });
  // Solvers own no clock: without an injected one the time limit is not enforced (as in solveClassic).
  const r = solveWeightedSplit(instance, {
    profile, startHeading, nodeLimit: options.nodeLimit, signal: options.signal, suboptimality: w,
    ...(options.now ? { now: options.now, timeLimitMs: options.timeLimitMs } : { now: () => 0 }),
  });
  const counts = {
    runtimeMs: r.runtimeMs, nodesGenerated: r.nodes.generated, nodesExpanded: r.nodes.expanded, lowLevelExpansions: r.lowLevelExpansions,
  };
  if (r.status !== 'solved') {
    const status: CbsStatus = r.status === 'infeasible' ? 'infeasible' : 'timeout';
    const reason = r.status === 'aborted' ? 'abort limit reached' : r.status === 'timeout' ? 'time or node limit reached' : r.infeasibleReason ?? 'no plan exists';
    return unsolved(head, parameters, 'ms', { ...counts, status, reason, lowerBound: status === 'timeout' ? r.lowerBoundMs : null });
  }
  const check = validateSchedule(instance, r.schedule, profile, { startHeading });
  return finish(head, parameters, 'ms', { ...counts, soc: r.soc }, check, 'schedule', {
    soc: r.soc, makespan: r.makespan, lowerBound: r.lowerBoundMs, plan: { kind: 'schedule', schedule: r.schedule },
    schedule: r.schedule, timeline: 'ms', waitStepMs: profile.waitMs,
    turnInclusiveSocMs: r.socMs, turnInclusiveMakespanMs: r.makespanMs, turns: r.turns,
  });
}

/** The model, its profile and the suboptimality factor w of the solve (w is not part of the result itself). */
type Head = Pick<ModelResult, 'model' | 'profile'> & { readonly w: number };
type Counts = Pick<ModelResult, 'runtimeMs' | 'nodesGenerated' | 'nodesExpanded' | 'lowLevelExpansions'>;
type Solved = Pick<ModelResult, 'soc' | 'makespan' | 'lowerBound' | 'plan' | 'schedule' | 'timeline' | 'waitStepMs'
  | 'turnInclusiveSocMs' | 'turnInclusiveMakespanMs' | 'turns'>;

function unsolved(
  head: Head, parameters: ModelParameters, units: 'steps' | 'ms',
  r: Counts & { readonly status: CbsStatus; readonly reason?: string; readonly lowerBound: number | null },
): ModelResult {
  return {
    model: head.model, profile: head.profile, parameters, units, status: r.status, ...(r.reason !== undefined ? { reason: r.reason } : {}),
    soc: null, makespan: null, lowerBound: r.lowerBound, gap: null,
    turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null,
    schedule: [], timeline: units === 'ms' ? 'ms' : 'steps', waitStepMs: head.profile.waitMs, plan: null, isValidated: false,
    runtimeMs: r.runtimeMs, nodesGenerated: r.nodesGenerated, nodesExpanded: r.nodesExpanded, lowLevelExpansions: r.lowLevelExpansions,
  };
}

/**
 * A solved result, or `error` when the independent validator rejects the plan, recomputes
 * another SOC, or (bounded solves) the SOC exceeds w × the proven lower bound.
 */
function finish(
  head: Head, parameters: ModelParameters, units: 'steps' | 'ms', r: Counts & { readonly soc: number | null },
  check: PlanCheck, validator: string, solved: Solved,
): ModelResult {
  const counts = { runtimeMs: r.runtimeMs, nodesGenerated: r.nodesGenerated, nodesExpanded: r.nodesExpanded, lowLevelExpansions: r.lowLevelExpansions };
  if (!check.ok || check.soc !== r.soc) {
    const reason = !check.ok
      ? `the solver's plan failed the ${validator} validator: ${check.violation?.message ?? 'unknown violation'}`
      : `the solver reported sum-of-costs ${r.soc} but the ${validator} validator recomputed ${check.soc}`;
    return unsolved(head, parameters, units, { ...counts, status: 'error', reason, lowerBound: null });
  }
  const soc = solved.soc as number;
  const lb = solved.lowerBound as number;
  if (solved.lowerBound === null || lb > soc || !isWithinBound(soc, lb, head.w)) {
    const reason = `the solver's sum-of-costs ${soc} is not within ${head.w} × its lower bound ${String(solved.lowerBound)}`;
    return unsolved(head, parameters, units, { ...counts, status: 'error', reason, lowerBound: solved.lowerBound });
  }
  return {
    model: head.model, profile: head.profile, parameters, units, status: 'solved', ...solved, gap: gapOf(soc, lb), isValidated: true, ...counts,
  };
}

/**
 * The following rule of a solve: 'allowed' when not given; a RangeError for an unknown value or
 * for a model that takes none (k-robust: k ≥ 1 already forbids following and k = 0 is classic;
 * weighted-split: continuous times, no unit step to follow in).
 */
export function checkFollowing(following: unknown, model: PlanModel): FollowingRule {
  if (following === undefined) return 'allowed';
  if (!(FOLLOWING_MODELS as readonly string[]).includes(model)) {
    const why = model === 'k-robust'
      ? 'k-robust with k ≥ 1 already forbids following (and k = 0 is classic: use classic with following)'
      : 'weighted-split plans run on a continuous ms timeline, where no unit step defines following';
    throw new RangeError(`option following applies to ${FOLLOWING_MODELS.join(', ')} only, not ${model}: ${why}`);
  }
  if (!(FOLLOWING_RULES as readonly unknown[]).includes(following)) {
    throw new RangeError(`option following must be one of ${FOLLOWING_RULES.join(', ')}, got ${JSON.stringify(following)}`);
  }
  return following as FollowingRule;
}

/** Returns the profile when its durations are positive integers of ms; otherwise throws a RangeError naming the field. */
function checkProfile(profile: RobotProfile): RobotProfile {
  for (const field of ['forwardMs', 'quarterTurnMs', 'waitMs'] as const) {
    const v = profile[field];
    if (!Number.isInteger(v) || v <= 0) throw new RangeError(`robot profile field ${field} must be a positive integer of ms, got ${String(v)}`);
  }
  return profile;
}
