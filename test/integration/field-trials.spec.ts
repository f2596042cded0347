/**
 * Field trials on a stored result (issue 17, item 2): a researcher attaches trial logs (CSV, JSON,
 * a zip of several) with the policy used and notes; every log is checked against the plan in the
 * interactive pool; per run the figures stored equal compareTrialToPlan's; a log that departs from
 * the plan is refused at its first divergent row (line named) and a bad file in a zip stores
 * nothing of the upload; visitors see the trials of public results, nobody those of results he
 * may not see. A real sweep (in-process worker, real PostgreSQL) on the open dataset's empty-8-8
 * (Stern et al., SoCS 2019, read in place) stores the result.
 */
import pino from 'pino';
import request from 'supertest';
import { CSRF_HEADER } from '@shared/auth';
import type { FieldTrialsView, NamedRobotProfile, TrialCalibrationView } from '@shared/field-trials';
import type { ModelComparisonReport } from '@shared/reports';
import type { ResultPlanView } from '@shared/result-plan-view';
import { parseTrialLog, TRIAL_LOG_FORMAT, TRIAL_LOG_VERSION } from '@shared/trial-log';
import { compareTrialToPlan } from '@solvers/trials/compare-to-plan';
import { signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { instanceOfView, inventedTrialLogs } from '../../api/src/trials/invented-trials';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';
import { buildZip } from './instance-library-support';

jest.setTimeout(120_000);

const RESEARCHER = 'marguerite-oyelaran';

describe('field trials on a stored result', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let researcher: SignedInClient;
  let setId: number;
  let resultId: number;
  let view: ResultPlanView;
  let logs: { name: string; text: string }[];

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    setId = (await uploadSet(s, 'trial floor', ['empty-8-8.map', 'empty-8-8-even-1.scen'])).setId;
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'trial plan', agentCounts: { kind: 'list', values: [4] }, models: [{ model: 'classic' }],
      execution: { policies: ['open-loop', 'dependency-gated'], runs: 5 },
    }));
    expect(await waitForSweep(s, sweep.id, 100_000)).toBe('finished');
    [{ id: resultId }] = await s.sql<{ id: number }>("SELECT id FROM results WHERE sweep_id = :id AND status = 'solved' ORDER BY id LIMIT 1", { id: sweep.id });
    view = (await (await fetch(`${s.url}/api/executions/results/${resultId}`)).json()) as ResultPlanView;
    logs = inventedTrialLogs(instanceOfView(view.instance), view.plan, view.profile, {
      policy: 'dependency-gated', noise: { jitterCv: 0.1, stallProbability: 0, stallMs: 0 }, seed: 7, runs: 4, prefix: 'bay-3',
    });
    researcher = await signInAs(s.url, RESEARCHER);
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  const post = (client: SignedInClient, files: { name: string; bytes: Buffer }[], fields: Record<string, string> = { policy: 'dependency-gated' }) => {
    let req = request(s.url).post(`/api/trials/results/${resultId}`).set('cookie', client.jar.header()).set(CSRF_HEADER, client.csrfToken);
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    for (const f of files) req = req.attach('files', f.bytes, { filename: f.name, contentType: 'application/octet-stream' });
    return req;
  };
  const asFile = (l: { name: string; text: string }) => ({ name: l.name, bytes: Buffer.from(l.text) });
  const counts = async () => (await s.sql<{ uploads: string; runs: string }>(
    'SELECT (SELECT count(*) FROM trial_uploads) AS uploads, (SELECT count(*) FROM trial_runs) AS runs'))[0];
  const expectedFigures = (name: string, text: string) => {
    const parsed = parseTrialLog(name, text);
    if (parsed.kind !== 'parsed') throw new Error('fixture log does not parse');
    const compared = compareTrialToPlan(instanceOfView(view.instance), view.plan, view.profile, parsed.log);
    if (compared.kind !== 'matches') throw new Error('fixture log diverges');
    return compared.figures;
  };

  it('stores a CSV run with the policy and notes, its figures equal to compareTrialToPlan', async () => {
    const res = await post(researcher, [asFile(logs[0])], { policy: 'dependency-gated', notes: 'Floor B, two-wheel robots, 3 Dec' });
    expect(res.status).toBe(201);
    const body = res.body as FieldTrialsView;
    expect(body.uploads).toHaveLength(1);
    const [upload] = body.uploads;
    expect(upload).toMatchObject({ policy: 'dependency-gated', notes: 'Floor B, two-wheel robots, 3 Dec', uploadedBy: RESEARCHER });
    // The sweep stored a dependency-gated replay: its settings are the simulation's.
    expect(upload.simulation.settingsFrom).toBe('stored');
    expect(upload.simulation.realisedMakespanMs.count).toBeGreaterThan(0);
    const f = expectedFigures(logs[0].name, logs[0].text);
    const [run] = upload.runs;
    expect(run).toMatchObject({
      fileName: logs[0].name, format: 'csv', isSuccess: f.isSuccess, isAborted: f.isAborted, collisions: f.collisions,
      realisedMakespanMs: f.realisedMakespanMs, realisedSocMs: f.realisedSocMs, finishSpreadMs: f.finishSpreadMs, waitingMs: f.waitingMs,
    });
    expect(run.perRobot).toEqual(f.perRobot);
    expect(run.perRobot).toHaveLength(4);
    const [stored] = await s.sql<{ realised_makespan_ms: number; is_success: boolean }>('SELECT realised_makespan_ms, is_success FROM trial_runs WHERE id = :id', { id: run.id });
    expect(stored).toEqual({ realised_makespan_ms: f.realisedMakespanMs, is_success: f.isSuccess });
  });

  it('stores a JSON run, and a zip of several as one upload with one run each', async () => {
    const parsed = parseTrialLog(logs[1].name, logs[1].text);
    if (parsed.kind !== 'parsed') throw new Error('fixture');
    const json = JSON.stringify({
      format: TRIAL_LOG_FORMAT, version: TRIAL_LOG_VERSION,
      rows: parsed.log.rows.map((r) => ({ robot: r.robot, action: r.action, start_ms: r.startMs, end_ms: r.endMs })),
    }, null, 1);
    const one = await post(researcher, [{ name: 'bay-3-02.json', bytes: Buffer.from(json) }]);
    expect(one.status).toBe(201);
    expect((one.body as FieldTrialsView).uploads[0].runs[0]).toMatchObject({ format: 'json', realisedMakespanMs: expectedFigures(logs[1].name, logs[1].text).realisedMakespanMs });

    const zip = await buildZip(logs.slice(1).map(asFile));
    const many = await post(researcher, [{ name: 'bay-3.zip', bytes: zip }], { policy: 'dependency-gated' });
    expect(many.status).toBe(201);
    const runs = (many.body as FieldTrialsView).uploads[0].runs;
    expect(runs.map((r) => r.fileName)).toEqual(logs.slice(1).map((l) => `bay-3.zip:${l.name}`));
    let compared = 0;
    for (const [k, r] of runs.entries()) {
      expect(r.realisedMakespanMs).toBe(expectedFigures(logs[k + 1].name, logs[k + 1].text).realisedMakespanMs);
      compared++;
    }
    expect(compared).toBe(3);
    const list = (await (await researcher.request(`/api/trials/results/${resultId}`)).json()) as FieldTrialsView;
    expect(list.uploads.map((u) => u.runs.length)).toEqual([1, 1, 3]);
    expect(list.safetyNote).toMatch(/no safety assessment/);
    // The board's row of the result counts its field runs.
    const board = (await (await fetch(`${s.url}/api/leaderboards/rows?cols=model&start=0&end=50`)).json()) as { rows: { resultId?: number; fieldRuns?: number }[] };
    expect(board.rows.find((r) => r.resultId === resultId)?.fieldRuns).toBe(5);
  });

  it('refuses a log that departs from the plan at its first divergent row, storing nothing', async () => {
    const before = await counts();
    const lines = logs[0].text.split('\n');
    // Line 4 of the file (the third row): its action replaced by one the plan does not have there.
    const cells = lines[3].split(',');
    cells[1] = cells[1] === 'wait' ? 'forward' : 'wait';
    lines[3] = cells.join(',');
    const res = await post(researcher, [asFile(logs[1]), { name: 'swapped.csv', bytes: Buffer.from(lines.join('\n')) }]);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('TRIAL_DIVERGES');
    expect(res.body.error.details.errors[0]).toMatchObject({ file: 'swapped.csv', line: 4, field: 'action' });
    expect(res.body.error.message).toMatch(/^swapped\.csv:4/);
    expect(await counts()).toEqual(before);
  });

  it('stores nothing of a zip with one bad file, naming file, line and column', async () => {
    const before = await counts();
    const bad = logs[2].text.replace(/\n(\d+),(\w[\w-]*),(\d+)/, '\n$1,$2,soon');
    const zip = await buildZip([asFile(logs[0]), { name: 'bad.csv', bytes: Buffer.from(bad) }, asFile(logs[1])]);
    const res = await post(researcher, [{ name: 'shift.zip', bytes: zip }]);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('INVALID_TRIAL_LOG');
    expect(res.body.error.details.errors[0]).toMatchObject({ file: 'shift.zip:bad.csv', line: 2, field: 'start_ms' });
    expect(res.body.error.details.errors[0].column).toBeGreaterThan(1);
    expect(await counts()).toEqual(before);
  });

  it('flags a run whose makespan lies outside the simulation’s central 95 %', async () => {
    const parsed = parseTrialLog(logs[0].name, logs[0].text);
    if (parsed.kind !== 'parsed') throw new Error('fixture');
    // Every time tripled: a fleet three times slower than planned.
    const slow = ['robot,action,start_ms,end_ms', ...parsed.log.rows.map((r) => `${r.robot},${r.action},${r.startMs * 3},${r.endMs * 3}`)].join('\n');
    const res = await post(researcher, [{ name: 'slow.csv', bytes: Buffer.from(slow) }]);
    expect(res.status).toBe(201);
    const [upload] = (res.body as FieldTrialsView).uploads;
    expect(upload.runs[0].outside).toContain('realisedMakespanMs');
    expect(upload.runs[0].realisedMakespanMs!).toBeGreaterThan(upload.simulation.realisedMakespanMs.high!);
  });

  it('puts the field runs beside the simulation in the model comparison report of the same policy', async () => {
    const [{ n }] = await s.sql<{ n: number }>('SELECT count(*)::int AS n FROM trial_runs WHERE result_id = :id', { id: resultId });
    const report = (await (await fetch(`${s.url}/api/reports/model-comparison?set=${setId}&policy=dependency-gated`)).json()) as ModelComparisonReport;
    const row = report.fieldTrials?.find((f) => f.resultId === resultId);
    expect(row).toMatchObject({ variant: 'classic', scenario: 'empty-8-8-even-1.scen', agents: 4, runs: n });
    expect(row!.runsOutside).toBeGreaterThanOrEqual(1);
    expect(row!.simulatedMakespan.low!).toBeLessThanOrEqual(row!.simulatedMakespan.high!);
    const openLoop = (await (await fetch(`${s.url}/api/reports/model-comparison?set=${setId}&policy=open-loop`)).json()) as ModelComparisonReport;
    expect(openLoop.fieldTrials).toBeUndefined();
  });

  it('refuses a policy that is not one and an upload without files, in the one error shape', async () => {
    const bad = await post(researcher, [asFile(logs[0])], { policy: 'teleport' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('VALIDATION_FAILED');
    expect(JSON.stringify(bad.body.error)).toMatch(/policy/);
    const none = await post(researcher, []);
    expect(none.status).toBe(400);
  });

  it('shows visitors the trials of a public result; hides those of a private one from all who may not see it', async () => {
    const visitor = await fetch(`${s.url}/api/trials/results/${resultId}`);
    expect(visitor.status).toBe(200);
    const seen = (await visitor.json()) as FieldTrialsView;
    expect(seen.canAttach).toBe(false);
    expect(seen.uploads.length).toBeGreaterThan(0);
    const visitorPost = await request(s.url).post(`/api/trials/results/${resultId}`).attach('files', Buffer.from(logs[0].text), 'a.csv');
    expect([401, 403]).toContain(visitorPost.status);

    await s.sql("UPDATE instance_sets SET visibility = 'private' WHERE id = :id", { id: setId });
    try {
      expect((await fetch(`${s.url}/api/trials/results/${resultId}`)).status).toBe(404);
      expect((await researcher.request(`/api/trials/results/${resultId}`)).status).toBe(404);
      const refused = await post(researcher, [asFile(logs[0])]);
      expect(refused.status).toBe(404);
      // The maintainer (a curator) still sees it.
      expect((await s.client.request(`/api/trials/results/${resultId}`)).status).toBe(200);
    } finally {
      await s.sql("UPDATE instance_sets SET visibility = 'public' WHERE id = :id", { id: setId });
    }
  });

  it('fits a profile to the runs, saves it under a name with its provenance and lists it for its owner and curators', async () => {
    const runs = await s.sql<{ id: number; file_name: string }>("SELECT id, file_name FROM trial_runs WHERE file_name LIKE '%bay-3%' ORDER BY id");
    expect(runs).toHaveLength(5);
    const runIds = runs.map((r) => r.id);
    const fitted = await researcher.request(`/api/trials/results/${resultId}/calibration`, { method: 'POST', body: JSON.stringify({ runIds }) });
    expect(fitted.status).toBe(200);
    const calibration = (await fitted.json()) as TrialCalibrationView;
    // Logs drawn with the sweep's profile (forward 1000 ms) and jitter 0.1: the fit lands near both (invented tolerance for ~100 actions).
    expect(calibration.fit.forwardMs!).toBeGreaterThan(900);
    expect(calibration.fit.forwardMs!).toBeLessThan(1100);
    expect(calibration.fit.ci95.forwardMs![0]).toBeLessThan(calibration.fit.forwardMs!);
    expect(calibration.fit.goodnessOfFit.qq.length).toBeGreaterThan(10);
    expect(calibration.profile).toMatchObject({ forwardMs: Math.round(calibration.fit.forwardMs!), cellPitchMm: 500, robotDiameterMm: 350 });
    expect(calibration.provenance.runs).toEqual(runs.map((r) => ({ id: r.id, fileName: r.file_name })));

    const saved = await researcher.request('/api/robot-profiles', { method: 'POST', body: JSON.stringify({ name: 'Floor B two-wheel', resultId, runIds }) });
    expect(saved.status).toBe(201);
    const profile = (await saved.json()) as NamedRobotProfile;
    expect(profile).toMatchObject({ name: 'Floor B two-wheel', owner: RESEARCHER, profile: calibration.profile });
    expect(profile.provenance).toMatchObject({ kind: 'trial-fit', resultId, runs: calibration.provenance.runs });
    const again = await researcher.request('/api/robot-profiles', { method: 'POST', body: JSON.stringify({ name: 'Floor B two-wheel', resultId, runIds }) });
    expect(again.status).toBe(409);
    const unknownRun = await researcher.request('/api/robot-profiles', { method: 'POST', body: JSON.stringify({ name: 'other', resultId, runIds: [999_999] }) });
    expect(unknownRun.status).toBe(400);
    const names = async (c: SignedInClient) => ((await (await c.request('/api/robot-profiles')).json()) as NamedRobotProfile[]).map((p) => p.name);
    expect(await names(researcher)).toEqual(['Floor B two-wheel']);
    expect(await names(s.client)).toEqual(['Floor B two-wheel']);
    expect(await names(await signInAs(s.url, 'ilse-marchetti'))).toEqual([]);
    expect((await fetch(`${s.url}/api/robot-profiles`)).status).toBe(401);
  });

  it('lets the uploader delete an upload, and refuses another researcher', async () => {
    const [{ id }] = await s.sql<{ id: number }>('SELECT id FROM trial_uploads ORDER BY id DESC LIMIT 1');
    const other = await signInAs(s.url, 'ilse-marchetti');
    expect((await other.request(`/api/trials/uploads/${id}`, { method: 'DELETE' })).status).toBe(403);
    expect((await researcher.request(`/api/trials/uploads/${id}`, { method: 'DELETE' })).status).toBe(204);
    expect(await s.sql('SELECT id FROM trial_runs WHERE upload_id = :id', { id })).toEqual([]);
  });
});
