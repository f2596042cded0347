/**
 * API tokens and the API reference in the browser (issue 16, items 1 and 2): a researcher opens
 * API tokens from the account menu, creates a token (the secret shows once), a script-like
 * request with it succeeds without cookies or CSRF header, revoking it after the confirmation
 * makes the same request fail with 401; the Help area's API reference draws the OpenAPI document
 * under the app's real Content-Security-Policy without a single violation or console error.
 */
import type { Page } from 'playwright-core';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { bootServer, type E2eServer } from './support/server';
import { accountMenuButton, demoIdentity, signInThroughUi } from './support/sign-in';
import { watchPageProblems } from './support/page-problems';

jest.setTimeout(120_000);

describe('API tokens and the API reference in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let problems: string[] = [];
  const researcher = demoIdentity('researcher');

  beforeAll(async () => {
    server = await bootServer();
    browser = await launchBrowser();
    page = browser.page;
    problems = watchPageProblems(page);
    await signInThroughUi(page, server.url, researcher);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  it('creates a token from the account menu, shows it once, and revokes it', async () => {
    await accountMenuButton(page, researcher).click();
    await page.getByRole('menuitem', { name: 'API tokens' }).click();
    await page.waitForURL(`${server.url}/account/tokens`);
    await page.getByRole('heading', { name: 'API tokens', level: 1 }).waitFor();
    await page.getByText('No tokens yet.').waitFor();

    await page.getByLabel('Name').fill('browser check');
    await page.getByRole('checkbox', { name: /^submit/ }).check();
    expect(await page.getByRole('checkbox', { name: /^sweep/ }).isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Create token' }).click();
    const secret = (await page.getByTestId('secret-value').innerText()).trim();
    expect(secret).toMatch(/^qtk_[A-Za-z0-9_-]{43}$/);
    expect(await page.getByTestId('new-secret').innerText()).toContain('shown only this once');

    // A script: the token alone, no cookie and no CSRF header.
    const me = await fetch(`${server.url}/api/me`, { headers: { authorization: `Bearer ${secret}` } });
    expect(((await me.json()) as { account: { login: string } }).account.login).toBe(researcher.login);

    await page.getByRole('button', { name: 'Done' }).click();
    // The secret leaves the page on the next render, not within the click: wait for it to go (5 s at most), then count.
    await page.getByTestId('new-secret').waitFor({ state: 'detached', timeout: 5_000 }).catch(() => undefined);
    expect(await page.getByTestId('new-secret').count()).toBe(0);
    const row = page.getByRole('row', { name: /browser check/ });
    expect(await row.innerText()).toMatch(/read, submit/);
    await row.getByRole('button', { name: 'Revoke browser check' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Revoke token' }).click();
    await page.getByText('No tokens yet.').waitFor();
    const after = await fetch(`${server.url}/api/me`, { headers: { authorization: `Bearer ${secret}` } });
    expect(after.status).toBe(401);
    expect(problems).toEqual([]);
  });

  it('draws the API reference from /api/openapi.json within the Content-Security-Policy', async () => {
    await page.goto(`${server.url}/help`);
    // Violations are reported as events in the page; collect them from before the reference loads.
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { qtCspViolations: string[] }).qtCspViolations = seen;
      document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
    });
    await page.getByRole('link', { name: 'API reference (OpenAPI)' }).click();
    await page.waitForURL(`${server.url}/help/api`);
    const reference = page.getByTestId('api-reference');
    await reference.locator('.opblock').first().waitFor({ timeout: 30_000 });
    const operations = await reference.locator('.opblock-summary-path').allInnerTexts();
    expect(operations.length).toBeGreaterThanOrEqual(45);
    expect(operations.map((p) => p.replace(/\u200b/g, '').trim())).toEqual(expect.arrayContaining(['/api/submissions', '/api/me/tokens', '/api/sweeps/{id}/cancel']));
    // The stylesheet applied: Swagger UI's own rules colour a GET block.
    expect(await reference.locator('.opblock-get').first().evaluate((el) => getComputedStyle(el).borderColor)).not.toBe('rgb(0, 0, 0)');
    expect(await reference.getByRole('button', { name: /try it out/i }).count()).toBe(0);
    expect(await page.evaluate(() => (window as unknown as { qtCspViolations: string[] }).qtCspViolations)).toEqual([]);
    expect(problems).toEqual([]);
  });
});
