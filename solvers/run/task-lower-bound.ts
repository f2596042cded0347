/**
 * A cheap proven lower bound on a task's optimal sum-of-costs, for runs whose thread was
 * terminated (hard time limit or heap limit) before the solver could report its own:
 * the sum of each agent's shortest path alone, which no plan with more agents can beat
 * (the root bound of CBS, Sharon et al., AIJ 2015).
 */
import { bfsDistances, UNREACHABLE } from '../grid/distance';
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import { headingIndex } from '../grid/heading-graph';
import type { PlanTask } from './plan-task';
import { fromTaskInstance } from './task-instance';

/** The sum of single-agent optimal costs in the model's own unit, or null when some goal is unreachable or the input is bad. */
export function taskLowerBound(task: PlanTask): number | null {
  try {
    const instance = fromTaskInstance(task.instance);
    let sum = 0;
    for (const a of instance.agents) {
      if (task.model.model === 'weighted-split') {
        const d = headingDistancesToGoal(instance.grid, a.goal, { forwardMs: task.profile.forwardMs, quarterTurnMs: task.profile.quarterTurnMs });
        const rule = a.startHeading ?? task.model.startHeading;
        const headings = rule === 'free' ? [0, 1, 2, 3] : [headingIndex(rule)];
        const best = Math.min(...headings.map((h) => d[a.start * 4 + h]));
        if (!Number.isFinite(best)) return null;
        sum += best;
      } else {
        const d = bfsDistances(instance.grid, a.goal)[a.start];
        if (d >= UNREACHABLE) return null;
        sum += d;
      }
    }
    return sum;
  } catch {
    return null;
  }
}
