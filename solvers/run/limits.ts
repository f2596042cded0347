/** The clock and abort signal a task runs under (solvers own no clock: the worker passes one in). */

/** Options of runPlanTask. */
export interface RunLimits {
  /** Injected clock in ms (the worker thread passes performance.now); without it the time limit is not enforced by the solver. */
  readonly now?: () => number;
  /** Stops the solve and the replay (cancel, or the pool's hard time limit). */
  readonly signal?: AbortSignal;
}
