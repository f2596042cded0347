import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { appHrefOf, extractGuide } from './help';

const ROOT = join(__dirname, '..');
const guide = extractGuide(readFileSync(join(ROOT, 'README.md'), 'utf8'));
/** The targets of the guide's Markdown links, `[text](target)`. */
const links = [...guide.matchAll(/\]\(([^)\s]+)\)/g)].map((m) => m[1]);

describe('appHrefOf', () => {
  it('turns the repository schema files into their stable URLs', () => {
    expect(appHrefOf('shared/plan-format.schema.json')).toBe('/api/schemas/plan-format.schema.json');
    expect(appHrefOf('./shared/instance-format.schema.json')).toBe('/api/schemas/instance-format.schema.json');
  });

  it("turns links into a local npm start into this app's paths", () => {
    expect(appHrefOf('http://127.0.0.1:4300/leaderboards')).toBe('/leaderboards');
    expect(appHrefOf('http://127.0.0.1:4300')).toBe('/');
    expect(appHrefOf('/help')).toBe('/help');
  });

  it('keeps other web addresses and drops repository files the app does not serve', () => {
    expect(appHrefOf('https://example.org/paper.pdf')).toBe('https://example.org/paper.pdf');
    expect(appHrefOf('DEVELOPERS.md')).toBeNull();
    expect(appHrefOf('benchmarks/README.md')).toBeNull();
  });

  it('drops script, protocol-relative and fragment links', () => {
    expect(appHrefOf('javascript:alert(1)')).toBeNull();
    expect(appHrefOf('//evil.example/x')).toBeNull();
    expect(appHrefOf('#roles')).toBeNull();
  });
});

describe("README.md's user guide", () => {
  it('names the five plan models and the three execution policies', () => {
    for (const name of ['classic', 'uniform-duration', 'orientation-split', 'weighted-split', 'k-robust', 'open-loop', 'lockstep', 'dependency-gated']) {
      expect(guide).toContain(`- **${name}**:`);
    }
  });

  it('carries the safety note wherever it explains execution results', () => {
    expect(guide).toContain('Simulation is no safety assessment');
  });

  it('links only to repository files that exist, to app pages or to the schema URLs', () => {
    expect(links.length).toBeGreaterThan(0);
    for (const target of links) {
      if (target.startsWith('http://127.0.0.1:4300/')) continue;
      expect([target, existsSync(join(ROOT, target))]).toEqual([target, true]);
    }
  });

  it('links to every published schema', () => {
    const hrefs = links.map(appHrefOf);
    expect(hrefs).toContain('/api/schemas/plan-format.schema.json');
    expect(hrefs).toContain('/api/schemas/instance-format.schema.json');
    expect(hrefs).toContain('/api/schemas/trial-log.schema.json');
    expect(hrefs).toContain('/api/schemas/submission-batch-format.schema.json');
  });
});
