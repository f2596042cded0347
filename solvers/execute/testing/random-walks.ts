/** Seeded random-walk fleet plans for the simulator's tests and benchmark. */
import type { Heading, RobotProfile, ScheduledAction } from '@shared/plan';
import { gridFromRows } from '../../grid/grid';
import type { MapfInstance } from '../../instance';
import { createRng } from '../../random';

const DELTA: Record<Heading, [number, number]> = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] };
const ORDER: Heading[] = ['N', 'E', 'S', 'W'];

/** What randomWalks draws. */
export interface RandomWalkOptions {
  readonly robots: number;
  /** Actions per robot. */
  readonly actions: number;
  /** The open grid is side × side. */
  readonly side: number;
  /** Robots start on a lattice, 10 per row, `spacing` apart across and twice that down. */
  readonly spacing: number;
  readonly profile: RobotProfile;
  /** Every third robot stops after a random number of its actions (one more draw per such robot). */
  readonly stopsEarly: boolean;
}

/**
 * Seeded random walks on an open grid (forward 60 %, quarter turns 30 %, waits 10 %), timed with
 * the profile's nominal durations back to back: plans that are not conflict-free, for the
 * simulator's regression cases and its benchmark.
 */
export function randomWalks(seed: number, o: RandomWalkOptions): { instance: MapfInstance; schedule: ScheduledAction[][] } {
  const { robots, actions, side, spacing, profile } = o;
  const rng = createRng(seed);
  const grid = gridFromRows(Array.from({ length: side }, () => Array(side).fill(1)));
  const schedule: ScheduledAction[][] = [];
  const agents = [];
  for (let r = 0; r < robots; r++) {
    let x = 2 + (r % 10) * spacing;
    let y = 2 + Math.floor(r / 10) * spacing * 2;
    const start = y * side + x;
    let heading: Heading = ORDER[rng.int(4)];
    let now = 0;
    const list: ScheduledAction[] = [];
    const n = actions - (o.stopsEarly && r % 3 === 0 ? rng.int(actions) : 0);
    for (let k = 0; k < n; k++) {
      const u = rng.next();
      const [dx, dy] = DELTA[heading];
      const canMove = x + dx >= 0 && y + dy >= 0 && x + dx < side && y + dy < side;
      let a: ScheduledAction;
      if (u < 0.6 && canMove) {
        a = { action: 'forward', from: [x, y], to: [x + dx, y + dy], heading, start: now, end: now + profile.forwardMs, step: k };
        x += dx;
        y += dy;
      } else if (u < 0.9) {
        const isRight = rng.next() < 0.5;
        heading = ORDER[(ORDER.indexOf(heading) + (isRight ? 1 : 3)) % 4];
        a = { action: isRight ? 'turn-right' : 'turn-left', from: [x, y], to: [x, y], heading, start: now, end: now + profile.quarterTurnMs, step: k };
      } else {
        a = { action: 'wait', from: [x, y], to: [x, y], heading, start: now, end: now + profile.waitMs, step: k };
      }
      now = a.end;
      list.push(a);
    }
    schedule.push(list);
    agents.push({ start, goal: y * side + x });
  }
  return { instance: { grid, agents } as MapfInstance, schedule };
}
