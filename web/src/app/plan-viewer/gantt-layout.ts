/**
 * The per-robot timeline (Gantt) of one run as flat segment lists: forward, turn, wait, held by
 * a barrier or dependency, at goal (padding), stopped by a collision, blocked by a dependency
 * cycle. Computed once per run; drawing reads the arrays.
 */
import { KIND, type FleetTrack } from './fleet-track';

/** Segment categories, in legend order. */
export const GANTT_KINDS = ['forward', 'turn', 'wait', 'held', 'at-goal', 'stopped', 'blocked'] as const;
export type GanttKind = (typeof GANTT_KINDS)[number];

/** Legend labels of the categories. */
export const GANTT_LABELS: Readonly<Record<GanttKind, string>> = {
  forward: 'Forward',
  turn: 'Quarter turn',
  wait: 'Planned wait',
  held: 'Waiting on dependency',
  'at-goal': 'At goal',
  stopped: 'Stopped by collision',
  blocked: 'Blocked (cycle)',
};

/** Segments of every robot, in robot order then time order. */
export interface GanttSegments {
  readonly count: number;
  readonly robot: Int32Array;
  /** Index into GANTT_KINDS. */
  readonly kind: Uint8Array;
  readonly t0: Float64Array;
  readonly t1: Float64Array;
  /** Right end of the chart, ms. */
  readonly horizonMs: number;
}

/** Lists the segments of `track`; open-ended states run to the track's horizon. */
export function ganttSegments(track: FleetTrack): GanttSegments {
  const robot: number[] = [];
  const kind: number[] = [];
  const t0: number[] = [];
  const t1: number[] = [];
  const horizon = track.horizonMs;
  const push = (r: number, k: GanttKind, a: number, b: number): void => {
    if (!(b > a)) return;
    robot.push(r);
    kind.push(GANTT_KINDS.indexOf(k));
    t0.push(a);
    t1.push(b);
  };
  for (let r = 0; r < track.robotCount; r++) {
    let ownEnd = 0;
    for (let a = track.first[r]; a < track.first[r + 1]; a++) {
      const start = track.start[a];
      if (start === Infinity) {
        push(r, track.stoppedAt[r] < Infinity ? 'stopped' : 'blocked', ownEnd, horizon);
        break;
      }
      if (track.waited[a] > 0) push(r, 'held', start - track.waited[a], start);
      const cut = track.cutAt[a];
      const end = cut < Infinity ? cut : track.end[a];
      push(r, categoryOf(track, a), start, end);
      if (cut < Infinity) {
        push(r, 'stopped', cut, horizon);
        break;
      }
      ownEnd = end;
    }
  }
  return {
    count: robot.length, robot: Int32Array.from(robot), kind: Uint8Array.from(kind),
    t0: Float64Array.from(t0), t1: Float64Array.from(t1), horizonMs: horizon,
  };
}

function categoryOf(track: FleetTrack, a: number): GanttKind {
  if (track.isPadding[a] === 1) return 'at-goal';
  const k = track.kind[a];
  return k === KIND.forward ? 'forward' : k === KIND.wait ? 'wait' : 'turn';
}

/** The lowest a robot's row gets, px: a bar and its outline stay readable; more robots scroll instead of squeezing. */
export const GANTT_MIN_ROW_PX = 10;

/** Row height (px) for `robots` rows within `maxHeightPx`, between GANTT_MIN_ROW_PX and 14 px (the chart scrolls past `maxHeightPx`). */
export function ganttRowHeight(robots: number, maxHeightPx: number): number {
  return Math.max(GANTT_MIN_ROW_PX, Math.min(14, Math.floor(maxHeightPx / Math.max(1, robots))));
}
