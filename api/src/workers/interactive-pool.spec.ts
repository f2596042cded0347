import { join } from 'node:path';
import { STARTER_PROFILE } from '@shared/executions-constants';
import { AppError } from '../errors/app-error';
import type { ExecutionTask } from '../executions/execution-task';
import { generateEntries, type GenerateRequest } from '../instance-sets/generate-entries';
import { InteractivePool } from './interactive-pool';

const SPIN = join(__dirname, 'testing/spin-thread.js');

/** Two robots swapping ends of a 4 × 1 corridor with a bay under cell 1: the classic optimum waits in the bay. */
const TASK: ExecutionTask = {
  instance: { width: 4, height: 2, cells: '11110100', agents: [{ start: 0, goal: 3 }, { start: 3, goal: 0 }] },
  model: 'classic',
  modelOptions: { startHeading: 'free' },
  profile: STARTER_PROFILE,
  simulation: { policy: 'dependency-gated', noise: { jitterCv: 0.2, stallProbability: 0, stallMs: 0 }, seed: 3, runs: 5, onCollision: 'count' },
  solveTimeLimitMs: 3000,
};

const GENERATE: GenerateRequest = {
  instanceSetId: 1, map: { kind: 'random', width: 16, height: 12, density: 0.2 }, scenarioCount: 2,
  scenarioMode: 'even', rowsPerBucket: 3, rowCount: 100, seed: 42,
};

/** The AppError `promise` rejects with. */
async function refusal(promise: Promise<unknown>): Promise<AppError> {
  const err = await promise.then(() => undefined, (e: unknown) => e);
  if (!(err instanceof AppError)) throw new Error(`expected an AppError, got ${String(err)}`);
  return err;
}

describe('InteractivePool', () => {
  let pool: InteractivePool | undefined;
  afterEach(async () => {
    await pool?.close();
    pool = undefined;
  });

  it('solves and simulates an execution task in a thread, not on the calling thread', async () => {
    pool = new InteractivePool({ threads: 1, timeLimitMs: 20_000 });
    const out = await pool.execute(TASK, 'user:1');
    expect(out.kind).toBe('done');
    if (out.kind !== 'done') return;
    // Hand-worked: one robot steps into the bay (1, 1) and back out, so its path is 2 steps
    // longer than the corridor's 3: sum-of-costs 3 + 5 = 8, makespan 5.
    expect(out.figures).toMatchObject({ isValid: true, soc: 8, makespan: 5 });
    // Dependency-gated execution never collides, whatever the jitter (Hönig et al. 2019).
    expect(out.summary).toMatchObject({ runs: 5, successRate: 1 });
    expect(out.summary.collisions.total).toBe(0);
    // The ping that loaded the thread and the job.
    expect(pool.completed).toBe(2);
  }, 60_000);

  it('generates the same bytes as the generators run in this thread', async () => {
    pool = new InteractivePool({ threads: 1, timeLimitMs: 20_000 });
    const pooled = await pool.generate(GENERATE, 'user:1');
    const local = generateEntries(GENERATE);
    expect(pooled.map((e) => e.name)).toEqual(local.map((e) => e.name));
    pooled.forEach((e, i) => expect(Buffer.compare(e.bytes, local[i].bytes)).toBe(0));
  }, 60_000);

  it('passes a refusal raised in the thread on as the same AppError', async () => {
    pool = new InteractivePool({ threads: 1, timeLimitMs: 20_000 });
    const err = await refusal(pool.generate({ ...GENERATE, map: { kind: 'rooms', roomsX: 64, roomsY: 64, roomWidth: 64, roomHeight: 64 } }, 'user:1'));
    expect([err.status, err.code]).toEqual([400, 'VALIDATION_FAILED']);
    expect(err.message).toContain('at most');
  }, 60_000);

  it('stops a job past its time limit with 503 COMPUTE_TIME_LIMIT and keeps serving', async () => {
    // The fixture spins forever on an execute job.
    pool = new InteractivePool({ threads: 1, timeLimitMs: 1000, filename: SPIN });
    const err = await refusal(pool.execute(TASK, 'user:1'));
    expect([err.status, err.code]).toEqual([503, 'COMPUTE_TIME_LIMIT']);
    expect(err.message).toContain('1000 ms');
    const again = await refusal(pool.execute(TASK, 'user:1'));
    expect(again.code).toBe('COMPUTE_TIME_LIMIT');
  }, 60_000);

  it('refuses at once with 503 COMPUTE_BUSY when the queue is full', async () => {
    pool = new InteractivePool({ threads: 1, timeLimitMs: 3000, maxQueued: 0, filename: SPIN });
    const first = pool.execute(TASK, 'user:1').catch((e: unknown) => e);
    const err = await refusal(pool.execute(TASK, 'user:1'));
    expect([err.status, err.code]).toEqual([503, 'COMPUTE_BUSY']);
    expect(((await first) as AppError).code).toBe('COMPUTE_TIME_LIMIT');
  }, 60_000);

  it('serves a second user before the rest of a flood from one user, and refuses the flood past its queue', async () => {
    // Each spinning job holds the one thread for its whole 1 s limit.
    pool = new InteractivePool({ threads: 1, timeLimitMs: 1000, filename: SPIN });
    await pool.warm();
    const finished: string[] = [];
    const send = (who: string, label: string) => pool!.execute(TASK, who).catch((e: unknown) => { finished.push(label); return e; });
    const flood = [send('user:1', 'a1'), send('user:1', 'a2'), send('user:1', 'a3')];
    const beyond = await refusal(pool.execute(TASK, 'user:1'));
    expect([beyond.status, beyond.code, beyond.retryAfterSeconds! >= 1]).toEqual([503, 'COMPUTE_BUSY', true]);
    const other = send('user:2', 'b1');
    await Promise.all([...flood, other]);
    expect(finished).toEqual(['a1', 'b1', 'a2', 'a3']);
  }, 60_000);

  it('cancels a job when its signal fires (a client that went away), long before the time limit', async () => {
    pool = new InteractivePool({ threads: 1, timeLimitMs: 20_000, filename: SPIN });
    await pool.warm();
    const gone = new AbortController();
    setTimeout(() => gone.abort(), 200);
    const t0 = performance.now();
    const err = await refusal(pool.execute(TASK, 'user:1', gone.signal));
    expect(err.message).toContain('cancelled');
    expect(performance.now() - t0).toBeLessThan(10_000);
  }, 60_000);
});
