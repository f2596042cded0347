/**
 * GET /api/exports returns exactly the rows and columns of the view the grid shows, in every
 * format; the LaTeX table compiles with pdflatex when a TeX engine is installed.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ExportJson } from '@shared/exports-json';
import type { LeaderboardPage } from '@shared/leaderboards';
import { insertResults, randomResults, startBoardWorld, type BoardWorld } from './leaderboard-support';

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

describe('exports', () => {
  let world: BoardWorld;
  const view = 'cols=map,scenario,agents,model,variant,socSteps,socMs,tiMakespanMs,successOpenLoop&sort=-tiMakespanMs&status.in=solved';

  beforeAll(async () => {
    world = await startBoardWorld();
    await insertResults(world.lib, randomResults(world, 77, 120));
  }, 60_000);
  afterAll(() => world?.lib.close());

  const get = async (q: string) => {
    const res = await world.visitor.request(`/api/exports?${q}`);
    return { res, text: await res.text() };
  };

  it('exports as JSON exactly the rows and columns of the grid view', async () => {
    const page = (await (await world.visitor.request(`/api/leaderboards/rows?${view}&start=0&end=500`)).json()) as LeaderboardPage;
    const { res, text } = await get(`format=json&${view}`);
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="quarterturn-leaderboard.json"');
    const doc = JSON.parse(text) as ExportJson;
    expect(doc.columns.map((c) => c.id)).toEqual(['map', 'scenario', 'agents', 'model', 'variant', 'socSteps', 'socMs', 'tiMakespanMs', 'successOpenLoop']);
    expect(doc.rows).toEqual(page.rows.map((r) => r.cells));
    expect(doc.rows.length).toBeGreaterThan(5);
    // Execution figures are in it, so the caption carries the safety note.
    expect(doc.caption).toContain('Simulation is no safety assessment');
  });

  it('exports CSV with one line per row plus the header', async () => {
    const page = (await (await world.visitor.request(`/api/leaderboards/rows?${view}&start=0&end=500`)).json()) as LeaderboardPage;
    const { res, text } = await get(`format=csv&${view}`);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    const lines = text.trimEnd().split('\r\n');
    expect(lines).toHaveLength(page.rows.length + 1);
    expect(lines[0]).toBe('Map,Scenario,Agents,Plan model,Variant,Sum-of-costs (steps),Sum-of-costs (ms),Turn-inclusive makespan (ms),"Execution success rate, open-loop"');
  });

  it('exports a comparison table in LaTeX with the best model per row in bold', async () => {
    // All plans: the executable-only rule has its own spec (leaderboard-nominal.spec.ts).
    const { text } = await get('format=latex&layout=compare&metric=tiMakespanMs&k=1&bestAmong=all');
    expect(text).toContain('\\toprule');
    const body = text.slice(text.indexOf('\\midrule'), text.indexOf('\\bottomrule')).split('\n').filter((l) => l.endsWith('\\\\'));
    expect(body.length).toBeGreaterThan(0);
    for (const line of body) {
      // A dagger marks a plan that collides at nominal times; it does not change the value.
      const cells = line.replace(/ \\\\$/, '').split(' & ').slice(4).map((c) => c.replace('\\textsuperscript{\\dag}', ''));
      const nums = cells.map((c) => Number(c.replace(/\\textbf\{(.*)\}/, '$1'))).filter((n) => Number.isFinite(n));
      const bold = cells.filter((c) => c.startsWith('\\textbf{')).map((c) => Number(c.slice(8, -1)));
      if (nums.length > 0) expect(bold).toEqual(bold.map(() => Math.min(...nums)));
      if (nums.length > 0) expect(bold.length).toBeGreaterThan(0);
    }
  });

  (hasPdflatex ? it : it.skip)(`compiles the LaTeX table with pdflatex${hasPdflatex ? '' : ' (skipped: pdflatex is not installed; apt-get install texlive-latex-base texlive-latex-recommended)'}`, async () => {
    const { text } = await get('format=latex&cols=map,scenario,agents,model,variant,profile,socSteps,socMs,gap,solver');
    const dir = mkdtempSync(join(tmpdir(), 'qt-latex-'));
    try {
      writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{booktabs}\n\\usepackage[margin=5mm,landscape]{geometry}\n\\begin{document}\n\\tiny\n${text}\\end{document}\n`);
      const run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
      expect({ status: run.status, log: run.status === 0 ? '' : run.stdout.slice(-1500) }).toEqual({ status: 0, log: '' });
      expect(readFileSync(join(dir, 'table.pdf')).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);

  it('exports Markdown and refuses an unknown format', async () => {
    const { text } = await get(`format=markdown&${view}`);
    expect(text.split('\n')[2]).toBe('| Map | Scenario | Agents | Plan model | Variant | Sum-of-costs (steps) | Sum-of-costs (ms) | Turn-inclusive makespan (ms) | Execution success rate, open-loop |');
    const bad = await get('format=docx');
    expect(bad.res.status).toBe(400);
  });
});
