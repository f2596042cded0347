/**
 * `solveKRobust`: optimal (minimum sum-of-costs) k-robust CBS (Atzmon et al.,
 * "Robust multi-agent path finding and executing", JAIR 2020; SoCS 2018): the
 * model-generic CBS engine on the classic graph with k-delay conflicts split by range
 * constraints (search/range-conflicts.ts). A k-robust plan stays free of collisions when any
 * agents run up to k steps late.
 *
 * Which engine improvements stay on for k ≥ 1 and why:
 * - MDD conflict prioritisation and bypass: only choose conflicts and adopt equal-cost paths,
 *   never prune, so they are sound for any split; range conflicts are classified by whether an
 *   agent's MDD must pass the cell inside the window.
 * - WDG: its pair weights come from two-agent sub-searches over this same model, so they are
 *   exact k-robust costs (or their lower bounds); the sub-search's own +1 bound holds because
 *   a pair with no classic-conflict-free MDD pair has no k-robust-conflict-free one either.
 * - Disjoint splitting, target, corridor and rectangle reasoning apply to vertex, swap and goal
 *   conflicts, which a k ≥ 1 model never reports; they are reported as off.
 * For k = 0 the model is classic and every improvement applies.
 */
import type { RobotProfile, Schedule, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { type CbsOptions, type CbsResult, type CbsSwitches, DEFAULT_SWITCHES } from '../search/cbs-types';
import { runModelCbs } from '../search/run-model-cbs';
import { switchesForSuboptimality } from '../search/bounded-switches';
import { checkSuboptimality } from '../search/suboptimality';
import { checkInstance } from './classic';
import { DEFAULT_ROBOT_PROFILE } from './heading-schedule';
import { KRobustModel, MAX_K } from './k-robust-model';
import { checkStartHeading } from './orientation-split-decode';
import { scheduleFromPaths } from './turn-schedule';

/** Options of one k-robust solve. */
export interface KRobustOptions extends CbsOptions {
  /** Robustness: tolerated delay in steps, an integer 0…MAX_K. */
  readonly k: number;
  /** Robot timing for the turn-inclusive figures (default DEFAULT_ROBOT_PROFILE). */
  readonly profile?: RobotProfile;
  /** Start heading of agents whose task has none, for the schedule (default free). */
  readonly startHeading?: StartHeading;
}

/** A k-robust result: the classic result shape plus the model fields. */
export interface KRobustResult extends CbsResult {
  readonly model: 'k-robust';
  readonly k: number;
  readonly profile: RobotProfile;
  readonly startHeading: StartHeading;
  /** Sum of turn-inclusive arrival times (actions back to back at nominal durations), ms; null unless solved. */
  readonly turnInclusiveSocMs: number | null;
  /** Largest turn-inclusive arrival time, ms; null unless solved. */
  readonly turnInclusiveMakespanMs: number | null;
  /** Quarter turns in the schedule; null unless solved. */
  readonly turns: number | null;
  /** The executed action lists on the steps timeline; empty unless solved. */
  readonly schedule: Schedule;
}

/** The switches a k-robust solve actually uses (see the file comment). */
export function kRobustSwitches(k: number, requested: Partial<CbsSwitches> = {}): CbsSwitches {
  const sw = { ...DEFAULT_SWITCHES, ...requested };
  if (k === 0) return sw;
  return { ...sw, disjointSplitting: false, targetReasoning: false, corridorReasoning: false, rectangleReasoning: false };
}

/** Solves `instance` optimally under the k-robust model; throws a RangeError for a bad k, profile or start heading. */
export function solveKRobust(instance: MapfInstance, options: KRobustOptions): KRobustResult {
  const { k } = options;
  if (!Number.isInteger(k) || k < 0 || k > MAX_K) throw new RangeError(`k-robust: option k must be an integer from 0 to ${MAX_K}, got ${String(k)}`);
  const profile = options.profile ?? DEFAULT_ROBOT_PROFILE;
  const startHeading = checkStartHeading(options.startHeading ?? 'free', 'k-robust');
  const switches = switchesForSuboptimality(kRobustSwitches(k, options.switches), checkSuboptimality(options.suboptimality));
  const base = { model: 'k-robust' as const, k, profile, startHeading, switches };
  const unsolved = { paths: [], soc: null, makespan: null, turnInclusiveSocMs: null, turnInclusiveMakespanMs: null, turns: null, schedule: [] };
  const model = new KRobustModel(instance, k);
  const problem = checkInstance(instance, model.classic);
  if (problem !== null) {
    return {
      ...base, ...unsolved, status: problem.status, reason: problem.reason, lowerBound: null,
      runtimeMs: 0, nodesGenerated: 0, nodesExpanded: 0, lowLevelExpansions: 0,
    };
  }
  const out = runModelCbs(model, model.degree, switches, options);
  const counters = {
    runtimeMs: out.runtimeMs, nodesGenerated: out.nodesGenerated, nodesExpanded: out.nodesExpanded, lowLevelExpansions: out.lowLevelExpansions,
  };
  if (out.status !== 'solved') return { ...base, ...unsolved, status: out.status, reason: out.reason, lowerBound: out.lowerBound, ...counters };
  const paths = out.statePaths.map((p) => Array.from(p));
  const turned = scheduleFromPaths(instance, paths, profile, { startHeading, stretch: 'none' });
  return {
    ...base, ...counters, status: 'solved', paths, soc: out.soc, makespan: out.makespan, lowerBound: out.lowerBound,
    turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs, turns: turned.turns,
    schedule: turned.schedule,
  };
}
