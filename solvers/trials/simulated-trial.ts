/**
 * A trial log written from a simulated run: what a fleet that behaved exactly like the simulator
 * would have logged. For tests (calibration must recover the noise model it was drawn from) and
 * for demo data; a simulated log is no field trial and must never be stored as one without saying so.
 */
import type { TrialLog, TrialRow } from '@shared/trial-log';
import type { RunTimeline } from '../execute/execution-types';

/** Options of trialLogFromTimeline. */
export interface SimulatedTrialOptions {
  /** Whether rows carry x_mm, y_mm (the cell centre where the action ended) and heading. */
  readonly withPose?: boolean;
  /** Cell pitch for the positions, mm (needed with withPose). */
  readonly cellPitchMm?: number;
}

/**
 * The log of one simulated run: per robot its plan actions that started (padding left out, as a
 * field robot at its goal logs nothing), with realised times; a collision marks the action of the
 * lower-numbered robot running at its time, and an action a collision stop cut short ends at the
 * stop and marks an abort. Rows in order of start time (ties: robot, then plan order), each with
 * the line it would have in CSV (header on line 1).
 */
export function trialLogFromTimeline(file: string, timeline: RunTimeline, options: SimulatedTrialOptions = {}): TrialLog {
  const pitch = options.cellPitchMm ?? 1;
  const marked = new Set<string>();
  for (const c of timeline.metrics.collisions) {
    const r = c.robots[0];
    const k = timeline.robots[r].findIndex((a) => !a.isPadding && a.start <= c.timeMs && c.timeMs <= (a.end < Infinity ? a.end : a.stoppedAt ?? Infinity));
    if (k >= 0) marked.add(`${r}:${k}`);
  }
  const rows: (Omit<TrialRow, 'line'> & { k: number })[] = [];
  timeline.robots.forEach((actions, robot) => {
    actions.forEach((a, k) => {
      if (a.isPadding || a.start === Infinity) return;
      const isCut = a.end === Infinity;
      const endMs = isCut ? (a.stoppedAt ?? a.start) : a.end;
      const event = isCut ? 'abort' : marked.has(`${robot}:${k}`) ? 'collision' : undefined;
      rows.push({
        robot, action: a.action, startMs: a.start, endMs, k,
        ...(options.withPose && !isCut ? { xMm: a.to[0] * pitch, yMm: a.to[1] * pitch, heading: a.heading } : {}),
        ...(event ? { event } : {}),
      });
    });
  });
  rows.sort((x, y) => x.startMs - y.startMs || x.robot - y.robot || x.k - y.k);
  return { file, format: 'csv', rows: rows.map(({ k: _k, ...row }, i) => ({ ...row, line: i + 2 })) };
}
