/**
 * What `npm start` shows a visitor: the demo data seeded as on every start, its demo sweep run by
 * a real worker process through the queue, and the public leaderboard, comparison layout and
 * charts of those results in Chromium, without signing in.
 */
import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { PLAN_MODELS } from '@shared/plan';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { DEMO_SWEEP_NAME } from '../../api/src/demo/seed-demo-results';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, spawnWorker, startSweepServer, waitForSweep, workerReady, type SweepServer, type WorkerProcess } from '../reliability/support/sweep-harness';
import { axeViolations, describeFindings } from './support/axe';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { demoIdentity, signInThroughUi } from './support/sign-in';

describe('the seeded demo board, as a visitor', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: WorkerProcess;
  let browser: E2eBrowser;
  let page: Page;
  let runCount: number;
  const pageErrors: string[] = [];
  /** Console errors and warnings, each with the page it appeared on (issue 14: no console error on any page). */
  const consoleProblems: string[] = [];

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
    page.on('console', (msg) => {
      if (msg.type() === 'error' || msg.type() === 'warning') consoleProblems.push(`${new URL(page.url()).pathname}${new URL(page.url()).search}: ${msg.type()}: ${msg.text()}`);
    });
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

  it('keeps every chart subtitle inside the downloaded PNG and SVG (issue 14, item 10: subtitles were clipped)', async () => {
    const figures = page.locator('figure.chart[data-chart]');
    const ids = await figures.evaluateAll((els) => els.map((e) => e.getAttribute('data-chart') ?? ''));
    expect(ids.length).toBeGreaterThanOrEqual(3);
    for (const id of ids) {
      const chart = page.locator(`figure[data-chart="${id}"]`);
      await chart.locator('canvas').waitFor();
      const [png] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: 'Download PNG' }).click()]);
      const dataUrl = `data:image/png;base64,${(await readFile(await png.path())).toString('base64')}`;
      // Text cut at the image edge leaves dark pixels in its outermost columns; the title and
      // subtitle band (top quarter) must have only background there.
      const edgeInk = await page.evaluate(async (src) => {
        const img = new Image();
        img.src = src;
        await img.decode();
        const c = document.createElement('canvas');
        c.width = img.width; c.height = img.height;
        const g = c.getContext('2d', { willReadFrequently: true });
        if (!g) throw new Error('no 2d context');
        g.drawImage(img, 0, 0);
        const band = Math.floor(img.height / 4);
        let ink = 0;
        for (const x of [0, 1, 2, img.width - 3, img.width - 2, img.width - 1]) {
          const d = g.getImageData(x, 0, 1, band).data;
          for (let i = 0; i < d.length; i += 4) if (d[i] + d[i + 1] + d[i + 2] < 600) ink += 1;
        }
        return { ink, width: img.width };
      }, dataUrl);
      expect({ id, ink: edgeInk.ink }).toEqual({ id, ink: 0 });
      expect(edgeInk.width).toBeGreaterThan(400);

      const [svg] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: 'Download SVG' }).click()]);
      const markup = await readFile(await svg.path(), 'utf8');
      // Every text of the SVG (laid out by the browser) lies within the drawing's width.
      const outside = await page.evaluate((m) => {
        const host = document.createElement('div');
        host.innerHTML = m;
        document.body.appendChild(host);
        try {
          const root = host.querySelector('svg') as SVGSVGElement;
          // Boxes on screen, so each text's transform (ECharts places labels with one) is applied.
          const frame = root.getBoundingClientRect();
          const texts = [...root.querySelectorAll('text')] as SVGTextElement[];
          const bad = texts.filter((t) => { const b = t.getBoundingClientRect(); return b.left < frame.left - 0.5 || b.right > frame.right + 0.5; }).map((t) => t.textContent);
          return { bad, count: texts.length };
        } finally {
          host.remove();
        }
      }, markup);
      expect(outside.count).toBeGreaterThan(3);
      expect({ id, outside: outside.bad }).toEqual({ id, outside: [] });
    }
  });

  /** Opens `path`, waits for its main heading and lets late requests and redraws settle. */
  async function visit(path: string, heading: RegExp | string): Promise<void> {
    await page.goto(`${s.url}${path}`);
    await page.getByRole('heading', { name: heading }).first().waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    await page.waitForTimeout(300);
  }

  it('draws a 161×63 map viewer at once, inside the window, and keeps its size (issue 14, item 1)', async () => {
    const [map] = await s.sql<{ id: number; set_id: number; name: string }>(
      "SELECT m.id, m.instance_set_id AS set_id, m.name FROM maps m WHERE m.name = 'warehouse-10-20-10-2-1.map' LIMIT 1");
    await visit(`/instance-sets/${map.set_id}/maps/${map.id}`, map.name);
    const canvas = page.getByRole('img', { name: /Map of 161 by 63 cells/ });
    await canvas.waitFor();
    const first = await canvas.boundingBox();
    await page.waitForTimeout(1000);
    const later = await canvas.boundingBox();
    if (!first || !later) throw new Error('the map canvas has no box');
    // The canvas was sized once from its container: the same box a second later (it used to grow ~25 px/s for 10–15 s).
    expect(later).toEqual(first);
    const viewport = page.viewportSize();
    if (!viewport) throw new Error('no viewport');
    // "Whole map" fits the visible area: the canvas lies inside the window and draws the map across most of its width.
    expect(later.x).toBeGreaterThanOrEqual(0);
    expect(later.x + later.width).toBeLessThanOrEqual(viewport.width);
    expect(later.y + later.height).toBeLessThanOrEqual(viewport.height);
    expect(later.width).toBeGreaterThan(viewport.width / 2);
    expect(consoleProblems.filter((m) => /ResizeObserver/.test(m))).toEqual([]);
  });

  it('shows every page to a visitor and to an admin without a console error or warning, and axe finds no WCAG 2.1 A/AA violation (issue 18)', async () => {
    const [set] = await s.sql<{ id: number; name: string }>("SELECT id, name FROM instance_sets WHERE visibility = 'public' ORDER BY id LIMIT 1");
    const [map] = await s.sql<{ id: number; name: string }>('SELECT id, name FROM maps WHERE instance_set_id = :set ORDER BY id LIMIT 1', { set: set.id });
    const [result] = await s.sql<{ id: number }>("SELECT id FROM results WHERE status = 'solved' ORDER BY id LIMIT 1");
    const [sweep] = await s.sql<{ id: number }>('SELECT id FROM sweeps WHERE name = :name', { name: DEMO_SWEEP_NAME });
    const visitorPages: [string, RegExp | string][] = [
      ['/', /Plans that still hold/],
      ['/instance-sets', 'Instance sets'],
      [`/instance-sets/${set.id}`, set.name],
      [`/instance-sets/${set.id}/maps/${map.id}`, map.name],
      ['/leaderboards', /Leaderboard/],
      ['/leaderboards?layout=compare', /Leaderboard/],
      ['/reports', /Plan model comparison/],
      [`/plans/view?result=${result.id}`, /Plan viewer/],
      ['/help', 'Help'],
      ['/no-such-page', 'No such page'],
    ];
    const adminPages: [string, RegExp | string][] = [
      ['/sweeps', 'Sweeps'],
      ['/sweeps/new', 'New sweep'],
      [`/sweeps/${sweep.id}`, DEMO_SWEEP_NAME],
      ['/leaderboards/submit', /Submit a plan/],
      ['/admin', 'Accounts'],
    ];
    let visited = 0;
    let audited = 0;
    const axeProblems: string[] = [];
    const tour = async (path: string, heading: RegExp | string) => {
      await visit(path, heading);
      visited += 1;
      axeProblems.push(...describeFindings(path, await axeViolations(page)));
      audited += 1;
    };
    for (const [path, heading] of visitorPages) await tour(path, heading);
    await signInThroughUi(page, s.url, demoIdentity('admin'));
    for (const [path, heading] of [...visitorPages, ...adminPages]) await tour(path, heading);
    expect(visited).toBe(2 * visitorPages.length + adminPages.length);
    expect(audited).toBe(visited);
    expect(consoleProblems).toEqual([]);
    expect(axeProblems).toEqual([]);
  }, 240_000);

  it('raised no script error', () => {
    expect(pageErrors).toEqual([]);
  });
});
