/**
 * Issue 16, items 5 and 6 against real PostgreSQL and a real sweep worker: a board row's history
 * lists every stored result and submission (two sweeps and one submission on the same instance →
 * all three, newest first, the superseded ones included) and obeys the instance set's visibility;
 * the instance set archive holds exactly the uploaded bytes; the sweep CSV has one row per run with
 * the stored figures; the plans zip holds one plan document per solved result, each accepted by its
 * model's validator when read back. Instances: the open dataset's empty-8-8 (Stern et al., SoCS 2019).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import pino from 'pino';
import yauzl from 'yauzl';
import type { InstanceHistory } from '@shared/history';
import type { LeaderboardPage } from '@shared/leaderboards';
import { createSequelize } from '../../api/src/db/sequelize';
import { defineModels } from '../../api/src/db/models';
import { loadInstance } from '../../api/src/instance-sets/load-instance';
import { checkPlan } from '../../api/src/submissions/check-plan';
import { readPlanFile } from '../../api/src/submissions/read-plan-file';
import { signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { visitorClient } from './instance-library-support';
import { baseDefinition, DATASET, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(120_000);

/** Every entry of a zip: path → bytes. */
function unzip(bytes: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(bytes, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err ?? new Error('no zip'));
      const out = new Map<string, Buffer>();
      zip.on('error', reject);
      zip.on('end', () => resolve(out));
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (e, stream) => {
          if (e || !stream) return reject(e ?? new Error('no stream'));
          const chunks: Buffer[] = [];
          stream.on('data', (c: Buffer) => chunks.push(c));
          stream.on('end', () => {
            out.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.readEntry();
    });
  });
}

/** RFC 4180 records of a CSV text without its `#` comment lines: header first. */
function csvRecords(text: string): string[][] {
  const records: string[][] = [];
  let field = '';
  let record: string[] = [];
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++; } else if (c === '"') quoted = false; else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { record.push(field); field = ''; } else if (c === '\r' && text[i + 1] === '\n') {
      record.push(field); records.push(record); record = []; field = ''; i++;
    } else field += c;
  }
  return records.filter((r) => !r[0].startsWith('#'));
}

const sha256 = (b: Buffer): string => createHash('sha256').update(b).digest('hex');

describe('row history and bulk downloads', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let other: SignedInClient;
  let visitor: SignedInClient;
  let setId: number;
  let scenarioId: number;
  let sweepA: number;
  let sweepB: number;
  let submissionResult: number;
  let profileHash: string;
  const sequelize = () => createSequelize(db.url, { poolMax: 1 });

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    other = await signInAs(s.url, 'marguerite-oyelaran');
    visitor = await visitorClient(s.url);
    let scenarios: Record<string, number>;
    ({ setId, scenarios } = await uploadSet(s, 'history floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']));
    scenarioId = scenarios['empty-8-8-even-1.scen'];
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    // Sweep A: four plan models; sweep B: classic again with another seed, so the classic row has two sweep results.
    sweepA = (await launchSweep(s, baseDefinition(setId, {
      name: 'history first pass', agentCounts: { kind: 'list', values: [2, 3] },
      models: [{ model: 'classic' }, { model: 'orientation-split', startHeading: 'N' }, { model: 'weighted-split', startHeading: 'N' }, { model: 'k-robust', k: 1 }],
      execution: { policies: ['open-loop'], runs: 3 },
    }))).id;
    expect(await waitForSweep(s, sweepA)).toBe('finished');
    sweepB = (await launchSweep(s, baseDefinition(setId, { name: 'history second pass', agentCounts: { kind: 'list', values: [2] }, seeds: [7], execution: { policies: [], runs: 1 } }))).id;
    expect(await waitForSweep(s, sweepB)).toBe('finished');
    // The submission: sweep A's classic plan, downloaded and submitted by another researcher under another solver name.
    const [classicA] = await s.sql<{ id: number; robot_profile_hash: string }>(
      "SELECT id, robot_profile_hash FROM results WHERE sweep_id = :sweepA AND model = 'classic' AND agents = 2", { sweepA },
    );
    profileHash = classicA.robot_profile_hash;
    const doc = (await (await s.client.request(`/api/executions/results/${classicA.id}/plan.json`)).json()) as { solver: { name: string; version: string } };
    doc.solver = { name: 'hand-copied planner', version: '0.9' };
    const submitted = await other.request('/api/submissions', { method: 'POST', body: JSON.stringify({ format: 'json', text: JSON.stringify(doc) }) });
    expect(submitted.status).toBe(201);
    [{ id: submissionResult }] = await s.sql<{ id: number }>('SELECT id FROM results WHERE submission_id IS NOT NULL');
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  const historyPath = (extra = '') => `/api/history?scenarioId=${scenarioId}&agents=2&model=classic&profile=${profileHash}${extra}`;

  it('lists every stored result and submission of the row, newest first, the superseded ones included', async () => {
    const res = await visitor.request(historyPath());
    expect(res.status).toBe(200);
    const h = (await res.json()) as InstanceHistory;
    const stored = await s.sql<{ id: number; soc: number; created_at: Date }>(
      "SELECT id, soc, created_at FROM results WHERE scenario_id = :scenarioId AND agents = 2 AND model = 'classic' ORDER BY created_at DESC, id DESC", { scenarioId },
    );
    expect(stored).toHaveLength(3);
    expect(h.total).toBe(3);
    expect(h.items.map((i) => i.resultId)).toEqual(stored.map((r) => r.id));
    // Submitted last, so first; then sweep B, then sweep A (a visitor sees no sweep names).
    expect(h.items.map((i) => i.source.kind)).toEqual(['submission', 'sweep', 'sweep']);
    expect(h.items[0].resultId).toBe(submissionResult);
    expect(h.items[0].solver).toMatchObject({ name: 'hand-copied planner', version: '0.9' });
    expect(h.items[0].seed).toBeNull();
    expect(h.items.slice(1).map((i) => (i.source.kind === 'sweep' ? [i.source.sweepId, i.source.sweepName, i.seed] : null)))
      .toEqual([[sweepB, null, 7], [sweepA, null, 1]]);
    expect(h.items.map((i) => i.soc)).toEqual(stored.map((r) => r.soc));
    expect(h.items.filter((i) => i.isBest)).toHaveLength(1);
    expect(h.items[2].executions.map((e) => e.policy)).toEqual(['open-loop']);
    expect(h).toMatchObject({ model: 'classic', variant: '', costUnit: 'steps', instance: { scenarioId, agents: 2, instanceSetName: 'history floor', mapName: 'empty-8-8.map' } });
    // A visitor cannot open other people's sweeps; the maintainer can.
    expect(h.items.slice(1).every((i) => i.source.kind === 'sweep' && !i.source.isSweepVisible)).toBe(true);
    const asMaintainer = (await (await s.client.request(historyPath())).json()) as InstanceHistory;
    expect(asMaintainer.items.slice(1).every((i) => i.source.kind === 'sweep' && i.source.isSweepVisible)).toBe(true);
    // The sweep names are as private as the sweeps: only the maintainer reads them.
    expect(asMaintainer.items.slice(1).map((i) => (i.source.kind === 'sweep' ? i.source.sweepName : null))).toEqual(['history second pass', 'history first pass']);
  });

  it('follows a board row to its history by the key the row carries (model and variant included, whether shown or not)', async () => {
    const page = (await (await visitor.request('/api/leaderboards/rows?cols=map&start=0&end=50')).json()) as LeaderboardPage;
    const rows = page.rows.filter((r) => r.scenarioId === scenarioId && r.agents === 2);
    // classic, orientation-split and weighted-split (both with a fixed start heading) and k-robust (k=1): one row each for 2 agents.
    expect(rows.map((r) => `${r.model}|${r.variant}`).sort()).toEqual(['classic|', 'k-robust|k=1', 'orientation-split|start N', 'weighted-split|start N']);
    let followed = 0;
    for (const row of rows) {
      const query = new URLSearchParams({ scenarioId: String(row.scenarioId), agents: String(row.agents), model: row.model ?? '', variant: row.variant ?? '', profile: row.profileHash });
      const h = (await (await visitor.request(`/api/history?${query}`)).json()) as InstanceHistory;
      expect(h.items.find((i) => i.isBest)?.resultId).toBe(row.resultId);
      expect(h.total).toBe(row.model === 'classic' ? 3 : 1);
      followed++;
    }
    expect(followed).toBe(4);
  });

  it('pages the history with start and limit and keeps the total', async () => {
    const h = (await (await visitor.request(historyPath('&start=1&limit=1'))).json()) as InstanceHistory;
    expect(h.total).toBe(3);
    expect(h.items).toHaveLength(1);
    expect(h.items[0].source).toMatchObject({ kind: 'sweep', sweepId: sweepB });
  });

  it('answers 404 for a row of a private set to everyone who may not see the set, and 400 naming a bad parameter', async () => {
    const patch = await s.client.request(`/api/instance-sets/${setId}`, { method: 'PATCH', body: JSON.stringify({ visibility: 'private' }) });
    expect(patch.status).toBe(200);
    try {
      for (const client of [visitor, other]) {
        const res = await client.request(historyPath());
        expect(res.status).toBe(404);
        expect(((await res.json()) as { error: { code: string } }).error.code).toBe('NOT_FOUND');
        expect((await client.request(`/api/instance-sets/${setId}/archive`)).status).toBe(404);
      }
      expect((await s.client.request(historyPath())).status).toBe(200);
    } finally {
      await s.client.request(`/api/instance-sets/${setId}`, { method: 'PATCH', body: JSON.stringify({ visibility: 'public' }) });
    }
    const bad = await visitor.request(`/api/history?scenarioId=${scenarioId}&agents=2&model=classic&profile=xyz`);
    expect(bad.status).toBe(400);
    expect(JSON.stringify(await bad.json())).toContain('profile');
    // A row with no results (no run had 5 agents) is as unknown as a hidden one.
    expect((await visitor.request(`/api/history?scenarioId=${scenarioId}&agents=5&model=classic&profile=${profileHash}`)).status).toBe(404);
  });

  it('zips the instance set with exactly the uploaded bytes and their stored checksums', async () => {
    const res = await visitor.request(`/api/instance-sets/${setId}/archive`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/zip');
    expect(res.headers.get('content-disposition')).toContain('history floor.zip');
    const entries = await unzip(Buffer.from(await res.arrayBuffer()));
    expect([...entries.keys()].sort()).toEqual([
      'history floor/README.txt', 'history floor/SHA256SUMS', 'history floor/maps/empty-8-8.map', 'history floor/scenarios/empty-8-8-even-1.scen',
    ]);
    const stored = await s.sql<{ name: string; checksum: string }>(
      `SELECT 'maps/' || name AS name, checksum FROM maps WHERE instance_set_id = :setId
       UNION ALL SELECT 'scenarios/' || name, checksum FROM scenarios WHERE instance_set_id = :setId ORDER BY 1`, { setId },
    );
    expect(stored).toHaveLength(2);
    for (const f of stored) {
      const bytes = entries.get(`history floor/${f.name}`) as Buffer;
      const uploaded = readFileSync(join(DATASET, f.name.split('/')[1]));
      expect(bytes.equals(uploaded)).toBe(true);
      expect(sha256(bytes)).toBe(f.checksum);
    }
    expect(entries.get('history floor/SHA256SUMS')?.toString('utf8')).toBe(stored.map((f) => `${f.checksum}  ${f.name}\n`).join(''));
  });

  it('writes the sweep results as CSV: one row per run with the stored figures and the provenance lines', async () => {
    const res = await s.client.request(`/api/sweeps/${sweepA}/results.csv`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toContain(`quarterturn-sweep-${sweepA}-results.csv`);
    const text = await res.text();
    expect(text).toContain('# Provenance (Quarterturn export)');
    expect(text).toContain(`# sweeps: ${sweepA}\r\n`);
    expect(text).toContain('# caution: Simulation is no safety assessment.');
    const [header, ...rows] = csvRecords(text);
    const runs = await s.sql<{ run_id: number; result_id: number; soc: number | null; ti: number | null; status: string }>(
      `SELECT r.id AS run_id, res.id AS result_id, res.soc, res.turn_inclusive_makespan_ms AS ti, r.status
       FROM runs r JOIN results res ON res.run_id = r.id WHERE r.sweep_id = :sweepA ORDER BY r.id`, { sweepA },
    );
    // 1 scenario × 2 agent counts × 4 models × 1 seed.
    expect(runs).toHaveLength(8);
    expect(rows).toHaveLength(8);
    const col = (label: string) => header.indexOf(label);
    for (const [i, run] of runs.entries()) {
      const row = rows[i];
      expect(Number(row[col('Run')])).toBe(run.run_id);
      expect(Number(row[col('Result')])).toBe(run.result_id);
      expect(row[col('Status')]).toBe(run.status);
      const soc = row[col('Sum-of-costs (steps)')] || row[col('Sum-of-costs (ms)')];
      expect(soc === '' ? null : Number(soc)).toBe(run.soc);
      expect(Number(row[col('Turn-inclusive makespan (ms)')])).toBe(run.ti);
    }
    expect(rows.map((r) => r[col('Model parameters')])).toContain('k-robust k=1');
    expect((await other.request(`/api/sweeps/${sweepA}/results.csv`)).status).toBe(404);
    expect((await visitor.request(`/api/sweeps/${sweepA}/results.csv`)).status).toBe(401);
  });

  it('zips one plan document per solved result, each accepted by its model validator when read back', async () => {
    const res = await s.client.request(`/api/sweeps/${sweepA}/plans.zip`);
    expect(res.status).toBe(200);
    const entries = await unzip(Buffer.from(await res.arrayBuffer()));
    const solved = await s.sql<{ id: number; model: string; agents: number; soc: number }>(
      "SELECT id, model, agents, soc FROM results WHERE sweep_id = :sweepA AND status = 'solved' AND plan_gz IS NOT NULL ORDER BY id", { sweepA },
    );
    expect(solved.length).toBeGreaterThanOrEqual(4);
    const plans = [...entries.keys()].filter((p) => p.endsWith('.json'));
    expect(plans).toHaveLength(solved.length);
    const conn = sequelize();
    const models = defineModels(conn);
    let checked = 0;
    try {
      for (const r of solved) {
        const path = plans.find((p) => p.endsWith(`-result-${r.id}.json`)) as string;
        expect(path).toMatch(new RegExp(`^sweep-${sweepA}-plans/empty-8-8-even-1\\.scen/${r.agents}-agents/${r.model}.*-seed-1-result-${r.id}\\.json$`));
        const sub = readPlanFile({ format: 'json', text: (entries.get(path) as Buffer).toString('utf8') });
        expect(sub.model).toBe(r.model);
        const loaded = await loadInstance(models, sub.scenarioId, sub.agents);
        const verdict = checkPlan(loaded.instance, sub);
        expect(verdict.ok).toBe(true);
        if (verdict.ok) expect(verdict.soc).toBe(r.soc);
        checked++;
      }
    } finally {
      await conn.close();
    }
    expect(checked).toBe(solved.length);
    const [header, ...rows] = csvRecords((entries.get(`sweep-${sweepA}-plans/manifest.csv`) as Buffer).toString('utf8'));
    expect(rows).toHaveLength(solved.length);
    for (const row of rows) expect(sha256(entries.get(`sweep-${sweepA}-plans/${row[header.indexOf('File')]}`) as Buffer)).toBe(row[header.indexOf('SHA-256 of the file')]);
    expect((await other.request(`/api/sweeps/${sweepA}/plans.zip`)).status).toBe(404);
  });
});
