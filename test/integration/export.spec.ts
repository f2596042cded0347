/**
 * GET /api/exports returns exactly the rows and columns of the view the grid shows, in every
 * format, with the provenance of exactly the exported results (issue 14, item 9); the LaTeX table
 * compiles with pdflatex within the text width when a TeX engine is installed (item 8).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ExportJson } from '@shared/exports-json';
import type { ExportProvenance } from '@shared/exports-provenance';
import { profileLabel, type LeaderboardPage } from '@shared/leaderboards';
import { parameterHash as parameterHashOf } from '../../api/src/sweeps/parameter-hash';
import { insertResults, PROFILES, randomResults, startBoardWorld, type BoardWorld, type SeedResult } from './leaderboard-support';

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

/**
 * Compiles a LaTeX export in a plain article (default text width, 345 pt) with the packages its
 * first line names; returns the exit status, the overfull box warnings of the log and the page count.
 */
function compileLatex(tex: string): { status: number | null; overfull: string[]; pages: number; log: string; scale: number | null } {
  const packages = /\\usepackage\{([^}]*)\}/.exec(tex.split('\n')[0])?.[1] ?? 'booktabs';
  const dir = mkdtempSync(join(tmpdir(), 'qt-latex-'));
  try {
    writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{${packages}}\n\\begin{document}\n${tex}\\end{document}\n`);
    // Twice, as longtable needs to settle its column widths.
    let run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
    if (run.status === 0) run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
    const log = readFileSync(join(dir, 'table.log'), 'utf8');
    return {
      status: run.status,
      overfull: log.split('\n').filter((l) => /^Overfull \\[hv]box/.test(l)),
      pages: Number(/Output written on table\.pdf \((\d+) pages?/.exec(log)?.[1] ?? 0),
      log: run.status === 0 ? '' : run.stdout.slice(-1500),
      scale: scaleOf(log),
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** How far the table was scaled down: line width ÷ natural width from the export's log line, at most 1 (null: no such line). */
function scaleOf(log: string): number | null {
  const m = /Quarterturn table: natural width ([\d.]+)pt, line width ([\d.]+)pt/.exec(log);
  return m ? Math.min(1, Number(m[2]) / Number(m[1])) : null;
}

describe('exports', () => {
  let world: BoardWorld;
  let sweeps: number[];
  const view = 'cols=map,scenario,agents,model,variant,socSteps,socMs,tiMakespanMs,successOpenLoop&sort=-tiMakespanMs&status.in=solved';

  beforeAll(async () => {
    world = await startBoardWorld();
    const results: SeedResult[] = randomResults(world, 77, 120);
    await insertResults(world.lib, results);
    // Two sweeps computed them (alternately), so the provenance has sweep ids and seeds to name.
    sweeps = (await world.lib.sql<{ id: number }>(
      `INSERT INTO sweeps (owner_id, name, definition) SELECT u.id, n, '{}' FROM (SELECT id FROM users ORDER BY id LIMIT 1) u, unnest(ARRAY['prov a', 'prov b']) n RETURNING id`,
    )).map((r) => r.id).sort((a, b) => a - b);
    await world.lib.sql('UPDATE results SET sweep_id = CASE WHEN id % 2 = 0 THEN :a ELSE :b END', { a: sweeps[0], b: sweeps[1] });
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
    // The rows mix the two robot profiles, so each names its own in a profile column after the instance columns.
    expect(doc.columns.map((c) => c.id)).toEqual(['map', 'scenario', 'agents', 'profile', 'model', 'variant', 'socSteps', 'socMs', 'tiMakespanMs', 'successOpenLoop']);
    expect(doc.rows).toEqual(page.rows.map((r) => ({ ...r.cells, profile: page.profiles[r.profileHash] })));
    expect(new Set(doc.rows.map((r) => r['profile'])).size).toBe(2);
    expect(doc.rows.length).toBeGreaterThan(5);
    // Execution figures are in it, so the caution is the safety note, beside the caption, not in it.
    expect(doc.caution).toContain('Simulation is no safety assessment');
    expect(doc.caption).not.toContain('Simulation is no safety assessment');
    expect(doc.caption).toContain('each row names its own in the Robot profile column');
  });

  it('exports CSV with one line per row plus the header', async () => {
    const page = (await (await world.visitor.request(`/api/leaderboards/rows?${view}&start=0&end=500`)).json()) as LeaderboardPage;
    const { res, text } = await get(`format=csv&${view}`);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    const all = text.trimEnd().split('\r\n');
    // `#` comment lines first (provenance, caption, caution), then the table.
    const firstData = all.findIndex((l) => !l.startsWith('#'));
    expect(all.slice(firstData).every((l) => !l.startsWith('#'))).toBe(true);
    expect(all.slice(0, firstData).some((l) => l.startsWith('# caution: Simulation is no safety assessment'))).toBe(true);
    const lines = all.slice(firstData);
    expect(lines).toHaveLength(page.rows.length + 1);
    expect(lines[0]).toBe('Map,Scenario,Agents,Robot profile,Plan model,Variant,Sum-of-costs (steps),Sum-of-costs (ms),Turn-inclusive makespan (ms),"Execution success rate, open-loop"');
  });

  it('exports a comparison table in LaTeX with the best model per row in bold', async () => {
    // All plans: the executable-only rule has its own spec (leaderboard-nominal.spec.ts).
    const { text } = await get('format=latex&layout=compare&metric=tiMakespanMs&k=1&bestAmong=all&start=0&end=30');
    expect(text).toContain('\\toprule');
    expect(text).not.toContain('longtable');
    const body = text.slice(text.indexOf('\\midrule') + 1, text.indexOf('\\bottomrule')).split('\n').filter((l) => l.endsWith('\\\\'));
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

  // Item 8: in a plain article (text width 345 pt), the default board view (20 columns) as a short
  // table and as a longtable over all its rows, and a comparison table, set without an overfull box.
  (hasPdflatex ? it.each : it.skip.each)([
    ['every default board column, 25 rows (a table float)', 'start=0&end=25&latexColumns=shown', false],
    ['every default board column, every row (a longtable)', 'latexColumns=shown', true],
    ['the comparison layout, every row', 'layout=compare', null],
    ['six columns, every row (a longtable at full size)', 'cols=map,scenario,agents,model,socSteps,tiMakespanMs', true],
  ])(`compiles %s within the text width${hasPdflatex ? '' : ' (skipped: pdflatex is not installed; apt-get install texlive-latex-base texlive-latex-recommended)'}`, async (_name, q, isLong) => {
    const { text } = await get(`format=latex&${q}`);
    if (isLong !== null) expect(text.includes('\\begin{longtable}')).toBe(isLong);
    const log = compileLatex(text);
    expect({ status: log.status, log: log.log }).toEqual({ status: 0, log: '' });
    expect(log.overfull).toEqual([]);
    expect(log.pages).toBeGreaterThan(0);
  }, 90_000);

  (hasPdflatex ? it : it.skip)('gives a LaTeX table of the default board columns the 12 paper columns, scaled by ≥ 0.55 where the 21 on screen needed 0.29', async () => {
    const { text } = await get('format=latex&start=0&end=25');
    const header = text.split('\n').find((l) => l.includes('Sum-of-')) ?? '';
    expect(header).toContain('Map');
    // Not among the paper columns: the interval bounds, status, source, solver.
    expect(text).not.toMatch(/Source|Solver|95 % CI/);
    // Optimality is among them, so the provenance says its bound may come from another run than the listed ones.
    expect(text.split('\n').filter((l) => l.startsWith('% note: lower bound, gap and optimality use the largest lower bound'))).toHaveLength(1);
    const log = compileLatex(text);
    expect(log.status).toBe(0);
    expect(log.overfull).toEqual([]);
    expect(log.scale).not.toBeNull();
    // Measured in a plain article (345 pt, about an LNCS page): 0.59 with mixed profiles (keys P1, P2),
    // where the 21 default columns gave 0.29. Wider pages (a 505 pt table* of a two-column paper) come near full size.
    expect(log.scale as number).toBeGreaterThanOrEqual(0.55);
    // The same view in CSV keeps every default column (the paper set is for LaTeX only).
    const csvHeader = (await get('format=csv&start=0&end=25')).text.split('\r\n').find((l) => !l.startsWith('#')) ?? '';
    expect(csvHeader.split(',').length).toBeGreaterThanOrEqual(20);
  }, 90_000);

  it('carries the provenance of exactly the exported results in every format', async () => {
    const q = 'cols=map,scenario,agents,model,socSteps&scenario.has=tiny-a&sort=agents,model';
    const page = (await (await world.visitor.request(`/api/leaderboards/rows?${q}&start=0&end=500`)).json()) as LeaderboardPage;
    const ids = page.rows.map((r) => r.resultId);
    // The board reaches the public set only; its rows of scenario tiny-a are a subset of all results.
    const stored = await world.lib.sql<{ id: number; sweep_id: number; seed: string; robot_profile_hash: string; map: string; map_sha: string; scen: string; scen_sha: string; set: string }>(
      `SELECT r.id, r.sweep_id, r.seed, r.robot_profile_hash, m.name AS map, m.checksum AS map_sha, s.name AS scen, s.checksum AS scen_sha, i.name AS set
       FROM results r JOIN maps m ON m.id = r.map_id JOIN scenarios s ON s.id = r.scenario_id JOIN instance_sets i ON i.id = r.instance_set_id
       WHERE r.id IN (:ids)`, { ids });
    expect(stored).toHaveLength(ids.length);
    expect((await world.lib.sql<{ n: number }>('SELECT count(*)::int AS n FROM results'))[0].n).toBeGreaterThan(ids.length);
    const uniq = <T,>(xs: T[]) => [...new Set(xs)];
    const byHash = Object.fromEntries(PROFILES.map((p) => [parameterHashOf(p), p]));
    const expected = {
      results: ids.length,
      sweeps: uniq(stored.map((r) => r.sweep_id)).sort((a, b) => a - b),
      submissions: [],
      seeds: uniq(stored.map((r) => Number(r.seed))).sort((a, b) => a - b),
      profiles: uniq(stored.map((r) => r.robot_profile_hash)).sort().map((hash) => ({ hash, label: profileLabel(byHash[hash]), parameters: byHash[hash] })),
      maps: uniq(stored.map((r) => `${r.set}\u0000${r.map}\u0000${r.map_sha}`)).map((k) => k.split('\u0000')).map(([set, name, sha256]) => ({ set, name, sha256 })),
      scenarios: uniq(stored.map((r) => `${r.set}\u0000${r.scen}\u0000${r.scen_sha}`)).map((k) => k.split('\u0000')).map(([set, name, sha256]) => ({ set, name, sha256 })),
    };
    expect(expected.sweeps).toEqual(sweeps);
    expect(expected.seeds.length).toBe(ids.length);

    const before = Date.now();
    const doc = JSON.parse((await get(`format=json&${q}`)).text) as ExportJson;
    const meta = doc.meta as ExportProvenance;
    expect(meta).toMatchObject(expected);
    expect(meta.hub.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(meta.hub.commit).toMatch(/^([0-9a-f]{40}|unknown)$/);
    expect(Date.parse(meta.exportedAt)).toBeGreaterThanOrEqual(before - 1000);
    expect(meta.maps[0].sha256).toMatch(/^[0-9a-f]{64}$/);

    // The same facts as comment lines in the text formats.
    const facts = [
      `hub version: ${meta.hub.version}`, `hub commit: ${meta.hub.commit}`, `sweeps: ${expected.sweeps.join(', ')}`, `seeds: ${expected.seeds.join(', ')}`,
      `results: ${ids.length}`, ...expected.profiles.map((p) => `robot profile ${p.hash}: ${p.label}`),
      ...expected.maps.map((m) => `map ${m.set} / ${m.name}: sha256 ${m.sha256}`), ...expected.scenarios.map((m) => `scenario ${m.set} / ${m.name}: sha256 ${m.sha256}`),
    ];
    const csv = (await get(`format=csv&${q}`)).text.split('\r\n');
    const tex = (await get(`format=latex&${q}`)).text.split('\n');
    const md = (await get(`format=markdown&${q}`)).text;
    const mdComment = /^<!--\n([\s\S]*?)\n-->\n/.exec(md)?.[1].split('\n') ?? [];
    // A profile line goes on with every parameter: "… jitter 0.1 (forwardMs=1000 …)".
    for (const fact of facts) {
      expect([fact, csv.filter((l) => l.startsWith(`# ${fact}`)).length, tex.filter((l) => l.startsWith(`% ${fact}`)).length, mdComment.filter((l) => l.startsWith(fact)).length]).toEqual([fact, 1, 1, 1]);
    }
    for (const p of expected.profiles) expect(csv.find((l) => l.startsWith(`# robot profile ${p.hash}`))).toContain(`forwardMs=${p.parameters.forwardMs} `);
    expect(csv.find((l) => l.startsWith('# exported at: '))).toMatch(/^# exported at: \d{4}-\d\d-\d\dT/);

    // The comparison layout: the results behind the shown model cells that hold a value.
    const cq = 'layout=compare&metric=tiMakespanMs&cols=map,scenario,agents,profile,m_classic,m_orientation_split&scenario.has=tiny-a';
    const cpage = (await (await world.visitor.request(`/api/leaderboards/rows?${cq}&start=0&end=500`)).json()) as LeaderboardPage;
    const cells = cpage.rows.flatMap((r) => ['m_classic', 'm_orientation_split'].filter((c) => r.cells[c] !== null)).length;
    expect(cells).toBeGreaterThan(0);
    const cdoc = JSON.parse((await get(`format=json&${cq}`)).text) as ExportJson;
    expect(cdoc.meta?.results).toBe(cells);
  });

  it('exports Markdown and refuses an unknown format', async () => {
    const { text } = await get(`format=markdown&${view}`);
    const lines = text.replace(/^<!--[\s\S]*?-->\n\n/, '').split('\n');
    expect(lines[2]).toBe('| Map | Scenario | Agents | Robot profile | Plan model | Variant | Sum-of-costs (steps) | Sum-of-costs (ms) | Turn-inclusive makespan (ms) | Execution success rate, open-loop |');
    // People's formats show only the profile parameters that differ (here all six), and the caution below the table.
    expect(lines.at(-2)).toContain('Simulation is no safety assessment');
    const bad = await get('format=docx');
    expect(bad.res.status).toBe(400);
  });
});
