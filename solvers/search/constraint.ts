/**
 * The constraint vocabulary of the CBS high level. Every constraint names one agent; some
 * also restrict the others (a positive constraint or a length bound of agent i implies
 * negative constraints for every other agent, which keeps disjoint splitting mutually
 * consistent: Li, Harabor, Stuckey, Ma, Koenig, "Disjoint splitting for multi-agent path
 * finding with conflict-based search", ICAPS 2019).
 * Times are unit steps; an edge constraint's time is the arrival time of the move.
 */

/** Agent may not be in cell `a` at time `t1`. */
export const C_VERTEX = 0;
/** Agent may not move from cell `a` to cell `b` arriving at time `t1`. */
export const C_EDGE = 1;
/** Agent may not be in cell `a` at any time in [t0, t1] (corridor reasoning). */
export const C_RANGE = 2;
/** Agent must be in cell `a` at time `t1`; every other agent may not (disjoint splitting). */
export const C_POS_VERTEX = 3;
/** Agent must move from `a` to `b` arriving at `t1`; others may not be in `b` at t1, in `a` at t1 − 1, nor move b → a at t1. */
export const C_POS_EDGE = 4;
/**
 * Agent's last arrival at its goal `a` is at time ≤ t1 (it is at the goal from t1 on); every other
 * agent may not be in `a` at any time ≥ t1 (target reasoning, Li et al., AIJ 2021).
 */
export const C_LEQ_LENGTH = 5;
/** Agent's last arrival at its goal is at time > t1 (target reasoning). */
export const C_GT_LENGTH = 6;

/** One CBS constraint; see the C_* kinds for the meaning of the fields. */
export interface Constraint {
  readonly kind: number;
  readonly agent: number;
  readonly a: number;
  readonly b: number;
  readonly t0: number;
  readonly t1: number;
}

/** Builds a constraint (all fields always set, so V8 keeps one object shape). */
export function constraint(kind: number, agent: number, a: number, b: number, t0: number, t1: number): Constraint {
  return { kind, agent, a, b, t0, t1 };
}

/** Whether constraint `c` restricts agents other than `c.agent` (positive and length-at-most constraints). */
export function affectsOthers(c: Constraint): boolean {
  return c.kind === C_POS_VERTEX || c.kind === C_POS_EDGE || c.kind === C_LEQ_LENGTH;
}
