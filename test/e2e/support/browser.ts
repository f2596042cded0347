/**
 * Launches Debian's Chromium through playwright-core for end-to-end tests: headless, a fresh
 * profile folder per launch, and the flags that stop it calling Google services it cannot reach.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { CHROMIUM_PATH } from '../../../scripts/chromium';

/** Launch flags from STACK.md: no sandbox as root, no GPU, and no background network traffic. */
export const CHROMIUM_FLAGS: readonly string[] = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** A running browser with one page; close() also deletes the profile folder. */
export interface E2eBrowser {
  readonly context: BrowserContext;
  readonly page: Page;
  close(): Promise<void>;
}

/** Starts Chromium with a new, empty user-data-dir (launchPersistentContext passes it as --user-data-dir). */
export async function launchBrowser(): Promise<E2eBrowser> {
  const userDataDir = await mkdtemp(join(tmpdir(), 'qt-e2e-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [...CHROMIUM_FLAGS],
    viewport: { width: 1280, height: 800 },
  });
  context.setDefaultTimeout(15_000);
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      await rm(userDataDir, { recursive: true, force: true });
    },
  };
}
