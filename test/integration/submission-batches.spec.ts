/**
 * Batch submissions end to end over HTTP against real PostgreSQL (issue 16, item 3): a zip of
 * plans is checked plan by plan in the background; accepted plans join the board with executions
 * under the three policies, refused ones name their first violation or reading problem and store
 * nothing; a malformed manifest is refused whole (400 naming file, line and field) before anything
 * is stored; a script with a `submit` token sends a batch; only the owner sees it.
 * The tiny map (leaderboard-support.ts) is 5 × 4 with a wall at (1, 1); agents (0,0)→(2,0),
 * (2,2)→(0,2), (4,3)→(4,0). Plans and their figures are worked by hand as in submission.spec.ts.
 */
import { gzipSync } from 'node:zlib';
import request from 'supertest';
import { CSRF_HEADER } from '@shared/auth';
import type { CreatedApiToken } from '@shared/api-tokens';
import type { LeaderboardPage } from '@shared/leaderboards';
import type { SubmissionBatchListResponse, SubmissionBatchSummary, SubmissionBatchView } from '@shared/submission-batches';
import { startServer } from '../../api/src/app';
import { loadConfig } from '../../api/src/config';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { buildZip } from './instance-library-support';
import { json, startBoardWorld, type BoardWorld, type SignedInClient } from './leaderboard-support';

jest.setTimeout(120_000);

const solver = { name: 'Batch planner', version: '1.0' };
const GOOD_TEXT = '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n';
/** Agent 1 reaches (2,0) at t = 2, the step agent 0 arrives there: a vertex conflict. */
const CONFLICT_TEXT = '(0,0) (1,0) (2,0)\n(2,2) (2,1) (2,0) (1,0) (0,0) (0,1) (0,2)\n(4,3) (4,2) (4,1) (4,0)\n';

interface ErrorBody { error: { code: string; message: string; details: { file: string; line: number; column: number; field: string; message: string }[] } }

describe('batch submissions', () => {
  let world: BoardWorld;
  const stored = async () => (await world.lib.sql<{ s: number; r: number; e: number; b: number }>(
    `SELECT (SELECT count(*) FROM submissions)::int AS s, (SELECT count(*) FROM results)::int AS r,
            (SELECT count(*) FROM executions)::int AS e, (SELECT count(*) FROM submission_batches)::int AS b`,
  ))[0];

  /** Sends a zip as the signed-in client's browser would (session cookie and CSRF header). */
  const sendZip = (client: SignedInClient, zip: Buffer, name = 'batch.zip') => request(world.lib.server.url)
    .post('/api/submissions/batches').set('cookie', client.jar.header()).set(CSRF_HEADER, client.csrfToken)
    .attach('archive', zip, { filename: name, contentType: 'application/zip' });

  /** Polls the batch until every plan is checked (the runner works in the background). */
  async function finished(read: () => Promise<Response>): Promise<SubmissionBatchView> {
    for (let i = 0; i < 600; i++) {
      const res = await read();
      expect(res.status).toBe(200);
      const view = (await res.json()) as SubmissionBatchView;
      if (view.status === 'done') return view;
      await new Promise((r) => setTimeout(r, 100));
    }
    throw new Error('the batch did not finish within 60 s');
  }

  beforeAll(async () => {
    world = await startBoardWorld();
  }, 60_000);
  afterAll(() => world?.lib.close());

  it('checks a zip batch plan by plan: accepted plans join the board with three policies, refused ones name why and store nothing', async () => {
    const before = await stored();
    const [publicA, publicB] = world.scenarios;
    const doc = { format: 'quarterturn-plan', version: 1, model: 'k-robust', k: 1, instance: { scenarioId: publicB, agents: 2 }, solver,
      paths: [[[0, 0], [1, 0], [2, 0]], [[2, 2], [1, 2], [0, 2]]] };
    const manifest = {
      format: 'quarterturn-plan-batch', version: 1,
      defaults: { set: 'Board public', model: 'classic', solver },
      plans: [
        { file: 'plans/good.txt', instance: { map: 'tiny.map', scenario: 'tiny-a.scen', agents: 2 } },
        { file: 'plans/conflict.txt', instance: { scenario: 'tiny-b.scen', agents: 3 } },
        { file: 'plans/robust.json' },
        { file: 'plans/typo.txt', instance: { scenarioId: publicA, agents: 2 } },
        { file: 'plans/good.txt', instance: { set: 'Board private', scenario: 'tiny-a.scen', agents: 2 } },
      ],
    };
    const zip = await buildZip([
      { name: 'batch.json', bytes: Buffer.from(JSON.stringify(manifest, null, 2)) },
      { name: 'plans/good.txt', bytes: Buffer.from(GOOD_TEXT) },
      { name: 'plans/conflict.txt', bytes: Buffer.from(CONFLICT_TEXT) },
      { name: 'plans/robust.json', bytes: Buffer.from(JSON.stringify(doc)) },
      { name: 'plans/typo.txt', bytes: Buffer.from('(0,0) (1,0)\n(2,2) (1;2)\n') },
    ]);

    const res = await sendZip(world.other, zip, 'week-12.zip');

    expect(res.status).toBe(202);
    const summary = res.body as SubmissionBatchSummary;
    expect(summary).toMatchObject({ status: 'running', source: 'zip', fileName: 'week-12.zip', total: 5 });
    expect(res.headers['location']).toBe(`/api/submissions/batches/${summary.id}`);
    const view = await finished(() => world.other.request(`/api/submissions/batches/${summary.id}`));
    expect([view.total, view.done, view.accepted, view.refused]).toEqual([5, 5, 2, 3]);
    expect(view.entries.map((e) => e.status)).toEqual(['accepted', 'refused', 'accepted', 'refused', 'refused']);

    const [good, conflict, robust, typo, hidden] = view.entries;
    // Hand-worked in submission.spec.ts: SOC 4, makespan 2; 2000 ms per robot under the starter profile.
    expect(good.accepted).toMatchObject({ soc: 4, makespan: 2, turnInclusiveSocMs: 4000, turnInclusiveMakespanMs: 2000, scenarioName: 'tiny-a.scen', model: 'classic' });
    expect(good.accepted?.executions.map((e) => e.policy).sort()).toEqual(['dependency-gated', 'lockstep', 'open-loop']);
    // JSON.stringify(manifest, null, 2): lines 1–3 open the object, format and version; defaults spans 4–11 (solver 7–10); plans opens on 12; its first entry on 13.
    expect(good).toMatchObject({ file: 'plans/good.txt', line: 13, instance: 'Board public / tiny.map / tiny-a.scen · 2 agents' });
    expect(robust.accepted).toMatchObject({ model: 'k-robust', variant: 'k=1', soc: 4, scenarioId: publicB });
    expect(conflict.refusal).toMatchObject({ code: 'PLAN_REJECTED', violation: { kind: 'vertex', agents: [0, 1], time: 2, cell: [2, 0] } });
    expect(typo.refusal?.code).toBe('VALIDATION_FAILED');
    expect(typo.refusal?.problems?.[0]).toMatchObject({ file: 'plans/typo.txt', line: 2, column: 7, field: 'agent 1, cell 1' });
    // The private set is not the submitter's: to him it does not exist.
    expect(hidden.refusal).toMatchObject({ code: 'SCENARIO_NOT_FOUND' });
    expect(hidden.accepted).toBeNull();

    // Exactly the two accepted plans were stored, each with one execution row per policy; refused ones left nothing.
    expect(await stored()).toEqual({ s: before.s + 2, r: before.r + 2, e: before.e + 6, b: before.b + 1 });
    const [{ waiting }] = await world.lib.sql<{ waiting: number }>('SELECT count(*)::int AS waiting FROM submission_batch_entries WHERE plan_gz IS NOT NULL');
    expect(waiting).toBe(0);
    const page = (await (await world.visitor.request('/api/leaderboards/rows?cols=model,source,solver,socSteps,successOpenLoop,successLockstep,successGated&source.in=submitted')).json()) as LeaderboardPage;
    const ours = page.rows.filter((r) => r.cells['solver'] === 'Batch planner 1.0');
    expect(ours).toHaveLength(2);
    for (const row of ours) {
      expect(row.cells).toMatchObject({ source: 'submitted', socSteps: 4 });
      for (const column of ['successOpenLoop', 'successLockstep', 'successGated']) expect(typeof row.cells[column]).toBe('number');
    }
  });

  it('refuses a malformed manifest whole, naming file, line and field, and stores nothing', async () => {
    const before = await stored();
    // Line 7 holds the agent count written as text.
    const text = [
      '{',
      '  "format": "quarterturn-plan-batch",',
      '  "version": 1,',
      '  "defaults": { "set": "Board public", "model": "classic", "solver": { "name": "x", "version": "1" } },',
      '  "plans": [',
      '    { "file": "a.txt", "instance": { "scenario": "tiny-a.scen", "agents": 2 } },',
      '    { "file": "a.txt", "instance": { "scenario": "tiny-a.scen", "agents": "two" } }',
      '  ]',
      '}',
    ].join('\n');
    const zip = await buildZip([{ name: 'batch.json', bytes: Buffer.from(text) }, { name: 'a.txt', bytes: Buffer.from(GOOD_TEXT) }]);

    const res = await sendZip(world.other, zip);

    expect(res.status).toBe(400);
    const body = res.body as ErrorBody;
    expect(body.error.code).toBe('VALIDATION_FAILED');
    expect(body.error.details[0]).toMatchObject({ file: 'batch.json', line: 7, field: 'plans[1].instance.agents' });
    expect(body.error.message).toContain('batch.json, line 7');
    expect(await stored()).toEqual(before);
  });

  it('refuses a manifest naming a file the zip lacks, and a zip without a manifest', async () => {
    const before = await stored();
    const manifest = { format: 'quarterturn-plan-batch', version: 1, plans: [{ file: 'missing.txt', model: 'classic', solver, instance: { scenarioId: world.scenarios[0], agents: 2 } }] };
    const missing = await sendZip(world.other, await buildZip([{ name: 'batch.json', bytes: Buffer.from(JSON.stringify(manifest)) }]));
    const bare = await sendZip(world.other, await buildZip([{ name: 'a.txt', bytes: Buffer.from(GOOD_TEXT) }]));

    expect(missing.status).toBe(400);
    expect((missing.body as ErrorBody).error.details[0]).toMatchObject({ file: 'batch.json', line: 1, field: 'plans[0].file', message: 'the zip holds no file missing.txt' });
    expect(bare.status).toBe(400);
    expect((bare.body as ErrorBody).error.details[0]).toMatchObject({ file: 'batch.zip', field: 'batch.json' });
    expect(await stored()).toEqual(before);
  });

  it('takes a JSON batch from a script with a submit token, and refuses a read-only token', async () => {
    const create = async (scopes: string[]) => {
      const res = await world.owner.request('/api/me/tokens', json('POST', { name: `batch ${scopes.join('+')}`, scopes, expiresInDays: 1 }));
      expect(res.status).toBe(201);
      return ((await res.json()) as CreatedApiToken).secret;
    };
    const submitter = await create(['read', 'submit']);
    const reader = await create(['read']);
    const url = world.lib.server.url;
    const withToken = (secret: string, path: string, init: RequestInit = {}) =>
      fetch(url + path, { ...init, headers: { authorization: `Bearer ${secret}`, 'content-type': 'application/json' } });
    const batch = [{ text: GOOD_TEXT, model: 'classic', solver: { name: 'Script batch', version: '2' }, instance: { scenarioId: world.scenarios[2], agents: 2 } }];

    const refused = await withToken(reader, '/api/submissions/batches', { method: 'POST', body: JSON.stringify(batch) });
    const sent = await withToken(submitter, '/api/submissions/batches', { method: 'POST', body: JSON.stringify(batch) });

    expect(refused.status).toBe(403);
    expect(((await refused.json()) as { error: { details: { missingScope: string } } }).error.details.missingScope).toBe('submit');
    expect(sent.status).toBe(202);
    const { id } = (await sent.json()) as SubmissionBatchSummary;
    // The private scenario is the token owner's own: accepted.
    const view = await finished(() => withToken(reader, `/api/submissions/batches/${id}`));
    expect(view.entries).toHaveLength(1);
    expect(view.entries[0]).toMatchObject({ status: 'accepted', file: 'plans[0]', line: 0 });
    expect(view.entries[0].accepted).toMatchObject({ soc: 4, solver: { name: 'Script batch', version: '2' } });
  });

  it('resumes a batch whose process ended with plans still pending when its owner opens it', async () => {
    // As a server that stopped mid-batch leaves it: running, one plan pending with its text, no runner in this process.
    // world.other is the third demo identity (leaderboard-support.ts).
    const [{ id: ownerId }] = await world.lib.sql<{ id: number }>('SELECT id FROM users WHERE login = :login', { login: DEMO_IDENTITIES[2].login });
    const request = { format: 'text', file: 'left.txt', instance: { scenarioId: world.scenarios[0], agents: 2 }, model: 'classic', startHeading: 'free', solver: { name: 'Left over', version: '1' } };
    const [{ id }] = await world.lib.sql<{ id: number }>("INSERT INTO submission_batches (owner_id, source, total) VALUES (:owner, 'json', 1) RETURNING id", { owner: ownerId });
    await world.lib.sql('INSERT INTO submission_batch_entries (batch_id, position, file, line, request, plan_gz) VALUES (:id, 1, :file, 0, :request, :plan)', {
      id, file: 'left.txt', request: JSON.stringify(request), plan: gzipSync(GOOD_TEXT),
    });

    const view = await finished(() => world.other.request(`/api/submissions/batches/${id}`));

    expect(view.entries[0]).toMatchObject({ status: 'accepted', accepted: { soc: 4, solver: { name: 'Left over', version: '1' } } });
  });

  it('resumes a batch left running when a server starts, before anyone opens it', async () => {
    const [{ id: ownerId }] = await world.lib.sql<{ id: number }>('SELECT id FROM users WHERE login = :login', { login: DEMO_IDENTITIES[2].login });
    const request = { format: 'text', file: 'restart.txt', instance: { scenarioId: world.scenarios[0], agents: 2 }, model: 'classic', startHeading: 'free', solver: { name: 'Restarted', version: '1' } };
    const [{ id }] = await world.lib.sql<{ id: number }>("INSERT INTO submission_batches (owner_id, source, total) VALUES (:owner, 'json', 1) RETURNING id", { owner: ownerId });
    await world.lib.sql('INSERT INTO submission_batch_entries (batch_id, position, file, line, request, plan_gz) VALUES (:id, 1, :file, 0, :request, :plan)', {
      id, file: 'restart.txt', request: JSON.stringify(request), plan: gzipSync(GOOD_TEXT),
    });

    // A second server on the same database, as after a restart; nobody asks it about the batch.
    const config = { ...loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent' }).config, webDist: '/nonexistent' };
    const restarted = await startServer({ config, databaseUrl: world.lib.db.url, port: 0, fakeOAuthPort: 0 });
    try {
      const deadline = Date.now() + 30_000;
      let status = 'running';
      while (status === 'running' && Date.now() < deadline) {
        await new Promise((r) => setTimeout(r, 200));
        [{ status }] = await world.lib.sql<{ status: string }>('SELECT status FROM submission_batches WHERE id = :id', { id });
      }
      expect(status).toBe('done');
      const entries = await world.lib.sql<{ status: string; n: number }>(
        `SELECT e.status, (SELECT count(*)::int FROM submissions s WHERE s.id = e.submission_id) AS n
           FROM submission_batch_entries e WHERE e.batch_id = :id`, { id },
      );
      expect(entries).toEqual([{ status: 'accepted', n: 1 }]);
    } finally {
      await restarted.close();
    }
  });

  it('shows a batch to its owner only', async () => {
    const batch = [{ text: GOOD_TEXT, model: 'classic', solver, instance: { scenarioId: world.scenarios[0], agents: 2 } }];
    const sent = await world.other.request('/api/submissions/batches', json('POST', batch));
    expect(sent.status).toBe(202);
    const { id } = (await sent.json()) as SubmissionBatchSummary;
    await finished(() => world.other.request(`/api/submissions/batches/${id}`));

    const byOwner = await world.other.request('/api/submissions/batches');
    const byOther = await world.owner.request(`/api/submissions/batches/${id}`);
    const listOfOther = (await (await world.owner.request('/api/submissions/batches')).json()) as SubmissionBatchListResponse;
    const byCurator = await world.curator.request(`/api/submissions/batches/${id}`);
    const byVisitor = await world.visitor.request(`/api/submissions/batches/${id}`);

    expect(((await byOwner.json()) as SubmissionBatchListResponse).items.map((b) => b.id)).toContain(id);
    expect(byOther.status).toBe(404);
    expect(((await byOther.json()) as ErrorBody).error.code).toBe('BATCH_NOT_FOUND');
    expect(listOfOther.items.map((b) => b.id)).not.toContain(id);
    expect(byCurator.status).toBe(404);
    expect(byVisitor.status).toBe(401);
  });
});
