/**
 * A fresh, migrated database per test suite inside the run's throwaway cluster, so suites
 * running in parallel never see each other's rows. Call `drop()` in afterAll.
 */
import { randomBytes } from 'node:crypto';
import { Client } from 'pg';
import { migrate } from '../../api/src/db/migrate';

/** A database created for one suite. */
export interface TestDatabase {
  readonly url: string;
  readonly name: string;
  drop(): Promise<void>;
}

function adminUrl(): string {
  const url = process.env.QT_TEST_PG_ADMIN_URL;
  if (!url) throw new Error('QT_TEST_PG_ADMIN_URL is not set: run the tests through jest (its global setup starts PostgreSQL).');
  return url;
}

async function admin<T>(fn: (c: Client) => Promise<T>): Promise<T> {
  const client = new Client({ connectionString: adminUrl() });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

/** Creates an empty database, runs every migration on it and returns its URL. */
export async function createTestDatabase(options: { readonly migrate?: boolean } = {}): Promise<TestDatabase> {
  const name = `qt_test_${process.pid}_${randomBytes(4).toString('hex')}`;
  await admin((c) => c.query(`CREATE DATABASE ${name}`));
  const url = adminUrl().replace(/\/[^/]*$/, `/${name}`);
  if (options.migrate !== false) await migrate(url);
  return {
    url,
    name,
    drop: () => admin(async (c) => {
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    }),
  };
}
