/** Signs in and out through the real UI: the shell's Sign in link, the fake provider's picker, the account menu. */
import type { Page } from 'playwright-core';
import { DEMO_IDENTITIES, type DemoIdentity } from '../../../api/src/dev/fake-oauth/demo-identities';

/** The first invented demo identity with the given demo role. */
export function demoIdentity(role: DemoIdentity['demoRole']): DemoIdentity {
  const found = DEMO_IDENTITIES.find((d) => d.demoRole === role);
  if (!found) throw new Error(`no demo identity with role ${role}`);
  return found;
}

/** The account menu button in the bar; its text is "<display name> <role>". */
export function accountMenuButton(page: Page, who: DemoIdentity) {
  return page.getByRole('banner').getByRole('button', { name: who.name });
}

/**
 * Opens the app as a visitor, clicks Sign in, picks `who` on the fake provider's page and waits
 * until the app shows the account menu again on the start page.
 */
export async function signInThroughUi(page: Page, baseUrl: string, who: DemoIdentity): Promise<void> {
  await page.goto(`${baseUrl}/`);
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).click();
  await page.locator(`button[data-login="${who.login}"]`).click();
  await page.waitForURL(`${baseUrl}/`);
  await accountMenuButton(page, who).waitFor();
}

/** Signs out through the account menu and waits for the Sign in link to come back. */
export async function signOutThroughUi(page: Page, who: DemoIdentity): Promise<void> {
  await accountMenuButton(page, who).click();
  await page.getByRole('menuitem', { name: 'Sign out' }).click();
  await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).waitFor();
}
