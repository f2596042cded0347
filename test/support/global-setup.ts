/**
 * Starts one throwaway PostgreSQL cluster for the whole Jest run (unless QT_TEST_PG_ADMIN_URL
 * already points at one) and publishes its admin URL through the environment, which the
 * test workers inherit. Each suite then creates its own database (see test-database.ts).
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startCluster } from '../../scripts/postgres';
import { freePort } from './free-port';

export default async function globalSetup(): Promise<void> {
  if (process.env.QT_TEST_PG_ADMIN_URL) return;
  const dataDir = mkdtempSync(join(tmpdir(), 'qt-test-pg-'));
  const port = await freePort();
  const cluster = startCluster(dataDir, port, { isThrowaway: true });
  process.env.QT_TEST_PG_ADMIN_URL = cluster.adminUrl;
  process.env.QT_TEST_PG_DATA = dataDir;
  (globalThis as { __qtCluster?: typeof cluster }).__qtCluster = cluster;
}
