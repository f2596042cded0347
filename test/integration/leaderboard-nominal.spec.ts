/**
 * Executable at nominal times on the board (issue 12, items 4, 5 and 7), on a real PostgreSQL:
 * a plan that collides when replayed open-loop with zero noise is never the best result of its
 * key, never the best value of a comparison row and never bold in an export (unless the view asks
 * for all plans); the flag reaches rows, summary and the derived tables kept by triggers (equal to
 * a rebuild after a backfill); steps and ms never share a column; success rates carry their Wilson
 * interval; the following rule shows in the variant.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { wilsonInterval } from '@shared/confidence-interval';
import type { ExportJson } from '@shared/exports-json';
import type { LeaderboardPage, LeaderboardSummary } from '@shared/leaderboards';
import { insertResults, startBoardWorld, type BoardWorld, type SeedResult } from './leaderboard-support';

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

describe('executable at nominal times on the leaderboard', () => {
  let world: BoardWorld;
  let results: SeedResult[];

  beforeAll(async () => {
    world = await startBoardWorld();
    const [a, b] = world.scenarios;
    const base = { agents: 3, profile: 0, status: 'solved', lowerBound: 4, runtimeMs: 5 } as const;
    results = [
      // Scenario a: orientation-split has the lowest turn-inclusive makespan but collides at nominal times.
      { ...base, scenarioId: a, model: 'classic', soc: 6, tiMakespanMs: 4000, seed: 1, executableAtNominal: true, openLoop: { success: 0.7, spread: 100, realised: 4100, runs: 10 } },
      { ...base, scenarioId: a, model: 'orientation-split', soc: 6, tiMakespanMs: 3000, seed: 2, executableAtNominal: false, openLoop: { success: 0, spread: 100, realised: 3100, runs: 10, realisedCi95: [3050, 3150], spreadCi95: [80, 120] } },
      { ...base, scenarioId: a, model: 'uniform-duration', soc: 6, tiMakespanMs: 3500, seed: 3, executableAtNominal: null },
      // A weighted-split result: its sum-of-costs is in ms.
      { ...base, scenarioId: a, model: 'weighted-split', soc: 5200, tiMakespanMs: 3600, lowerBound: 5000, seed: 4, executableAtNominal: true },
      // Scenario b, one key with two classic results: the lower sum-of-costs collides at nominal times.
      { ...base, scenarioId: b, model: 'classic', soc: 6, tiMakespanMs: 4000, seed: 5, executableAtNominal: false },
      { ...base, scenarioId: b, model: 'classic', soc: 7, tiMakespanMs: 4500, seed: 6, executableAtNominal: true },
      // The following rule forbidden is its own variant.
      { ...base, scenarioId: b, model: 'classic', soc: 8, tiMakespanMs: 5000, seed: 7, executableAtNominal: true, extraModelParams: { following: 'forbidden' } },
    ];
    await insertResults(world.lib, results);
  }, 60_000);
  afterAll(() => world?.lib.close());

  const rows = async (q: string): Promise<LeaderboardPage> => {
    const res = await world.visitor.request(`/api/leaderboards/rows?${q}`);
    expect(res.status).toBe(200);
    return (await res.json()) as LeaderboardPage;
  };
  const exported = async (q: string): Promise<string> => {
    const res = await world.visitor.request(`/api/exports?${q}`);
    expect(res.status).toBe(200);
    return res.text();
  };

  it('prefers a plan executable at nominal times as the best result of a key, and says so in the row', async () => {
    const page = await rows(`cols=scenario,model,variant,executableAtNominal,nominalCollisions,socSteps&model.in=classic&sort=variant`);
    const b = page.rows.filter((r) => r.scenarioId === world.scenarios[1]);
    expect(b.map((r) => [r.cells['variant'], r.resultId, r.cells['socSteps'], r.cells['executableAtNominal'], r.isExecutableAtNominal])).toEqual([
      ['', results[5].id, 7, 'yes', true],
      ['following forbidden', results[6].id, 8, 'yes', true],
    ]);
    const a = page.rows.find((r) => r.scenarioId === world.scenarios[0]);
    expect(a?.cells['nominalCollisions']).toBe(0);
    const notChecked = await rows('cols=model,executableAtNominal&executableAtNominal.in=not checked');
    expect(notChecked.rows.map((r) => [r.cells['model'], r.isExecutableAtNominal])).toEqual([['uniform-duration', null]]);
  });

  it('never marks a comparison value of a plan that collides at nominal times as the best of its row, unless asked', async () => {
    const compare = await rows('layout=compare&metric=tiMakespanMs');
    const row = compare.rows.find((r) => r.scenarioId === world.scenarios[0]);
    expect(row?.isExecutableAtNominalByColumn).toEqual({ m_classic: true, m_uniform_duration: null, m_orientation_split: false, m_weighted_split: true, m_k_robust: null });

    // After the provenance comment (issue 14, item 9) the caption is the first line.
    const md = (await exported('format=markdown&layout=compare&metric=tiMakespanMs&scenario.has=tiny-a')).replace(/^<!--[\s\S]*?-->\n\n/, '').split('\n');
    const line = md.find((l) => l.includes('3000'));
    // Columns: map, scenario, agents, profile, classic, uniform-duration, orientation-split, weighted-split, k-robust.
    expect(line?.split(' | ').slice(4, 8)).toEqual(['4000', '**3500**', '3000 †', '3600']);
    expect(md[0]).toContain('among plans that are executable at nominal times');
    expect(md[0]).toContain('† after a value: that plan collides at nominal times');

    const all = (await exported('format=markdown&layout=compare&metric=tiMakespanMs&scenario.has=tiny-a&bestAmong=all')).split('\n');
    expect(all.find((l) => l.includes('3000'))?.split(' | ').slice(4, 8)).toEqual(['4000', '3500', '**3000** †', '3600']);

    const tex = await exported('format=latex&layout=compare&metric=tiMakespanMs&scenario.has=tiny-a');
    expect(tex).toContain('\\textbf{3500}');
    expect(tex).not.toContain('\\textbf{3000}');
    expect(tex).toContain('3000\\textsuperscript{\\dag}');
    // CSV keeps numbers plain.
    expect(await exported('format=csv&layout=compare&metric=tiMakespanMs&scenario.has=tiny-a')).toContain(',4000,3500,3000,3600,');
  });

  (hasPdflatex ? it : it.skip)(`compiles the comparison table with its dagger marks${hasPdflatex ? '' : ' (skipped: pdflatex is not installed)'}`, async () => {
    const tex = await exported('format=latex&layout=compare&metric=tiMakespanMs&scenario.has=tiny-a');
    expect(tex).toContain('\\dag');
    const dir = mkdtempSync(join(tmpdir(), 'qt-latex-nominal-'));
    try {
      writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{booktabs,longtable,array,graphicx}\n\\usepackage[margin=5mm,landscape]{geometry}\n\\begin{document}\n\\tiny\n${tex}\\end{document}\n`);
      const run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
      expect({ status: run.status, log: run.status === 0 ? '' : run.stdout.slice(-1500) }).toEqual({ status: 0, log: '' });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);

  it('keeps steps and ms in separate columns', async () => {
    const page = await rows('cols=model,socSteps,socMs,makespanSteps,makespanMs,lowerBoundSteps,lowerBoundMs&scenario.has=tiny-a&sort=model');
    expect(page.columns.map((c) => `${c.label} (${c.unit ?? ''})`)).toEqual([
      'Plan model ()', 'Sum-of-costs (steps)', 'Sum-of-costs (ms)', 'Makespan (steps)', 'Makespan (ms)', 'Lower bound (steps)', 'Lower bound (ms)',
    ]);
    const byModel = Object.fromEntries(page.rows.map((r) => [r.cells['model'], r.cells]));
    expect(byModel['weighted-split']).toMatchObject({ socSteps: null, socMs: 5200, makespanSteps: null, makespanMs: 5200, lowerBoundSteps: null, lowerBoundMs: 5000 });
    expect(byModel['classic']).toMatchObject({ socSteps: 6, socMs: null, makespanSteps: 6, makespanMs: null, lowerBoundSteps: 4, lowerBoundMs: null });
    const old = await world.visitor.request('/api/leaderboards/rows?cols=model,soc');
    expect(old.status).toBe(400);
    expect(JSON.stringify(await old.json())).toContain('socSteps and socMs');
  });

  it('gives each execution success rate its Wilson interval from rate × runs, and names the methods in exports', async () => {
    const page = await rows('cols=model,successOpenLoop,successOpenLoopLo,successOpenLoopHi,realisedOpenLoop,realisedOpenLoopLo&scenario.has=tiny-a&model.in=classic');
    expect(page.rows).toHaveLength(1);
    const [lo, hi] = wilsonInterval(7, 10);
    expect(page.rows[0].cells).toMatchObject({ successOpenLoop: 0.7, successOpenLoopLo: lo, successOpenLoopHi: hi, realisedOpenLoop: 4100, realisedOpenLoopLo: null });
    expect(lo).toBeLessThan(0.7);
    expect(hi).toBeGreaterThan(0.7);
    const doc = JSON.parse(await exported('format=json&cols=model,successOpenLoop,successOpenLoopLo,successOpenLoopHi&scenario.has=tiny-a&model.in=classic')) as ExportJson;
    expect(doc.rows[0]).toEqual({ model: 'classic', successOpenLoop: 0.7, successOpenLoopLo: lo, successOpenLoopHi: hi });
    expect(doc.caption).toContain('Wilson score interval');
    expect(doc.caption).toContain('interval not stored');
    // A stored interval of the mean realised makespan is shown as stored; with 0 of 10 runs collision-free, Wilson still gives a non-zero upper end.
    const stored = await rows('cols=model,successOpenLoopLo,successOpenLoopHi,realisedOpenLoopLo,realisedOpenLoopHi,spreadOpenLoopLo,spreadOpenLoopHi&model.in=orientation-split');
    expect(stored.rows.map((r) => r.cells)).toEqual([{
      model: 'orientation-split', successOpenLoopLo: wilsonInterval(0, 10)[0], successOpenLoopHi: wilsonInterval(0, 10)[1],
      realisedOpenLoopLo: 3050, realisedOpenLoopHi: 3150, spreadOpenLoopLo: 80, spreadOpenLoopHi: 120,
    }]);
    expect(wilsonInterval(0, 10)[1]).toBeGreaterThan(0.2);
    const sorted = await world.visitor.request('/api/leaderboards/rows?sort=successOpenLoopLo');
    expect(sorted.status).toBe(400);
  });

  it('leaves plans that collide at nominal times out of the per-model summary unless asked', async () => {
    const get = async (q: string) => (await (await world.visitor.request(`/api/leaderboards/summary?${q}`)).json()) as LeaderboardSummary;
    const executable = await get('');
    const all = await get('bestAmong=all');
    const os = (s: LeaderboardSummary) => s.models.find((m) => m.model === 'orientation-split');
    expect(executable.bestAmong).toBe('executable');
    expect(os(executable)).toMatchObject({ solved: 1, executableAtNominal: 0, notExecutableAtNominal: 1, meanTiMakespanVsClassic: null, pairedWithClassic: 0 });
    expect(os(executable)?.meanSuccess['open-loop']).toBeNull();
    expect(os(all)).toMatchObject({ pairedWithClassic: 1, meanTiMakespanVsClassic: 3000 / 4000 });
    expect(os(all)?.meanSuccess['open-loop']).toBe(0);
    expect((await world.visitor.request('/api/leaderboards/summary?bestAmong=some')).status).toBe(400);
  });

  it('re-ranks a key when its results are backfilled, and the trigger-kept tables equal a rebuild', async () => {
    const sql = world.lib.sql;
    // Backfill: the executable classic result of scenario b turns out to collide too; the lower sum-of-costs wins again.
    await sql('UPDATE results SET executable_at_nominal = false, nominal_collisions = 1 WHERE id = :id', { id: results[5].id });
    const page = await rows('cols=model,variant,executableAtNominal,socSteps&model.in=classic&variant.eq=');
    const b = page.rows.find((r) => r.scenarioId === world.scenarios[1]);
    expect([b?.resultId, b?.cells['socSteps'], b?.cells['executableAtNominal']]).toEqual([results[4].id, 6, 'no']);

    const snapshot = async () => ({
      entries: (await sql<Record<string, unknown>>('SELECT * FROM leaderboard_entries ORDER BY scenario_id, agents, model, variant, robot_profile_hash'))
        .map(({ id: _id, updated_at: _at, ...rest }) => rest),
      compare: await sql('SELECT * FROM leaderboard_compare ORDER BY scenario_id, agents, robot_profile_hash'),
      groups: await sql('SELECT * FROM leaderboard_group_counts ORDER BY map_id, robot_profile_hash, model, variant, status, source, solver'),
    });
    const kept = await snapshot();
    await sql('SELECT leaderboard_rebuild()');
    expect(await snapshot()).toEqual(kept);
    expect(kept.entries.length).toBe(6);
  });
});
