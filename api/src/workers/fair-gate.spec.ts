import { AppError } from '../errors/app-error';
import { FairGate, type FairGateOptions } from './fair-gate';

const OPTIONS: FairGateOptions = { slots: 1, perRequesterRunning: 1, perRequesterQueued: 3, maxQueued: 8, startLimitMs: 60_000 };

/** The AppError `promise` rejects with. */
async function refusal(promise: Promise<unknown>): Promise<AppError> {
  const err = await promise.then(() => undefined, (e: unknown) => e);
  if (!(err instanceof AppError)) throw new Error(`expected an AppError, got ${String(err)}`);
  return err;
}

/**
 * Enters the gate for each requester in turn, each job giving its slot back a moment after it is admitted;
 * resolves with the order of admission once all are through.
 */
function admissionOrder(gate: FairGate, requesters: readonly string[]): Promise<string[]> {
  const order: string[] = [];
  return Promise.all(requesters.map((r) => gate.enter(r, 'the job').then((leave) => {
    order.push(r);
    return new Promise<void>((done) => setImmediate(() => { leave(); done(); }));
  }))).then(() => order);
}

describe('FairGate', () => {
  it('serves a second user after at most one more job of a user who flooded the queue', async () => {
    const gate = new FairGate(OPTIONS);
    // Alice sends four jobs before Bob sends one: first come, first served would make Bob wait for all four.
    expect(await admissionOrder(gate, ['alice', 'alice', 'alice', 'alice', 'bob'])).toEqual(['alice', 'bob', 'alice', 'alice', 'alice']);
  });

  it('gives each free slot to the waiting user served longest ago', async () => {
    const gate = new FairGate({ ...OPTIONS, perRequesterQueued: 4 });
    const held = await gate.enter('alice', 'the job');
    const order = admissionOrder(gate, ['alice', 'alice', 'alice', 'bob', 'bob', 'carol']);
    expect(gate.queued).toBe(6);
    held();
    // Alice was just served, Bob and Carol never: they go first, then the turns alternate.
    expect(await order).toEqual(['bob', 'carol', 'alice', 'bob', 'alice', 'alice']);
    expect([gate.active, gate.queued]).toEqual([0, 0]);
  });

  it('lets one requester hold at most perRequesterRunning slots while others are free', async () => {
    const gate = new FairGate({ ...OPTIONS, slots: 2, perRequesterRunning: 1 });
    const a1 = await gate.enter('alice', 'the job');
    const a2 = gate.enter('alice', 'the job');
    const b1 = await gate.enter('bob', 'the job');
    expect([gate.active, gate.queued]).toEqual([2, 1]);
    b1();
    // Bob's slot is free, but Alice already holds her one: her second job still waits.
    await new Promise((r) => setImmediate(r));
    expect([gate.active, gate.queued]).toEqual([1, 1]);
    a1();
    (await a2)();
    expect([gate.active, gate.queued]).toEqual([0, 0]);
  });

  it("refuses a requester's job past his queue with 503 COMPUTE_BUSY, Retry-After and a message saying why", async () => {
    const gate = new FairGate({ ...OPTIONS, perRequesterQueued: 2 });
    const running = await gate.enter('alice', 'the execution');
    const waiting = [gate.enter('alice', 'the execution'), gate.enter('alice', 'the execution')];
    const err = await refusal(gate.enter('alice', 'the execution'));
    expect([err.status, err.code]).toEqual([503, 'COMPUTE_BUSY']);
    expect(err.message).toMatch(/You already have 3 computations running or waiting.*Retry in about \d+ s\./);
    expect(err.retryAfterSeconds).toBeGreaterThanOrEqual(1);
    // Someone else still gets a place in the queue.
    const bob = gate.enter('bob', 'the execution');
    expect(gate.queued).toBe(3);
    running();
    await Promise.all([...waiting, bob].map((w) => w.then((leave) => setImmediate(leave))));
  });

  it('refuses anyone at once when the whole queue is full', async () => {
    const gate = new FairGate({ ...OPTIONS, maxQueued: 1 });
    const running = await gate.enter('alice', 'the job');
    const waiting = gate.enter('bob', 'the job');
    const err = await refusal(gate.enter('carol', 'the job'));
    expect(err.message).toContain('The server is busy with 2 computations');
    running();
    (await waiting)();
  });

  it('drops a waiting job whose signal aborts, and one that waits past startLimitMs', async () => {
    const gate = new FairGate({ ...OPTIONS, startLimitMs: 50 });
    const running = await gate.enter('alice', 'the job');
    const gone = new AbortController();
    const cancelled = refusal(gate.enter('bob', 'the job', gone.signal));
    gone.abort();
    expect((await cancelled).message).toContain('The job was cancelled.');
    const late = await refusal(gate.enter('carol', 'the job'));
    expect(late.message).toContain('too busy to begin the job within 0 s');
    expect(gate.queued).toBe(0);
    running();
    expect(gate.active).toBe(0);
  });

  it('estimates Retry-After from the mean duration of finished jobs', async () => {
    let clock = 0;
    const gate = new FairGate({ ...OPTIONS, perRequesterQueued: 0, now: () => clock });
    for (let i = 0; i < 30; i++) {
      const leave = await gate.enter('alice', 'the job');
      clock += 10_000;
      leave();
    }
    const running = await gate.enter('alice', 'the job');
    const err = await refusal(gate.enter('alice', 'the job'));
    // Mean ≈ 10 s (a running mean that started at 2 s and saw thirty 10 s jobs: within 0.02 s of 10 s).
    expect(err.retryAfterSeconds).toBe(10);
    running();
  });
});
