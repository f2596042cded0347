/** The realised timeline of one run, for the plan viewer's animation and Gantt chart. */
import type { RobotProfile } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { ExecutionRunner } from './execution-runner';
import type { ExecutablePlan, ExecutionOptions, RealisedAction, RunTimeline } from './execution-types';
import { actionWait, criticalChain, waitByRobot } from './wait-attribution';

/**
 * Per robot, the realised actions of run `run` of the batch described by `options` (the same
 * run the Monte Carlo batch with that seed simulates), padding included and flagged; who
 * waited for whom and the critical chain of the realised makespan (wait-attribution.ts).
 */
export function realisedTimeline(
  instance: MapfInstance,
  plan: ExecutablePlan,
  profile: RobotProfile,
  options: Omit<ExecutionOptions, 'runs' | 'signal'>,
  run = 0,
): RunTimeline {
  const runner = new ExecutionRunner(instance, plan, profile, options);
  const metrics = runner.run(run);
  const p = runner.prepared;
  const { start, end, cutAt, waited } = runner.times;
  const robots: RealisedAction[][] = [];
  for (let r = 0; r < p.robotCount; r++) {
    const list: RealisedAction[] = [];
    for (let a = p.first[r]; a < p.first[r + 1]; a++) {
      const planned = p.actions[a];
      list.push({
        action: planned.action,
        from: planned.from,
        to: planned.to,
        heading: planned.heading,
        step: planned.step,
        plannedStart: planned.start,
        plannedEnd: planned.end,
        start: start[a],
        end: end[a],
        durationMs: runner.duration[a],
        waitedMs: waited[a],
        ...actionWait(p, runner.times, options.policy, a),
        stoppedAt: cutAt[a] < Infinity ? cutAt[a] : start[a] === Infinity && runner.stoppedAt[r] < Infinity && (a === p.first[r] || end[a - 1] < Infinity) ? runner.stoppedAt[r] : null,
        isPadding: p.isPadding[a] === 1,
      });
    }
    robots.push(list);
  }
  return {
    robots, metrics, waitByRobot: waitByRobot(p, runner.times), criticalChain: criticalChain(p, runner.times, options.policy),
  };
}
