/**
 * External solvers in the browser (issue 16, item 4): an admin registers the shipped example solver
 * on the External solvers page, which shows the stand-alone worker (`worker-main.ts` with
 * WORKER_SOLVERS, as `npm run worker` would run) that declared it; the sweep editor offers it
 * beside the built-in models; the sweep runs both, and the results grid names the solver with its
 * CPU time and peak memory; the board shows its rows as their own variant. The page meets WCAG 2.1 AA.
 */
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { EXAMPLE_SOLVER } from '@shared/external-solvers';
import type { LeaderboardPage } from '@shared/leaderboards';
import type { SweepResultRow } from '@shared/runs';
import { commandSha256 } from '../../api/src/external-solvers/command-hash';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, spawnWorker, startSweepServer, uploadSet, workerReady, type SweepServer, type WorkerProcess } from '../reliability/support/sweep-harness';
import { axeViolations } from './support/axe';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { settledText } from './support/settled-text';
import { demoIdentity, signInThroughUi } from './support/sign-in';
import { watchPageProblems } from './support/page-problems';

jest.setTimeout(180_000);

const admin = demoIdentity('admin');
const KEY = `${EXAMPLE_SOLVER.name}@${EXAMPLE_SOLVER.version}`;
/** The SHA-256 of the example's command: the worker's operator approves exactly this command (WORKER_SOLVERS). */
const HASH = commandSha256(EXAMPLE_SOLVER.command);

describe('an external solver from the browser', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: WorkerProcess;
  let browser: E2eBrowser;
  let page: Page;
  let problems: string[] = [];

  beforeAll(async () => {
    const webDist = resolve(ROOT, 'dist/web/browser');
    ensureWebBuild({ root: ROOT, webDist, log: () => undefined });
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { WEB_DIST: webDist, ADMIN_LOGINS: admin.login });
    await uploadSet(s, 'sorting floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    worker = spawnWorker(db.url, { WORKER_SOLVERS: `${KEY}=sha256:${HASH}` });
    await workerReady(worker);
    browser = await launchBrowser();
    page = browser.page;
    problems = watchPageProblems(page);
    await signInThroughUi(page, s.url, admin);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await worker?.stop('SIGKILL');
    await s?.close();
    await db?.drop();
  });

  it('registers the example on the External solvers page and shows the worker that has it', async () => {
    expect(worker.output()).toContain(`and external solvers ${KEY}`);
    await page.goto(`${s.url}/sweeps`);
    await page.getByRole('link', { name: 'External solvers' }).click();
    await page.waitForURL(`${s.url}/sweeps/solvers`);
    await page.getByText('No external solver is registered.').waitFor();
    await page.getByLabel('Name').fill(EXAMPLE_SOLVER.name);
    await page.getByLabel('Version').fill(EXAMPLE_SOLVER.version);
    await page.getByLabel('Command').fill(EXAMPLE_SOLVER.command.replace(' {plan}', ''));
    expect(await settledText(page.getByTestId('solver-problem'), 'command: the command must use {plan}')).toBe('command: the command must use {plan}');
    await page.getByLabel('Command').fill(EXAMPLE_SOLVER.command);
    expect(await settledText(page.getByTestId('solver-problem'), '')).toBe('');
    await page.getByRole('button', { name: 'Register' }).click();
    const item = page.locator(`[data-solver="${KEY}"]`);
    await item.waitFor();
    expect(await item.getByTestId('solver-workers').innerText()).toContain(`:${worker.child.pid}`);
    // The hash the worker's operator pinned is the one the page shows.
    expect(await item.getByTestId('command-hash').innerText()).toBe(`sha256:${HASH}`);
    expect(await axeViolations(page)).toEqual([]);
  });

  it('runs the example beside built-in classic from the sweep editor; grid and board show it as its own variant', async () => {
    await page.goto(`${s.url}/sweeps/new`);
    await page.getByLabel('Sweep name').fill('built-in and external');
    await page.getByRole('combobox', { name: 'Instance set' }).click();
    await page.getByRole('option', { name: /sorting floor/ }).click();
    await page.getByLabel('Agent counts', { exact: true }).fill('2, 4');
    await page.getByRole('combobox', { name: 'Plan models' }).click();
    await page.getByRole('option', { name: 'weighted-split' }).click();
    await page.keyboard.press('Escape');
    await page.getByRole('combobox', { name: 'External solvers' }).click();
    await page.getByRole('option', { name: `${EXAMPLE_SOLVER.name} ${EXAMPLE_SOLVER.version}: classic` }).click();
    await page.keyboard.press('Escape');
    // 1 scenario × 2 agent counts × (classic + the example) × 1 seed; 2 policies × 20 runs each.
    expect(await settledText(page.getByTestId('sweep-size'), '4 runs · 160 simulated fleet runs', 10_000)).toBe('4 runs · 160 simulated fleet runs');
    await page.getByRole('button', { name: 'Launch sweep' }).click();
    await page.waitForURL(/\/sweeps\/\d+$/);
    expect(await settledText(page.getByTestId('sweep-status'), 'Finished', 120_000)).toBe('Finished');
    await page.locator('.ag-row').nth(3).waitFor();
    expect(await page.locator('.ag-cell[col-id=status]').allInnerTexts()).toEqual(Array(4).fill('solved'));
    const labels = await page.locator('.ag-cell[col-id=model]').allInnerTexts();
    expect([...new Set(labels)].sort()).toEqual(['classic', `classic, by ${KEY}`]);
    // The CPU time and peak memory columns sit far right (the grid renders only the columns in view): read the rows they show.
    const sweepId = Number(/\/sweeps\/(\d+)$/.exec(page.url())?.[1]);
    const rows = ((await (await s.client.request(`/api/sweeps/${sweepId}/results`)).json()) as { items: SweepResultRow[] }).items;
    expect(rows.filter((r) => (r.cpuTimeMs ?? 0) > 0 && (r.peakMemoryKb ?? 0) > 0).map((r) => r.modelIndex)).toEqual([1, 1]);

    const board = (await (await s.client.request('/api/leaderboards/rows?cols=agents,model,variant,solver&sort=agents,variant&start=0&end=10')).json()) as LeaderboardPage;
    expect(board.rows.map((r) => [r.agents, r.cells['variant'], String(r.cells['solver']).split(' ')[0]])).toEqual([
      [2, '', 'Quarterturn'], [2, `solver=${KEY}`, EXAMPLE_SOLVER.name], [4, '', 'Quarterturn'], [4, `solver=${KEY}`, EXAMPLE_SOLVER.name],
    ]);
  });

  it('raised no script or console error', () => {
    expect(problems).toEqual([]);
  });
});
