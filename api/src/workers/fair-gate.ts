/**
 * Turn-taking in front of the interactive pool, so one user cannot starve everyone else of its few threads.
 *
 * - At most `slots` jobs hold a thread at once (the pool's thread count), so the gate, not the pool's own FIFO,
 *   decides who goes next.
 * - One requester holds at most `perRequesterRunning` slots, and may have at most `perRequesterQueued` jobs waiting;
 *   past that his next job is refused at once (503 with Retry-After) instead of pushing others back.
 * - When a slot frees, the waiting requester who was served longest ago (or never) goes next, so a user with one
 *   job waits behind at most one job of each other user, however many the others sent.
 * - A job that waits longer than `startLimitMs`, or whose request is cancelled, leaves the queue.
 *
 * Retry-After is estimated from the mean duration of recent jobs and the work ahead (common practice: an estimate,
 * never a promise).
 */
import { AppError } from '../errors/app-error';

/** Settings of a FairGate. */
export interface FairGateOptions {
  /** Jobs that may hold a thread at once. */
  readonly slots: number;
  /** Slots one requester may hold at once. */
  readonly perRequesterRunning: number;
  /** Jobs one requester may have waiting. */
  readonly perRequesterQueued: number;
  /** Jobs that may wait in all. */
  readonly maxQueued: number;
  /** How long a job may wait for its turn, ms. */
  readonly startLimitMs: number;
  /** Injected clock (tests). */
  readonly now?: () => number;
}

/** The 503 code of a refused or expired wait (the same one the pool uses when it is busy). */
export const FAIR_GATE_BUSY = 'COMPUTE_BUSY';

interface Waiter {
  readonly requester: string;
  readonly admit: () => void;
  readonly refuse: (err: Error) => void;
}

/** Mean duration assumed before any job finished, ms. */
const INITIAL_MEAN_MS = 2_000;
/** Weight of the newest duration in the running mean. */
const MEAN_WEIGHT = 0.2;

export class FairGate {
  private readonly running = new Map<string, number>();
  /** Waiting jobs per requester, in the order the requesters queued (a Map keeps insertion order). */
  private readonly waiting = new Map<string, Waiter[]>();
  /** When each requester was last given a slot (a counter); forgotten whenever nobody waits. */
  private readonly lastServed = new Map<string, number>();
  private serveCount = 0;
  private runningTotal = 0;
  private waitingTotal = 0;
  private meanMs = INITIAL_MEAN_MS;
  private readonly now: () => number;

  constructor(private readonly options: FairGateOptions) {
    this.now = options.now ?? (() => performance.now());
  }

  /** Jobs holding a slot now. */
  get active(): number {
    return this.runningTotal;
  }

  /** Jobs waiting now. */
  get queued(): number {
    return this.waitingTotal;
  }

  /**
   * Waits for `requester`'s turn; resolves with the function that gives the slot back (call it exactly once, when
   * the job is over). Throws AppError 503 COMPUTE_BUSY, with Retry-After, when the requester's or the gate's queue
   * is full, when the wait outlasts startLimitMs, or when `signal` aborts.
   */
  async enter(requester: string, what: string, signal?: AbortSignal): Promise<() => void> {
    if (signal?.aborted) throw this.busy(`${capitalised(what)} was cancelled.`);
    if (this.waitingTotal === 0 && this.canRun(requester)) return this.take(requester);
    const mine = this.waiting.get(requester)?.length ?? 0;
    if (mine >= this.options.perRequesterQueued) {
      throw this.busy(`You already have ${(this.running.get(requester) ?? 0) + mine} computations running or waiting on the server; `
        + `wait for one to finish before asking for ${what}.`, mine + 1);
    }
    if (this.waitingTotal >= this.options.maxQueued) {
      throw this.busy(`The server is busy with ${this.runningTotal + this.waitingTotal} computations; try again later.`, this.waitingTotal + 1);
    }
    return new Promise<() => void>((resolve, reject) => {
      const cleanup = (): void => {
        clearTimeout(timer);
        signal?.removeEventListener('abort', onAbort);
      };
      const waiter: Waiter = {
        requester,
        admit: () => { cleanup(); resolve(this.take(requester)); },
        refuse: (err) => { cleanup(); reject(err); },
      };
      const leave = (err: Error): void => {
        if (this.remove(waiter)) waiter.refuse(err);
      };
      const onAbort = (): void => leave(this.busy(`${capitalised(what)} was cancelled.`));
      const timer = setTimeout(() => leave(this.busy(`The server was too busy to begin ${what} within ${Math.round(this.options.startLimitMs / 1000)} s; try again later.`)), this.options.startLimitMs);
      signal?.addEventListener('abort', onAbort, { once: true });
      const queue = this.waiting.get(requester);
      if (queue) queue.push(waiter);
      else this.waiting.set(requester, [waiter]);
      this.waitingTotal++;
      // A free slot that the requesters ahead may not take (their per-requester limit) goes to this one.
      this.admitNext();
    });
  }

  private canRun(requester: string): boolean {
    return this.runningTotal < this.options.slots && (this.running.get(requester) ?? 0) < this.options.perRequesterRunning;
  }

  /** Takes a slot for `requester` and returns the function that gives it back. */
  private take(requester: string): () => void {
    this.lastServed.set(requester, ++this.serveCount);
    this.runningTotal++;
    this.running.set(requester, (this.running.get(requester) ?? 0) + 1);
    const began = this.now();
    let given = false;
    return () => {
      if (given) return;
      given = true;
      this.meanMs += MEAN_WEIGHT * (this.now() - began - this.meanMs);
      this.runningTotal--;
      const left = (this.running.get(requester) ?? 1) - 1;
      if (left === 0) this.running.delete(requester);
      else this.running.set(requester, left);
      this.admitNext();
    };
  }

  /** Admits waiting jobs while slots are free: each time the eligible requester served longest ago. */
  private admitNext(): void {
    while (this.runningTotal < this.options.slots) {
      let next: string | undefined;
      for (const requester of this.waiting.keys()) {
        if (!this.canRun(requester)) continue;
        if (next === undefined || (this.lastServed.get(requester) ?? 0) < (this.lastServed.get(next) ?? 0)) next = requester;
      }
      if (next === undefined) return;
      const queue = this.waiting.get(next)!;
      const waiter = queue.shift()!;
      if (queue.length === 0) this.waiting.delete(next);
      this.waitingTotal--;
      if (this.waitingTotal === 0) this.lastServed.clear();
      waiter.admit();
    }
  }

  private remove(waiter: Waiter): boolean {
    const queue = this.waiting.get(waiter.requester);
    const at = queue?.indexOf(waiter) ?? -1;
    if (!queue || at < 0) return false;
    queue.splice(at, 1);
    if (queue.length === 0) this.waiting.delete(waiter.requester);
    this.waitingTotal--;
    if (this.waitingTotal === 0) this.lastServed.clear();
    return true;
  }

  /** A 503 saying when a retry may find room: the work ahead of `position` jobs, spread over the slots. */
  private busy(message: string, position = 1): AppError {
    const seconds = Math.max(1, Math.ceil((this.meanMs * position) / this.options.slots / 1000));
    return new AppError(FAIR_GATE_BUSY, 503, `${message} Retry in about ${seconds} s.`, { retryAfterSeconds: seconds }, seconds);
  }
}

function capitalised(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
