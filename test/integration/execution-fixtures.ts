/**
 * An invented instance for the execution suites (integration and e2e): "relay-lane", a 12×3 yard
 * whose middle row is a wall with gaps at both ends. Robots queue nose to tail in the top lane and
 * each drives 7 cells east, so the unit-step plan is nose-to-tail following: safe at nominal
 * times, unsafe once timing jitter lets a follower catch up, safe again when dependency-gated.
 */
import type { RobotProfile } from '@shared/plan';

/** The map file. */
export const RELAY_MAP_NAME = 'relay-lane.map';
/** The scenario file (on RELAY_MAP_NAME). */
export const RELAY_SCENARIO_NAME = 'relay-lane-queue.scen';

/** The map text: width 12, height 3. */
export const RELAY_MAP = ['type octile', 'height 3', 'width 12', 'map', '............', '.@@@@@@@@@@.', '............', ''].join('\n');

/** Starts and goals, leader first: robot i starts at [3 − i, 0] and stops 7 cells east. Two more robots use the bottom lane westwards. */
export const RELAY_TASKS: readonly { readonly start: readonly [number, number]; readonly goal: readonly [number, number] }[] = [
  { start: [3, 0], goal: [10, 0] },
  { start: [2, 0], goal: [9, 0] },
  { start: [1, 0], goal: [8, 0] },
  { start: [0, 0], goal: [7, 0] },
];

/** The scenario text (bucket, map, size, start, goal, straight-line length). */
export const RELAY_SCENARIO = ['version 1', ...RELAY_TASKS.map((t) =>
  ['0', RELAY_MAP_NAME, '12', '3', t.start[0], t.start[1], t.goal[0], t.goal[1], '7.00000000'].join('\t')), ''].join('\n');

/** A small differential-drive robot on a 1 m grid (invented figures): 70 cm disks on 1 m cells. */
export const RELAY_PROFILE: RobotProfile = {
  forwardMs: 1000,
  quarterTurnMs: 500,
  waitMs: 1000,
  cellPitchMm: 1000,
  robotDiameterMm: 700,
  timingJitter: 0,
};
