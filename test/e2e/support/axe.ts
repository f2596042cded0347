/**
 * Runs axe-core (npm `axe-core`, pinned in package.json) in the page with the WCAG 2.1 A and AA
 * rules. The app's Content-Security-Policy allows only same-origin script files (script-src
 * 'self'), so the engine is neither served nor added as an inline script tag: its source is
 * evaluated through the DevTools protocol (Playwright's page.evaluate), which page CSP does not govern.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';

const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

/** axe's tags for WCAG 2.0 and 2.1 at levels A and AA (axe-core API: runOnly by tag). */
export const WCAG_21_AA_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] as const;

/** One violation, readable in a test failure. */
export interface AxeFinding {
  readonly rule: string;
  readonly impact: string | null;
  readonly help: string;
  /** CSS path of each failing element, with axe's summary of what fails there. */
  readonly nodes: readonly string[];
}

/** The WCAG 2.1 A/AA violations of the page as it is now (none is the goal). */
export async function axeViolations(page: Page): Promise<AxeFinding[]> {
  const hasAxe = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe === 'object');
  if (!hasAxe) await page.evaluate(AXE_SOURCE);
  return page.evaluate(async (tags) => {
    interface AxeNode { target: unknown[]; failureSummary?: string }
    interface AxeViolation { id: string; impact?: string | null; help: string; nodes: AxeNode[] }
    const axe = (window as unknown as { axe: { run(ctx: Document, opts: object): Promise<{ violations: AxeViolation[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: 'tag', values: tags }, resultTypes: ['violations'] });
    return result.violations.map((v) => ({
      rule: v.id,
      impact: v.impact ?? null,
      help: v.help,
      nodes: v.nodes.slice(0, 5).map((n) => `${n.target.map(String).join(' ')} — ${(n.failureSummary ?? '').replace(/\s+/g, ' ').trim()}`),
    }));
  }, [...WCAG_21_AA_TAGS]);
}

/** The findings of one page as one block of text per rule, for an expectation that prints them. */
export function describeFindings(path: string, findings: readonly AxeFinding[]): string[] {
  return findings.map((f) => `${path}: ${f.rule} (${f.impact ?? 'no impact'}): ${f.help}\n    ${f.nodes.join('\n    ')}`);
}
