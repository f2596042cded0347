/**
 * An example of a script driving Quarterturn with a personal API token (issue 16): it plans
 * some instances with "my" solver on this machine, submits the plans as one batch, launches a
 * sweep that runs the built-in classic CBS beside a registered external solver on the hub's
 * workers, waits for both, and prints the board rows of the instances side by side and the
 * model comparison report (a board row holds the best plan of its model variant, so the submitted
 * classic plans are shown in the history of the classic rows). It uses nothing but HTTP with `Authorization: Bearer` (no cookie, no
 * CSRF header), so it is also the shape of any other client.
 *
 *   QT_TOKEN=qtk_… npx tsx scripts/compare-my-solver.ts --url http://127.0.0.1:4300 \
 *     --set "Open grid benchmarks" --map empty-8-8.map --scenario empty-8-8-even-1.scen --agents 2,4,6
 *
 * The token needs the scopes read, submit and sweep (sweep only works for maintainers and admins).
 * "My solver" here is the example external solver shipped in the repository
 * (solvers/cli/external-example/prioritised-astar.ts), run as a child process on the map and
 * scenario files found under --files (default: the repository's open benchmark files); put your
 * own program in `planWithMySolver`. The sweep's external solver is --external (default the
 * example, prioritised-astar@1.0.0, which `npm start` registers and its embedded worker runs).
 *
 * Exit status: 0 when every plan was accepted and the sweep finished; 1 otherwise (the reason printed).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import type { MeResponse } from '../shared/auth';
import type { InstanceHistory } from '../shared/history';
import type { InstanceSetDetail, InstanceSetListResponse } from '../shared/instance-sets';
import type { LeaderboardPage } from '../shared/leaderboards';
import type { SweepDetail } from '../shared/runs';
import type { SubmissionBatchView } from '../shared/submission-batches';

const ROOT = resolve(__dirname, '..');

const { values } = parseArgs({
  options: {
    url: { type: 'string', default: process.env.QT_URL ?? 'http://127.0.0.1:4300' },
    set: { type: 'string', default: 'Open grid benchmarks' },
    map: { type: 'string', default: 'empty-8-8.map' },
    scenario: { type: 'string', default: 'empty-8-8-even-1.scen' },
    agents: { type: 'string', default: '2,4,6' },
    files: { type: 'string', default: join(ROOT, 'benchmarks', 'datasets', 'grid-benchmarks') },
    external: { type: 'string', default: 'prioritised-astar@1.0.0' },
    'time-limit-ms': { type: 'string', default: '10000' },
    'wait-s': { type: 'string', default: '300' },
  },
});

const token = process.env.QT_TOKEN;
if (!token) fail('set QT_TOKEN to a personal API token (scopes read, submit, sweep), made on the account page');
const base = values.url.replace(/\/+$/, '');
const agentCounts = values.agents.split(',').map((a) => Number(a.trim()));
if (agentCounts.some((n) => !Number.isInteger(n) || n < 1)) fail(`--agents: a comma list of whole numbers ≥ 1 (got ${values.agents})`);
const [externalName, externalVersion] = values.external.split('@');
if (!externalName || !externalVersion) fail(`--external: name@version (got ${values.external})`);
const timeLimitMs = Number(values['time-limit-ms']);
const waitMs = Number(values['wait-s']) * 1000;
/** One profile for the batch and the sweep, so their results share board rows. */
const robotProfile = { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1 };
const MY_SOLVER = { name: 'my-prioritised-planner', version: '0.1' };

function fail(message: string): never {
  console.error(`compare-my-solver: ${message}`);
  process.exit(1);
}

/** One API call with the token; throws with the server's error message unless the status is `expect`. */
async function api<T>(path: string, init: { method?: string; body?: unknown } = {}, expect = 200): Promise<T> {
  const res = await fetch(base + path, {
    method: init.method ?? 'GET',
    headers: { authorization: `Bearer ${token}`, ...(init.body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  const text = await res.text();
  if (res.status !== expect) {
    let message = text;
    try {
      const err = (JSON.parse(text) as { error?: { code: string; message: string } }).error;
      if (err) message = `${err.code}: ${err.message}`;
    } catch { /* not JSON: show the text */ }
    throw new Error(`${init.method ?? 'GET'} ${path} answered ${res.status}: ${message}`);
  }
  return (res.headers.get('content-type') ?? '').includes('application/json') ? (JSON.parse(text) as T) : (text as T);
}

async function waitFor<T>(what: string, read: () => Promise<T>, isDone: (v: T) => boolean, describe: (v: T) => string): Promise<T> {
  const until = Date.now() + waitMs;
  let last = '';
  for (;;) {
    const v = await read();
    const line = describe(v);
    if (line !== last) console.log(`  ${what}: ${line}`);
    last = line;
    if (isDone(v)) return v;
    if (Date.now() > until) throw new Error(`${what} not done after ${waitMs / 1000} s (${line})`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

/** "My solver": the repository's example program on the local files; returns the plan in the text format. */
function planWithMySolver(agents: number): string {
  const dir = mkdtempSync(join(tmpdir(), 'qt-my-solver-'));
  try {
    const plan = join(dir, 'plan.txt');
    execFileSync(process.execPath, [
      '--import', 'tsx', join(ROOT, 'solvers', 'cli', 'external-example', 'prioritised-astar.ts'),
      '--map', join(values.files, values.map), '--scenario', join(values.files, values.scenario), '--agents', String(agents), '--plan', plan,
    ], { cwd: ROOT, stdio: ['ignore', 'ignore', 'inherit'] });
    return readFileSync(plan, 'utf8');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function main(): Promise<void> {
  const me = await api<MeResponse>('/api/me');
  if (!me.account) fail('the token was not accepted');
  console.log(`signed in by token as ${me.account.login} (${me.account.role})`);

  const sets = await api<InstanceSetListResponse>(`/api/instance-sets?q=${encodeURIComponent(values.set)}`);
  const set = sets.items.find((s) => s.name === values.set) ?? fail(`no instance set named "${values.set}" that this token may see`);
  const detail = await api<InstanceSetDetail>(`/api/instance-sets/${set.id}`);
  const scenario = detail.scenarios.find((s) => s.name === values.scenario) ?? fail(`set "${values.set}" has no scenario ${values.scenario}`);
  const map = detail.maps.find((m) => m.id === scenario.mapId) ?? fail(`scenario ${values.scenario} has no map`);
  if (map.name !== values.map) fail(`scenario ${values.scenario} belongs to ${map.name}, not ${values.map}`);

  console.log(`1. planning ${agentCounts.length} instances with ${MY_SOLVER.name} and submitting them as one batch`);
  const plans = agentCounts.map((agents) => ({ text: planWithMySolver(agents), format: 'text', instance: { set: values.set, map: values.map, scenario: values.scenario, agents } }));
  const created = await api<{ id: number }>('/api/submissions/batches', {
    method: 'POST',
    body: { format: 'quarterturn-plan-batch', version: 1, defaults: { model: 'classic', solver: MY_SOLVER, robotProfile }, plans },
  }, 202);
  const batch = await waitFor('batch', () => api<SubmissionBatchView>(`/api/submissions/batches/${created.id}`), (b) => b.status === 'done',
    (b) => `${b.done}/${b.total} checked, ${b.accepted} accepted, ${b.refused} refused`);
  for (const e of batch.entries) {
    const outcome = e.accepted
      ? `accepted, sum-of-costs ${e.accepted.soc} steps, execution success ${e.accepted.executions.map((x) => `${x.policy} ${(x.successRate * 100).toFixed(0)} %`).join(', ')}`
      : `${e.status}${e.refusal ? `: ${e.refusal.message}` : ''}`;
    console.log(`  plan ${e.position} (${e.instance}): ${outcome}`);
  }
  if (batch.accepted !== agentCounts.length) throw new Error(`${batch.refused} of ${batch.total} plans were refused`);

  console.log(`2. launching a sweep: built-in classic CBS beside ${externalName}@${externalVersion} on the hub's workers`);
  const sweep = await api<SweepDetail>('/api/sweeps', {
    method: 'POST',
    body: {
      name: `classic CBS beside ${externalName} on ${values.scenario}`,
      instances: { instanceSetId: set.id, scenarioIds: [scenario.id] },
      agentCounts: { kind: 'list', values: agentCounts },
      models: [{ model: 'classic' }, { model: 'classic', externalSolver: { name: externalName, version: externalVersion } }],
      robotProfile, timeLimitMs, memoryLimitMb: 512,
      execution: { policies: ['open-loop', 'lockstep', 'dependency-gated'], runs: 10 },
      seeds: [1],
    },
  }, 201);
  const over = await waitFor('sweep', () => api<SweepDetail>(`/api/sweeps/${sweep.id}`), (s) => ['finished', 'failed', 'cancelled'].includes(s.status),
    (s) => `${s.status}, ${s.progress.done}/${s.progress.total} runs over${s.progress.perModel.map((m) => m.external?.waiting ? `; ${m.external.waiting}` : '').join('')}`);
  if (over.status !== 'finished') throw new Error(`the sweep ended ${over.status}`);

  console.log(`3. the board rows of ${values.scenario} (robot profile of this script), side by side`);
  const cols = ['agents', 'model', 'variant', 'solver', 'source', 'status', 'socSteps', 'makespanSteps', 'tiMakespanMs'];
  const board = await api<LeaderboardPage>(`/api/leaderboards/rows?mapId=${map.id}&cols=${cols.join(',')}&sort=agents,solver&scenario.eq=${encodeURIComponent(values.scenario)}&start=0&end=200`);
  console.log(`  ${cols.join(' | ')}`);
  for (const r of board.rows) console.log(`  ${cols.map((c) => r.cells[c] ?? '–').join(' | ')}`);
  // A board row shows the best plan of its model variant; the submitted plans compete in the classic rows,
  // so the history of each classic row shows them beside the built-in search.
  for (const r of board.rows.filter((x) => x.model === 'classic' && x.variant === '')) {
    const history = await api<InstanceHistory>(`/api/history?scenarioId=${r.scenarioId}&agents=${r.agents}&model=classic&variant=&profile=${r.profileHash}`);
    console.log(`  history of the classic row, ${r.agents} agents:`);
    for (const i of history.items) {
      console.log(`    ${i.solver.name} ${i.solver.version} (${i.source.kind}): ${i.status}, sum-of-costs ${i.soc ?? '–'} steps${i.isBest ? ' (shown on the board)' : ''}`);
    }
  }

  console.log('4. the model comparison report (Markdown)');
  console.log(await api<string>(`/api/reports/model-comparison?set=${set.id}&format=markdown`));
}

main().catch((err: Error) => fail(err.message));
