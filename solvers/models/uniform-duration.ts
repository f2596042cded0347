/**
 * The uniform-duration plan model: the classic plan (CBS on unit steps, optimal sum-of-costs),
 * executed with every abstract step stretched to the longest action a robot may need in one
 * step (turn back then forward: forward + 2 × quarter turn). The fleet then stays in step at
 * nominal times, and turn-inclusive makespan = makespan × step length exactly.
 */
import type { RobotProfile, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { scheduleFromPaths, uniformStepMs, type TurnSchedule } from './turn-schedule';

export { uniformStepMs };

/** The uniform-duration schedule of a classic plan (its unit-step paths). */
export function uniformDurationSchedule(
  instance: MapfInstance,
  paths: readonly (readonly number[])[],
  profile: RobotProfile,
  startHeading: StartHeading,
): TurnSchedule {
  return scheduleFromPaths(instance, paths, profile, { startHeading, stretch: 'uniform' });
}
