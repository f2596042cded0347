/**
 * The "done when" of issue 16, end to end: a script with a personal API token
 * (scripts/compare-my-solver.ts, run as a real process over HTTP, no cookie, no CSRF header)
 * submits a batch of plans from its own solver and launches a sweep mixing the built-in classic
 * CBS and the example external solver, which the server's embedded worker runs as a real child
 * process. Afterwards the three sources stand side by side on the board (same instance, same
 * robot profile) and in the model comparison report. Real PostgreSQL, real queue.
 */
import { execFile } from 'node:child_process';
import { join } from 'node:path';
import type { CreatedApiToken } from '@shared/api-tokens';
import { EXAMPLE_SOLVER } from '@shared/external-solvers';
import type { InstanceHistory } from '@shared/history';
import type { LeaderboardPage } from '@shared/leaderboards';
import pino from 'pino';
import { startEmbeddedWorker, type EmbeddedWorker } from '../../api/src/workers/embedded-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, startSweepServer, uploadSet, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(240_000);

/** Runs the script to its end; resolves with its exit code and output. */
function runScript(args: readonly string[], env: Record<string, string>): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, ['--import', 'tsx', join(ROOT, 'scripts', 'compare-my-solver.ts'), ...args], {
      cwd: ROOT, env: { ...process.env, ...env }, timeout: 200_000, maxBuffer: 8 * 1024 * 1024,
    }, (err, stdout, stderr) => resolve({ code: err ? (typeof err.code === 'number' ? err.code : -1) : 0, stdout, stderr }));
  });
}

describe('a script with a token submits a batch and launches a sweep mixing a built-in model and the example external solver', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: EmbeddedWorker | undefined;

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { EMBEDDED_WORKER: 'true', WORKER_THREADS: '1' });
    // The worker `npm start` runs beside the server; it declares the example solver by default (WORKER_SOLVERS).
    worker = await startEmbeddedWorker(s.server.app.context.config, db.url, pino({ level: process.env.QT_TEST_LOG ?? 'silent' }));
    expect(worker).toBeDefined();
  });
  afterAll(async () => {
    await worker?.stop();
    await s?.close();
    await db?.drop();
  });

  it('puts the batch plans, the built-in results and the external solver results side by side on the board and in the report', async () => {
    const registered = await s.client.request('/api/external-solvers', { method: 'POST', body: JSON.stringify(EXAMPLE_SOLVER) });
    expect(registered.status).toBe(201);
    const { setId } = await uploadSet(s, 'script floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    const created = await s.client.request('/api/me/tokens', { method: 'POST', body: JSON.stringify({ name: 'comparison script', scopes: ['read', 'submit', 'sweep'], expiresInDays: 1 }) });
    expect(created.status).toBe(201);
    const { secret } = (await created.json()) as CreatedApiToken;

    const run = await runScript(['--url', s.url, '--set', 'script floor', '--map', 'empty-8-8.map', '--scenario', 'empty-8-8-even-1.scen', '--agents', '2,4'], { QT_TOKEN: secret });
    if (process.env.QT_TEST_LOG) console.log(run.stdout);
    if (run.code !== 0) throw new Error(`the script failed (${run.code}):\n${run.stdout}\n${run.stderr}`);
    expect(run.stdout).toContain('plan 1 (');
    expect(run.stdout).toMatch(/2\/2 checked, 2 accepted, 0 refused/);

    // Stored: per agent count one submitted plan, one built-in result and one external result, all solved.
    const stored = await s.sql<{ agents: number; source: string; status: string; executions: number }>(
      `SELECT r.agents, CASE WHEN r.submission_id IS NOT NULL THEN 'submitted'
                             WHEN r.solver_name IS NOT NULL THEN r.solver_name ELSE 'built-in' END AS source,
              r.status, (SELECT count(*)::int FROM executions e WHERE e.result_id = r.id) AS executions
         FROM results r WHERE r.instance_set_id = :setId ORDER BY r.agents, source`, { setId });
    expect(stored.map((r) => `${r.agents} ${r.source} ${r.status} ${r.executions}`)).toEqual([
      '2 built-in solved 3', `2 ${EXAMPLE_SOLVER.name} solved 3`, '2 submitted solved 3',
      '4 built-in solved 3', `4 ${EXAMPLE_SOLVER.name} solved 3`, '4 submitted solved 3',
    ]);

    // The board (as a visitor: the set is public) has the three side by side for each agent count, under one profile.
    const [map] = await s.sql<{ id: number }>('SELECT id FROM maps WHERE instance_set_id = :setId', { setId });
    const res = await fetch(`${s.url}/api/leaderboards/rows?mapId=${map.id}&cols=agents,model,variant,solver,source,socSteps,profile&sort=agents,solver&start=0&end=50`);
    expect(res.status).toBe(200);
    const page = (await res.json()) as LeaderboardPage;
    // One row per model variant and instance: the classic row holds the best plan of the built-in search and the
    // submitted ones (both are classic plans), the external solver has a variant row of its own.
    const rows = page.rows.map((r) => `${r.cells.agents} ${r.cells.model} ${r.variant} ${r.cells.source}`);
    expect(rows).toHaveLength(4);
    for (const agents of [2, 4]) {
      const here = page.rows.filter((r) => r.cells.agents === agents);
      expect(here.map((r) => r.variant).sort()).toEqual(['', `solver=${EXAMPLE_SOLVER.name}@${EXAMPLE_SOLVER.version}`]);
      expect(new Set(here.map((r) => r.profileHash)).size).toBe(1);
      const external = here.find((r) => r.variant !== '');
      expect(String(external?.cells.solver)).toContain(EXAMPLE_SOLVER.name);
      // The classic row's history lists the built-in result and the submitted plan, one of them shown as best.
      const classic = here.find((r) => r.variant === '');
      const history = await fetch(`${s.url}/api/history?scenarioId=${classic?.scenarioId}&agents=${agents}&model=classic&variant=&profile=${classic?.profileHash}`);
      expect(history.status).toBe(200);
      const items = ((await history.json()) as InstanceHistory).items;
      expect(items.map((i) => i.source.kind).sort()).toEqual(['submission', 'sweep']);
      expect(items.filter((i) => i.isBest)).toHaveLength(1);
      // The built-in search is optimal: no submitted plan costs less.
      const builtIn = items.find((i) => i.source.kind === 'sweep');
      const submitted = items.find((i) => i.source.kind === 'submission');
      expect(builtIn?.soc).not.toBeNull();
      expect(submitted?.soc ?? 0).toBeGreaterThanOrEqual(builtIn?.soc ?? Infinity);
      expect(submitted?.solver.name).toBe('my-prioritised-planner');
    }
    // The script printed the same rows.
    expect(run.stdout).toContain(EXAMPLE_SOLVER.name);
    expect(run.stdout).toContain('my-prioritised-planner');

    // The comparison report names the external solver's variant beside the built-in model.
    const report = await fetch(`${s.url}/api/reports/model-comparison?set=${setId}&format=markdown`);
    expect(report.status).toBe(200);
    const markdown = await report.text();
    expect(markdown).toContain(`solver=${EXAMPLE_SOLVER.name}@${EXAMPLE_SOLVER.version}`);
    expect(run.stdout).toContain(`solver=${EXAMPLE_SOLVER.name}@${EXAMPLE_SOLVER.version}`);
  });
});
