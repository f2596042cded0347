/**
 * The leaderboard over real PostgreSQL: random results written like the sweep worker writes
 * them, the trigger-maintained best-result table, and the paged, sorted, filtered API, all
 * checked against a brute-force recomputation in TypeScript (leaderboard-support.ts).
 */
import type { LeaderboardCharts, LeaderboardPage, LeaderboardSummary } from '@shared/leaderboards';
import { parseView } from '@shared/leaderboards';
import { createSequelize } from '../../api/src/db/sequelize';
import { createLeaderboardsService } from '../../api/src/leaderboards/leaderboards.service';
import { parameterHash } from '../../api/src/sweeps/parameter-hash';
import {
  expectedEntries, insertResults, PROFILES, randomResults, startBoardWorld, type BoardWorld, type ExpectedEntry, type SeedResult, type SignedInClient,
} from './leaderboard-support';

const HASHES = PROFILES.map((p) => parameterHash(p));

describe('leaderboard over SQL', () => {
  let world: BoardWorld;
  let results: SeedResult[];
  /** Brute-force entries with their table id. */
  let expected: (ExpectedEntry & { id: number })[];

  async function loadExpected(): Promise<void> {
    const rows = await world.lib.sql<{ id: number; scenario_id: number; agents: number; model: string; variant: string; robot_profile_hash: string }>(
      'SELECT id, scenario_id, agents, model, variant, robot_profile_hash FROM leaderboard_entries',
    );
    const ids = new Map(rows.map((r) => [`${r.scenario_id}|${r.agents}|${r.model}|${r.variant}|${HASHES.indexOf(r.robot_profile_hash)}`, r.id]));
    expected = expectedEntries(results).map((e) => ({ ...e, id: ids.get(e.key) ?? -1 }));
  }

  beforeAll(async () => {
    world = await startBoardWorld();
    results = randomResults(world, 20240611, 260);
    await insertResults(world.lib, results);
    await loadExpected();
  }, 60_000);

  afterAll(() => world?.lib.close());

  async function allPages(client: SignedInClient, query: string, pageSize = 7): Promise<LeaderboardPage['rows']> {
    const rows: LeaderboardPage['rows'][number][] = [];
    for (let start = 0; ; start += pageSize) {
      const res = await client.request(`/api/leaderboards/rows?${query}&start=${start}&end=${start + pageSize}`);
      expect(res.status).toBe(200);
      const page = (await res.json()) as LeaderboardPage;
      rows.push(...page.rows);
      if (page.rows.length < pageSize) {
        expect(page.rowCount).toBe(rows.length);
        return rows;
      }
    }
  }

  it('keeps one row per instance × model variant × profile with the best result, largest lower bound and gap', async () => {
    const rows = await world.lib.sql<{ id: number; result_id: number; lower_bound: number | null; gap: number | null; attempts: number; success_open_loop: number | null; status: string }>(
      'SELECT id, result_id, lower_bound, gap, attempts, success_open_loop, status FROM leaderboard_entries',
    );
    expect(rows).toHaveLength(expected.length);
    const byId = new Map(rows.map((r) => [r.id, r]));
    for (const e of expected) {
      const row = byId.get(e.id);
      expect(row).toBeDefined();
      expect({ result: row?.result_id, status: row?.status, attempts: row?.attempts }).toEqual({ result: e.best.id, status: e.best.status, attempts: e.attempts });
      expect(row?.lower_bound ?? null).toBe(e.lowerBound);
      if (e.gap === null) expect(row?.gap).toBeNull();
      else expect(row?.gap).toBeCloseTo(e.gap, 12);
      expect(row?.success_open_loop ?? null).toBe(e.best.openLoop?.success ?? null);
    }
  });

  /** The sum-of-costs in steps of an expected entry: weighted-split counts ms, so its steps column is empty. */
  const socSteps = (e: (typeof expected)[number]): number | null => (e.model === 'weighted-split' ? null : e.best.soc);

  it('pages a sorted, filtered view exactly like the brute-force order', async () => {
    const want = expected
      .filter((e) => (e.model === 'classic' || e.model === 'k-robust') && e.agents >= 2)
      // PostgreSQL default: ascending puts nulls last; the id breaks ties in the first key's direction.
      .sort((a, b) => (a.best.soc === b.best.soc ? 0 : a.best.soc === null ? 1 : b.best.soc === null ? -1 : a.best.soc - b.best.soc) || a.id - b.id)
      .map((e) => String(e.id));
    const got = await allPages(world.curator, 'cols=agents,model,socSteps&sort=socSteps&model.in=classic,k-robust&agents.gte=2');
    expect(got.map((r) => r.id)).toEqual(want);
    expect(Object.keys(got[0].cells)).toEqual(['agents', 'model', 'socSteps']);
  });

  it('sorts descending with the id tie-break descending', async () => {
    const want = [...expected].sort((a, b) => b.best.runtimeMs - a.best.runtimeMs || b.id - a.id).map((e) => String(e.id));
    const got = await allPages(world.curator, 'sort=-runtimeMs', 50);
    expect(got.map((r) => r.id)).toEqual(want);
  });

  it('filters numbers, enums and text together', async () => {
    const want = expected
      .filter((e) => e.best.status === 'solved' && (e.best.soc ?? Infinity) <= 4 && e.variant.includes('k='))
      .sort((a, b) => a.scenarioId - b.scenarioId || a.agents - b.agents || a.model.localeCompare(b.model) || a.id - b.id);
    const got = await allPages(world.curator, 'status.in=solved&socSteps.lte=4&variant.has=k%3D', 5);
    expect(new Set(got.map((r) => r.id))).toEqual(new Set(want.map((e) => String(e.id))));
    for (const r of got) expect(r.cells['status']).toBe('solved');
  });

  it('sorts by several keys led by a column of few values, in every page', async () => {
    const nullsFirstDesc = (a: number | null, b: number | null) => (a === b ? 0 : a === null ? -1 : b === null ? 1 : b - a);
    const want = [...expected]
      .sort((a, b) => (a.model < b.model ? -1 : a.model > b.model ? 1 : 0) || nullsFirstDesc(socSteps(a), socSteps(b)) || a.id - b.id)
      .map((e) => String(e.id));
    const got = await allPages(world.curator, 'cols=model,socSteps&sort=model,-socSteps', 9);
    expect(got.map((r) => r.id)).toEqual(want);
  });

  it('matches "contains" filters on map, scenario, profile and solver names', async () => {
    // Scenario "tiny-a.scen" exists in both sets (world.scenarios[0] and [2]); profile 0 has jitter 0.1.
    const want = expected.filter((e) => (e.scenarioId === world.scenarios[0] || e.scenarioId === world.scenarios[2]) && e.profile === 0);
    const got = await allPages(world.curator, `map.has=TINY&scenario.has=a.scen&profile.has=${encodeURIComponent('jitter 0.1')}&solver.has=cbs`, 6);
    expect(new Set(got.map((r) => r.id))).toEqual(new Set(want.map((e) => String(e.id))));
    expect(want.length).toBeGreaterThan(0);
  });

  it('reads a deep page from the far end of an unfiltered view with exactly the same rows', async () => {
    const sequelize = createSequelize(world.lib.db.url, { poolMax: 2 });
    try {
      // From row 1 on, every page nearer the end than the start is counted off from the end.
      const mirrored = createLeaderboardsService({ sequelize, reverseFromRow: 1 });
      const forward = createLeaderboardsService({ sequelize, reverseFromRow: Number.MAX_SAFE_INTEGER });
      const owner = { id: (await world.lib.sql<{ id: number }>("SELECT owner_id AS id FROM instance_sets WHERE id = :id", { id: world.privateSet }))[0].id, role: 'researcher' } as Express.User;
      for (const query of [{}, { sort: '-socSteps' }, { sort: 'successOpenLoop,-agents' }, { sort: 'model,runtimeMs' }]) {
        const view = parseView(query);
        const total = (await forward.page(view, owner, {}, { start: 0, end: 1 })).rowCount;
        for (const start of [total - 7, total - 30, Math.floor(total / 2) + 3]) {
          const [a, b] = await Promise.all([forward, mirrored].map((svc) => svc.page(view, owner, {}, { start, end: start + 11 })));
          expect({ query, start, rows: b.rows, rowCount: b.rowCount }).toEqual({ query, start, rows: a.rows, rowCount: a.rowCount });
          expect(a.rows.length).toBe(Math.min(11, total - start));
        }
      }
    } finally {
      await sequelize.close();
    }
  });

  it('pages deep windows of a sort led by a few-valued column group by group with exactly the rows of a plain ORDER BY … OFFSET', async () => {
    const sequelize = createSequelize(world.lib.db.url, { poolMax: 2 });
    try {
      // From row 0 on, every window of such a sort is read group by group (the bench's depths need 1,000,000 results).
      const grouped = createLeaderboardsService({ sequelize, groupsFromRow: 0 });
      const pageSql: string[] = [];
      const query = sequelize.query.bind(sequelize) as (sql: string, opts: object) => Promise<unknown>;
      jest.spyOn(sequelize, 'query').mockImplementation(((sql: string, opts: object) => {
        pageSql.push(sql);
        return query(sql, opts);
      }) as typeof sequelize.query);
      const ownerId = (await world.lib.sql<{ id: number }>('SELECT owner_id AS id FROM instance_sets WHERE id = :id', { id: world.privateSet }))[0].id;
      const viewers: { viewer: Express.User | null; visible: string }[] = [
        { viewer: null, visible: 'e.is_public' },
        { viewer: { id: ownerId, role: 'researcher' } as Express.User, visible: `(e.is_public OR e.owner_id = ${ownerId})` },
        { viewer: { id: 9999, role: 'maintainer' } as Express.User, visible: 'TRUE' },
      ];
      // Each view with its hand-written ORDER BY (the id follows the first key's direction) and filter.
      const views: { query: Record<string, string>; order: string; where?: string }[] = [
        { query: { sort: 'model,tiMakespanMs' }, order: 'e.model, e.ti_makespan_ms, e.id' },
        { query: { sort: '-model,-socSteps' }, order: 'e.model DESC, e.soc_steps DESC, e.id DESC' },
        { query: { sort: 'model,-socMs' }, order: 'e.model, e.soc_ms DESC, e.id' },
        { query: { sort: '-status,runtimeMs' }, order: 'e.status DESC, e.runtime_ms, e.id DESC' },
        { query: { sort: 'variant,-successOpenLoop' }, order: 'e.variant, e.success_open_loop DESC, e.id' },
        { query: { sort: '-profile,agents' }, order: 'e.profile_label DESC, e.agents, e.id DESC' },
        { query: { sort: 'source,map' }, order: 'e.source, e.map_name, e.id' },
        { query: { sort: 'solver,-gap' }, order: 'e.solver, e.gap DESC, e.id' },
        { query: { sort: 'status,socSteps,-agents' }, order: 'e.status, e.soc_steps, e.agents DESC, e.id' },
        { query: { sort: 'model,-status' }, order: 'e.model, e.status DESC, e.id' },
        { query: { sort: '-source,profile,-socSteps' }, order: 'e.source DESC, e.profile_label, e.soc_steps DESC, e.id DESC' },
        { query: { sort: 'status,-variant,model' }, order: 'e.status, e.variant DESC, e.model, e.id' },
        { query: { sort: 'profile,-variant', 'socSteps.lte': '5' }, order: 'e.profile_label, e.variant DESC, e.id', where: 'e.soc_steps <= 5' },
        { query: { sort: 'model,-tiMakespanMs', 'agents.gte': '2' }, order: 'e.model, e.ti_makespan_ms DESC, e.id', where: 'e.agents >= 2' },
        { query: { sort: '-profile,socSteps', 'status.in': 'solved,timeout' }, order: 'e.profile_label DESC, e.soc_steps, e.id DESC', where: "e.status IN ('solved', 'timeout')" },
      ];
      let straddling = 0;
      for (const { query: params, order, where } of views) {
        const view = parseView(params);
        for (const { viewer, visible } of viewers) {
          const cond = where ? `${visible} AND ${where}` : visible;
          const all = (await world.lib.sql<{ id: number; g: string }>(
            `SELECT e.id, ${order.split(',')[0].replace(/ DESC$/, '')} AS g FROM leaderboard_entries e WHERE ${cond} ORDER BY ${order}`)).map((r) => ({ id: String(r.id), g: r.g }));
          for (const [start, size] of [[0, 7], [5, 30], [Math.floor(all.length / 3), 17], [Math.floor(all.length / 2) - 4, 11], [all.length - 9, 9], [all.length - 3, 10], [all.length + 2, 5]]) {
            const { rows, rowCount } = await grouped.page(view, viewer, {}, { start, end: start + size });
            const want = all.slice(start, start + size);
            expect({ params, start, ids: rows.map((r) => r.id), rowCount }).toEqual({ params, start, ids: want.map((r) => r.id), rowCount: all.length });
            if (want.length > 1 && want[0].g !== want[want.length - 1].g) straddling++;
          }
          // Every block of one view, so each boundary between two groups falls inside some block.
          const blocks: string[] = [];
          for (let start = 0; start < all.length; start += 13) blocks.push(...(await grouped.page(view, viewer, {}, { start, end: start + 13 }, false)).rows.map((r) => r.id));
          expect(blocks).toEqual(all.map((r) => r.id));
        }
      }
      expect(straddling).toBeGreaterThan(20);
      expect(pageSql.some((sql) => sql.includes('FROM leaderboard_group_counts g'))).toBe(true);
      expect(pageSql.some((sql) => sql.includes('OFFSET :go1'))).toBe(true);
    } finally {
      await sequelize.close();
    }
  });

  it('counts views filtered on few-valued columns only exactly like a plain count', async () => {
    const queries = ['status.in=solved,memory', 'variant.has=k%3D&status.in=timeout', `profile.has=${encodeURIComponent('jitter 0.1')}&model.in=classic,k-robust`,
      'solver.has=cbs&source.in=sweep', 'profile.has=nothing-like-this'];
    // allPages checks the first block's row count against the rows it then pages.
    for (const client of [world.visitor, world.owner, world.curator]) {
      for (const query of queries) await allPages(client, query, 60);
    }
    const all = await allPages(world.curator, 'status.in=solved,memory', 60);
    expect(all.length).toBe(expected.filter((e) => e.best.status === 'solved' || e.best.status === 'memory').length);
  });

  it('says which entry rows have a plan to replay, even when the status column is hidden (issue 14, item 10)', async () => {
    const rows = await allPages(world.curator, 'cols=agents', 100);
    const byId = new Map(expected.map((e) => [String(e.id), e]));
    const compared = rows.map((r) => ({ hasPlan: r.hasPlan, solved: byId.get(r.id)?.best.status === 'solved' }));
    expect(compared).toHaveLength(expected.length);
    expect(compared.every((c) => c.hasPlan === c.solved)).toBe(true);
    // Both kinds occur, so the check above compared rows with and without a plan.
    expect(compared.some((c) => c.hasPlan) && compared.some((c) => !c.hasPlan)).toBe(true);
  });

  it('shows private sets only to their owner and maintainers', async () => {
    const privateScenario = world.scenarios[2];
    const publicCount = expected.filter((e) => e.scenarioId !== privateScenario).length;
    const count = async (c: SignedInClient) => ((await (await c.request('/api/leaderboards/rows?start=0&end=1')).json()) as LeaderboardPage).rowCount;
    expect(await count(world.visitor)).toBe(publicCount);
    expect(await count(world.other)).toBe(publicCount);
    expect(await count(world.owner)).toBe(expected.length);
    expect(await count(world.curator)).toBe(expected.length);
    const uncounted = (await (await world.visitor.request('/api/leaderboards/rows?start=0&end=5&count=0')).json()) as LeaderboardPage;
    expect([uncounted.rowCount, uncounted.rows.length]).toEqual([-1, 5]);
    const visitorRows = await allPages(world.visitor, 'cols=map', 100);
    expect(visitorRows.every((r) => r.scenarioId !== privateScenario)).toBe(true);
  });

  it('refuses unknown columns, bad operators and oversized pages, naming the parameter', async () => {
    const bad = async (q: string) => {
      const res = await world.visitor.request(`/api/leaderboards/rows?${q}`);
      return { status: res.status, body: (await res.json()) as { error: { code: string; details: { param: string }[] } } };
    };
    for (const [q, param] of [['sort=soc%3BDROP%20TABLE%20results', 'sort'], ['cols=map,password', 'cols'], ['agents.gte=abc', 'agents.gte'],
      ['model.in=classic,sql', 'model.in'], ['socSteps.has=1', 'socSteps.has'], ['cols=map,soc', 'cols'], ['sort=successOpenLoopLo', 'sort'], ['start=0&end=501', 'end']] as const) {
      const { status, body } = await bad(q);
      expect({ q, status, code: body.error.code, param: body.error.details[0].param }).toEqual({ q, status: 400, code: 'VALIDATION_FAILED', param });
    }
    expect((await world.lib.sql('SELECT count(*)::int AS n FROM results'))[0]).toEqual({ n: results.length });
  });

  it('pivots models into columns for one figure in the comparison layout', async () => {
    const got = await allPages(world.curator, 'layout=compare&metric=tiMakespanMs&k=2', 100);
    const keys = new Set(expected.map((e) => `${e.scenarioId}:${e.agents}:${HASHES[e.profile]}`));
    expect(got).toHaveLength(keys.size);
    for (const row of got) {
      const of = (model: string, variant: string) =>
        expected.find((e) => e.scenarioId === row.scenarioId && e.agents === row.agents && HASHES[e.profile] === row.profileHash && e.model === model && e.variant === variant);
      expect(row.cells['m_classic']).toBe(of('classic', '')?.best.tiMakespanMs ?? null);
      expect(row.cells['m_k_robust']).toBe(of('k-robust', 'k=2')?.best.tiMakespanMs ?? null);
      expect(row.cells['m_orientation_split']).toBeNull();
    }
  });

  it.each(['executable', 'all'] as const)('summarises per model: solved by agent count and turn-inclusive makespan relative to classic (best among %s plans)', async (bestAmong) => {
    const res = await world.curator.request(`/api/leaderboards/summary?profile=${HASHES[0]}&bestAmong=${bestAmong}`);
    const summary = (await res.json()) as LeaderboardSummary;
    const mine = expected.filter((e) => e.profile === 0);
    // Plans known to collide at nominal times take no part in the ratio unless all plans are asked for.
    const usable = (e: (typeof mine)[number] | undefined) => bestAmong === 'all' || e?.best.executableAtNominal !== false;
    expect(summary.bestAmong).toBe(bestAmong);
    for (const m of summary.models) {
      const solved = mine.filter((e) => e.model === m.model && e.variant === m.variant && e.best.status === 'solved');
      expect([m.executableAtNominal, m.notExecutableAtNominal])
        .toEqual([solved.filter((e) => e.best.executableAtNominal === true).length, solved.filter((e) => e.best.executableAtNominal === false).length]);
      const rows = mine.filter((e) => e.model === m.model && e.variant === m.variant);
      expect(m.instances).toBe(rows.length);
      for (const b of m.byAgents) {
        const at = rows.filter((e) => e.agents === b.agents);
        expect([b.instances, b.solved]).toEqual([at.length, at.filter((e) => e.best.status === 'solved').length]);
      }
      const ratios = rows.flatMap((e) => {
        const c = mine.find((x) => x.model === 'classic' && x.scenarioId === e.scenarioId && x.agents === e.agents);
        return e.best.status === 'solved' && c?.best.status === 'solved' && c.best.tiMakespanMs && usable(e) && usable(c) ? [(e.best.tiMakespanMs ?? 0) / c.best.tiMakespanMs] : [];
      });
      expect(m.pairedWithClassic).toBe(ratios.length);
      if (ratios.length) expect(m.meanTiMakespanVsClassic).toBeCloseTo(ratios.reduce((a, b) => a + b, 0) / ratios.length, 9);
      else expect(m.meanTiMakespanVsClassic).toBeNull();
    }
    expect(summary.models.reduce((n, m) => n + m.instances, 0)).toBe(mine.length);
  });

  it('computes chart data for one robot profile', async () => {
    const res = await world.curator.request(`/api/leaderboards/charts?profile=${HASHES[1]}&policy=open-loop`);
    const charts = (await res.json()) as LeaderboardCharts;
    expect(charts.profile?.hash).toBe(HASHES[1]);
    const mine = expected.filter((e) => e.profile === 1);
    for (const s of charts.successByAgents) {
      for (const [agents, rate] of s.points) {
        const at = mine.filter((e) => e.model === s.model && e.variant === s.variant && e.agents === agents);
        expect(rate).toBeCloseTo(at.filter((e) => e.best.status === 'solved').length / at.length, 12);
      }
    }
    for (const s of charts.cactus) {
      const times = mine.filter((e) => e.model === s.model && e.variant === s.variant && e.best.status === 'solved').map((e) => e.best.runtimeMs).sort((a, b) => a - b);
      const [lastT, lastN] = s.points[s.points.length - 1];
      expect([lastT, lastN]).toEqual([times[times.length - 1], times.length]);
    }
  });

  it('recomputes a row when its best result is deleted, and drops rows with no result left', async () => {
    const target = expected.find((e) => e.attempts >= 2 && e.best.status === 'solved') as ExpectedEntry;
    const lone = expected.find((e) => e.attempts === 1) as ExpectedEntry;
    await world.lib.sql('DELETE FROM results WHERE id IN (:ids)', { ids: [target.best.id, lone.best.id] });
    results = results.filter((r) => r.id !== target.best.id && r.id !== lone.best.id);
    const before = expected.length;
    await loadExpected();
    expect(expected).toHaveLength(before - 1);
    const again = expected.find((e) => e.key === target.key);
    const [row] = await world.lib.sql<{ result_id: number }>('SELECT result_id FROM leaderboard_entries WHERE id = :id', { id: again?.id });
    expect(row.result_id).toBe(again?.best.id);
    expect(row.result_id).not.toBe(target.best.id);
  });
});
