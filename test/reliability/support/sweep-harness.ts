/**
 * Test harness for sweeps: a server on a fresh database (or a given URL), a maintainer signed
 * in, an instance set uploaded from the open dataset (read in place), sweeps launched through
 * the API, worker processes spawned for real (`node --import tsx worker-main.ts`, one process
 * so SIGKILL hits the worker itself), and SQL to check the outcome.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { CSRF_HEADER } from '@shared/auth';
import type { SweepDetail } from '@shared/runs';
import type { SweepDefinitionInput } from '@shared/sweeps';
import { startServer, type RunningServer } from '../../../api/src/app';
import { loadConfig } from '../../../api/src/config';
import { createSequelize } from '../../../api/src/db/sequelize';
import { startFakeSmtp, type RunningFakeSmtp } from '../../../api/src/dev/fake-smtp/fake-smtp-server';
import { signInAs, type SignedInClient } from '../../../api/src/dev/sign-in-as';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../../benchmarks/datasets/open-grid-benchmarks';

/** The repository root. */
export const ROOT = resolve(__dirname, '../../..');
/** The open benchmark files (Stern et al., SoCS 2019), read in place. */
export const DATASET = OPEN_GRID_BENCHMARKS_DIR;

/** A running server with a signed-in maintainer, its mailbox and SQL on its database. */
export interface SweepServer {
  readonly url: string;
  readonly databaseUrl: string;
  readonly server: RunningServer;
  readonly smtp: RunningFakeSmtp;
  readonly client: SignedInClient;
  sql<T extends object = Record<string, unknown>>(text: string, replacements?: Record<string, unknown>): Promise<T[]>;
  close(): Promise<void>;
}

/** The maintainer identity of the fake provider used by these tests. */
export const MAINTAINER = 'tobiah-venkat';

/** Starts server + fake SMTP on `databaseUrl` (no embedded worker) and signs the maintainer in. */
export async function startSweepServer(databaseUrl: string, env: Record<string, string> = {}): Promise<SweepServer> {
  const smtp = await startFakeSmtp(0);
  const { config } = loadConfig({
    NODE_ENV: 'test', LOG_LEVEL: 'silent', SESSION_SECRET: randomBytes(24).toString('hex'), JOB_EXPIRY_MARGIN_SECONDS: '3',
    EMBEDDED_WORKER: 'false', ...(process.env.QT_TEST_LOG ? { LOG_LEVEL: process.env.QT_TEST_LOG } : {}), ...env,
  });
  const server = await startServer({ config: { ...config, webDist: env.WEB_DIST ? config.webDist : '/nonexistent', smtpUrl: smtp.url }, databaseUrl, port: 0, fakeOAuthPort: 0, mailbox: smtp.mailbox });
  const sequelize: Sequelize = createSequelize(databaseUrl, { poolMax: 2 });
  const sql = <T extends object>(text: string, replacements: Record<string, unknown> = {}) => sequelize.query<T>(text, { replacements, type: QueryTypes.SELECT });
  const client = await signInAs(server.url, MAINTAINER);
  await sql("UPDATE users SET role = 'maintainer' WHERE login = :login", { login: MAINTAINER });
  return {
    url: server.url, databaseUrl, server, smtp, client, sql,
    async close() {
      await server.close();
      await smtp.close();
      await sequelize.close();
    },
  };
}

/** Creates a public instance set holding the given dataset files; returns its id and scenario ids by file name. */
export async function uploadSet(s: SweepServer, name: string, files: readonly string[]): Promise<{ setId: number; scenarios: Record<string, number> }> {
  const created = await s.client.request('/api/instance-sets', { method: 'POST', body: JSON.stringify({ name, visibility: 'public' }) });
  if (created.status !== 201) throw new Error(`create set: ${created.status} ${await created.text()}`);
  const setId = ((await created.json()) as { id: number }).id;
  let req = request(s.url).post(`/api/instance-sets/${setId}/files`).set('cookie', s.client.jar.header()).set(CSRF_HEADER, s.client.csrfToken);
  for (const f of files) req = req.attach('files', readFileSync(join(DATASET, f)), { filename: f, contentType: 'application/octet-stream' });
  const res = await req;
  if (res.status !== 201) throw new Error(`upload: ${res.status} ${JSON.stringify(res.body)}`);
  const rows = await s.sql<{ id: number; name: string }>('SELECT id, name FROM scenarios WHERE instance_set_id = :setId', { setId });
  return { setId, scenarios: Object.fromEntries(rows.map((r) => [r.name, r.id])) };
}

/** A small valid definition to start from. */
export function baseDefinition(setId: number, overrides: Partial<SweepDefinitionInput> = {}): SweepDefinitionInput {
  return {
    name: 'depot aisle check',
    instances: { instanceSetId: setId },
    agentCounts: { kind: 'list', values: [2, 4] },
    models: [{ model: 'classic' }],
    robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1 },
    timeLimitMs: 10_000,
    memoryLimitMb: 256,
    execution: { policies: ['open-loop'], runs: 5 },
    seeds: [1],
    ...overrides,
  };
}

/** POST /api/sweeps; throws unless 201. */
export async function launchSweep(s: SweepServer, def: SweepDefinitionInput): Promise<SweepDetail> {
  const res = await s.client.request('/api/sweeps', { method: 'POST', body: JSON.stringify(def) });
  if (res.status !== 201) throw new Error(`launch: ${res.status} ${await res.text()}`);
  return (await res.json()) as SweepDetail;
}

/** Polls the sweep row until `test` holds (default: over); returns its status. */
export async function waitForSweep(s: SweepServer, sweepId: number, timeoutMs = 60_000, test = (status: string) => ['finished', 'failed', 'cancelled'].includes(status)): Promise<string> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const rows = await s.sql<{ status: string }>('SELECT status FROM sweeps WHERE id = :id', { id: sweepId }).catch(() => []);
    if (rows[0] && test(rows[0].status)) return rows[0].status;
    if (Date.now() > until) throw new Error(`sweep ${sweepId} still ${rows[0]?.status ?? '?'} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Polls until `fn` returns true. */
export async function waitUntil(fn: () => Promise<boolean>, timeoutMs: number, what: string): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!(await fn().catch(() => false))) {
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A spawned worker process. */
export interface WorkerProcess {
  readonly child: ChildProcess;
  /** stdout + stderr so far. */
  output(): string;
  /** Resolves when the process has exited. */
  exited: Promise<number | null>;
  stop(signal?: NodeJS.Signals): Promise<void>;
}

/** Spawns `npm run worker`'s entry as one node process (tsx as an import hook). */
export function spawnWorker(databaseUrl: string, env: Record<string, string> = {}): WorkerProcess {
  const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'api/src/workers/worker-main.ts')], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: databaseUrl, WORKER_THREADS: '1', LOG_LEVEL: 'info', WORKER_MAINTENANCE_SECONDS: '1', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout?.on('data', (d: Buffer) => { out += d.toString(); });
  child.stderr?.on('data', (d: Buffer) => { out += d.toString(); });
  const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
  return {
    child,
    output: () => out,
    exited,
    async stop(signal = 'SIGTERM') {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}

/** Resolves once the worker printed that it is ready. */
export async function workerReady(w: WorkerProcess, timeoutMs = 30_000): Promise<void> {
  await waitUntil(async () => /ready with/.test(w.output()), timeoutMs, `worker ready (output: ${w.output().slice(-500)})`);
}

/** Per run of a sweep: status, attempts, worker and how many result rows it has. */
export async function runLedger(s: SweepServer, sweepId: number) {
  return s.sql<{ id: number; status: string; attempts: number; worker: string | null; results: string; elapsed_ms: number | null }>(
    `SELECT r.id, r.status, r.attempts, r.worker, r.elapsed_ms, (SELECT count(*) FROM results x WHERE x.run_id = r.id) AS results
     FROM runs r WHERE r.sweep_id = :sweepId ORDER BY r.id`, { sweepId });
}
