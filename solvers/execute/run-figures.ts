/**
 * The timing figures of one run from its realised action ends and waits: realised makespan and
 * sum-of-costs, waiting (total, mean and max per robot) and finish spread. One computation for
 * simulated runs (ExecutionRunner) and field trials (solvers/trials/compare-to-plan.ts), so the
 * two report the same figures by the same rules (execution-types.ts, RunMetrics).
 */
import type { RunMetrics } from './execution-types';
import type { PreparedPlan } from './prepared-plan';

/** The RunMetrics fields that follow from times alone. */
export type TimingFigures = Pick<
  RunMetrics, 'realisedMakespanMs' | 'realisedSocMs' | 'waitingMs' | 'waitingMeanPerRobotMs' | 'waitingMaxPerRobotMs' | 'finishSpreadMs'
>;

/**
 * Figures of a run of `p` whose action a (padded list, p's indexing) ended at `end[a]` (Infinity
 * when it never finished) after standing idle `waited[a]` before it started.
 */
export function timingFigures(p: PreparedPlan, end: Float64Array, waited: Float64Array): TimingFigures {
  let makespan = 0;
  let soc = 0;
  let firstFinish = Infinity;
  let lastFinish = 0;
  for (let r = 0; r < p.robotCount; r++) {
    const lf = p.lastForward[r];
    const arrival = lf < 0 ? 0 : end[lf];
    if (arrival > makespan) makespan = arrival;
    soc += arrival;
    const finish = p.first[r + 1] > p.first[r] ? end[p.first[r + 1] - 1] : 0;
    if (finish < firstFinish) firstFinish = finish;
    if (finish > lastFinish) lastFinish = finish;
  }
  // Waiting: the sum over robots (the historical `waitingMs`) and per robot its mean and max,
  // of the idle time before each robot reaches its goal for good (actions up to its last
  // forward move): a robot holding its goal through barriers or planned starts of padding and
  // trailing actions is done, not waiting (execution-types.ts, RunMetrics.waitingMs).
  let waiting = 0;
  let waitingMax = 0;
  for (let r = 0; r < p.robotCount; r++) {
    let robotWaited = 0;
    for (let a = p.first[r]; a <= p.lastForward[r]; a++) {
      robotWaited += waited[a];
      // Added action by action, in plan order, as before the per-robot figures (same bits).
      waiting += waited[a];
    }
    if (robotWaited > waitingMax) waitingMax = robotWaited;
  }
  const isComplete = makespan < Infinity;
  return {
    realisedMakespanMs: isComplete ? makespan : null,
    realisedSocMs: isComplete ? soc : null,
    waitingMs: waiting,
    waitingMeanPerRobotMs: p.robotCount === 0 ? 0 : waiting / p.robotCount,
    waitingMaxPerRobotMs: waitingMax,
    // The same rule under every policy: lockstep closes no barrier after the last step / the
    // planned makespan, so its robots finish apart once durations are noisy (execution-types.ts).
    finishSpreadMs: p.robotCount === 0 ? 0 : lastFinish === Infinity ? null : lastFinish - firstFinish,
  };
}
