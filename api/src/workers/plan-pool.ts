/**
 * The worker pool: piscina threads that run plan tasks under a hard time limit and a heap
 * limit. One piscina per memory limit (resourceLimits are fixed per pool), created on demand;
 * the callers (one pg-boss worker per thread) bound the total concurrency.
 *
 * Limits: the solver gets the soft time limit itself (it stops and reports its best lower
 * bound); the pool adds a hard limit a little later — piscina terminates a thread whose task
 * is aborted, even mid-computation, and replaces it — and the thread's V8 heap is capped with
 * maxOldGenerationSizeMb, so a run that outgrows it dies alone and the pool keeps serving.
 */
import { join } from 'node:path';
import { Piscina } from 'piscina';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';

/** How a pooled task ended. */
export type PoolOutcome =
  | { readonly kind: 'done'; readonly result: PlanTaskResult }
  | { readonly kind: 'hard-timeout' }
  | { readonly kind: 'memory'; readonly message: string }
  | { readonly kind: 'aborted' }
  | { readonly kind: 'crashed'; readonly message: string };

/** Options of one pooled task. */
export interface PoolRunOptions {
  /** When the thread is terminated, ms after the start. */
  readonly hardLimitMs: number;
  readonly memoryLimitMb: number;
  /** Aborts the task (cancel); the thread is terminated. */
  readonly signal?: AbortSignal;
}

/** Options of the pool. */
export interface PlanPoolOptions {
  readonly threads: number;
  /** Worker file; default the plan-thread bootstrap. Tests pass a misbehaving one. */
  readonly filename?: string;
}

/** The default worker file. */
export const PLAN_THREAD_FILE = join(__dirname, 'plan-thread.js');

/** A set of piscina pools keyed by heap limit. */
export class PlanPool {
  private readonly pools = new Map<number, Piscina<PlanTask, PlanTaskResult>>();
  private isClosed = false;

  constructor(private readonly options: PlanPoolOptions) {}

  /** Threads per heap limit (and the concurrency the callers should keep). */
  get threads(): number {
    return this.options.threads;
  }

  /** Runs one task; never rejects (every failure is an outcome). */
  async run(task: PlanTask, options: PoolRunOptions): Promise<PoolOutcome> {
    if (this.isClosed) return { kind: 'crashed', message: 'the pool is closed' };
    const pool = this.poolFor(options.memoryLimitMb);
    const hard = AbortSignal.timeout(options.hardLimitMs);
    const signal = options.signal ? AbortSignal.any([hard, options.signal]) : hard;
    try {
      return { kind: 'done', result: await pool.run(task, { signal }) };
    } catch (err) {
      if (options.signal?.aborted) return { kind: 'aborted' };
      if (hard.aborted) return { kind: 'hard-timeout' };
      const e = err as { code?: string; message?: string };
      // Node names a thread that hit its resourceLimits ERR_WORKER_OUT_OF_MEMORY.
      if (e.code === 'ERR_WORKER_OUT_OF_MEMORY' || /out of memory|heap/i.test(e.message ?? '')) return { kind: 'memory', message: e.message ?? 'out of memory' };
      return { kind: 'crashed', message: e.message ?? String(err) };
    }
  }

  /** Terminates every thread. */
  async close(): Promise<void> {
    this.isClosed = true;
    await Promise.all([...this.pools.values()].map((p) => p.close({ force: true })));
    this.pools.clear();
  }

  private poolFor(memoryLimitMb: number): Piscina<PlanTask, PlanTaskResult> {
    let pool = this.pools.get(memoryLimitMb);
    if (!pool) {
      pool = new Piscina<PlanTask, PlanTaskResult>({
        filename: this.options.filename ?? PLAN_THREAD_FILE,
        minThreads: 0,
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
