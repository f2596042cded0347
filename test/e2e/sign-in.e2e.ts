/**
 * The walking skeleton end to end: real web build, real server, fresh database, the local fake
 * OAuth provider and Chromium. A researcher signs in, sees the role and is refused the admin
 * page; an admin then promotes that researcher, and the change survives a reload.
 */
import type { Page } from 'playwright-core';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { watchNetwork, type NetworkWatch } from './support/network-watch';
import { bootServer, type E2eServer } from './support/server';
import { focusRing, isFocused, tabUntil } from './support/keyboard';
import { settledText } from './support/settled-text';
import { accountMenuButton, demoIdentity, signInThroughUi, signOutThroughUi } from './support/sign-in';

const researcher = demoIdentity('researcher');
const admin = demoIdentity('admin');

describe('sign-in and roles in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let network: NetworkWatch;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    // Only the admin identity is in ADMIN_LOGINS; everyone else starts as researcher.
    server = await bootServer({ adminLogins: [admin.login] });
    browser = await launchBrowser();
    page = browser.page;
    network = watchNetwork(page);
    page.on('pageerror', (err) => pageErrors.push(err.message));
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  const roleSelect = (login: string) => page.getByRole('combobox', { name: `Role of ${login}` });

  it('shows a visitor the start page with live counts and a sign-in link', async () => {
    await page.goto(`${server.url}/`);

    await page.getByRole('heading', { name: 'On the hub now' }).waitFor();
    await page.locator('[data-counter="instanceSets"] dd').waitFor();
    expect(await page.locator('[data-counter] dt').allTextContents()).toEqual([
      'Instance sets', 'Maps', 'Scenarios', 'Sweeps', 'Results',
    ]);
    // A fresh database holds nothing yet.
    expect(await page.locator('[data-counter] dd').allTextContents()).toEqual(['0', '0', '0', '0', '0']);
    expect(await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).getAttribute('href')).toBe('/api/auth/github');
  });

  it('signs a researcher in through the provider and shows the role', async () => {
    await signInThroughUi(page, server.url, researcher);

    expect(await accountMenuButton(page, researcher).innerText()).toMatch(/researcher/i);
    const areas = await page.getByRole('navigation', { name: 'Areas' }).getByRole('link').allInnerTexts();
    expect(areas).toEqual(['Instance sets', 'Sweeps', 'Leaderboards', 'Model comparison']);
  });

  it('refuses the researcher the admin page', async () => {
    await page.goto(`${server.url}/admin`);

    await page.getByRole('heading', { name: 'Not allowed' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/not-allowed');
    expect(await page.locator('main').innerText()).toContain('Admin needs the admin role.');
    expect(await page.getByRole('table', { name: 'Accounts' }).count()).toBe(0);
  });

  it('signs the researcher out, and the server forgets the session', async () => {
    await signOutThroughUi(page, researcher);
    await page.reload();

    await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();
    expect(await accountMenuButton(page, researcher).count()).toBe(0);
  });

  it("lets an admin change the researcher's role, and the change is stored", async () => {
    await signInThroughUi(page, server.url, admin);
    expect(await accountMenuButton(page, admin).innerText()).toMatch(/admin/i);
    await page.getByRole('navigation', { name: 'Areas' }).getByRole('link', { name: 'Admin' }).click();
    await page.waitForURL(`${server.url}/admin`);
    await expectRole(researcher.login, 'researcher');

    await roleSelect(researcher.login).click();
    const saved = page.waitForResponse((r) => r.request().method() === 'PATCH' && r.url().includes('/api/admin/users/'));
    await page.getByRole('option', { name: 'maintainer' }).click();
    // The pick is only pending (issue 18, item 1) until its Save button.
    await page.getByRole('button', { name: `Save role of ${researcher.login}` }).click();
    // The admin page asks first (a Material confirmation dialog); nothing is sent until the admin acts.
    const question = page.getByRole('dialog');
    await question.waitFor();
    expect(await question.getByRole('heading').innerText()).toBe(`Make ${researcher.name} (${researcher.login}) a maintainer?`);
    await question.getByRole('button', { name: 'Make maintainer' }).click();
    const response = await saved;
    expect(response.status()).toBe(200);
    expect(await response.json()).toMatchObject({ login: researcher.login, role: 'maintainer' });

    await page.reload();
    await expectRole(researcher.login, 'maintainer');
    await expectRole(admin.login, 'admin');
  });

  it('shows the promoted account its new role at its next sign-in', async () => {
    await signOutThroughUi(page, admin);
    await signInThroughUi(page, server.url, researcher);

    expect(await accountMenuButton(page, researcher).innerText()).toMatch(/maintainer/i);
  });

  it('changes a role by keyboard only: an arrow key on the closed picker saves nothing; Save, the confirmation and a polite "saved" do (issue 18, item 1)', async () => {
    await signOutThroughUi(page, researcher);
    await signInThroughUi(page, server.url, admin);
    await page.goto(`${server.url}/admin`);
    await expectRole(researcher.login, 'maintainer');
    const patches: string[] = [];
    page.on('request', (r) => { if (r.method() === 'PATCH') patches.push(r.url()); });

    await tabUntil(page, `[aria-label="Role of ${researcher.login}"]`);
    await page.keyboard.press('ArrowUp');
    // One stray key: the picker shows the pending choice, and nothing is asked or sent.
    expect(await settledText(roleSelect(researcher.login), 'researcher')).toBe('researcher');
    await page.waitForTimeout(500);
    expect(await page.getByRole('dialog').count()).toBe(0);
    expect(patches).toEqual([]);
    expect(await page.getByText(`unsaved: maintainer → researcher`).isVisible()).toBe(true);

    await page.keyboard.press('Tab');
    expect(await isFocused(page, `[aria-label="Save role of ${researcher.login}"]`)).toBe(true);
    await page.keyboard.press('Enter');
    const question = page.getByRole('dialog');
    await question.waitFor();
    expect(await question.getByRole('heading').innerText()).toBe(`Make ${researcher.name} (${researcher.login}) a researcher?`);
    const saved = page.waitForResponse((r) => r.request().method() === 'PATCH' && r.url().includes('/api/admin/users/'));
    await tabUntil(page, '[data-testid=confirm-act]', 5);
    await page.keyboard.press('Enter');
    expect((await saved).status()).toBe(200);
    // Announced in the snack bar's polite live region.
    const announced = page.locator('[aria-live="polite"]').filter({ hasText: `Saved: ${researcher.name} (${researcher.login}) is now a researcher.` });
    await announced.waitFor();
    await page.reload();
    await expectRole(researcher.login, 'researcher');
  });

  it('shows a strong focus ring on the top-bar links, the role picker and buttons (issue 18, item 4)', async () => {
    await page.goto(`${server.url}/admin`);
    await expectRole(researcher.login, 'researcher');
    const rings = [];
    await tabUntil(page, 'nav[aria-label=Areas] a[href="/admin"]');
    rings.push(await focusRing(page));
    await tabUntil(page, `[aria-label="Role of ${researcher.login}"]`);
    rings.push(await focusRing(page));
    await tabUntil(page, `[aria-label="Storage quota of ${researcher.login}"]`);
    rings.push(await focusRing(page));
    expect(rings).toHaveLength(3);
    // WCAG 2.4.7 (visible) and 1.4.11 (at least 3:1 against adjacent colours); 2 px or more so it is no hairline.
    for (const ring of rings) {
      expect({ element: ring.element, style: ring.style, isWide: ring.widthPx >= 2, isContrasting: ring.contrast >= 3 })
        .toEqual({ element: ring.element, style: 'solid', isWide: true, isContrasting: true });
    }
  });

  it('made no request to any host but 127.0.0.1 and raised no script error', () => {
    // Both loopback servers were used: the app and the fake OAuth provider.
    const origins = new Set(network.seen.map((u) => new URL(u).origin));
    expect(origins).toEqual(new Set([server.url, server.fakeOAuthUrl]));
    expect(network.outside).toEqual([]);
    expect(pageErrors).toEqual([]);
  });

  async function expectRole(login: string, role: string): Promise<void> {
    // mat-select writes its value text just after the row appears, hence the short wait.
    expect(await settledText(roleSelect(login), role)).toBe(role);
  }
});
