/**
 * Who waited for whom in the drawn run, and the chain of segments that set its realised makespan,
 * as short sentences for the viewer and as segments the Gantt chart outlines. Reads the
 * simulator's attribution of one run (solvers/execute RunTimeline: waitByRobot, criticalChain).
 * Robots are numbered from 1 on screen (0-based inside the simulator).
 */
import type { ExecutionPolicyName } from '@shared/executions-constants';
import type { ChainSegment, RunTimeline } from '@solvers/execute';
import { formatSeconds } from './viewer-format';

export type { ChainSegment } from '@solvers/execute';

/** What the viewer says about one run. */
export interface RunAttribution {
  /** "robot 3 waited 1.2 s: 0.8 s for robot 5, 0.4 s for robot 1", robots that waited only, most waiting first. */
  readonly waits: readonly string[];
  /** The longest single waits, "robot 3 waited 0.8 s for robot 5 (dependency), 12.1 s to 12.9 s", at most MAX_WAIT_EVENTS. */
  readonly events: readonly string[];
  /** How many shorter waits the event list leaves out. */
  readonly moreEvents: number;
  /** The chain, earliest first: "robot 5 drove its own actions from 0 s to 12.4 s", … */
  readonly chain: readonly string[];
  /** The chain's segments for the Gantt chart. */
  readonly chainSegments: readonly ChainSegment[];
  /** Why the list is short or empty, or null. */
  readonly note: string | null;
}

/** Single waits listed at most (a large fleet can have thousands). */
export const MAX_WAIT_EVENTS = 8;

const REASON_TEXT: Readonly<Record<ChainSegment['reason'], string>> = {
  own: 'drove its own actions',
  dependency: 'waited on a dependency',
  barrier: 'waited at a lockstep barrier',
  'planned-start': 'waited for the planned start of its next action',
};

/** The sentences and chain of `timeline` (one run under `policy`). */
export function runAttribution(timeline: RunTimeline, policy: ExecutionPolicyName): RunAttribution {
  const robotName = (r: number) => `robot ${r + 1}`;
  const waits = [...timeline.waitByRobot]
    .filter((w) => w.waitedMs > 0)
    .sort((a, b) => b.waitedMs - a.waitedMs || a.robot - b.robot)
    .map((w) => {
      const whom = w.waitedFor.filter((x) => x.ms > 0).map((x) => `${formatSeconds(x.ms)} for ${robotName(x.robot)}`);
      const own = w.waitedMs - w.waitedFor.reduce((sum, x) => sum + x.ms, 0);
      // The rest of a robot's wait is on its own planned start (lockstep on the ms timeline).
      if (own > 0.5) whom.push(`${formatSeconds(own)} for its planned start`);
      return `${robotName(w.robot)} waited ${formatSeconds(w.waitedMs)}${whom.length > 0 ? `: ${whom.join(', ')}` : ''}`;
    });
  // Padding actions (after a robot reached its goal for good) are left out, as in the robot totals
  // above: a robot held at its goal by a lockstep barrier is not waiting to get anywhere.
  const all = timeline.robots.flatMap((actions, robot) => actions
    .filter((a) => !a.isPadding && a.waitedMs > 0 && Number.isFinite(a.start))
    .map((a) => ({ robot, a })));
  all.sort((x, y) => y.a.waitedMs - x.a.waitedMs || x.a.start - y.a.start);
  const events = all.slice(0, MAX_WAIT_EVENTS).map(({ robot, a }) => {
    const whom = a.waitedFor !== null ? ` for ${robotName(a.waitedFor)}` : '';
    const why = a.waitReason ? ` (${a.waitReason})` : '';
    return `${robotName(robot)} waited ${formatSeconds(a.waitedMs)}${whom}${why}, ${formatSeconds(a.start - a.waitedMs)} to ${formatSeconds(a.start)}`;
  });
  const chainSegments = timeline.criticalChain;
  const chain = chainSegments.map((c) => {
    const whom = c.waitedFor !== null ? ` for ${robotName(c.waitedFor)}` : '';
    return `${robotName(c.robot)} ${REASON_TEXT[c.reason]}${whom}, ${formatSeconds(c.fromMs)} to ${formatSeconds(c.toMs)}`;
  });
  let note: string | null = null;
  if (chain.length === 0) note = 'No chain: the run has no realised makespan (a collision stopped robots, or they deadlocked), or no robot moved.';
  else if (waits.length === 0) {
    note = policy === 'open-loop'
      ? 'Open-loop: no robot waits for another; each runs its own plan, so the realised makespan is the slowest robot\'s own time.'
      : 'No robot waited for another in this run: the gating never held anyone, so the realised makespan is the slowest robot\'s own time.';
  }
  return { waits, events, moreEvents: all.length - events.length, chain, chainSegments, note };
}
