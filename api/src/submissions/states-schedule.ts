/**
 * The executed action list of an orientation-split plan: each unit step becomes its one action
 * (forward, a quarter turn, or a wait) at the robot profile's duration, back to back, with
 * `step` = the unit step. The turn-inclusive cost of an agent is the end of its final arrival at
 * its goal cell (turns and waits there afterwards cost nothing, as in the step cost).
 */
import type { CellXY, Heading, RobotProfile, ScheduledAction } from '@shared/plan';

const RIGHT: Readonly<Record<Heading, Heading>> = { N: 'E', E: 'S', S: 'W', W: 'N' };

/** A schedule and its turn-inclusive figures. */
export interface StatesSchedule {
  readonly schedule: ScheduledAction[][];
  readonly turnInclusiveSocMs: number;
  readonly turnInclusiveMakespanMs: number;
}

/** Builds the schedule of validated states; `goals` are the agents' goal cells as [x, y]. */
export function scheduleFromStates(
  states: readonly (readonly (readonly [number, number, Heading])[])[],
  goals: readonly CellXY[],
  profile: RobotProfile,
): StatesSchedule {
  let soc = 0;
  let makespan = 0;
  const schedule = states.map((seq, i) => {
    const actions: ScheduledAction[] = [];
    let now = 0;
    let cost = 0;
    for (let t = 0; t + 1 < seq.length; t++) {
      const [x0, y0, h0] = seq[t];
      const [x1, y1, h1] = seq[t + 1];
      const moved = x0 !== x1 || y0 !== y1;
      const action: ScheduledAction['action'] = moved ? 'forward' : h1 === h0 ? 'wait' : RIGHT[h0] === h1 ? 'turn-right' : 'turn-left';
      const ms = action === 'forward' ? profile.forwardMs : action === 'wait' ? profile.waitMs : profile.quarterTurnMs;
      actions.push({ action, from: [x0, y0], to: [x1, y1], heading: h1, start: now, end: now + ms, step: t });
      now += ms;
      // The last step that enters the goal cell fixes the cost; later ones (if it leaves and returns) move it on.
      if (moved && x1 === goals[i][0] && y1 === goals[i][1]) cost = now;
    }
    soc += cost;
    makespan = Math.max(makespan, cost);
    return actions;
  });
  return { schedule, turnInclusiveSocMs: soc, turnInclusiveMakespanMs: makespan };
}
