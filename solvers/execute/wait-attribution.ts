/**
 * Who waited for whom in one realised run, and the critical chain that set its realised
 * makespan. Built from the run's times after the fact (only for the viewer's one-run timeline,
 * never inside the Monte Carlo loop): realise-times.ts records, per action, whose end released it.
 */
import type { ChainSegment, ExecutionPolicy, RobotWait, WaitReason } from './execution-types';
import type { PreparedPlan } from './prepared-plan';
import { RELEASED_BY_NONE, RELEASED_BY_PLANNED_START, type RunTimes } from './realise-times';

/** The reason a release by another action's end has under `policy`. */
function reasonOf(policy: ExecutionPolicy): WaitReason {
  return policy === 'dependency-gated' ? 'dependency' : 'barrier';
}

/** Per action: the robot it waited for and why (both null when it did not wait). */
export function actionWait(
  p: PreparedPlan, times: RunTimes, policy: ExecutionPolicy, a: number,
): { readonly waitedFor: number | null; readonly waitReason: WaitReason | null } {
  const by = times.releasedBy[a];
  if (by === RELEASED_BY_NONE || !(times.waited[a] > 0)) return { waitedFor: null, waitReason: null };
  if (by === RELEASED_BY_PLANNED_START) return { waitedFor: null, waitReason: 'planned-start' };
  return { waitedFor: p.robotOf[by], waitReason: reasonOf(policy) };
}

/**
 * Per robot, the total it waited before reaching its goal for good (actions up to its last
 * forward move, as RunMetrics counts waiting) and the ms waited for each releasing robot (largest
 * first, then by robot).
 */
export function waitByRobot(p: PreparedPlan, times: RunTimes): RobotWait[] {
  const out: RobotWait[] = [];
  for (let r = 0; r < p.robotCount; r++) {
    let waitedMs = 0;
    const forRobot = new Map<number, number>();
    for (let a = p.first[r]; a <= p.lastForward[r]; a++) {
      const w = times.waited[a];
      if (!(w > 0)) continue;
      waitedMs += w;
      const by = times.releasedBy[a];
      if (by >= 0) forRobot.set(p.robotOf[by], (forRobot.get(p.robotOf[by]) ?? 0) + w);
    }
    const waitedFor = [...forRobot].map(([robot, ms]) => ({ robot, ms })).sort((x, y) => y.ms - x.ms || x.robot - y.robot);
    out.push({ robot: r, waitedMs, waitedFor });
  }
  return out;
}

/**
 * The critical chain of the run, earliest first. Start at the robot whose arrival (end of its
 * last forward move; lowest index on ties) is the realised makespan, at that move. Walk back
 * through its own actions while each started right when the previous one ended: that stretch is
 * an `own` segment. The action where the walk stops started at 0 (chain complete), or was held
 * by the plan's clock (a `planned-start` segment, the idle stretch; chain complete: whatever
 * happened before it had slack and did not set the makespan), or was released by the end of
 * action b of another robot: a wait segment (the idle stretch, `waitedFor` = b's robot), and
 * the walk continues at b. Empty when the makespan is not finite or is 0.
 */
export function criticalChain(p: PreparedPlan, times: RunTimes, policy: ExecutionPolicy): ChainSegment[] {
  const { start, end, waited, releasedBy } = times;
  let robot = -1;
  let makespan = 0;
  for (let r = 0; r < p.robotCount; r++) {
    const lf = p.lastForward[r];
    const arrival = lf < 0 ? 0 : end[lf];
    if (arrival > makespan) {
      makespan = arrival;
      robot = r;
    }
  }
  if (robot < 0 || !Number.isFinite(makespan)) return [];
  const reversed: ChainSegment[] = [];
  let a = p.lastForward[robot];
  // Every step moves to an action that ends no later than the current one starts: at most
  // actionCount steps (a guard against a malformed times buffer, never reached otherwise).
  for (let guard = 0; guard <= p.actionCount; guard++) {
    const r = p.robotOf[a];
    const toMs = end[a];
    let b = a;
    while (b > p.first[r] && !(waited[b] > 0 && releasedBy[b] !== RELEASED_BY_NONE)) b--;
    const isReleased = waited[b] > 0 && releasedBy[b] !== RELEASED_BY_NONE;
    if (start[b] < toMs) reversed.push({ robot: r, fromMs: start[b], toMs, reason: 'own', waitedFor: null });
    if (!isReleased) break;
    if (releasedBy[b] === RELEASED_BY_PLANNED_START) {
      reversed.push({ robot: r, fromMs: start[b] - waited[b], toMs: start[b], reason: 'planned-start', waitedFor: null });
      break;
    }
    const by = releasedBy[b];
    reversed.push({ robot: r, fromMs: start[b] - waited[b], toMs: start[b], reason: reasonOf(policy), waitedFor: p.robotOf[by] });
    a = by;
  }
  return reversed.reverse();
}
