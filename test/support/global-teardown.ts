/** Stops and deletes the throwaway cluster that global-setup.ts started, if it started one. */
import { rmSync } from 'node:fs';
import type { PgCluster } from '../../scripts/postgres';

export default async function globalTeardown(): Promise<void> {
  const cluster = (globalThis as { __qtCluster?: PgCluster }).__qtCluster;
  if (!cluster) return;
  cluster.stop();
  rmSync(cluster.dataDir, { recursive: true, force: true });
}
