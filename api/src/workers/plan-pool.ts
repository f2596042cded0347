/**
 * The worker pool: piscina threads that run jobs (sweep runs, interactive executions and
 * generations; see thread-job.ts) under a hard time limit and a heap limit. One piscina per
 * memory limit (resourceLimits are fixed per pool), created on demand; the callers bound the
 * total concurrency (one pg-boss worker per thread for sweeps, the interactive pool's queue).
 *
 * Limits: the solver gets the soft time limit itself (it stops and reports its best lower
 * bound); the pool adds a hard limit a little later — piscina terminates a thread whose task
 * is aborted, even mid-computation, and replaces it — and the thread's V8 heap is capped with
 * maxOldGenerationSizeMb, so a run that outgrows it dies alone and the pool keeps serving.
 * The hard limit starts when the thread reports that it began the job, not when the job is
 * handed to piscina: loading a tsx thread takes ~0.5 s idle and several seconds on a loaded
 * machine, and a replacement thread after a kill loads again, so counting from the hand-over
 * made short runs "time out" before they started. A pool can be warmed (`warm`) so that its
 * threads are loaded before the first job, and a warmed pool keeps its threads (a killed one
 * is replaced at once).
 */
import { join } from 'node:path';
import { MessageChannel, type MessagePort } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';
import type { ThreadAnswer, ThreadEnvelope, ThreadJob, ThreadRefusal, ThreadResults } from './thread-job';

/** How a pooled job ended. */
export type PoolOutcome<R = PlanTaskResult> =
  | { readonly kind: 'done'; readonly result: R }
  | { readonly kind: 'refused'; readonly refusal: ThreadRefusal }
  | { readonly kind: 'hard-timeout' }
  /** No thread began the job within `startLimitMs` (queue full of long jobs, or threads failing to load). */
  | { readonly kind: 'not-started' }
  | { readonly kind: 'memory'; readonly message: string }
  | { readonly kind: 'aborted' }
  | { readonly kind: 'crashed'; readonly message: string };

/** Options of one pooled job. */
export interface PoolRunOptions {
  /** When the thread is terminated, ms after the thread began the job. */
  readonly hardLimitMs: number;
  readonly memoryLimitMb: number;
  /** Aborts the job (cancel); a running thread is terminated, a queued job leaves the queue. */
  readonly signal?: AbortSignal;
  /** How long the job may wait for a thread to begin it, ms; default DEFAULT_START_LIMIT_MS. */
  readonly startLimitMs?: number;
  /** Buffers and ports the job holds that move to the thread instead of being copied (they are unusable here afterwards). */
  readonly transferList?: readonly (ArrayBuffer | MessagePort)[];
}

/** Options of the pool. */
export interface PlanPoolOptions {
  readonly threads: number;
  /** Worker file; default the plan-thread bootstrap. Tests pass a misbehaving one. */
  readonly filename?: string;
}

/** The default worker file. */
export const PLAN_THREAD_FILE = join(__dirname, 'plan-thread.js');

/** Default wait for a thread to begin a job, ms: covers a cold tsx load on a loaded 2-core machine with room to spare. */
export const DEFAULT_START_LIMIT_MS = 60_000;

/** A set of piscina pools keyed by heap limit. */
export class PlanPool {
  private readonly pools = new Map<number, Piscina<ThreadEnvelope, ThreadAnswer>>();
  private readonly warmed = new Set<number>();
  private isClosed = false;

  constructor(private readonly options: PlanPoolOptions) {}

  /** Threads per heap limit (and the concurrency the callers should keep). */
  get threads(): number {
    return this.options.threads;
  }

  /** Jobs finished by the threads (any kind, any heap limit), for tests and stats. */
  get completed(): number {
    let n = 0;
    for (const p of this.pools.values()) n += p.completed;
    return n;
  }

  /** Runs one sweep run; never rejects (every failure is an outcome). */
  run(task: PlanTask, options: PoolRunOptions): Promise<PoolOutcome> {
    return this.runJob({ kind: 'plan', task }, options);
  }

  /** Runs one job of any kind; never rejects (every failure is an outcome). */
  async runJob<J extends ThreadJob>(job: J, options: PoolRunOptions): Promise<PoolOutcome<ThreadResults[J['kind']]>> {
    if (this.isClosed) return { kind: 'crashed', message: 'the pool is closed' };
    const pool = this.poolFor(options.memoryLimitMb);
    const limit = new AbortController();
    let why: 'hard-timeout' | 'not-started' | undefined;
    const stop = (reason: 'hard-timeout' | 'not-started') => {
      why = reason;
      limit.abort();
    };
    let timer = setTimeout(() => stop('not-started'), options.startLimitMs ?? DEFAULT_START_LIMIT_MS);
    const { port1, port2 } = new MessageChannel();
    port1.once('message', () => {
      clearTimeout(timer);
      timer = setTimeout(() => stop('hard-timeout'), options.hardLimitMs);
    });
    const signal = options.signal ? AbortSignal.any([limit.signal, options.signal]) : limit.signal;
    try {
      const answer = await pool.run({ job, started: port2 }, { signal, transferList: [port2, ...(options.transferList ?? [])] });
      if (answer.ok) return { kind: 'done', result: answer.value as ThreadResults[J['kind']] };
      return { kind: 'refused', refusal: answer.refusal };
    } catch (err) {
      if (options.signal?.aborted) return { kind: 'aborted' };
      if (why) return { kind: why };
      const e = err as { code?: string; message?: string };
      // Node names a thread that hit its resourceLimits ERR_WORKER_OUT_OF_MEMORY.
      if (e.code === 'ERR_WORKER_OUT_OF_MEMORY' || /out of memory|heap/i.test(e.message ?? '')) return { kind: 'memory', message: e.message ?? 'out of memory' };
      return { kind: 'crashed', message: e.message ?? String(err) };
    } finally {
      clearTimeout(timer);
      port1.close();
    }
  }

  /**
   * Starts and loads every thread of the heap limit `memoryLimitMb` (one ping per thread) and
   * keeps them from then on; resolves when all answered, rejects when one could not load.
   */
  async warm(memoryLimitMb: number): Promise<void> {
    this.warmed.add(memoryLimitMb);
    const pings = Array.from({ length: this.options.threads }, () =>
      this.runJob({ kind: 'ping' }, { hardLimitMs: 10_000, memoryLimitMb }));
    for (const out of await Promise.all(pings)) {
      if (out.kind !== 'done') throw new Error(`a pool thread did not load: ${out.kind}${'message' in out ? `: ${out.message}` : ''}`);
    }
  }

  /** Terminates every thread. */
  async close(): Promise<void> {
    this.isClosed = true;
    await Promise.all([...this.pools.values()].map((p) => p.close({ force: true })));
    this.pools.clear();
  }

  private poolFor(memoryLimitMb: number): Piscina<ThreadEnvelope, ThreadAnswer> {
    let pool = this.pools.get(memoryLimitMb);
    if (!pool) {
      const isWarm = this.warmed.has(memoryLimitMb);
      pool = new Piscina<ThreadEnvelope, ThreadAnswer>({
        filename: this.options.filename ?? PLAN_THREAD_FILE,
        // A warmed heap limit keeps its threads loaded and replaces a killed one at once.
        minThreads: isWarm ? this.options.threads : 0,
        maxThreads: this.options.threads,
        // Idle pools of a heap limit no sweep uses any more let their threads go.
        idleTimeout: 60_000,
        resourceLimits: { maxOldGenerationSizeMb: memoryLimitMb },
      });
      this.pools.set(memoryLimitMb, pool);
    }
    return pool;
  }
}
