/**
 * Independent validator of classic-model plans.
 *
 * Plan semantics (shared by every engineer; classic and k-robust paths): per agent an array
 * of cell indices (`y * width + x`), one per unit time step; `path[0]` is the start; the last
 * entry is the goal and the agent stays there forever afterwards; the agent's cost is
 * `path.length − 1` (the time of its last arrival at the goal); SOC = sum of costs,
 * makespan = max. Classic conflicts: vertex (same cell, same t), swap (exchange cells between
 * t and t+1), and goal (an agent at its goal forever is hit by another entering that cell
 * later — a vertex conflict at a t beyond the first agent's path end). Following is allowed,
 * unless the plan was made with `following: forbidden` (then following-rule.ts applies).
 *
 * The cost is computed as the time of the last arrival at the goal, so a path padded with
 * waits at its goal (as some outside solvers write them) is charged what it really costs,
 * not its padded length; for an unpadded path the two agree.
 */
import type { FollowingRule } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { firstCellConflict } from './cell-conflicts';
import { firstFollowingViolation } from './following-rule';
import { arrivalStep } from './grid-cells';
import { agentCountViolation, firstPathRuleViolation } from './path-rules';
import { firstOf, verdict, type PlanCheck, type RankedViolation } from './plan-check';

/** Which rule variant a unit-step plan is checked under. */
export interface UnitStepRuleOptions {
  /** Following rule (default allowed); forbidden also rejects following moves. */
  readonly following?: FollowingRule;
}

/** Checks a classic plan against its instance; reports the first violation and recomputes SOC and makespan (steps). */
export function validateClassicPlan(
  instance: MapfInstance, paths: readonly (readonly number[])[], options: UnitStepRuleOptions = {},
): PlanCheck {
  const goals = instance.agents.map((a) => a.goal);
  const costs = paths.map((p, i) => (i < goals.length ? arrivalStep(p, goals[i]) : Math.max(0, p.length - 1)));
  const count = agentCountViolation(instance.agents.length, paths.length);
  if (count) return verdict(count, costs);
  const candidates: (RankedViolation | undefined)[] = paths.map((p, i) => firstPathRuleViolation(instance, i, p));
  candidates.push(firstCellConflict(instance.grid, paths, goals));
  if (options.following === 'forbidden') candidates.push(firstFollowingViolation(instance.grid, paths));
  return verdict(firstOf(candidates), costs);
}
