/**
 * Responsiveness during uploads (issue 13, item 1; target: GET /api/health under 100 ms p95 while a
 * maximal upload is checked and stored).
 *
 * Starts the app on a throwaway PostgreSQL cluster, on loopback only, with the storage quota raised
 * so maximal uploads are stored in full (the most work an upload can cause). A maximal upload is as
 * many 1024 × 1024 maps as UPLOAD_LIMITS.maxTotalBytes allows (63 maps, 63 MiB), sent as one
 * multipart body. Measures /api/health latency (a request every 20 ms, each a database round trip)
 *   - idle, as the baseline;
 *   - during each of `--rounds` (default 2) maximal uploads one after the other;
 *   - during `--parallel` (default 4) maximal uploads at once by two users (two each, the default
 *     UPLOADS_PER_USER), plus the process's peak resident memory meanwhile.
 * The client runs in the same process as the server, so its own work counts against the figures.
 * Bounded: a fixed number of uploads, health polling ends with them; prints a table and writes
 * benchmarks/results/upload.json. Noisy when others share the 2 cores: it prints the load average.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { Client } from 'pg';
import { CSRF_HEADER } from '../shared/auth';
import { UPLOAD_LIMITS } from '../shared/instance-sets';
import { startServer } from '../api/src/app';
import { loadConfig } from '../api/src/config';
import { migrate } from '../api/src/db/migrate';
import { DEMO_IDENTITIES } from '../api/src/dev/fake-oauth/demo-identities';
import { signInAs, type SignedInClient } from '../api/src/dev/sign-in-as';
import { startCluster } from '../scripts/postgres';
import { freePort } from '../test/support/free-port';

const HEALTH_EVERY_MS = 20;
const IDLE_SAMPLES = 100;
const BOUNDARY = 'qt-bench-boundary-5f1c9a';

/** One map file of `side` × `side` cells: free but for one wall per row. */
function squareMap(side: number): Buffer {
  const row = `${'.'.repeat(side - 1)}@\n`;
  return Buffer.from(`type octile\nheight ${side}\nwidth ${side}\nmap\n${row.repeat(side)}`);
}

/** A multipart body of as many 1024 × 1024 maps as one upload may carry, named `prefix-i.map`. */
function maximalBody(prefix: string): { body: Buffer; maps: number } {
  const map = squareMap(UPLOAD_LIMITS.maxMapSide);
  const maps = Math.floor(UPLOAD_LIMITS.maxTotalBytes / map.length);
  const parts: Buffer[] = [];
  for (let i = 0; i < maps; i++) {
    parts.push(Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="files"; filename="${prefix}-${i}.map"\r\nContent-Type: application/octet-stream\r\n\r\n`), map, Buffer.from('\r\n'));
  }
  parts.push(Buffer.from(`--${BOUNDARY}--\r\n`));
  return { body: Buffer.concat(parts), maps };
}

/** POSTs a raw multipart body as `client`; resolves with the status (0: the connection was reset) and the time taken. */
function postBody(url: string, client: SignedInClient, path: string, body: Buffer): Promise<{ status: number; ms: number }> {
  const began = performance.now();
  return new Promise((resolve) => {
    const req = httpRequest(url + path, {
      method: 'POST',
      headers: {
        cookie: client.jar.header(), [CSRF_HEADER]: client.csrfToken,
        'content-type': `multipart/form-data; boundary=${BOUNDARY}`, 'content-length': String(body.length),
      },
    }, (res) => {
      res.resume();
      res.on('end', () => resolve({ status: res.statusCode ?? 0, ms: performance.now() - began }));
    });
    req.on('error', () => resolve({ status: 0, ms: performance.now() - began }));
    req.end(body);
  });
}

async function createSet(client: SignedInClient, name: string): Promise<number> {
  const res = await client.request('/api/instance-sets', { method: 'POST', body: JSON.stringify({ name, visibility: 'private' }) });
  if (res.status !== 201) throw new Error(`create set: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { id: number }).id;
}

/** Health latencies (ms), one request every HEALTH_EVERY_MS until `until` settles or `count` were sent; failed requests count in `failures`. */
async function healthLatencies(url: string, until: Promise<unknown> | null, count = Infinity, failures = { n: 0 }): Promise<number[]> {
  let isDone = false;
  void until?.finally(() => {
    isDone = true;
  });
  const out: number[] = [];
  while (!isDone && out.length < count) {
    const began = performance.now();
    try {
      const res = await fetch(`${url}/api/health`);
      await res.arrayBuffer();
      if (res.status !== 200) failures.n++;
    } catch {
      failures.n++;
    }
    out.push(performance.now() - began);
    await new Promise((r) => setTimeout(r, HEALTH_EVERY_MS));
  }
  return out;
}

/** Peak resident memory (MB) sampled every 20 ms until `until` settles. */
async function peakRss(until: Promise<unknown>): Promise<number> {
  let isDone = false;
  void until.finally(() => {
    isDone = true;
  });
  let peak = 0;
  while (!isDone) {
    peak = Math.max(peak, process.memoryUsage().rss);
    await new Promise((r) => setTimeout(r, 20));
  }
  return peak / 1e6;
}

const quantile = (values: readonly number[], q: number): number => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
};

interface Row {
  readonly case: string;
  readonly samples: number;
  readonly p50: number;
  readonly p95: number;
  readonly max: number;
  readonly uploadSeconds?: number;
  readonly statuses?: readonly number[];
  readonly peakRssMb?: number;
  /** Health requests that failed (reset or not 200). */
  readonly failed?: number;
}

function row(name: string, latencies: readonly number[], extra: Partial<Row> = {}): Row {
  return { case: name, samples: latencies.length, p50: quantile(latencies, 0.5), p95: quantile(latencies, 0.95), max: Math.max(...latencies), ...extra };
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { rounds: { type: 'string', default: '2' }, parallel: { type: 'string', default: '4' } } });
  const rounds = Math.max(0, Math.min(5, Number(values.rounds)));
  const parallel = Math.max(0, Math.min(4, Number(values.parallel)));
  const dir = mkdtempSync(join(tmpdir(), 'qt-bench-upload-'));
  const cluster = startCluster(dir, await freePort(), { isThrowaway: true, log: () => undefined });
  const load = [loadavg()[0]];
  try {
    const admin = new Client({ connectionString: cluster.adminUrl });
    await admin.connect();
    await admin.query('CREATE DATABASE qt_bench');
    await admin.end();
    const databaseUrl = cluster.urlFor('qt_bench');
    await migrate(databaseUrl);
    // Quotas far above what the bench stores, so every maximal upload is stored in full.
    const big = String(Number.MAX_SAFE_INTEGER);
    const config = { ...loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', HOST: '127.0.0.1', QUOTA_FILES: big, QUOTA_CELLS: big, QUOTA_BYTES: big }).config, webDist: '/nonexistent' };
    const server = await startServer({ config, databaseUrl, port: 0, fakeOAuthPort: 0 });
    const rows: Row[] = [];
    try {
      const url = server.url;
      const [alice, bob] = await Promise.all([signInAs(url, DEMO_IDENTITIES[0].login), signInAs(url, DEMO_IDENTITIES[1].login)]);
      // Load the pool thread first (as npm start does at start-up), so the figures are not its start-up.
      const warmSet = await createSet(alice, 'warm-up');
      await postBody(url, alice, `/api/instance-sets/${warmSet}/files`, Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="files"; filename="w.map"\r\n\r\n${squareMap(8).toString()}\r\n--${BOUNDARY}--\r\n`));

      rows.push(row('idle', await healthLatencies(url, null, IDLE_SAMPLES)));

      const { body, maps } = maximalBody('m');
      console.log(`maximal upload: ${maps} maps of 1024 × 1024, ${(body.length / 2 ** 20).toFixed(1)} MiB`);
      for (let i = 0; i < rounds; i++) {
        const setId = await createSet(alice, `round ${i}`);
        const upload = postBody(url, alice, `/api/instance-sets/${setId}/files`, body);
        const failures = { n: 0 };
        const latencies = await healthLatencies(url, upload, Infinity, failures);
        const done = await upload;
        rows.push(row(`one maximal upload (${i + 1})`, latencies, { uploadSeconds: done.ms / 1000, statuses: [done.status], failed: failures.n }));
      }

      if (parallel > 0) {
        const sets = await Promise.all(Array.from({ length: parallel }, (_, i) => createSet(i % 2 === 0 ? alice : bob, `parallel ${i}`)));
        const began = performance.now();
        const uploads = Promise.all(sets.map((setId, i) => postBody(url, i % 2 === 0 ? alice : bob, `/api/instance-sets/${setId}/files`, body)));
        const failures = { n: 0 };
        const [latencies, peak] = await Promise.all([healthLatencies(url, uploads, Infinity, failures), peakRss(uploads)]);
        const done = await uploads;
        rows.push(row(`${parallel} maximal uploads at once (2 users)`, latencies, {
          uploadSeconds: (performance.now() - began) / 1000, statuses: done.map((d) => d.status), peakRssMb: peak, failed: failures.n,
        }));
      }
    } finally {
      await server.close();
    }
    load.push(loadavg()[0]);
    console.log(`\n/api/health latency, ms (one request every ${HEALTH_EVERY_MS} ms; load average ${load[0].toFixed(1)} before, ${load[1].toFixed(1)} after)`);
    console.log('case                                   | samples | failed |  p50 |  p95 |  max | upload s | statuses (0 = reset) | peak RSS MB');
    for (const r of rows) {
      console.log(`${r.case.padEnd(38)} | ${String(r.samples).padStart(7)} | ${String(r.failed ?? 0).padStart(6)} | ${r.p50.toFixed(0).padStart(4)} | ${r.p95.toFixed(0).padStart(4)} | ${r.max.toFixed(0).padStart(4)} | `
        + `${(r.uploadSeconds?.toFixed(1) ?? '').padStart(8)} | ${(r.statuses?.join(' ') ?? '').padEnd(20)} | ${r.peakRssMb?.toFixed(0) ?? ''}`);
    }
    mkdirSync(join(__dirname, 'results'), { recursive: true });
    writeFileSync(join(__dirname, 'results/upload.json'), JSON.stringify({ loadAverage: load, rows }, null, 2));
  } finally {
    cluster.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

main().then(() => process.exit(0), (err: unknown) => {
  console.error(err);
  process.exit(1);
});
