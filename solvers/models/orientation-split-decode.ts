/**
 * Between the orientation-split engine's packed states and the plan vocabulary: decoding state
 * paths into (cell, heading) steps, and checking a start-heading option.
 */
import { HEADINGS, type StartHeading } from '@shared/plan';
import { headingLetter } from '../grid/heading-graph';
import type { OrientedState } from '../validate/orientation-split';

/** Returns `rule` when it is N, E, S, W or free; otherwise throws a RangeError naming the option and the model. */
export function checkStartHeading(rule: unknown, model: string): StartHeading {
  if (rule === 'free' || (HEADINGS as readonly unknown[]).includes(rule)) return rule as StartHeading;
  throw new RangeError(`${model}: option startHeading must be N, E, S, W or free, got ${JSON.stringify(rule)}`);
}

/**
 * The (cell, heading) steps of one packed state path (`cell * 4 + heading`, or
 * `4 * cellCount + cell` for the undecided start heading). An undecided step takes the heading
 * of the first decided step after it — the heading the robot chose at time 0 for free — or N
 * when the agent never leaves its start.
 */
export function decodeStatePath(path: Int32Array | readonly number[], cellCount: number): OrientedState[] {
  const out: OrientedState[] = new Array(path.length);
  let later = 0;
  for (let t = path.length - 1; t >= 0; t--) {
    const s = path[t];
    if (s < 4 * cellCount) {
      later = s & 3;
      out[t] = { cell: s >> 2, heading: headingLetter(later) };
    } else {
      out[t] = { cell: s - 4 * cellCount, heading: headingLetter(later) };
    }
  }
  return out;
}
