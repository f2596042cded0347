/** Tiny instances and runs for the plan viewer's specs (not part of the app bundle: imported by specs only). */
import type { RobotProfile } from '@shared/plan';
import { ExecutionRunner, type ExecutionPolicy, type NoiseModel } from '@solvers/execute';
import { gridFromText } from '@solvers/grid/grid';
import type { MapfInstance } from '@solvers/instance';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { trackFromRunner, type FleetTrack } from './fleet-track';

/** 1 m cells, 70 cm robots, 1 s forward, 0.5 s quarter turn (invented figures). */
export const TEST_PROFILE: RobotProfile = {
  forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0,
};

/** A map from text rows, with tasks given as [start, goal] cell indices and optional start headings. */
export function testInstance(text: string, tasks: readonly (readonly [number, number, ('N' | 'E' | 'S' | 'W')?])[]): MapfInstance {
  return { grid: gridFromText(text), agents: tasks.map(([start, goal, h]) => (h ? { start, goal, startHeading: h } : { start, goal })) };
}

/** Runs run `run` of unit-step `paths` (classic turn schedule) and returns the runner and its track. */
export function runPaths(
  instance: MapfInstance, paths: number[][], options: { policy?: ExecutionPolicy; noise?: Partial<NoiseModel>; seed?: number; run?: number; onCollision?: 'count' | 'stop' } = {},
): { runner: ExecutionRunner; track: FleetTrack } {
  const { schedule } = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: 'none' });
  const runner = new ExecutionRunner(instance, { timeline: 'steps', schedule }, TEST_PROFILE, {
    policy: options.policy ?? 'open-loop', noise: options.noise ?? {}, seed: options.seed ?? 1, onCollision: options.onCollision,
  });
  runner.run(options.run ?? 0);
  return { runner, track: trackFromRunner(runner) };
}
