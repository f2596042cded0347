/**
 * The Help page in the browser: a visitor reaches it from the top bar of another page, reads the
 * user guide (README.md's guide part, served by the API), jumps through its contents list, opens
 * the published JSON Schemas and follows a link into the app without reloading it.
 */
import type { Page } from 'playwright-core';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { bootServer, type E2eServer } from './support/server';
import { watchPageProblems } from './support/page-problems';

describe('Help page in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let problems: string[] = [];

  beforeAll(async () => {
    server = await bootServer();
    browser = await launchBrowser();
    page = browser.page;
    problems = watchPageProblems(page);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  const guideHeadings = () => page.locator('article.guide h2').allInnerTexts();

  it('is linked from the top bar of another page and shows the user guide', async () => {
    await page.goto(`${server.url}/instance-sets`);
    await page.getByRole('banner').getByRole('link', { name: 'Help' }).click();

    await page.waitForURL(`${server.url}/help`);
    await page.getByRole('heading', { name: 'Help', level: 1 }).waitFor();
    await page.locator('article.guide h2').first().waitFor();
    expect(await page.title()).toBe('Help · Quarterturn');
    expect(await guideHeadings()).toEqual(expect.arrayContaining([
      'Signing in', 'Roles', 'Plan models', 'Execution policies', 'What the figures mean', 'File formats', 'Command-line tools',
    ]));
    expect(await page.locator('article.guide').innerText()).toContain('Simulation is no safety assessment');
  });

  it('links to both JSON Schemas, which the API serves to anyone', async () => {
    const links = page.getByRole('navigation', { name: 'JSON Schemas' }).getByRole('link');
    const hrefs = await links.evaluateAll((as) => as.map((a) => a.getAttribute('href')));
    expect(hrefs).toEqual(['/api/schemas/plan-format.schema.json', '/api/schemas/instance-format.schema.json']);

    for (const href of hrefs) {
      const res = await page.request.get(`${server.url}${href}`);
      expect([href, res.status(), res.headers()['content-type']]).toEqual([href, 200, 'application/schema+json; charset=utf-8']);
      expect((await res.json()).$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    }
  });

  it('scrolls to a section picked in the contents list', async () => {
    await page.getByRole('navigation', { name: 'On this page' }).getByRole('button', { name: 'File formats' }).click();

    const heading = page.locator('article.guide h2', { hasText: 'File formats' });
    const box = await heading.boundingBox();
    expect(box && box.y >= 0 && box.y < 200).toBe(true);
  });

  it('follows a link into the app without reloading it', async () => {
    await page.evaluate(() => Object.assign(window, { qtSamePage: true }));

    await page.locator('article.guide a[href="/leaderboards"]').first().click();

    await page.waitForURL(`${server.url}/leaderboards`);
    await page.getByRole('heading', { name: 'Leaderboards' }).waitFor();
    expect(await page.evaluate(() => (window as unknown as { qtSamePage?: boolean }).qtSamePage)).toBe(true);
  });

  it('raised no script or console error', () => {
    expect(problems).toEqual([]);
  });
});
