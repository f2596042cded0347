/**
 * What `npm start` shows a visitor: the demo data seeded as on every start, its demo sweep run by
 * a real worker process through the queue, and the public leaderboard, comparison layout and
 * charts of those results in Chromium, without signing in.
 */
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { PLAN_MODELS } from '@shared/plan';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { DEMO_SWEEP_NAME } from '../../api/src/demo/seed-demo-results';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, spawnWorker, startSweepServer, waitForSweep, workerReady, type SweepServer, type WorkerProcess } from '../reliability/support/sweep-harness';
import { launchBrowser, type E2eBrowser } from './support/browser';

describe('the seeded demo board, as a visitor', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: WorkerProcess;
  let browser: E2eBrowser;
  let page: Page;
  let runCount: number;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    const webDist = resolve(ROOT, 'dist/web/browser');
    ensureWebBuild({ root: ROOT, webDist, log: () => undefined });
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { WEB_DIST: webDist });
    const sequelize = createSequelize(db.url, { poolMax: 2 });
    try {
      await seedDemo(sequelize);
    } finally {
      await sequelize.close();
    }
    const [sweep] = await s.sql<{ id: number; run_count: number }>('SELECT id, run_count FROM sweeps WHERE name = :name', { name: DEMO_SWEEP_NAME });
    runCount = sweep.run_count;
    worker = spawnWorker(db.url);
    await workerReady(worker);
    expect(await waitForSweep(s, sweep.id, 180_000)).toBe('finished');
    browser = await launchBrowser();
    page = browser.page;
    page.on('pageerror', (err) => pageErrors.push(err.message));
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
    await worker?.stop('SIGKILL');
    await s?.close();
    await db?.drop();
  });

  it('lists every demo result on the public board, all five plan models, with the safety note', async () => {
    await page.goto(`${s.url}/leaderboards`);
    await page.getByText(`${runCount} rows`).waitFor({ timeout: 20_000 });
    await page.locator('.ag-row').first().waitFor();
    const models = new Set(await page.locator('.ag-cell[col-id=model]').allInnerTexts());
    expect([...models].sort()).toEqual([...PLAN_MODELS].sort());
    expect(new Set(await page.locator('.ag-cell[col-id=status]').allInnerTexts())).toEqual(new Set(['solved']));
    expect(await page.getByText('Simulation is no safety assessment').first().isVisible()).toBe(true);
  });

  it('shows the models side by side and draws the charts, naming the robot profile', async () => {
    await page.goto(`${s.url}/leaderboards?layout=compare`);
    await page.locator('.ag-row').first().waitFor({ timeout: 20_000 });
    const headers = await page.locator('.ag-header-cell[col-id]').evaluateAll((els) => els.map((e) => e.textContent?.trim() ?? ''));
    for (const model of PLAN_MODELS) expect(headers.some((h) => h.startsWith(model))).toBe(true);
    await page.locator('figure.chart canvas, figure.chart svg').first().waitFor({ timeout: 20_000 });
    expect(await page.locator('.charts .caption').first().innerText()).toMatch(/^All figures: robot profile .+; execution figures under the .+ policy\./);
  });

  it('raised no script error', () => {
    expect(pageErrors).toEqual([]);
  });
});
