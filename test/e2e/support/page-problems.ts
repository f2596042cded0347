import type { Page } from 'playwright-core';

/**
 * Collects what a page reports as wrong while a test drives it: uncaught errors and console
 * errors. The returned array fills as they happen; tests assert it is empty at their end.
 */
export function watchPageProblems(page: Page): string[] {
  const problems: string[] = [];
  page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
  page.on('console', (msg) => {
    if (msg.type() === 'error') problems.push(`console error: ${msg.text()}`);
  });
  return problems;
}
