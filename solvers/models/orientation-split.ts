/**
 * `solveOrientationSplit`: optimal (minimum sum-of-costs, in unit steps where a quarter turn
 * is a step of its own) CBS over the (cell, heading) graph — the model-generic CBS engine of
 * Sharon et al. (AIJ 2015) on OrientationSplitModel.
 *
 * Which engine improvements apply and why:
 * - MDD prioritisation and bypass (Boyarski et al., IJCAI 2015), WDG (Li et al., IJCAI 2019),
 *   disjoint splitting (Li et al., ICAPS 2019) and target reasoning (Li et al., AIJ 2021) only
 *   rely on cell conflicts, cell constraints, agents resting at their goal cell and MDDs over
 *   the model's own states, all of which hold here; the WDG sub-searches use this same model.
 * - Corridor and rectangle reasoning derive their constraints from Manhattan-shortest cell
 *   paths, which turn steps break; the model reports `supportsGridSymmetry = false` and the
 *   result reports them as off.
 * - With `following: forbidden` following conflicts (on cells) join the rule; how each
 *   improvement treats them is stated in solvers/search/cbs.ts.
 */
import type { FollowingRule, RobotProfile, Schedule, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { type CbsOptions, type CbsResult, type CbsSwitches, DEFAULT_SWITCHES } from '../search/cbs-types';
import { runModelCbs } from '../search/run-model-cbs';
import { switchesForSuboptimality } from '../search/bounded-switches';
import { checkSuboptimality } from '../search/suboptimality';
import type { OrientedState } from '../validate/orientation-split';
import { checkInstance } from './classic';
import { DEFAULT_ROBOT_PROFILE, scheduleFromHeadingStates } from './heading-schedule';
import { checkStartHeading, decodeStatePath } from './orientation-split-decode';
import { OrientationSplitModel } from './orientation-split-model';

/** Options of one orientation-split solve. */
export interface OrientationSplitOptions extends CbsOptions {
  /** Start heading of agents whose task has none: one for all, or free (chosen at no cost). Default free. */
  readonly startHeading?: StartHeading;
  /** Robot timing for the schedule and the turn-inclusive figures (default DEFAULT_ROBOT_PROFILE). */
  readonly profile?: RobotProfile;
  /** Following rule on cells (default allowed); forbidden adds following conflicts, Stern et al., SoCS 2019. */
  readonly following?: FollowingRule;
}

/** An orientation-split result: the classic result shape (paths = the cells per step) plus the model fields. */
export interface OrientationSplitResult extends CbsResult {
  readonly model: 'orientation-split';
  readonly startHeading: StartHeading;
  readonly profile: RobotProfile;
  /** Per agent its (cell, heading) per unit step, ending on the final arrival; empty unless solved. */
  readonly states: readonly (readonly OrientedState[])[];
  /** Sum of turn-inclusive arrival times at nominal durations, ms; null unless solved. */
  readonly turnInclusiveSocMs: number | null;
  /** Largest turn-inclusive arrival time, ms; null unless solved. */
  readonly turnInclusiveMakespanMs: number | null;
  /** Quarter turns in the plan; null unless solved. */
  readonly turns: number | null;
  /** One action per unit step on the steps timeline; empty unless solved. */
  readonly schedule: Schedule;
}

/** The switches an orientation-split solve actually uses. */
export function orientationSwitches(requested: Partial<CbsSwitches> = {}): CbsSwitches {
  return { ...DEFAULT_SWITCHES, ...requested, corridorReasoning: false, rectangleReasoning: false };
}

/** Solves `instance` optimally under the orientation-split model; throws a RangeError for a bad start heading. */
export function solveOrientationSplit(instance: MapfInstance, options: OrientationSplitOptions = {}): OrientationSplitResult {
  const startHeading = checkStartHeading(options.startHeading ?? 'free', 'orientation-split');
  instance.agents.forEach((a, i) => {
    if (a.startHeading !== undefined) checkStartHeading(a.startHeading, `orientation-split: agent ${i}`);
  });
  const profile = options.profile ?? DEFAULT_ROBOT_PROFILE;
  const switches = switchesForSuboptimality(orientationSwitches(options.switches), checkSuboptimality(options.suboptimality));
  const base = { model: 'orientation-split' as const, startHeading, profile, switches };
  const unsolved = { paths: [], states: [], soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null, schedule: [] };
  // Cell reachability decides feasibility here too: a robot can turn on the spot anywhere.
  const problem = checkInstance(instance);
  if (problem !== null) {
    return {
      ...base, ...unsolved, status: problem.status, reason: problem.reason, lowerBound: null,
      runtimeMs: 0, nodesGenerated: 0, nodesExpanded: 0, lowLevelExpansions: 0,
    };
  }
  const model = new OrientationSplitModel(instance.grid, instance, startHeading, options.following ?? 'allowed');
  const out = runModelCbs(model, model.degree, switches, options);
  const counters = {
    runtimeMs: out.runtimeMs, nodesGenerated: out.nodesGenerated, nodesExpanded: out.nodesExpanded, lowLevelExpansions: out.lowLevelExpansions,
  };
  if (out.status !== 'solved') return { ...base, ...unsolved, status: out.status, reason: out.reason, lowerBound: out.lowerBound, ...counters };
  const states = out.statePaths.map((p) => decodeStatePath(p, model.cellCount));
  const built = scheduleFromHeadingStates(instance, states, profile);
  return {
    ...base, ...counters, status: 'solved',
    paths: states.map((seq) => seq.map((s) => s.cell)), states,
    soc: out.soc, makespan: out.makespan, lowerBound: out.lowerBound,
    turnInclusiveSocMs: built.turnInclusiveSocMs, turnInclusiveMakespanMs: built.turnInclusiveMakespanMs, turns: built.turns,
    schedule: built.schedule,
  };
}
