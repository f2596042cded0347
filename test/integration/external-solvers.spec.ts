/**
 * External solvers in sweeps (issue 16, item 4), against a real PostgreSQL with real child
 * processes: a maintainer registers the shipped example solver (prioritised planning with
 * space-time A*, run by Node with tsx), launches a sweep mixing built-in classic and the example,
 * and a worker declaring the solver runs both; the example's plans pass the classic validator
 * and its results sit beside the built-in ones on the board and in the model comparison report,
 * with their CPU time and peak memory. Throwaway "solvers" (small Node scripts) crash, overrun the
 * time limit (killed), overrun the memory limit (killed by the operating system's RLIMIT_DATA),
 * write garbage, write nothing and write an invalid plan: each is a recorded status with its
 * reason and the sweep finishes; a solver sees none of the worker's environment (its database URL
 * never reaches a stored reason). A worker runs a registration only when its command is the one the
 * worker's operator approved (WORKER_SOLVERS pins the command's SHA-256): a solver removed and
 * registered again with another command ends in error, and a name and version with stored results
 * cannot be registered again. A solver no worker declares leaves its runs visibly waiting, and
 * cancelling a sweep kills a running solver. Instances: the open dataset's empty-8-8 (Stern et
 * al., SoCS 2019), read in place.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pino from 'pino';
import { EXAMPLE_SOLVER, EXTERNAL_FAILURE_PREFIX, type ExternalSolverListResponse, type ExternalSolverView } from '@shared/external-solvers';
import { commandSha256 } from '../../api/src/external-solvers/command-hash';
import { externalRunQueue } from '../../api/src/workers/sweep-queue';
import type { LeaderboardPage } from '@shared/leaderboards';
import type { ModelComparisonReport } from '@shared/reports';
import type { SweepDetail, SweepResultRow } from '@shared/runs';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, waitUntil, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(240_000);

const EXAMPLE = { name: EXAMPLE_SOLVER.name, version: EXAMPLE_SOLVER.version };

/** Throwaway solvers: name → script body. Arguments: map, scenario, agents, plan. */
const SCRIPTS: Record<string, string> = {
  'crashes': "console.error('crash test: giving up on purpose'); process.exit(3);",
  'sleeps': 'setInterval(() => {}, 1000);',
  'hogs': 'const kept = []; for (;;) kept.push(Buffer.alloc(8 * 1024 * 1024, 1));',
  'scribbles': "require('fs').writeFileSync(process.argv[5], 'these are not cells\\n');",
  'writes-nothing': "console.log('done, but no plan');",
  // Every agent stays on the top-left cell: a vertex conflict at step 0 (and the wrong starts).
  'collides': "const n = Number(process.argv[4]); require('fs').writeFileSync(process.argv[5], Array.from({ length: n }, () => '(0,0) (0,0)').join('\\n'));",
  // Says which environment variables it sees and the database URL if it got one, then fails (its last line becomes the reason).
  'tells-env': "console.error('env: ' + Object.keys(process.env).sort().join(',') + ' db: ' + (process.env.DATABASE_URL ?? 'none')); process.exit(1);",
};

/** The registered command of a throwaway solver. */
const scriptCommand = (dir: string, name: string) => `{node} ${join(dir, `${name}.js`)} {map} {scenario} {agents} {plan}`;

/** The processes whose command line holds `text` (from /proc). */
function processesWith(text: string): number[] {
  const pids: number[] = [];
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry) || Number(entry) === process.pid) continue;
    try {
      if (readFileSync(`/proc/${entry}/cmdline`, 'utf8').includes(text)) pids.push(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  return pids;
}

describe('external solvers in sweeps', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let setId: number;
  let scriptDir: string;

  const register = async (body: unknown) => s.client.request('/api/external-solvers', { method: 'POST', body: JSON.stringify(body) });

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    ({ setId } = await uploadSet(s, 'external floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']));
    scriptDir = mkdtempSync(join(tmpdir(), 'qt-throwaway-solvers-'));
    for (const [name, body] of Object.entries(SCRIPTS)) writeFileSync(join(scriptDir, `${name}.js`), body);
    const registered = await register(EXAMPLE_SOLVER);
    expect(registered.status).toBe(201);
    for (const name of Object.keys(SCRIPTS)) {
      const res = await register({ name, version: '0.1', models: ['classic'], command: scriptCommand(scriptDir, name) });
      expect(res.status).toBe(201);
    }
    // Each solver pinned to its command's hash as its operator approved it; `swapped` is approved for the
    // 'writes-nothing' command (a 16-digit prefix) and registered later with another one.
    worker = await startSweepWorker({
      databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1,
      solvers: [
        { ...EXAMPLE, commandSha256: commandSha256(EXAMPLE_SOLVER.command) },
        ...Object.keys(SCRIPTS).map((name) => ({ name, version: '0.1', commandSha256: commandSha256(scriptCommand(scriptDir, name)) })),
        { name: 'swapped', version: '0.1', commandSha256: commandSha256(scriptCommand(scriptDir, 'writes-nothing')).slice(0, 16) },
      ],
    });
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
    if (scriptDir) rmSync(scriptDir, { recursive: true, force: true });
  });

  it('lists registrations with the workers that declared them, refuses bad ones and keeps visitors out', async () => {
    const list = (await (await s.client.request('/api/external-solvers')).json()) as ExternalSolverListResponse;
    const example = list.items.find((x) => x.name === EXAMPLE.name);
    expect(example?.models).toEqual(['classic']);
    expect(example?.workers).toEqual([worker.name]);
    // The hash an operator pins in WORKER_SOLVERS: SHA-256 of the stored command.
    expect(example?.commandSha256).toBe(commandSha256(EXAMPLE_SOLVER.command));
    expect(example?.commandSha256).toMatch(/^[0-9a-f]{64}$/);
    expect(list.items).toHaveLength(1 + Object.keys(SCRIPTS).length);

    const again = await register(EXAMPLE_SOLVER);
    expect(again.status).toBe(409);
    const noPlan = await register({ name: 'no-plan', version: '1', models: ['classic'], command: '/bin/true {map} {scenario} {agents}' });
    expect(noPlan.status).toBe(400);
    expect(JSON.stringify(await noPlan.json())).toContain('the command must use {plan}');
    const unknown = await register({ name: 'typo', version: '1', models: ['classic'], command: '/bin/true {map} {scenario} {agents} {plan} {mapp}' });
    expect(unknown.status).toBe(400);
    expect(JSON.stringify(await unknown.json())).toContain('{mapp} is not a placeholder');
    const textWeighted = await register({ name: 'timed', version: '1', models: ['weighted-split'], command: '/bin/true {map} {scenario} {agents} {plan}' });
    expect(textWeighted.status).toBe(400);

    expect((await fetch(`${s.url}/api/external-solvers`)).status).toBe(401);
    const count = await s.sql<{ n: string }>('SELECT count(*) AS n FROM external_solvers');
    expect(Number(count[0].n)).toBe(1 + Object.keys(SCRIPTS).length);
  });

  it('runs a sweep mixing built-in classic and the example solver; both appear side by side on the board and in the report', async () => {
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'built-in beside external',
      agentCounts: { kind: 'list', values: [3, 6] },
      models: [{ model: 'classic' }, { model: 'classic', externalSolver: EXAMPLE }],
      timeLimitMs: 30_000,
      execution: { policies: ['open-loop'], runs: 3 },
    }));
    expect(await waitForSweep(s, sweep.id, 200_000)).toBe('finished');

    const stored = await s.sql<{ params: { model: Record<string, unknown> }; status: string; solver_name: string | null; solver_version: string; cpu_time_ms: number | null; peak_memory_kb: string | null; soc: number; lower_bound: number; executable_at_nominal: boolean | null; nodes: number | null; nodes_expanded: number | null }>(
      'SELECT params, status, solver_name, solver_version, cpu_time_ms, peak_memory_kb, soc, lower_bound, executable_at_nominal, nodes, nodes_expanded FROM results WHERE sweep_id = :id ORDER BY id', { id: sweep.id });
    expect(stored).toHaveLength(4);
    expect(stored.every((r) => r.status === 'solved')).toBe(true);
    const external = stored.filter((r) => r.params.model['externalSolver'] !== undefined);
    const builtIn = stored.filter((r) => r.params.model['externalSolver'] === undefined);
    expect([external.length, builtIn.length]).toEqual([2, 2]);
    for (const r of external) {
      expect([r.solver_name, r.solver_version]).toEqual([EXAMPLE.name, EXAMPLE.version]);
      expect(r.cpu_time_ms).toBeGreaterThan(0);
      expect(Number(r.peak_memory_kb)).toBeGreaterThan(10_000);
      // The validator accepted it and the root bound (shortest paths alone) is ours.
      expect(r.soc).toBeGreaterThanOrEqual(r.lower_bound);
      expect(r.executable_at_nominal).not.toBeNull();
      // Search effort is never measured for an external program: null ("–"), not 0.
      expect([r.nodes, r.nodes_expanded]).toEqual([null, null]);
    }
    expect(builtIn.every((r) => (r.nodes ?? 0) > 0)).toBe(true);
    // Built-in runs keep their params exactly as before the field existed.
    expect(builtIn.every((r) => !('externalSolver' in r.params.model) && r.solver_name === null && r.cpu_time_ms === null)).toBe(true);

    const rows = ((await (await s.client.request(`/api/sweeps/${sweep.id}/results`)).json()) as { items: SweepResultRow[] }).items;
    expect(rows.filter((r) => r.modelIndex === 1 && (r.cpuTimeMs ?? 0) > 0 && (r.peakMemoryKb ?? 0) > 0 && r.executions.length === 1)).toHaveLength(2);
    const detail = (await (await s.client.request(`/api/sweeps/${sweep.id}`)).json()) as SweepDetail;
    expect(detail.progress.perModel.map((m) => m.label)).toEqual(['classic', `classic by ${EXAMPLE.name}@${EXAMPLE.version}`]);
    expect(detail.progress.perModel[1].external).toEqual({ solver: `${EXAMPLE.name}@${EXAMPLE.version}`, workers: 1, waiting: null, refused: null });

    const cols = 'scenario,agents,model,variant,solver,socSteps';
    const page = (await (await s.client.request(`/api/leaderboards/rows?cols=${cols}&model.in=classic&sort=agents,variant&start=0&end=100`)).json()) as LeaderboardPage;
    const variant = `solver=${EXAMPLE.name}@${EXAMPLE.version}`;
    expect(page.rows.map((r) => [r.agents, r.cells['variant'], r.cells['solver']])).toEqual([
      [3, '', expect.stringMatching(/^Quarterturn CBS /)], [3, variant, `${EXAMPLE.name} ${EXAMPLE.version}`],
      [6, '', expect.stringMatching(/^Quarterturn CBS /)], [6, variant, `${EXAMPLE.name} ${EXAMPLE.version}`],
    ]);
    // Prioritised planning is not optimal: never below the optimum CBS found on the same instance.
    for (const agents of [3, 6]) {
      const [cbs, prio] = page.rows.filter((r) => r.agents === agents).map((r) => r.cells['socSteps'] as number);
      expect(prio).toBeGreaterThanOrEqual(cbs);
    }

    const profile = await s.sql<{ robot_profile_hash: string }>('SELECT robot_profile_hash FROM results WHERE sweep_id = :id LIMIT 1', { id: sweep.id });
    const res = await s.client.request(`/api/reports/model-comparison?set=${setId}&profile=${profile[0].robot_profile_hash}&policy=open-loop`);
    expect(res.status).toBe(200);
    const report = (await res.json()) as ModelComparisonReport;
    expect(report.variants.map((v) => v.label)).toEqual(['classic', `classic (${variant})`]);
    expect(report.variants.every((v) => v.instances === 2 && v.solved === 2)).toBe(true);
  });

  it('lets a script with a sweep-scoped token launch the mixed sweep, but never register a solver', async () => {
    const created = await s.client.request('/api/me/tokens', { method: 'POST', body: JSON.stringify({ name: 'sweep script', scopes: ['read', 'sweep'], expiresInDays: 1 }) });
    expect(created.status).toBe(201);
    const { secret } = (await created.json()) as { secret: string };
    const call = (path: string, body?: unknown) => fetch(`${s.url}${path}`, {
      method: body === undefined ? 'GET' : 'POST', headers: { authorization: `Bearer ${secret}`, 'content-type': 'application/json' },
      ...(body === undefined ? {} : { body: JSON.stringify(body) }),
    });
    const refused = await call('/api/external-solvers', { ...EXAMPLE_SOLVER, version: '9.9.9' });
    expect(refused.status).toBe(403);
    expect(((await refused.json()) as { error: { details: unknown } }).error.details).toEqual({ missingScope: null });
    expect((await call('/api/external-solvers')).status).toBe(200);
    // Exactly the body the issue's script sends: a built-in model and the example solver side by side.
    const launched = await call('/api/sweeps', {
      name: 'scripted mixed sweep',
      instances: { instanceSetId: setId },
      agentCounts: { kind: 'list', values: [4] },
      models: [{ model: 'classic' }, { model: 'classic', externalSolver: { name: 'prioritised-astar', version: '1.0.0' } }],
      robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1 },
      timeLimitMs: 30_000,
      memoryLimitMb: 512,
      execution: { policies: ['open-loop'], runs: 2 },
      seeds: [1],
    });
    expect(launched.status).toBe(201);
    const sweep = (await launched.json()) as SweepDetail;
    expect(await waitForSweep(s, sweep.id, 120_000)).toBe('finished');
    const statuses = await s.sql<{ model_index: number; status: string }>('SELECT model_index, status FROM runs WHERE sweep_id = :id ORDER BY model_index', { id: sweep.id });
    expect(statuses).toEqual([{ model_index: 0, status: 'solved' }, { model_index: 1, status: 'solved' }]);
  });

  it('records a crash, a timeout, a memory overrun, garbage, no plan and an invalid plan as statuses, and the sweep finishes', async () => {
    const names = Object.keys(SCRIPTS);
    // The worker runs in this process: a database URL in its environment must not reach the solver.
    const savedUrl = process.env.DATABASE_URL;
    process.env.DATABASE_URL = db.url;
    let sweep: SweepDetail;
    try {
      sweep = await launchSweep(s, baseDefinition(setId, {
        name: 'misbehaving solvers',
        agentCounts: { kind: 'list', values: [2] },
        models: names.map((name) => ({ model: 'classic' as const, externalSolver: { name, version: '0.1' } })),
        timeLimitMs: 5000,
        memoryLimitMb: 256,
        execution: { policies: ['open-loop'], runs: 2 },
      }));
      expect(await waitForSweep(s, sweep.id, 120_000)).toBe('failed');
    } finally {
      if (savedUrl === undefined) delete process.env.DATABASE_URL;
      else process.env.DATABASE_URL = savedUrl;
    }
    const runs = await s.sql<{ model_index: number; status: string; reason: string; cpu_time_ms: number | null; peak_memory_kb: string | null }>(
      `SELECT r.model_index, r.status, r.reason, res.cpu_time_ms, res.peak_memory_kb FROM runs r LEFT JOIN results res ON res.run_id = r.id
       WHERE r.sweep_id = :id ORDER BY r.model_index`, { id: sweep.id });
    const by = Object.fromEntries(runs.map((r) => [names[r.model_index], r]));
    expect(runs).toHaveLength(names.length);
    expect([by['crashes'].status, by['crashes'].reason]).toEqual(['error', expect.stringContaining(`${EXTERNAL_FAILURE_PREFIX.crash}: exited with status 3`)]);
    expect(by['crashes'].reason).toContain('crash test: giving up on purpose');
    expect([by['sleeps'].status, by['sleeps'].reason]).toEqual(['timeout', expect.stringContaining('killed at the time limit of 5000 ms')]);
    expect([by['hogs'].status, by['hogs'].reason]).toEqual(['memory', expect.stringContaining('memory limit of 256 MB reached')]);
    expect([by['scribbles'].status, by['scribbles'].reason]).toEqual(['error', expect.stringContaining(EXTERNAL_FAILURE_PREFIX.badOutput)]);
    expect([by['writes-nothing'].status, by['writes-nothing'].reason]).toEqual(['error', `${EXTERNAL_FAILURE_PREFIX.badOutput}: it wrote no plan file (plan.txt)`]);
    expect([by['collides'].status, by['collides'].reason]).toEqual(['error', expect.stringContaining(`${EXTERNAL_FAILURE_PREFIX.invalidPlan}: `)]);
    // Its whole environment: PATH, LANG, HOME and TMPDIR; no database URL.
    expect([by['tells-env'].status, by['tells-env'].reason]).toEqual(['error', expect.stringContaining('it said: env: HOME,LANG,PATH,TMPDIR db: none')]);
    expect(runs.some((r) => r.reason.includes(db.url))).toBe(false);
    // The process's usage is recorded whatever the ending (GNU time outlives the killed solver).
    expect(runs.every((r) => r.cpu_time_ms !== null && Number(r.peak_memory_kb) > 0)).toBe(true);
    // The memory overrun was stopped by the limit: its peak stayed at most the limit.
    expect(Number(by['hogs'].peak_memory_kb)).toBeLessThanOrEqual(256 * 1024);
    // Nothing is left running or lying around.
    expect(processesWith(join(scriptDir, 'sleeps.js'))).toEqual([]);
    expect(processesWith(join(scriptDir, 'hogs.js'))).toEqual([]);
    const runIds = await s.sql<{ id: number }>('SELECT id FROM runs WHERE sweep_id = :id', { id: sweep.id });
    const left = readdirSync(tmpdir()).filter((d) => runIds.some((r) => d.startsWith(`qt-run-${r.id}-`)));
    expect(left).toEqual([]);
  });

  it('leaves runs of a solver no worker declares visibly waiting, refuses removing it meanwhile, and cancels', async () => {
    const lonely = (await (await register({ name: 'lonely', version: '1', models: ['classic'], command: '/bin/false {map} {scenario} {agents} {plan}' })).json()) as ExternalSolverView;
    const sweep = await launchSweep(s, baseDefinition(setId, { name: 'nobody has it', models: [{ model: 'classic', externalSolver: { name: 'lonely', version: '1' } }] }));
    await new Promise((r) => setTimeout(r, 1500));
    const detail = (await (await s.client.request(`/api/sweeps/${sweep.id}`)).json()) as SweepDetail;
    expect(detail.progress.counts.pending).toBe(2);
    expect(detail.progress.perModel[0].external).toEqual({ solver: 'lonely@1', workers: 0, waiting: 'waiting for a worker with solver lonely@1', refused: null });
    // Its jobs wait in the solver's own queue, expiring after the time limit (10 s) plus the plan check's 60 s plus the margin (3 s).
    const queue = externalRunQueue({ name: 'lonely', version: '1' });
    expect(queue).toMatch(/^qt-external-runs-lonely-1-[0-9a-f]{8}$/);
    const jobs = await s.sql<{ expire: number }>('SELECT extract(epoch FROM expire_in)::int AS expire FROM pgboss.job WHERE name = :queue', { queue });
    expect(jobs.map((j) => j.expire)).toEqual([73, 73]);
    const removing = await s.client.request(`/api/external-solvers/${lonely.id}`, { method: 'DELETE' });
    expect(removing.status).toBe(409);
    expect((await s.client.request(`/api/sweeps/${sweep.id}/cancel`, { method: 'POST' })).status).toBe(200);
    expect((await s.client.request(`/api/external-solvers/${lonely.id}`, { method: 'DELETE' })).status).toBe(204);
    // The queue holds no job of it any more.
    const queued = await s.sql<{ n: string }>("SELECT count(*) AS n FROM pgboss.job WHERE name = :queue AND state IN ('created', 'retry')", { queue });
    expect(Number(queued[0].n)).toBe(0);

    const unknown = await s.client.request('/api/sweeps', { method: 'POST', body: JSON.stringify(baseDefinition(setId, { models: [{ model: 'classic', externalSolver: { name: 'lonely', version: '1' } }] })) });
    expect(unknown.status).toBe(400);
    expect(((await unknown.json()) as { error: { message: string } }).error.message).toBe('models[0]: no external solver lonely@1 is registered');
    const wrongModel = await s.client.request('/api/sweeps', { method: 'POST', body: JSON.stringify(baseDefinition(setId, { models: [{ model: 'orientation-split', externalSolver: EXAMPLE }] })) });
    expect(wrongModel.status).toBe(400);
  });

  it('kills a running solver when its sweep is cancelled', async () => {
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'cancel while sleeping', agentCounts: { kind: 'list', values: [2] },
      models: [{ model: 'classic', externalSolver: { name: 'sleeps', version: '0.1' } }], timeLimitMs: 120_000,
    }));
    const script = join(scriptDir, 'sleeps.js');
    await waitUntil(async () => processesWith(script).length > 0, 30_000, 'the sleeping solver to start');
    expect((await s.client.request(`/api/sweeps/${sweep.id}/cancel`, { method: 'POST' })).status).toBe(200);
    await waitUntil(async () => processesWith(script).length === 0, 10_000, 'the sleeping solver to be killed');
    const [run] = await s.sql<{ status: string }>('SELECT status FROM runs WHERE sweep_id = :id', { id: sweep.id });
    expect(run.status).toBe('cancelled');
    expect(existsSync(scriptDir)).toBe(true);
  });

  it('refuses to run a registration whose command the worker did not approve, and a name and version with stored results cannot be registered again', async () => {
    // Registered with the approved command, removed, and registered again with another one.
    const first = (await (await register({ name: 'swapped', version: '0.1', models: ['classic'], command: scriptCommand(scriptDir, 'writes-nothing') })).json()) as ExternalSolverView;
    expect((await s.client.request(`/api/external-solvers/${first.id}`, { method: 'DELETE' })).status).toBe(204);
    const again = await register({ name: 'swapped', version: '0.1', models: ['classic'], command: scriptCommand(scriptDir, 'tells-env') });
    expect(again.status).toBe(201);
    const swappedHash = ((await again.json()) as ExternalSolverView).commandSha256;
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'swapped command', agentCounts: { kind: 'list', values: [2] },
      models: [{ model: 'classic', externalSolver: { name: 'swapped', version: '0.1' } }], timeLimitMs: 5000,
    }));
    expect(await waitForSweep(s, sweep.id, 60_000)).toBe('failed');
    const [run] = await s.sql<{ status: string; reason: string }>('SELECT status, reason FROM runs WHERE sweep_id = :id', { id: sweep.id });
    expect(run.status).toBe('error');
    expect(run.reason).toContain(`${EXTERNAL_FAILURE_PREFIX.unapproved}: the worker's approved command differs from the registration`);
    expect(run.reason).toContain(`registered command sha256:${swappedHash.slice(0, 16)}…`);
    // It never ran: the refused command would have said its environment.
    expect(run.reason).not.toContain('env:');
    // The sweep page says why under the solver's row.
    const detail = (await (await s.client.request(`/api/sweeps/${sweep.id}`)).json()) as SweepDetail;
    expect(detail.progress.perModel[0].external?.refused).toBe("1 run refused: the worker's approved command differs from the registration of swapped@0.1 (the worker's operator pins the registered command's hash in WORKER_SOLVERS)");

    // crashes@0.1 has stored results (the misbehaving sweep): removing is allowed, registering it again is not.
    const list = (await (await s.client.request('/api/external-solvers')).json()) as ExternalSolverListResponse;
    const crashes = list.items.find((x) => x.name === 'crashes');
    expect(crashes).toBeDefined();
    expect((await s.client.request(`/api/external-solvers/${crashes?.id}`, { method: 'DELETE' })).status).toBe(204);
    const reused = await register({ name: 'crashes', version: '0.1', models: ['classic'], command: scriptCommand(scriptDir, 'collides') });
    expect(reused.status).toBe(409);
    expect(((await reused.json()) as { error: { message: string } }).error.message).toContain('crashes@0.1 has 1 stored result(s) from an earlier registration');
    expect((await register({ name: 'crashes', version: '0.2', models: ['classic'], command: scriptCommand(scriptDir, 'collides') })).status).toBe(201);
  });

  it('kills a running solver when its worker stops gracefully, and the run comes back to the queue', async () => {
    // A solver only a second worker declares (both workers live in this process: the same worker name).
    expect((await register({ name: 'naps', version: '0.1', models: ['classic'], command: scriptCommand(scriptDir, 'sleeps') })).status).toBe(201);
    const second = await startSweepWorker({
      databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1,
      solvers: [{ name: 'naps', version: '0.1', commandSha256: commandSha256(scriptCommand(scriptDir, 'sleeps')) }],
    });
    let isStopped = false;
    try {
      const sweep = await launchSweep(s, baseDefinition(setId, {
        name: 'worker stops while a solver naps', agentCounts: { kind: 'list', values: [2] },
        models: [{ model: 'classic', externalSolver: { name: 'naps', version: '0.1' } }], timeLimitMs: 120_000,
      }));
      const script = join(scriptDir, 'sleeps.js');
      await waitUntil(async () => processesWith(script).length > 0, 30_000, 'the napping solver to start');
      const pids = processesWith(script);
      const began = Date.now();
      await second.stop({ graceful: true, timeoutMs: 60_000 });
      isStopped = true;
      // Killed when the stop began, not after the graceful timeout or the run's 120 s limit.
      expect(Date.now() - began).toBeLessThan(15_000);
      expect(processesWith(script)).toEqual([]);
      expect(pids.length).toBeGreaterThan(0);
      // The run is not recorded as an outcome: its job is back for another worker.
      const [run] = await s.sql<{ status: string; job_id: string }>('SELECT status, job_id FROM runs WHERE sweep_id = :id', { id: sweep.id });
      expect(['pending', 'running']).toContain(run.status);
      const [job] = await s.sql<{ state: string }>('SELECT state FROM pgboss.job WHERE id = :id', { id: run.job_id });
      expect(['retry', 'created']).toContain(job.state);
      const results = await s.sql<{ n: string }>('SELECT count(*) AS n FROM results WHERE sweep_id = :id', { id: sweep.id });
      expect(Number(results[0].n)).toBe(0);
      expect((await s.client.request(`/api/sweeps/${sweep.id}/cancel`, { method: 'POST' })).status).toBe(200);
    } finally {
      if (!isStopped) await second.stop({ graceful: false });
    }
  });
});
