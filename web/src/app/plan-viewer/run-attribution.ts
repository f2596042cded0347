/**
 * Who waited for whom in the drawn run, and the chain of segments that set its realised makespan,
 * as short sentences for the viewer and as segments the Gantt chart outlines. Reads the
 * simulator's attribution of one run (solvers/execute RunTimeline: waitByRobot, criticalChain).
 * Robots are numbered from 1 on screen (0-based inside the simulator).
 */
import type { ExecutionPolicyName } from '@shared/executions-constants';
import type { RunTimeline } from '@solvers/execute';
import { formatSeconds } from './viewer-format';

/** One link of the chain that set the realised makespan (simulator form, robots 0-based). */
export interface ChainSegment {
  readonly robot: number;
  readonly fromMs: number;
  readonly toMs: number;
  readonly reason: 'own' | 'dependency' | 'barrier' | 'planned-start';
  readonly waitedFor: number | null;
}

/** Per robot: how long it waited in the run and for whom (simulator form, robots 0-based). */
export interface RobotWait {
  readonly robot: number;
  readonly waitedMs: number;
  readonly waitedFor: readonly { readonly robot: number; readonly ms: number }[];
}

/** The attribution fields of a run timeline (absent on a simulator that does not attribute waits). */
type AttributedTimeline = RunTimeline & { readonly waitByRobot?: readonly RobotWait[]; readonly criticalChain?: readonly ChainSegment[] };

/** What the viewer says about one run. */
export interface RunAttribution {
  /** "robot 3 waited 1.2 s: 0.8 s for robot 5, 0.4 s for robot 1", robots that waited only, most waiting first. */
  readonly waits: readonly string[];
  /** The chain, earliest first: "robot 5 drove its own actions from 0 s to 12.4 s", … */
  readonly chain: readonly string[];
  /** The chain's segments for the Gantt chart. */
  readonly chainSegments: readonly ChainSegment[];
  /** Why the list is short or empty, or null. */
  readonly note: string | null;
}

const REASON_TEXT: Readonly<Record<ChainSegment['reason'], string>> = {
  own: 'drove its own actions',
  dependency: 'waited on a dependency',
  barrier: 'waited at a lockstep barrier',
  'planned-start': 'waited for the planned start of its next action',
};

/** The sentences and chain of `timeline` (one run under `policy`). */
export function runAttribution(timeline: RunTimeline, policy: ExecutionPolicyName): RunAttribution {
  const t = timeline as AttributedTimeline;
  const robotName = (r: number) => `robot ${r + 1}`;
  const waits = t.waitByRobot
    ? [...t.waitByRobot]
      .filter((w) => w.waitedMs > 0)
      .sort((a, b) => b.waitedMs - a.waitedMs || a.robot - b.robot)
      .map((w) => {
        const whom = w.waitedFor.filter((x) => x.ms > 0).map((x) => `${formatSeconds(x.ms)} for ${robotName(x.robot)}`);
        return `${robotName(w.robot)} waited ${formatSeconds(w.waitedMs)}${whom.length > 0 ? `: ${whom.join(', ')}` : ''}`;
      })
    : fallbackWaits(timeline);
  const chainSegments = t.criticalChain ?? [];
  const chain = chainSegments.map((c) => {
    const whom = c.waitedFor !== null ? ` for ${robotName(c.waitedFor)}` : '';
    return `${robotName(c.robot)} ${REASON_TEXT[c.reason]}${whom}, ${formatSeconds(c.fromMs)} to ${formatSeconds(c.toMs)}`;
  });
  let note: string | null = null;
  if (!t.criticalChain) note = 'This build of the simulator does not name whom a robot waited for.';
  else if (waits.length === 0) {
    note = policy === 'open-loop'
      ? 'Open-loop: no robot waits for another; each runs its own plan, so the realised makespan is the slowest robot\'s own time.'
      : 'No robot waited for another in this run: the gating never held anyone, so the realised makespan is the slowest robot\'s own time.';
  }
  return { waits, chain, chainSegments, note };
}

/** Per-robot waiting summed from the realised actions, without whom (older simulator builds). */
function fallbackWaits(timeline: RunTimeline): string[] {
  return timeline.robots
    .map((actions, r) => ({ r, ms: actions.reduce((sum, a) => sum + a.waitedMs, 0) }))
    .filter((w) => w.ms > 0)
    .sort((a, b) => b.ms - a.ms || a.r - b.r)
    .map((w) => `robot ${w.r + 1} waited ${formatSeconds(w.ms)}`);
}
