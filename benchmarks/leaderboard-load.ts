/**
 * The concurrent mode of `npm run bench:leaderboard` (issue 13, item 12): the real app
 * (`startServer`) on 127.0.0.1, port 0, against the seeded database, and C clients in this
 * process, each asking for the leaderboard's first page (`GET /api/leaderboards/rows`, rows 0–100
 * with the row count, as the grid's first block) over HTTP, one request after another. A third of
 * the clients are visitors, a third researchers and a third maintainers, each signed in with a
 * session of their own through the real redirect chain (`signInAs`). Every level stops after a
 * fixed number of requests or seconds, whichever comes first. The clients share the server's
 * process, so their own work (fetch, JSON parsing) counts in the figures too.
 */
import { cpus, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import pino from 'pino';
import { Client } from 'pg';
import { startServer } from '../api/src/app';
import { loadConfig } from '../api/src/config';
import { CookieJar } from '../api/src/dev/cookie-jar';
import { DEMO_IDENTITIES } from '../api/src/dev/fake-oauth/demo-identities';
import { clientFor, signInAs, type SignedInClient } from '../api/src/dev/sign-in-as';
import { createLogger } from '../api/src/http/logger';

/** Options of one concurrent run. */
export interface LoadOptions {
  /** Client counts to measure, one level after another. */
  readonly levels: readonly number[];
  /** Timed requests per level (all clients together). */
  readonly requests: number;
  /** A level also stops after this many seconds. */
  readonly maxSeconds: number;
}

/** Figures of one level. */
export interface LoadLevel {
  readonly clients: number;
  readonly requests: number;
  readonly failed: number;
  readonly p50: number;
  readonly p95: number;
  readonly max: number;
  readonly p95ByViewer: Record<string, number>;
  readonly requestsPerS: number;
  readonly seconds: number;
  readonly loadAverage1m: readonly [number, number];
  /** CPU time per request of this process (server and clients), and of the whole machine (with PostgreSQL and other work). */
  readonly cpuMsPerRequest: { readonly process: number; readonly machine: number };
}

/** Busy (non-idle) CPU milliseconds of all cores since boot. */
function machineBusyMs(): number {
  return cpus().reduce((sum, c) => sum + c.times.user + c.times.nice + c.times.sys + c.times.irq, 0);
}

type Kind = 'visitor' | 'researcher' | 'maintainer';
const KINDS: readonly Kind[] = ['visitor', 'researcher', 'maintainer'];
/** The grid's first block of the default view, with its row count. */
const FIRST_PAGE = '/api/leaderboards/rows?start=0&end=100';

function quantile(sorted: readonly number[], q: number): number {
  return sorted.length === 0 ? NaN : sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)];
}
const ms = (x: number) => +x.toFixed(1);

/** Runs every level of `options` against the database at `url` and returns their figures. */
export async function runLoad(url: string, options: LoadOptions): Promise<LoadLevel[]> {
  // Loopback only; sign-ins of many clients would pass the default auth rate limit (60 per 15 min).
  const { config } = loadConfig({ HOST: '127.0.0.1', AUTH_RATE_LIMIT: '100000', LOG_LEVEL: 'info' });
  // The request log is written as in production (one JSON line per request), to /dev/null so it
  // neither floods the bench's output nor waits on a terminal.
  const logger = createLogger('info', pino.destination({ dest: '/dev/null', sync: true }));
  const server = await startServer({ config: { ...config, webDist: '/nonexistent' }, databaseUrl: url, port: 0, fakeOAuthPort: 0, logger });
  try {
    const [researcher, maintainer] = DEMO_IDENTITIES;
    const most = Math.max(...options.levels);
    const clients: { kind: Kind; client: SignedInClient }[] = [];
    for (let i = 0; i < most; i++) {
      const kind = KINDS[i % KINDS.length];
      const client = kind === 'visitor' ? clientFor(server.url, new CookieJar())
        : await signInAs(server.url, kind === 'researcher' ? researcher.login : maintainer.login);
      clients.push({ kind, client });
    }
    const admin = new Client({ connectionString: url });
    await admin.connect();
    await admin.query("UPDATE users SET role = 'maintainer' WHERE login = $1", [maintainer.login]);
    await admin.end();

    const levels: LoadLevel[] = [];
    for (const level of options.levels) {
      const active = clients.slice(0, level);
      // Warm-up, not timed: connections and JIT (the first few hundred requests are slower).
      let warm = Math.min(options.requests, 300);
      await Promise.all(active.map(async ({ client }) => {
        while (warm-- > 0) await (await client.request(FIRST_PAGE)).arrayBuffer();
      }));
      const times: number[] = [];
      const byKind: Record<Kind, number[]> = { visitor: [], researcher: [], maintainer: [] };
      let issued = 0;
      let failed = 0;
      const loadBefore = loadavg()[0];
      const cpuBefore = process.cpuUsage();
      const busyBefore = machineBusyMs();
      const started = performance.now();
      const deadline = started + options.maxSeconds * 1000;
      await Promise.all(active.map(async ({ kind, client }) => {
        while (issued < options.requests && performance.now() < deadline) {
          issued++;
          const t = performance.now();
          const res = await client.request(FIRST_PAGE);
          await res.arrayBuffer();
          const took = performance.now() - t;
          if (res.status !== 200) failed++;
          times.push(took);
          byKind[kind].push(took);
        }
      }));
      const seconds = (performance.now() - started) / 1000;
      const cpu = process.cpuUsage(cpuBefore);
      const busyMs = machineBusyMs() - busyBefore;
      times.sort((a, b) => a - b);
      for (const k of KINDS) byKind[k].sort((a, b) => a - b);
      const row: LoadLevel = {
        clients: level, requests: times.length, failed,
        p50: ms(quantile(times, 0.5)), p95: ms(quantile(times, 0.95)), max: ms(times[times.length - 1]),
        p95ByViewer: Object.fromEntries(KINDS.map((k) => [k, ms(quantile(byKind[k], 0.95))])),
        requestsPerS: +(times.length / seconds).toFixed(0), seconds: +seconds.toFixed(1),
        loadAverage1m: [+loadBefore.toFixed(1), +loadavg()[0].toFixed(1)],
        cpuMsPerRequest: { process: +((cpu.user + cpu.system) / 1000 / times.length).toFixed(2), machine: +(busyMs / times.length).toFixed(2) },
      };
      levels.push(row);
      console.log(`${level} clients: ${row.requests} requests (${failed} failed) in ${row.seconds} s, ${row.requestsPerS}/s; `
        + `p50 ${row.p50} ms, p95 ${row.p95} ms, max ${row.max} ms; p95 by viewer ${JSON.stringify(row.p95ByViewer)}; load ${row.loadAverage1m.join(' → ')}; `
        + `CPU ms per request: this process ${row.cpuMsPerRequest.process}, machine ${row.cpuMsPerRequest.machine}`);
    }
    return levels;
  } finally {
    await server.close();
  }
}
