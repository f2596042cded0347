/**
 * A visitor replays and downloads public results (issue 14, items 6 and 7), in Chromium, without
 * signing in: the demo data seeded as on every start, its demo sweep and a 40-robot sweep on the
 * open benchmark set's 161×63 warehouse map run by an in-process worker; the visitor opens a demo
 * result from the public leaderboard's Replay link, sees the stored figures replayed in the
 * browser, downloads the plan as JSON and as text; the warehouse result is drawn at a readable
 * scale, zooms, and its timeline scrolls instead of squeezing 40 rows.
 */
import { resolve } from 'node:path';
import { readFile } from 'node:fs/promises';
import pino from 'pino';
import type { Page } from 'playwright-core';
import { PlanDocumentSchema } from '@shared/plan-format';
import { parsePlanText } from '@shared/plan-format-text';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { DEMO_SWEEP_NAME } from '../../api/src/demo/seed-demo-results';
import { OPEN_BENCHMARKS_SET_NAME } from '../../api/src/demo/seed-open-benchmarks';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, baseDefinition, launchSweep, startSweepServer, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';
import { launchBrowser, type E2eBrowser } from './support/browser';

describe('a visitor replays and downloads public results', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let browser: E2eBrowser;
  let page: Page;
  let warehouseResultId: number;
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
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    const [demo] = await s.sql<{ id: number }>('SELECT id FROM sweeps WHERE name = :name', { name: DEMO_SWEEP_NAME });
    expect(await waitForSweep(s, demo.id, 240_000)).toBe('finished');
    // The large map: 40 robots of one warehouse scenario (the signed-in maintainer launches it; the visitor only reads).
    const [set] = await s.sql<{ id: number }>('SELECT id FROM instance_sets WHERE name = :name', { name: OPEN_BENCHMARKS_SET_NAME });
    const [scenario] = await s.sql<{ id: number }>("SELECT id FROM scenarios WHERE instance_set_id = :set AND name = 'warehouse-10-20-10-2-1-even-1.scen'", { set: set.id });
    const sweep = await launchSweep(s, baseDefinition(set.id, {
      name: 'warehouse aisle replay', instances: { instanceSetId: set.id, scenarioIds: [scenario.id] },
      agentCounts: { kind: 'list', values: [40] }, models: [{ model: 'classic' }], timeLimitMs: 60_000,
      execution: { policies: ['open-loop'], runs: 5 },
    }));
    expect(await waitForSweep(s, sweep.id, 120_000)).toBe('finished');
    const [wh] = await s.sql<{ id: number }>("SELECT id FROM results WHERE sweep_id = :id AND status = 'solved'", { id: sweep.id });
    warehouseResultId = wh.id;
    browser = await launchBrowser();
    page = browser.page;
    page.on('pageerror', (err) => pageErrors.push(err.message));
  }, 480_000);

  afterAll(async () => {
    await browser?.close();
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  it('opens a demo result from the public leaderboard and sees the stored figures replayed in the browser', async () => {
    await page.goto(`${s.url}/leaderboards`);
    const replay = page.getByRole('link', { name: /^Replay result \d+$/ }).first();
    await replay.waitFor({ timeout: 20_000 });
    const resultId = Number(/(\d+)$/.exec((await replay.getAttribute('aria-label')) ?? '')![1]);
    await replay.click();
    await page.waitForURL(`**/plans/view?result=${resultId}`);
    const check = page.locator('[data-testid="stored-check"]').first();
    await check.waitFor({ timeout: 30_000 });
    // Chromium's maths may round the last bits of a mean differently from Node's (the sweep's): equal to 9 significant digits then, said so.
    expect(await check.innerText()).toMatch(/all \d+ stored figures compared equal (to the digit\.|to 9 significant digits \(\d differ in the last bits only)/);
    expect(await page.locator('.source').innerText()).toContain(`stored result ${resultId}`);
    expect(await page.locator('app-execution-summary-card').first().innerText()).toContain('computed in this browser');
    expect(await page.getByRole('button', { name: 'Re-run on server' }).count()).toBe(0);
    expect(await page.locator('[data-testid="browser-only"]').innerText()).toContain('needs a researcher account');
  });

  it('downloads the plan as the JSON plan document and as text, both for the same cells', async () => {
    const pane = page.locator('article.pane').first();
    const model = await pane.getAttribute('data-model');
    const jsonLink = pane.locator('[data-testid="download-json"]');
    const [jsonFile] = await Promise.all([page.waitForEvent('download'), jsonLink.click()]);
    expect(jsonFile.suggestedFilename()).toMatch(new RegExp(`^quarterturn-result-\\d+-${model}\\.json$`));
    const doc = PlanDocumentSchema.parse(JSON.parse(await readFile((await jsonFile.path())!, 'utf8')));
    expect(doc.model).toBe(model);
    if (doc.model === 'weighted-split') {
      expect(await pane.locator('[data-testid="download-text"]').count()).toBe(0);
      return;
    }
    const [textFile] = await Promise.all([page.waitForEvent('download'), pane.locator('[data-testid="download-text"]').click()]);
    expect(textFile.suggestedFilename()).toMatch(/\.txt$/);
    const text = parsePlanText(await readFile((await textFile.path())!, 'utf8'), { file: 'plan.txt', withHeadings: doc.model === 'orientation-split' });
    if (!text.ok) throw new Error(JSON.stringify(text.problems));
    const cells = doc.model === 'orientation-split' ? doc.states.map((p) => p.map(([x, y]) => [x, y])) : doc.paths;
    expect(text.cells).toEqual(cells);
    expect(text.cells.length).toBe(doc.instance.agents);
  });

  it('draws the 161×63 warehouse at a readable scale, zooms it, and scrolls the 40-robot timeline', async () => {
    await page.goto(`${s.url}/plans/view?result=${warehouseResultId}`);
    await page.locator('[data-testid="stored-check"]').first().waitFor({ timeout: 60_000 });
    expect(await page.locator('.source').innerText()).toContain('(161×63) · 40 agents');
    const canvas = page.locator('app-fleet-canvas canvas');
    const box = (await canvas.boundingBox())!;
    // Was 340×130 px: now the pane's width, at least 260 px high.
    expect(box.width).toBeGreaterThanOrEqual(600);
    expect(box.height).toBeGreaterThanOrEqual(260);
    const zoom = page.locator('[data-testid="fleet-zoom"]');
    expect(await zoom.innerText()).toBe('8 px per cell');
    // The readout follows each click once the page has rendered: wait for it to change rather than read at once.
    const readoutLeaves = (from: number) => page.waitForFunction((before) => parseFloat(document.querySelector('[data-testid="fleet-zoom"]')?.textContent ?? '') !== before, from, { timeout: 5_000 });
    await page.getByRole('button', { name: 'Zoom in' }).click();
    await readoutLeaves(8);
    expect(await zoom.innerText()).toBe('12 px per cell');
    await page.getByRole('button', { name: 'Whole map' }).click();
    await readoutLeaves(12);
    expect(parseFloat(await zoom.innerText())).toBeLessThan(8);
    const whole = parseFloat(await zoom.innerText());
    await canvas.focus();
    await page.keyboard.press('+');
    // The readout follows the key once the page has rendered; wait for it rather than read at once.
    await page.waitForFunction((before) => parseFloat(document.querySelector('[data-testid="fleet-zoom"]')?.textContent ?? '') > before, whole, { timeout: 5_000 });
    expect(parseFloat(await zoom.innerText())).toBeCloseTo(whole * 1.5, 1);
    // 40 rows keep 10 px each; the chart scrolls instead of squeezing them.
    const rows = page.locator('app-gantt-chart .rows');
    const { scrollHeight, clientHeight, canvasHeight } = await rows.evaluate((el) => ({
      scrollHeight: el.scrollHeight, clientHeight: el.clientHeight, canvasHeight: el.querySelector('canvas')!.getBoundingClientRect().height,
    }));
    expect(canvasHeight).toBeGreaterThanOrEqual(40 * 10);
    expect(scrollHeight).toBeGreaterThan(clientHeight);
  });

  it('raised no script error', () => {
    expect(pageErrors).toEqual([]);
  });
});
