/** Reads an element's text once it shows what a test expects, for values Angular fills in a tick late. */
import type { Locator } from 'playwright-core';

/**
 * Polls the locator's trimmed inner text until it equals `expected` or `timeoutMs` passes, and
 * returns the last text read, so the caller's `expect(...).toBe(expected)` reports the real value.
 */
export async function settledText(locator: Locator, expected: string, timeoutMs = 5_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  await locator.waitFor({ timeout: timeoutMs });
  for (;;) {
    const text = (await locator.innerText()).trim();
    if (text === expected || Date.now() >= deadline) return text;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}
