/**
 * Submitting a plan in Chromium (issue 14, item 4): a researcher picks the instance from lists
 * (set, map, scenario, agents), the form offers the robot profile the instance's stored result
 * uses as its default, the plan file goes in through the styled picker, and the accepted result
 * names the profile the plan was scored under, the same one the server stored.
 * The instance and its earlier result are made over the API by another person: the tiny map of
 * test/integration/leaderboard-support.ts (5 × 4, wall at (1, 1)) and a submitted plan under a
 * robot profile other than the starter profile.
 */
import type { Page } from 'playwright-core';
import { STARTER_PROFILE } from '@shared/executions-constants';
import type { InstanceSetDetail } from '@shared/instance-sets';
import { profileLabel } from '@shared/leaderboards';
import type { SubmissionListResponse } from '@shared/submissions';
import { signInAs } from '../../api/src/dev/sign-in-as';
import { createSet, json, upload } from '../integration/instance-library-support';
import { TINY_MAP, TINY_SCEN } from '../integration/leaderboard-support';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { bootServer, type E2eServer } from './support/server';
import { demoIdentity, signInThroughUi } from './support/sign-in';
import { watchPageProblems } from './support/page-problems';

const researcher = demoIdentity('researcher');
// Without the demo seed everyone starts as researcher; this identity only provides the earlier result.
const colleague = demoIdentity('maintainer');
/** The profile of the earlier result: the starter profile with slower turns and a wider robot (invented figures). */
const USED = { ...STARTER_PROFILE, quarterTurnMs: 900, robotDiameterMm: 760 };
/** Agent 0 (0,0)→(2,0) along row 0, agent 1 (2,2)→(0,2) along row 2: a valid classic plan (hand-worked, SOC 4). */
const PLAN = '# two robots on rows 0 and 2\n(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n';

describe('submitting a plan in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let scenarioId: number;
  let problems: string[] = [];

  beforeAll(async () => {
    server = await bootServer();
    const other = await signInAs(server.url, colleague.login);
    const setId = await createSet(other, 'Quay submissions', 'public');
    await upload(server.url, other, setId, [{ name: 'tiny.map', bytes: Buffer.from(TINY_MAP) }, { name: 'tiny-a.scen', bytes: Buffer.from(TINY_SCEN) }]).expect(201);
    const set = (await (await other.request(`/api/instance-sets/${setId}`)).json()) as InstanceSetDetail;
    scenarioId = set.scenarios[0].id;
    const doc = { format: 'quarterturn-plan', version: 1, model: 'classic', instance: { scenarioId, agents: 2 }, solver: { name: 'Colleague planner', version: '1' },
      robotProfile: USED, paths: [[[0, 0], [1, 0], [2, 0]], [[2, 2], [1, 2], [0, 2]]] };
    const res = await other.request('/api/submissions', json('POST', { format: 'json', text: JSON.stringify(doc) }));
    if (res.status !== 201) throw new Error(`the earlier result was refused: ${res.status} ${await res.text()}`);

    browser = await launchBrowser();
    page = browser.page;
    problems = watchPageProblems(page);
    await signInThroughUi(page, server.url, researcher);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  const choose = async (field: string, option: string | RegExp) => {
    await page.getByRole('combobox', { name: field }).click();
    await page.getByRole('option', { name: option }).click();
  };

  it('picks the instance from lists and defaults to the profile of the instance\'s result', async () => {
    await page.goto(`${server.url}/leaderboards/submit`);
    await page.getByRole('heading', { name: 'Submit a plan' }).waitFor();
    // No field asks for a numeric scenario id.
    expect(await page.getByLabel('Scenario id').count()).toBe(0);

    await choose('Instance set', /^Quay submissions · public/);
    await choose('Map', /^tiny\.map · 5 × 4/);
    await choose('Scenario', /^tiny-a\.scen · up to 3 agents/);
    await page.getByText(`Scenario id ${scenarioId}, as a JSON plan document names it.`).waitFor();
    await page.getByRole('spinbutton', { name: 'Agents' }).fill('2');

    const profile = page.getByRole('combobox', { name: 'Robot profile' });
    await profile.filter({ hasText: '1 result of this instance' }).waitFor();
    expect(await profile.innerText()).toContain(profileLabel(USED));
    // The starter profile is offered too, after it.
    await profile.click();
    expect(await page.getByRole('option').allInnerTexts()).toEqual([
      `${profileLabel(USED)} · 1 result of this instance`,
      `${profileLabel(STARTER_PROFILE)} · starter profile, no results of this instance yet`,
    ]);
    await page.keyboard.press('Escape');
  });

  it('loads the plan file through the styled picker and shows the profile on the accepted result', async () => {
    await page.getByLabel('Solver name').fill('Hand planner');
    await page.getByLabel('Solver version').fill('0.9');
    await expect(page.getByRole('button', { name: 'Choose a plan file…' }).isVisible()).resolves.toBe(true);
    await page.getByLabel('Plan file', { exact: true }).setInputFiles({ name: 'rows.txt', mimeType: 'text/plain', buffer: Buffer.from(PLAN) });
    await page.getByText(`rows.txt, ${Buffer.byteLength(PLAN)} B`).waitFor();
    expect(await page.getByRole('textbox', { name: 'Plan' }).inputValue()).toBe(PLAN);

    await page.getByRole('button', { name: 'Check and submit' }).click();
    const accepted = page.getByRole('status', { name: 'Plan accepted' });
    await accepted.waitFor();
    expect(await accepted.locator('[data-field=profile]').innerText()).toBe(profileLabel(USED));
    // Under USED a quarter turn takes 900 ms, but the free start heading needs none: 2 forwards of 1000 ms.
    expect(await accepted.innerText()).toContain('turn-inclusive makespan 2,000 ms');
  });

  it('stored the plan under the chosen profile', async () => {
    const me = await signInAs(server.url, researcher.login);
    const list = (await (await me.request('/api/submissions')).json()) as SubmissionListResponse;
    expect(list.items).toHaveLength(1);
    expect(list.items[0].robotProfile).toEqual(USED);
    expect([list.items[0].scenarioId, list.items[0].agents]).toEqual([scenarioId, 2]);
  });

  it('raised no script or console error', () => {
    expect(problems).toEqual([]);
  });
});
