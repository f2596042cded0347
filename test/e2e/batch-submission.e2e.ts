/**
 * Submitting a batch in Chromium (issue 16, item 3): a researcher chooses a zip with batch.json
 * and two plan files on the submit page, sends it, and sees the outcome table fill in: one plan
 * accepted with its figures, success rates per policy, the safety note and a plan viewer link, one
 * refused with its first violation. The section passes axe's WCAG 2.1 AA rules.
 * The instance is the tiny map of test/integration/leaderboard-support.ts (5 × 4, wall at (1, 1)),
 * uploaded over the API by another person into a public set.
 */
import type { Page } from 'playwright-core';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { signInAs } from '../../api/src/dev/sign-in-as';
import { buildZip, createSet, upload } from '../integration/instance-library-support';
import { TINY_MAP, TINY_SCEN } from '../integration/leaderboard-support';
import { axeViolations } from './support/axe';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { bootServer, type E2eServer } from './support/server';
import { demoIdentity, signInThroughUi } from './support/sign-in';
import { watchPageProblems } from './support/page-problems';

const researcher = demoIdentity('researcher');
const colleague = demoIdentity('maintainer');
/** Agents on rows 0 and 2, never near each other: a valid classic plan (hand-worked, SOC 4). */
const GOOD = '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n';
/** Agent 1 reaches (2,0) at t = 2, the step agent 0 arrives there: a vertex conflict. */
const CONFLICT = '(0,0) (1,0) (2,0)\n(2,2) (2,1) (2,0) (1,0) (0,0) (0,1) (0,2)\n(4,3) (4,2) (4,1) (4,0)\n';

describe('submitting a batch in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let problems: string[] = [];

  beforeAll(async () => {
    server = await bootServer();
    const other = await signInAs(server.url, colleague.login);
    const setId = await createSet(other, 'Quay batches', 'public');
    await upload(server.url, other, setId, [{ name: 'tiny.map', bytes: Buffer.from(TINY_MAP) }, { name: 'tiny-a.scen', bytes: Buffer.from(TINY_SCEN) }]).expect(201);

    browser = await launchBrowser();
    page = browser.page;
    problems = watchPageProblems(page);
    await signInThroughUi(page, server.url, researcher);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  it('uploads a batch zip and shows each plan\'s outcome', async () => {
    const manifest = {
      format: 'quarterturn-plan-batch', version: 1,
      defaults: { set: 'Quay batches', model: 'classic', solver: { name: 'Browser batch', version: '1' } },
      plans: [
        { file: 'good.txt', instance: { map: 'tiny.map', scenario: 'tiny-a.scen', agents: 2 } },
        { file: 'conflict.txt', instance: { scenario: 'tiny-a.scen', agents: 3 } },
      ],
    };
    const zip = await buildZip([
      { name: 'batch.json', bytes: Buffer.from(JSON.stringify(manifest, null, 2)) },
      { name: 'good.txt', bytes: Buffer.from(GOOD) },
      { name: 'conflict.txt', bytes: Buffer.from(CONFLICT) },
    ]);
    await page.goto(`${server.url}/leaderboards/submit`);
    await page.getByRole('heading', { name: 'Submit a batch of plans' }).waitFor();

    await page.getByLabel('Batch file (zip or JSON)').setInputFiles({ name: 'quay.zip', mimeType: 'application/zip', buffer: zip });
    await page.getByText(`quay.zip, ${zip.length} B`).waitFor();
    await page.getByRole('button', { name: 'Submit the batch' }).click();

    await page.getByText('2 of 2 plans all checked · 1 accepted · 1 refused').waitFor({ timeout: 60_000 });
    const table = page.getByRole('table', { name: 'Outcome of each plan' });
    const rows = table.getByRole('row');
    expect(await rows.count()).toBe(3);
    const good = await rows.nth(1).innerText();
    expect(good).toContain('Accepted');
    expect(good).toContain('SOC 4 · makespan 2');
    for (const policy of ['open-loop', 'lockstep', 'dependency-gated']) expect(good).toContain(`${policy}: success rate`);
    const conflict = await rows.nth(2).innerText();
    expect(conflict).toContain('Refused');
    expect(conflict).toContain('vertex: agents 0, 1 at time 2, cell (2, 0)');
    expect(await page.getByText(SAFETY_NOTE).count()).toBeGreaterThan(0);
    const link = table.getByRole('link', { name: 'Open plan 1 in the plan viewer' });
    expect(await link.getAttribute('href')).toMatch(/^\/plans\/view\?result=\d+$/);
    await page.getByRole('heading', { name: 'Your batches' }).waitFor();
  });

  it('meets WCAG 2.1 AA on the page with the outcome table', async () => {
    expect(await axeViolations(page)).toEqual([]);
  });

  it('raised no script or console error', () => {
    expect(problems).toEqual([]);
  });
});
