/**
 * How a plan of unit-step paths becomes the turn-inclusive schedule the fleet runs, and the
 * turn-inclusive figures of a timed schedule. One place, so an execution task (worker thread) and
 * the read-only view of a stored result (request handler; linear in the plan's length, no search)
 * hand the simulator the same schedule, and the browser's replay of a result equals the server's.
 */
import type { PlanFigures } from '@shared/executions';
import type { Heading, PlanModel, RobotProfile, Schedule } from '@shared/plan';
import type { MapfInstance } from '@solvers/instance';
import { scheduleFromPaths, type TurnSchedule } from '@solvers/models/turn-schedule';

/** The turn-inclusive schedule of `paths` (cells y * width + x) under `model`: uniform-duration stretches every step to the longest action. */
export function pathsSchedule(
  model: PlanModel,
  startHeading: Heading | 'free',
  instance: MapfInstance,
  paths: readonly (readonly number[])[],
  profile: RobotProfile,
): TurnSchedule {
  return scheduleFromPaths(instance, paths, profile, { startHeading, stretch: model === 'uniform-duration' ? 'uniform' : 'none' });
}

/** Turn-inclusive figures of a timed schedule: each robot's cost is the end of its last forward (0 if it never moves). */
export function arrivalFigures(schedule: Schedule): Pick<PlanFigures, 'turnInclusiveSocMs' | 'turnInclusiveMakespanMs'> {
  let soc = 0;
  let makespan = 0;
  for (const list of schedule) {
    let arrival = 0;
    for (const a of list) if (a.action === 'forward') arrival = a.end;
    soc += arrival;
    makespan = Math.max(makespan, arrival);
  }
  return { turnInclusiveSocMs: soc, turnInclusiveMakespanMs: makespan };
}
