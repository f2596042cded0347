/**
 * A researcher's field-trial journey (issue 17, "done when"): attach trial logs to a stored result
 * on its page, see the field runs beside the simulation, fit a profile to them, save it under a
 * name, find it in the sweep editor, where it fills the profile fields, and launch a sweep with it. The maintainer (who
 * may also open the sweep editor) walks it. A real sweep (in-process worker) on the open dataset's
 * empty-8-8 (Stern et al., SoCS 2019, read in place) stores the result; the logs are simulated runs
 * of its plan written as trial logs (invented data).
 */
import { resolve } from 'node:path';
import pino from 'pino';
import type { Page } from 'playwright-core';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { ResultPlanView } from '@shared/result-plan-view';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { instanceOfView, inventedTrialLogs } from '../../api/src/trials/invented-trials';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { ensureWebBuild } from '../../scripts/web-build';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { ROOT, MAINTAINER, baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { signInThroughUi } from './support/sign-in';

describe('field trials in the browser', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let browser: E2eBrowser;
  let page: Page;
  let resultId: number;
  let logs: { name: string; text: string }[];
  const pageErrors: string[] = [];

  beforeAll(async () => {
    const webDist = resolve(ROOT, 'dist/web/browser');
    ensureWebBuild({ root: ROOT, webDist, log: () => undefined });
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { WEB_DIST: webDist });
    const { setId } = await uploadSet(s, 'trial floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'trial plan', agentCounts: { kind: 'list', values: [4] }, models: [{ model: 'classic' }], execution: { policies: ['dependency-gated'], runs: 5 },
    }));
    expect(await waitForSweep(s, sweep.id, 100_000)).toBe('finished');
    [{ id: resultId }] = await s.sql<{ id: number }>("SELECT id FROM results WHERE sweep_id = :id AND status = 'solved' ORDER BY id LIMIT 1", { id: sweep.id });
    const view = (await (await fetch(`${s.url}/api/executions/results/${resultId}`)).json()) as ResultPlanView;
    logs = inventedTrialLogs(instanceOfView(view.instance), view.plan, view.profile, {
      policy: 'dependency-gated', noise: { jitterCv: 0.12, stallProbability: 0, stallMs: 0 }, seed: 5, runs: 6, prefix: 'floor-b',
    });
    browser = await launchBrowser();
    page = browser.page;
    page.on('pageerror', (err) => pageErrors.push(err.message));
    await signInThroughUi(page, s.url, DEMO_IDENTITIES.find((d) => d.login === MAINTAINER)!);
  }, 480_000);

  afterAll(async () => {
    await browser?.close();
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  it('attaches logs, shows them beside the simulation, fits and saves a profile, and launches a sweep with it from the sweep editor', async () => {
    await page.goto(`${s.url}/plans/view?result=${resultId}`);
    const panel = page.locator('[data-testid="field-trials"]');
    await panel.getByText(`No field runs are attached to result ${resultId} yet.`).waitFor({ timeout: 30_000 });
    await panel.locator('.safety').filter({ hasText: SAFETY_NOTE }).waitFor();

    await panel.locator('[data-testid="trial-files"]').setInputFiles(logs.map((l) => ({ name: l.name, mimeType: 'text/csv', buffer: Buffer.from(l.text) })));
    await panel.getByLabel('Notes (floor, robot type, date)').fill('Floor B, two-wheel robots, invented logs');
    await panel.locator('[data-testid="trial-attach"]').click();
    await panel.getByRole('status').filter({ hasText: 'Stored 6 field runs.' }).waitFor({ timeout: 30_000 });
    await panel.locator('[data-testid="trial-run"]').nth(5).waitFor();
    expect(await panel.locator('[data-testid="trial-run"]').count()).toBe(6);
    const simulated = await panel.locator('tr.simulated').textContent();
    expect(simulated).toMatch(/\d+\.\d\d s \(\d+\.\d\d s – \d+\.\d\d s\)/);
    expect(await panel.getByRole('figure').count()).toBe(2);

    await panel.locator('[data-testid="fit-profile"]').click();
    const values = panel.locator('[data-testid="fit-values"]');
    await values.waitFor({ timeout: 30_000 });
    expect(await values.locator('tbody tr').first().textContent()).toMatch(/Forward time \(\d+ actions\)\s*\d+ ms\s*\d+ ms – \d+ ms/);
    await panel.locator('[data-testid="profile-name"]').fill('Floor B two-wheel');
    await panel.locator('[data-testid="save-profile"]').click();
    await panel.locator('[data-testid="profile-saved"]').waitFor({ timeout: 30_000 });
    const [stored] = await s.sql<{ profile: { forwardMs: number } }>("SELECT profile FROM robot_profiles WHERE name = 'Floor B two-wheel'");

    await page.goto(`${s.url}/sweeps/new`);
    await page.locator('[data-testid="named-profile"]').click();
    await page.getByRole('option', { name: /^Floor B two-wheel/ }).click();
    expect(await page.locator('input[formcontrolname="forwardMs"]').inputValue()).toBe(String(stored.profile.forwardMs));

    // ... and launches a sweep with it: the stored definition carries the fitted profile.
    await page.getByLabel('Sweep name').fill('fitted profile check');
    await page.getByRole('combobox', { name: 'Instance set' }).click();
    await page.getByRole('option', { name: /trial floor/ }).click();
    await page.getByLabel('Agent counts', { exact: true }).fill('2');
    await page.getByRole('button', { name: 'Launch sweep' }).click();
    await page.waitForURL(/\/sweeps\/\d+$/, { timeout: 30_000 });
    const sweepId = Number(/\/sweeps\/(\d+)$/.exec(page.url())?.[1]);
    const [launched] = await s.sql<{ definition: { robotProfile: { forwardMs: number } } }>('SELECT definition FROM sweeps WHERE id = :id', { id: sweepId });
    expect(launched.definition.robotProfile.forwardMs).toBe(stored.profile.forwardMs);
    expect(pageErrors).toEqual([]);
  });
});

