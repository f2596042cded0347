/**
 * A maintainer launches a sweep from the web, watches it progress live, and receives the
 * e-mail in the local mailbox; the runs are taken by a worker process started on its own
 * (`worker-main.ts`, as `npm run worker` would), not by the server.
 */
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, runLedger, spawnWorker, startSweepServer, uploadSet, workerReady, type SweepServer, type WorkerProcess } from '../reliability/support/sweep-harness';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { focusAgainst, focusedDescription, isFocused, tabUntil } from './support/keyboard';
import { settledText } from './support/settled-text';
import { demoIdentity, signInThroughUi } from './support/sign-in';

const admin = demoIdentity('admin');

describe('a sweep from the browser', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: WorkerProcess;
  let browser: E2eBrowser;
  let page: Page;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    const webDist = resolve(ROOT, 'dist/web/browser');
    ensureWebBuild({ root: ROOT, webDist, log: () => undefined });
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { WEB_DIST: webDist, ADMIN_LOGINS: admin.login });
    await uploadSet(s, 'parcel hall', ['empty-8-8.map', 'empty-8-8-even-1.scen', 'empty-8-8-even-2.scen']);
    worker = spawnWorker(db.url, { SMTP_URL: s.smtp.url, PUBLIC_URL: s.url });
    await workerReady(worker);
    browser = await launchBrowser();
    page = browser.page;
    page.on('pageerror', (err) => pageErrors.push(err.message));
    await signInThroughUi(page, s.url, admin);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await worker?.stop('SIGKILL');
    await s?.close();
    await db?.drop();
  });

  it('launches from the form, shows live progress and results, and mails the launcher', async () => {
    await page.goto(`${s.url}/sweeps/new`);
    await page.getByLabel('Sweep name').fill('parcel hall check');
    await page.getByRole('combobox', { name: 'Instance set' }).click();
    await page.getByRole('option', { name: /parcel hall/ }).click();
    await page.getByLabel('Agent counts', { exact: true }).fill('2, 4');
    // 2 scenarios × 2 agent counts × 2 default models (classic, weighted-split) × 1 seed.
    await settledText(page.getByTestId('sweep-size'), '8 runs · 320 simulated fleet runs', 10_000);
    // Each model once more at w = 1.5 (issue 15, item 1): twice the runs.
    await page.getByLabel('Suboptimality factor w').fill('1, 1.5');
    await settledText(page.getByTestId('sweep-size'), '16 runs · 640 simulated fleet runs', 10_000);
    await page.getByRole('button', { name: 'Launch sweep' }).click();
    await page.waitForURL(/\/sweeps\/\d+$/);

    await settledText(page.getByTestId('sweep-status'), 'Finished', 60_000);
    await settledText(page.getByTestId('sweep-done'), '16 of 16 runs over');
    await page.locator('.ag-row').nth(15).waitFor();
    expect(await page.locator('.ag-row').count()).toBe(16);
    expect(await page.locator('.ag-cell[col-id=status]').allInnerTexts()).toEqual(Array(16).fill('solved'));
    const labels = await page.locator('.ag-cell[col-id=model]').allInnerTexts();
    expect([...new Set(labels)].sort()).toEqual(['classic', 'classic, w = 1.5', 'weighted-split', 'weighted-split, w = 1.5']);

    const sweepId = Number(/\/sweeps\/(\d+)$/.exec(page.url())?.[1]);
    const ledger = await runLedger(s, sweepId);
    expect(new Set(ledger.map((r) => r.worker)).size).toBe(1);
    expect(ledger[0].worker).toContain(`:${worker.child.pid}`);

    // A solved run's stored plan opens in the plan viewer, replayed on the server by its result id.
    await page.getByRole('link', { name: `Replay the plan of run ${ledger[0].id}`, exact: true }).click();
    await page.waitForURL(/\/plans\/view\?result=\d+$/);
    await page.locator('.source').filter({ hasText: new RegExp(`stored result \\d+ of sweep ${sweepId}\\b`) }).waitFor({ timeout: 30_000 });
    expect(await page.locator('article.pane [data-metric="success-rate"] dd').first().innerText()).toMatch(/^\d+%$/);

    // The board keeps w = 1.5 apart from exact search, and the summary counts the proven optima of each line.
    await page.goto(`${s.url}/leaderboards`);
    const optimality = page.locator('td[data-cell=optimality]');
    await optimality.nth(3).waitFor({ timeout: 20_000 });
    const lines = await page.locator('app-model-summary tr.mat-mdc-row').allInnerTexts();
    expect(lines.filter((l) => /^(classic|weighted-split) \(w=1\.5\)/.test(l))).toHaveLength(2);
    expect(lines.find((l) => l.startsWith('classic\t'))).toMatch(/4 \/ 4 proven/);

    await page.goto(`${s.url}/sweeps/mailbox`);
    await page.getByText('Quarterturn: sweep "parcel hall check" finished').waitFor({ timeout: 10_000 });
    expect(pageErrors).toEqual([]);
  }, 120_000);

  it('launches by keyboard alone; focus lands on the new page, Tab leaves its grid in one step and Enter follows a Replay cell (issue 18)', async () => {
    await page.goto(`${s.url}/sweeps/new`);
    await page.getByRole('heading', { name: 'New sweep' }).waitFor();
    await tabUntil(page, 'input[formcontrolname=name]', 40);
    await page.keyboard.type('parcel hall by keys');
    await page.keyboard.press('Tab');
    expect(await isFocused(page, 'mat-select[formcontrolname=instanceSetId]')).toBe(true);
    // Open the picker, take its first choice.
    await page.keyboard.press('Enter');
    await page.getByRole('option', { name: /parcel hall/ }).waitFor();
    await page.keyboard.press('Enter');
    expect(await page.getByRole('combobox', { name: 'Instance set' }).innerText()).toMatch(/parcel hall/);
    await tabUntil(page, 'input[formcontrolname=countList]', 10);
    await page.keyboard.press('Control+A');
    await page.keyboard.type('2');
    // 2 scenarios × 1 agent count × 2 default models × 1 seed.
    await page.waitForFunction(() => document.querySelector('[data-testid=sweep-size]')?.textContent?.trim().startsWith('4 runs') ?? false, undefined, { timeout: 10_000 });
    await tabUntil(page, 'button[type=submit]', 80);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/sweeps\/\d+$/);
    // Focus went to the new page's content, not to the body (issue 18, item 7).
    await page.getByTestId('sweep-status').waitFor();
    expect(await focusedDescription(page)).toMatch(/^main#main-content/);

    await settledText(page.getByTestId('sweep-status'), 'Finished', 60_000);
    await page.locator('.ag-row').nth(3).waitFor();
    await tabUntil(page, '.ag-root-wrapper, .ag-root-wrapper *', 20);
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Tab');
    // Out in one step; nothing focusable follows the grid on this page, so focus leaves the document ('none').
    expect(['after', 'none']).toContain(await focusAgainst(page, 'ag-grid-angular'));
    await page.keyboard.press('Shift+Tab');
    expect(await focusAgainst(page, 'ag-grid-angular')).toBe('inside');
    await page.keyboard.press('Shift+Tab');
    expect(await isFocused(page, 'a.qt-skip-link[href="#after-sweep-grid"]')).toBe(true);
    await page.keyboard.press('Tab');
    // Back in the grid (Tab enters at the header row); down into the first row, then along it to the Replay cell.
    expect(await focusAgainst(page, 'ag-grid-angular')).toBe('inside');
    if (await isFocused(page, '.ag-header-cell')) await page.keyboard.press('ArrowDown');
    expect(await isFocused(page, '.ag-cell')).toBe(true);
    for (let i = 0; i < 12 && !(await isFocused(page, '.ag-cell[col-id=replay]')); i++) await page.keyboard.press('ArrowRight');
    expect(await isFocused(page, '.ag-cell[col-id=replay]')).toBe(true);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/plans\/view\?result=\d+$/);
    expect(pageErrors).toEqual([]);
  }, 120_000);
});
