/**
 * Sweep throughput: runs per minute of a fixed small sweep with a 1-thread and a 2-thread
 * worker, and the queue overhead per run (pg-boss round trip of an empty job: fetch, handler,
 * complete, with the same one-poller-per-thread set-up the sweep worker uses).
 *
 * The fixed sweep: empty-16-16 with scenarios even-1 and even-2 of the open benchmark set
 * (Stern et al., SoCS 2019; read in place), 6, 8 and 10 agents, classic and weighted-split,
 * seeds 1–2 (24 runs), replayed open-loop and dependency-gated with 50 Monte Carlo runs each.
 * Runs against a throwaway PostgreSQL cluster; prints a table and writes benchmarks/results/sweep.json.
 * Timings are noisy when other work shares the 2 cores.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Client } from 'pg';
import pino from 'pino';
import { migrate } from '../api/src/db/migrate';
import { startSweepWorker } from '../api/src/workers/sweep-worker';
import { createBoss } from '../api/src/workers/sweep-queue';
import { startCluster } from '../scripts/postgres';
import { freePort } from '../test/support/free-port';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../test/reliability/support/sweep-harness';

const EMPTY_JOBS = 200;

async function sweepRate(s: SweepServer, setId: number, threads: number): Promise<{ runs: number; seconds: number; perMinute: number }> {
  const worker = await startSweepWorker({ databaseUrl: s.databaseUrl, threads, logger: pino({ level: 'silent' }), publicUrl: s.url });
  try {
    // Warm the threads (tsx loading costs ~0.5 s per thread) so the figure is the steady rate.
    const warm = await launchSweep(s, baseDefinition(setId, { name: `warm ${threads}`, agentCounts: { kind: 'list', values: [2] }, seeds: Array.from({ length: threads }, (_, i) => i + 1) }));
    await waitForSweep(s, warm.id, 120_000);
    const t0 = performance.now();
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: `bench ${threads}`, agentCounts: { kind: 'list', values: [6, 8, 10] }, seeds: [1, 2],
      models: [{ model: 'classic' }, { model: 'weighted-split', startHeading: 'N' }],
      execution: { policies: ['open-loop', 'dependency-gated'], runs: 50 },
    }));
    await waitForSweep(s, sweep.id, 600_000);
    const seconds = (performance.now() - t0) / 1000;
    return { runs: sweep.progress.total, seconds, perMinute: (sweep.progress.total / seconds) * 60 };
  } finally {
    await worker.stop({ graceful: false });
  }
}

async function queueOverhead(databaseUrl: string, pollers: number): Promise<number> {
  const boss = await createBoss(databaseUrl, { logger: pino({ level: 'silent' }), isSupervisor: false });
  const queue = 'qt-bench-empty';
  await boss.createQueue(queue);
  let done = 0;
  let finish: () => void = () => undefined;
  const allDone = new Promise<void>((r) => { finish = r; });
  for (let i = 0; i < pollers; i++) {
    // Same as the sweep worker: a finished job wakes its poller at once (see sweep-worker.ts).
    const slot: { id?: string } = {};
    slot.id = await boss.work(queue, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async () => {
      if (++done === EMPTY_JOBS) finish();
      if (slot.id) boss.notifyWorker(slot.id);
    });
  }
  const t0 = performance.now();
  await boss.insert(Array.from({ length: EMPTY_JOBS }, () => ({ name: queue, data: {} })));
  await allDone;
  const ms = (performance.now() - t0) / EMPTY_JOBS;
  await boss.stop({ graceful: false, wait: true });
  return ms;
}

async function main(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'qt-bench-sweep-'));
  const cluster = startCluster(dir, await freePort(), { isThrowaway: true, log: () => undefined });
  try {
    const admin = new Client({ connectionString: cluster.adminUrl });
    await admin.connect();
    await admin.query('CREATE DATABASE qt_bench');
    await admin.end();
    const url = cluster.urlFor('qt_bench');
    await migrate(url);
    const s = await startSweepServer(url);
    try {
      const { setId } = await uploadSet(s, 'bench floor', ['empty-16-16.map', 'empty-16-16-even-1.scen', 'empty-16-16-even-2.scen']);
      const rows = [];
      for (const threads of [1, 2]) rows.push({ threads, ...(await sweepRate(s, setId, threads)) });
      const overhead1 = await queueOverhead(url, 1);
      const overhead2 = await queueOverhead(url, 2);
      console.log('\nSweep throughput (24 runs: classic + weighted-split, 2 policies × 50 replays)');
      console.log('threads | runs | seconds | runs/min');
      for (const r of rows) console.log(`${String(r.threads).padStart(7)} | ${String(r.runs).padStart(4)} | ${r.seconds.toFixed(1).padStart(7)} | ${r.perMinute.toFixed(0).padStart(8)}`);
      console.log(`\nQueue overhead per empty job (${EMPTY_JOBS} jobs): ${overhead1.toFixed(1)} ms with 1 poller, ${overhead2.toFixed(1)} ms with 2 pollers\n`);
      mkdirSync(join(__dirname, 'results'), { recursive: true });
      writeFileSync(join(__dirname, 'results/sweep.json'), JSON.stringify({ rows, queueOverheadMs: { pollers1: overhead1, pollers2: overhead2 } }, null, 2));
    } finally {
      await s.close();
    }
  } finally {
    cluster.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
