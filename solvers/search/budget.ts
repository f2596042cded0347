/**
 * Limits shared by one solve and every search inside it: a wall-clock limit through an
 * injected clock, an AbortSignal, and the reason a search stopped early.
 */

/** Why a search gave up before proving a result. */
export type LimitReason = 'time' | 'abort' | 'nodes' | 'memory';

/** Thrown inside a search when a limit is reached; caught by the CBS driver, never by callers. */
export class LimitReached extends Error {
  /** Creates the signal for `reason`. */
  constructor(readonly reason: LimitReason) {
    super(`search limit reached: ${reason}`);
  }
}

/** The time and abort budget of one solve. */
export class Budget {
  private readonly started: number;
  private readonly deadline: number;

  /**
   * Starts the clock. Without `now` the time limit cannot be enforced (solvers own no
   * clock): only the abort signal and the node/memory limits apply.
   */
  constructor(private readonly now: (() => number) | undefined, timeLimitMs: number | undefined,
    private readonly signal: AbortSignal | undefined) {
    this.started = now ? now() : 0;
    this.deadline = now && timeLimitMs !== undefined && Number.isFinite(timeLimitMs) ? this.started + timeLimitMs : Infinity;
  }

  /** Throws {@link LimitReached} when the signal has fired or the deadline has passed. */
  check(): void {
    if (this.signal?.aborted) throw new LimitReached('abort');
    if (this.deadline !== Infinity && (this.now as () => number)() > this.deadline) throw new LimitReached('time');
  }

  /** Milliseconds since the start (0 without a clock). */
  elapsedMs(): number {
    return this.now ? this.now() - this.started : 0;
  }
}
