/**
 * Helpers of the leaderboard, export and submission suites: a server with a public and a private
 * instance set holding a tiny hand-written map and scenario (our own files, standard text
 * formats), result rows written straight into `results`/`executions` the way the sweep worker
 * writes them, and a brute-force reimplementation of the best-result rule to check SQL against.
 */
import { createRng } from '@solvers/random';
import { parameterHash } from '../../api/src/sweeps/parameter-hash';
import {
  createSet, json, setRole, signInAs, startLibraryServer, upload, visitorClient, type LibraryServer, type SignedInClient,
} from './instance-library-support';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';

/** A 5 × 4 map with one wall cell at (1, 1). */
export const TINY_MAP = 'type octile\nheight 4\nwidth 5\nmap\n.....\n.@...\n.....\n.....\n';
/** Three agents: (0,0)→(2,0), (2,2)→(0,2), (4,3)→(4,0). */
export const TINY_SCEN = 'version 1\n0\ttiny.map\t5\t4\t0\t0\t2\t0\t2\n0\ttiny.map\t5\t4\t2\t2\t0\t2\t2\n0\ttiny.map\t5\t4\t4\t3\t4\t0\t3\n';

/** Two robot profiles (invented figures). */
export const PROFILES = [
  { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.1 },
  { forwardMs: 800, quarterTurnMs: 900, waitMs: 800, cellPitchMm: 1200, robotDiameterMm: 600, timingJitter: 0 },
] as const;

/** The board's world: server, people, sets and scenarios. */
export interface BoardWorld {
  readonly lib: LibraryServer;
  readonly visitor: SignedInClient;
  readonly owner: SignedInClient;
  readonly other: SignedInClient;
  readonly curator: SignedInClient;
  readonly publicSet: number;
  readonly privateSet: number;
  /** Scenario ids: [public a, public b, private a]. */
  readonly scenarios: readonly number[];
}

const [ownerId, curatorId, otherId] = DEMO_IDENTITIES;

async function fill(lib: LibraryServer, client: SignedInClient, set: number, names: readonly string[]): Promise<void> {
  const files = [{ name: 'tiny.map', bytes: Buffer.from(TINY_MAP) }, ...names.map((n) => ({ name: n, bytes: Buffer.from(TINY_SCEN) }))];
  await upload(lib.server.url, client, set, files).expect(201);
}

/** Starts a server with a public set (two scenarios) and a private one (one scenario) owned by one researcher. */
export async function startBoardWorld(): Promise<BoardWorld> {
  const lib = await startLibraryServer();
  const url = lib.server.url;
  const visitor = await visitorClient(url);
  const owner = await signInAs(url, ownerId.login);
  const other = await signInAs(url, otherId.login);
  const curator = await signInAs(url, curatorId.login);
  await setRole(lib, curatorId.login, 'maintainer');
  const publicSet = await createSet(owner, 'Board public', 'public');
  const privateSet = await createSet(owner, 'Board private', 'private');
  await fill(lib, owner, publicSet, ['tiny-a.scen', 'tiny-b.scen']);
  await fill(lib, owner, privateSet, ['tiny-a.scen']);
  const rows = await lib.sql<{ id: number }>(
    'SELECT id FROM scenarios ORDER BY (instance_set_id = :priv), name', { priv: privateSet },
  );
  return { lib, visitor, owner, other, curator, publicSet, privateSet, scenarios: rows.map((r) => r.id) };
}

/** One result row as the tests write it. */
export interface SeedResult {
  id?: number;
  readonly scenarioId: number;
  readonly agents: number;
  readonly model: string;
  readonly k?: number;
  readonly profile: number;
  readonly status: 'solved' | 'infeasible' | 'timeout' | 'memory' | 'error';
  readonly soc: number | null;
  readonly tiMakespanMs: number | null;
  readonly lowerBound: number | null;
  readonly runtimeMs: number;
  readonly seed: number;
  /** Execution success rate and finish spread under open-loop, when replayed (runs: default 10). */
  readonly openLoop?: {
    readonly success: number; readonly spread: number; readonly realised: number; readonly runs?: number;
    /** The stored 95 % interval of the mean realised makespan (metrics.ci95, as sweeps store it since issue 12); absent = not stored. */
    readonly realisedCi95?: readonly [number, number];
    /** The stored 95 % interval of the mean finish spread; absent = not stored. */
    readonly spreadCi95?: readonly [number, number];
  };
  /** Executable at nominal times (migration 0405); absent = not checked. */
  readonly executableAtNominal?: boolean | null;
  /** Model parameters beyond model, k and start heading (e.g. the following rule). */
  readonly extraModelParams?: Record<string, unknown>;
}

/** Writes results (and their open-loop execution) like the sweep worker does; sets `id` on each. */
export async function insertResults(lib: LibraryServer, results: SeedResult[]): Promise<void> {
  for (const r of results) {
    const params = { model: { model: r.model, startHeading: 'free', switches: {}, ...(r.k !== undefined ? { k: r.k } : {}), ...r.extraModelParams }, robotProfile: PROFILES[r.profile], timeLimitMs: 1000, memoryLimitMb: 256 };
    const [row] = await lib.sql<{ id: number }>(
      `INSERT INTO results (instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, soc, makespan,
         turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
         solver_version, solver_commit, node_version, cpu_model, thread_count, executable_at_nominal, nominal_collisions)
       SELECT s.instance_set_id, s.map_id, s.id, :agents, :model, :params, :hash, :seed, :status, :soc, :soc, :ti, :ti, :lb, :runtime, 1,
         :profile, :profileHash, '0.1.0', 'test', 'v20', 'test cpu', 1, :nominal, :nominalCollisions FROM scenarios s WHERE s.id = :scenario RETURNING id`,
      {
        agents: r.agents, model: r.model, params: JSON.stringify(params), hash: parameterHash(params), seed: r.seed, status: r.status,
        soc: r.soc, ti: r.tiMakespanMs, lb: r.lowerBound, runtime: r.runtimeMs, profile: JSON.stringify(PROFILES[r.profile]),
        profileHash: parameterHash(PROFILES[r.profile]), scenario: r.scenarioId,
        nominal: r.executableAtNominal ?? null, nominalCollisions: r.executableAtNominal === undefined || r.executableAtNominal === null ? null : r.executableAtNominal ? 0 : 2,
      },
    );
    r.id = row.id;
    if (r.openLoop) {
      await lib.sql(
        `INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean, realised_makespan_mean_ms, realised_makespan_p95_ms, finish_spread_mean_ms, metrics)
         VALUES (:id, 'open-loop', '{}', :runs, :success, 0, :realised, :realised, :spread, :metrics)`,
        {
          id: row.id, success: r.openLoop.success, realised: r.openLoop.realised, spread: r.openLoop.spread, runs: r.openLoop.runs ?? 10,
          metrics: JSON.stringify(r.openLoop.realisedCi95 || r.openLoop.spreadCi95
            ? { ci95: { realisedMakespanMs: r.openLoop.realisedCi95 ?? null, finishSpreadMs: r.openLoop.spreadCi95 ?? null } } : {}),
        },
      );
    }
  }
}

/** Random results over the world's scenarios, agents 1..3, four models, two profiles, from one seed. */
export function randomResults(world: BoardWorld, seed: number, count: number): SeedResult[] {
  const rng = createRng(seed);
  const models = [['classic'], ['uniform-duration'], ['k-robust', 1], ['k-robust', 2], ['weighted-split']] as const;
  const out: SeedResult[] = [];
  for (let i = 0; i < count; i++) {
    const [model, k] = models[rng.int(models.length)] as readonly [string, number?];
    const roll = rng.next();
    const status = roll < 0.6 ? 'solved' : roll < 0.8 ? 'timeout' : roll < 0.9 ? 'memory' : 'error';
    const soc = status === 'solved' ? 2 + rng.int(6) : null;
    out.push({
      scenarioId: world.scenarios[rng.int(world.scenarios.length)], agents: 1 + rng.int(3), model, k, profile: rng.int(2), status,
      soc, tiMakespanMs: soc === null ? null : soc * 700 + rng.int(500),
      lowerBound: status === 'error' ? null : soc === null ? 1 + rng.int(3) : Math.max(1, soc - rng.int(2)),
      runtimeMs: Math.round(rng.next() * 5000) / 10, seed: i,
      openLoop: soc !== null && rng.next() < 0.7 ? { success: rng.int(11) / 10, spread: rng.int(4000), realised: soc * 800 + rng.int(900) } : undefined,
      // Executable at nominal times: checked (either way) or not, for solved results only.
      executableAtNominal: soc === null ? undefined : ([true, false, null] as const)[rng.int(3)],
    });
  }
  return out;
}

/** What the board should say for one key, computed by brute force from the results. */
export interface ExpectedEntry {
  readonly key: string;
  readonly scenarioId: number;
  readonly agents: number;
  readonly model: string;
  readonly variant: string;
  readonly profile: number;
  readonly best: SeedResult;
  readonly lowerBound: number | null;
  readonly gap: number | null;
  readonly attempts: number;
}

const STATUS_RANK = { solved: 0, infeasible: 1, timeout: 2, memory: 3, error: 4 } as const;
const cmpNullLast = (a: number | null, b: number | null) => (a === b ? 0 : a === null ? 1 : b === null ? -1 : a - b);

/** The best-result rule written again in plain TypeScript (migrations 0401 and 0405): one entry per key. */
export function expectedEntries(results: readonly SeedResult[]): ExpectedEntry[] {
  const groups = new Map<string, SeedResult[]>();
  for (const r of results) {
    const key = `${r.scenarioId}|${r.agents}|${r.model}|${r.k !== undefined ? `k=${r.k}` : ''}|${r.profile}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  return [...groups].map(([key, rs]) => {
    // Migration 0405: among equal statuses a plan known to collide at nominal times comes last.
    const collides = (r: SeedResult) => (r.executableAtNominal === false ? 1 : 0);
    const best = [...rs].sort((a, b) => STATUS_RANK[a.status] - STATUS_RANK[b.status] || collides(a) - collides(b) || cmpNullLast(a.soc, b.soc)
      || cmpNullLast(a.tiMakespanMs, b.tiMakespanMs) || a.runtimeMs - b.runtimeMs || (a.id ?? 0) - (b.id ?? 0))[0];
    const lbs = rs.map((r) => r.lowerBound).filter((v): v is number => v !== null);
    const lowerBound = lbs.length ? Math.max(...lbs) : null;
    const gap = best.status === 'solved' && lowerBound !== null && lowerBound > 0 && best.soc !== null ? (best.soc - lowerBound) / lowerBound : null;
    return {
      key, scenarioId: best.scenarioId, agents: best.agents, model: best.model, variant: best.k !== undefined ? `k=${best.k}` : '',
      profile: best.profile, best, lowerBound, gap, attempts: rs.length,
    };
  });
}

export { json, setRole, type LibraryServer, type SignedInClient };
