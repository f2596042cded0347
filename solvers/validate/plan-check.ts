/**
 * The verdict every Quarterturn plan validator returns, and the one rule for which violation
 * is "first". Validators keep the leaderboard honest: a plan from any solver (ours or an
 * uploaded one) is accepted only if its validator finds nothing, and a rejected plan is shown
 * with its FIRST violation, so the rule below must be the same for every model.
 *
 * First = earliest `time`; at the same time a violation of a position (where an agent IS at t)
 * comes before one of a move that starts at t (a swap or an illegal step from t to t + 1 is
 * under way after the agents stood at their cells at t); then the lowest agent indices
 * (compared lexicographically, agents sorted ascending); then the order of `VIOLATION_KINDS`.
 */
import type { CellXY } from '@shared/plan';

/** Every kind of violation a validator can report. */
export const VIOLATION_KINDS = [
  'agent-count',
  'empty-path',
  'wrong-start',
  'off-grid',
  'blocked-cell',
  'bad-heading',
  'bad-move',
  'bad-duration',
  'gap',
  'bad-step',
  'wrong-goal',
  'vertex',
  'goal',
  'swap',
  'following',
  'k-robust',
  'overlap',
] as const;

/** What went wrong: see `VIOLATION_KINDS`. */
export type PlanViolationKind = (typeof VIOLATION_KINDS)[number];

/** One broken rule of a plan, located precisely. */
export interface PlanViolation {
  /** Which rule is broken. */
  readonly kind: PlanViolationKind;
  /** The agents involved, ascending (one for a per-agent rule, two for a conflict; empty for 'agent-count'). */
  readonly agents: readonly number[];
  /**
   * When: the unit step t for path models (for a move or a swap, the t the step starts at),
   * milliseconds for schedules (for an overlap, the instant it begins).
   */
  readonly time: number;
  /** Where, as [x, y] (for a swap, the cell the lower-numbered agent leaves). */
  readonly cell: CellXY;
  /** A sentence for people, e.g. "agents 2 and 5 both at (4, 7) at t = 12". */
  readonly message: string;
}

/** A validator's verdict with the plan's figures recomputed from the plan itself. */
export interface PlanCheck {
  /** Whether the plan breaks no rule. */
  readonly ok: boolean;
  /** The first violation (see the module comment); absent when `ok`. */
  readonly violation?: PlanViolation;
  /** Sum of the agents' costs (steps, or ms for schedules); computed even for a rejected plan. */
  readonly soc: number;
  /** Largest agent cost (steps, or ms for schedules). */
  readonly makespan: number;
}

/** A violation with the sub-step phase used to order it: 0 = a position at `time`, 1 = a move from `time`. */
export interface RankedViolation {
  /** The violation itself. */
  readonly violation: PlanViolation;
  /** 0 for a position at `time`, 1 for a move starting at `time`. */
  readonly phase: 0 | 1;
}

/** Whether `a` is strictly earlier than `b` under the "first violation" rule. */
export function isEarlier(a: RankedViolation, b: RankedViolation): boolean {
  if (a.violation.time !== b.violation.time) return a.violation.time < b.violation.time;
  if (a.phase !== b.phase) return a.phase < b.phase;
  const x = a.violation.agents;
  const y = b.violation.agents;
  for (let i = 0; i < Math.min(x.length, y.length); i++) {
    if (x[i] !== y[i]) return x[i] < y[i];
  }
  if (x.length !== y.length) return x.length < y.length;
  return VIOLATION_KINDS.indexOf(a.violation.kind) < VIOLATION_KINDS.indexOf(b.violation.kind);
}

/** The first of several candidate violations (undefined entries are skipped), or undefined if none. */
export function firstOf(candidates: readonly (RankedViolation | undefined)[]): RankedViolation | undefined {
  let best: RankedViolation | undefined;
  for (const c of candidates) {
    if (c && (!best || isEarlier(c, best))) best = c;
  }
  return best;
}

/** Builds the verdict from the first violation (if any) and the agents' costs. */
export function verdict(first: RankedViolation | undefined, costs: readonly number[]): PlanCheck {
  const soc = costs.reduce((s, c) => s + c, 0);
  const makespan = costs.reduce((m, c) => Math.max(m, c), 0);
  return first ? { ok: false, violation: first.violation, soc, makespan } : { ok: true, soc, makespan };
}

/** Formats a cell for messages: "(4, 7)". */
export function showCell(cell: CellXY): string {
  return `(${cell[0]}, ${cell[1]})`;
}

/** A pair of agent indices, ascending. */
export function pair(a: number, b: number): readonly [number, number] {
  return a < b ? [a, b] : [b, a];
}
