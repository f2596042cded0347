/**
 * A stored result's plan for visitors (issue 14, item 6): GET /api/executions/results/:id (what the
 * plan viewer draws and replays in the browser) and its downloads plan.json / plan.txt answer
 * anyone who may see the result, visitors included for public sets, and 404 to those who may not.
 * A real sweep (in-process worker, real PostgreSQL) on the open dataset's empty-8-8 (Stern et al.,
 * SoCS 2019, read in place) stores the results. The downloads are checked by reading them back:
 * the JSON document re-submitted scores the same figures, the text parses to the same cells.
 */
import pino from 'pino';
import type { ExecutionView } from '@shared/executions';
import { PlanDocumentSchema, type PlanDocument } from '@shared/plan-format';
import { parsePlanText } from '@shared/plan-format-text';
import type { ResultPlanView } from '@shared/result-plan-view';
import type { SubmissionView } from '@shared/submissions';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(120_000);

interface Row { id: number; model: string; soc: number; makespan: number; ti_soc: number; ti_makespan: number; scenario_id: number; agents: number }

describe('stored result plans for visitors', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let setId: number;
  let rows: Row[];

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    const upload = await uploadSet(s, 'aisle plans', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    setId = upload.setId;
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    // The three stored plan kinds: paths (classic), a steps schedule (orientation-split), an ms schedule (weighted-split).
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'plan download check',
      agentCounts: { kind: 'list', values: [5] },
      models: [{ model: 'classic' }, { model: 'orientation-split' }, { model: 'weighted-split', startHeading: 'N' }],
      execution: { policies: ['open-loop'], runs: 5 },
    }));
    expect(await waitForSweep(s, sweep.id, 100_000)).toBe('finished');
    rows = await s.sql<Row>(
      `SELECT id, model, soc, makespan, turn_inclusive_soc_ms AS ti_soc, turn_inclusive_makespan_ms AS ti_makespan, scenario_id, agents
       FROM results WHERE sweep_id = :id AND status = 'solved' ORDER BY id`, { id: sweep.id });
    expect(rows.map((r) => r.model).sort()).toEqual(['classic', 'orientation-split', 'weighted-split']);
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  const of = (model: string) => rows.find((r) => r.model === model)!;
  const visitorGet = (path: string) => fetch(`${s.url}${path}`);

  it('shows a visitor the plan with its stored figures, the same schedule a signed-in execution of the result runs', async () => {
    let compared = 0;
    for (const r of rows) {
      const res = await visitorGet(`/api/executions/results/${r.id}`);
      expect(res.status).toBe(200);
      const view = (await res.json()) as ResultPlanView;
      expect(view.source).toMatchObject({ resultId: r.id, instanceSetId: setId, scenarioId: r.scenario_id });
      expect(view.instance.agents).toHaveLength(5);
      expect(view.plan.schedule).toHaveLength(5);
      expect(view.figures).toMatchObject({ soc: r.soc, makespan: r.makespan, turnInclusiveSocMs: r.ti_soc, turnInclusiveMakespanMs: r.ti_makespan, isValid: true });
      const run = await s.client.request('/api/executions', { method: 'POST', body: JSON.stringify({ resultId: r.id, policy: 'open-loop', runs: 1 }) });
      expect(run.status).toBe(201);
      const server = (await run.json()) as ExecutionView;
      // The browser replays exactly what the server would run.
      expect({ timeline: view.plan.timeline, schedule: view.plan.schedule }).toEqual({ timeline: server.plan.timeline, schedule: server.plan.schedule });
      compared++;
    }
    expect(compared).toBe(3);
  });

  it('lets a visitor download the JSON plan document; re-submitted, it scores the stored figures', async () => {
    let compared = 0;
    for (const r of rows) {
      const res = await visitorGet(`/api/executions/results/${r.id}/plan.json`);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-disposition')).toContain(`attachment; filename="quarterturn-result-${r.id}-${r.model}.json"`);
      const text = await res.text();
      const doc: PlanDocument = PlanDocumentSchema.parse(JSON.parse(text));
      expect(doc).toMatchObject({ model: r.model, instance: { scenarioId: r.scenario_id, agents: 5 }, solver: { name: 'Quarterturn CBS' } });
      const sub = await s.client.request('/api/submissions', { method: 'POST', body: JSON.stringify({ format: 'json', fileName: 'plan.json', text }) });
      expect(sub.status).toBe(201);
      const scored = (await sub.json()) as SubmissionView;
      expect([scored.soc, scored.makespan, scored.turnInclusiveSocMs, scored.turnInclusiveMakespanMs]).toEqual([r.soc, r.makespan, r.ti_soc, r.ti_makespan]);
      compared++;
    }
    expect(compared).toBe(3);
  });

  it('lets a visitor download the text plan, which reads back to the document cells; weighted-split answers 409 naming JSON', async () => {
    for (const model of ['classic', 'orientation-split']) {
      const r = of(model);
      const res = await visitorGet(`/api/executions/results/${r.id}/plan.txt`);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/^text\/plain/);
      const text = await res.text();
      expect(text.split('\n')[0]).toBe(`# Quarterturn result ${r.id}: plan model ${model}, start heading free`);
      const parsed = parsePlanText(text, { file: 'plan.txt', withHeadings: model === 'orientation-split' });
      if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
      const doc = PlanDocumentSchema.parse(await (await visitorGet(`/api/executions/results/${r.id}/plan.json`)).json());
      const cells = doc.model === 'orientation-split' ? doc.states.map((p) => p.map(([x, y]) => [x, y])) : 'paths' in doc ? doc.paths : [];
      expect(parsed.cells).toEqual(cells);
      expect(parsed.cells).toHaveLength(5);
      if (doc.model === 'orientation-split') expect(parsed.headings).toEqual(doc.states.map((p) => p.map((st) => st[2])));
    }
    const weighted = await visitorGet(`/api/executions/results/${of('weighted-split').id}/plan.txt`);
    expect(weighted.status).toBe(409);
    const body = (await weighted.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('PLAN_FORMAT_UNAVAILABLE');
    expect(body.error.message).toContain('plan.json');
  });

  it('keeps running on the server to signed-in users, and hides a private set\'s results (404) from visitors only', async () => {
    const r = of('classic');
    const post = await fetch(`${s.url}/api/executions`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ resultId: r.id, policy: 'open-loop' }) });
    expect([401, 403]).toContain(post.status);
    const bad = await visitorGet('/api/executions/results/abc/plan.json');
    expect(bad.status).toBe(400);

    await s.sql("UPDATE instance_sets SET visibility = 'private' WHERE id = :setId RETURNING id", { setId });
    let hidden = 0;
    for (const path of ['', '/plan.json', '/plan.txt']) {
      const res = await visitorGet(`/api/executions/results/${r.id}${path}`);
      expect(res.status).toBe(404);
      expect(await res.json()).toEqual({ error: { code: 'RESULT_NOT_FOUND', message: `No result ${r.id}` } });
      // The owner still sees it.
      expect((await s.client.request(`/api/executions/results/${r.id}${path}`)).status).toBe(200);
      hidden++;
    }
    expect(hidden).toBe(3);
  });
});
