/**
 * A field trial checked against the plan it ran, and its figures: the same per-run figures the
 * execution simulator reports for a simulated run (realised makespan and sum-of-costs, waiting,
 * finish spread; solvers/execute/run-figures.ts computes them for both), plus collisions and
 * aborts as the log marks them and each robot's delay against the plan.
 *
 * What a log must hold: per robot exactly the plan's actions in the plan's order (the padding
 * waits the simulator adds to reach the makespan are not plan actions: a robot at its goal just
 * stands, and logs it not). Only a log with an `abort` row may end early: then every robot may
 * stop after any prefix of its actions, since the whole run was stopped.
 *
 * How logged times become the simulator's quantities: action a of robot r realised at the logged
 * [start_ms, end_ms]; the time r stood idle before a is start(a) − end(previous action of r), or
 * start(a) for its first action, the field counterpart of the simulator's waits on barriers and
 * dependencies (a robot idles in the field only when held back). Padding ends where the robot's
 * last action ended (not logged, it takes no time), so the finish spread is last minus first
 * robot's end of its last action, where the simulator's padded lists finish at the plan's
 * makespan plus noise: compare a trial's spread with a simulated one knowing that.
 * Simulation is no safety assessment, and neither is a trial of a few runs.
 */
import type { ActionKind, RobotProfile } from '@shared/plan';
import type { TrialLog, TrialLogError, TrialRow } from '@shared/trial-log';
import type { MapfInstance } from '../instance';
import type { ExecutablePlan } from '../execute/execution-types';
import { preparePlan } from '../execute/prepared-plan';
import { timingFigures, type TimingFigures } from '../execute/run-figures';

/** The first place a log departs from its plan, as an error of the log (line of the row, field `robot` or `action`). */
export interface TrialDivergence extends TrialLogError {
  readonly robot: number;
  /** Index of the robot's action (0-based, in the plan's order) where the log departs. */
  readonly actionIndex: number;
  /** The plan's action there; null when the plan has no more actions for the robot (or no such robot). */
  readonly planned: ActionKind | null;
  /** The logged action there; null when the log stops before it. */
  readonly logged: ActionKind | null;
}

/** One robot's figures in a trial. */
export interface TrialRobotFigures {
  readonly robot: number;
  /** Actions logged / planned (fewer only in an aborted run). */
  readonly actionsLogged: number;
  readonly actionsPlanned: number;
  /** End of the robot's last forward move in the plan, nominal ms (0 when it never moves). */
  readonly plannedArrivalMs: number;
  /** End of its last forward move as logged; null when the run was aborted before it. */
  readonly realisedArrivalMs: number | null;
  /** realisedArrivalMs − plannedArrivalMs; null with no realised arrival. */
  readonly arrivalDelayMs: number | null;
  /** End of its last logged action. */
  readonly lastEndMs: number;
  /** Idle time before its actions up to its last forward move (as RunMetrics.waitingMs counts per robot). */
  readonly waitedMs: number;
}

/** A collision a log marks: the row of the robot that logged it. */
export interface TrialCollision {
  readonly robot: number;
  readonly line: number;
  readonly startMs: number;
  readonly endMs: number;
}

/** The figures of one trial run: the simulator's per-run figures plus the trial's own. */
export interface TrialRunFigures extends TimingFigures {
  /** Whether the run completed every planned action with no collision and no abort marked. */
  readonly isSuccess: boolean;
  /** Whether some row marks an abort. */
  readonly isAborted: boolean;
  /** Rows marked `collision` (each marked row counts once: mark a collision on one robot's row). */
  readonly collisions: number;
  readonly collisionEvents: readonly TrialCollision[];
  readonly perRobot: readonly TrialRobotFigures[];
}

/** The outcome of checking a log against its plan. */
export type TrialComparison =
  | { readonly kind: 'matches'; readonly figures: TrialRunFigures }
  | { readonly kind: 'diverges'; readonly divergence: TrialDivergence };

/**
 * Checks `log` against `plan` (for `instance`, timed for `profile`) and, when it follows the plan,
 * computes the run's figures. Rows are checked in file order, so the divergence reported is the
 * first row of the file that departs from the plan; a log that stops short without an abort is
 * reported after that, at the last row of the lowest-numbered robot that stops short. Throws only
 * when the plan itself is invalid for the instance (preparePlan's message).
 */
export function compareTrialToPlan(instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile, log: TrialLog): TrialComparison {
  const p = preparePlan(instance, plan, profile);
  const robots = p.robotCount;
  const logged: TrialRow[][] = Array.from({ length: robots }, () => []);
  const planned = (r: number): number => plan.schedule[r].length;
  const diverge = (row: TrialRow | null, r: number, k: number, field: 'robot' | 'action', message: string, isShort = false): TrialComparison => {
    const plannedAction = r < robots && k < planned(r) ? plan.schedule[r][k].action : null;
    return {
      kind: 'diverges',
      divergence: {
        file: log.file, line: row?.line ?? null, column: null, field, message,
        robot: r, actionIndex: k, planned: plannedAction, logged: isShort ? null : row?.action ?? null,
      },
    };
  };

  for (const row of log.rows) {
    const r = row.robot;
    if (r >= robots) return diverge(row, r, 0, 'robot', `robot ${r} is not in the plan, which has ${robots} robot${robots === 1 ? '' : 's'} (0–${robots - 1})`);
    const k = logged[r].length;
    if (k >= planned(r)) {
      return diverge(row, r, k, 'action', `robot ${r} has ${planned(r)} planned action${planned(r) === 1 ? '' : 's'}, and this row would be action ${k + 1} (${row.action})`);
    }
    const expected = plan.schedule[r][k].action;
    if (row.action !== expected) {
      return diverge(row, r, k, 'action', `robot ${r}'s action ${k + 1} is ${expected} in the plan, but the log has ${row.action}`);
    }
    logged[r].push(row);
  }
  const isAborted = log.rows.some((row) => row.event === 'abort');
  if (!isAborted) {
    for (let r = 0; r < robots; r++) {
      const k = logged[r].length;
      if (k < planned(r)) {
        const last = logged[r].at(-1) ?? null;
        return diverge(
          last, r, k, 'action',
          `robot ${r} stops after ${k} of its ${planned(r)} planned actions (next: ${plan.schedule[r][k].action}) and no row marks an abort`,
          true,
        );
      }
    }
  }
  return { kind: 'matches', figures: trialFigures(p, plan, logged, isAborted, log) };
}

function trialFigures(
  p: ReturnType<typeof preparePlan>, plan: ExecutablePlan, logged: readonly (readonly TrialRow[])[], isAborted: boolean, log: TrialLog,
): TrialRunFigures {
  const end = new Float64Array(p.actionCount).fill(Infinity);
  const waited = new Float64Array(p.actionCount);
  const perRobot: TrialRobotFigures[] = [];
  for (let r = 0; r < p.robotCount; r++) {
    const rows = logged[r];
    let prevEnd = 0;
    rows.forEach((row, k) => {
      const a = p.first[r] + k;
      end[a] = row.endMs;
      waited[a] = row.startMs - prevEnd;
      prevEnd = row.endMs;
    });
    const isComplete = rows.length === plan.schedule[r].length;
    // Padding (not logged) takes no time: it ends where the robot's last action ended.
    if (isComplete) for (let a = p.first[r] + rows.length; a < p.first[r + 1]; a++) end[a] = prevEnd;
    const lf = p.lastForward[r];
    const plannedArrivalMs = lf < 0 ? 0 : plan.schedule[r][lf - p.first[r]].end;
    const realisedArrivalMs = lf < 0 ? 0 : end[lf] < Infinity ? end[lf] : null;
    let robotWaited = 0;
    for (let a = p.first[r]; a <= lf; a++) robotWaited += waited[a];
    perRobot.push({
      robot: r,
      actionsLogged: rows.length,
      actionsPlanned: plan.schedule[r].length,
      plannedArrivalMs,
      realisedArrivalMs,
      arrivalDelayMs: realisedArrivalMs === null ? null : realisedArrivalMs - plannedArrivalMs,
      lastEndMs: prevEnd,
      waitedMs: robotWaited,
    });
  }
  const figures = timingFigures(p, end, waited);
  const collisionEvents = log.rows
    .filter((row) => row.event === 'collision')
    .map((row) => ({ robot: row.robot, line: row.line, startMs: row.startMs, endMs: row.endMs }));
  return {
    ...figures,
    isSuccess: !isAborted && collisionEvents.length === 0 && figures.realisedMakespanMs !== null,
    isAborted,
    collisions: collisionEvents.length,
    collisionEvents,
    perRobot,
  };
}
