/**
 * Runs the numbered migrations in db/migrations/ with umzug. A PostgreSQL advisory lock
 * serialises concurrent callers (the web process and a worker starting together), and the
 * applied names are kept in the `schema_migrations` table.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type RunnableMigration } from 'umzug';
import { createSequelize } from './sequelize';
import type { Migration } from './migration';

const MIGRATIONS_DIR = join(__dirname, 'migrations');
/** Migration files are `NNNN-name.ts` (or .js once compiled); specs and declarations are skipped. */
const MIGRATION_FILE = /^\d{4}-[a-z0-9-]+\.(ts|js)$/;
/** Arbitrary constant key of the advisory lock (common practice: one fixed bigint per purpose). */
const LOCK_KEY = 7_105_330_001;

interface MigrationModule {
  readonly up: Migration;
  readonly down?: Migration;
}

/** The migrations on disk, in file-name order. */
export function listMigrations(): RunnableMigration<QueryInterface>[] {
  return readdirSync(MIGRATIONS_DIR)
    .filter((f) => MIGRATION_FILE.test(f))
    .sort()
    .map((file) => {
      const name = file.replace(/\.(ts|js)$/, '');
      const path = join(MIGRATIONS_DIR, file);
      // Loaded lazily so a broken migration only fails when it is due.
      const load = () => require(path) as MigrationModule;
      return {
        name,
        path,
        up: (params) => load().up(params),
        down: (params) => {
          const down = load().down;
          if (!down) throw new Error(`Migration ${name} has no down step`);
          return down(params);
        },
      };
    });
}

/** An umzug instance over an open Sequelize (for tests that step migrations up and down). */
export function createMigrator(sequelize: Sequelize): Umzug<QueryInterface> {
  return new Umzug({
    migrations: listMigrations(),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/** Applies every pending migration to the database at `databaseUrl`. */
export async function migrate(databaseUrl: string): Promise<void> {
  const sequelize = createSequelize(databaseUrl, { poolMax: 2 });
  try {
    await sequelize.transaction(async (t) => {
      // Transaction-scoped lock: released on commit or rollback, even if this process dies.
      await sequelize.query('SELECT pg_advisory_xact_lock(:key)', { replacements: { key: LOCK_KEY }, transaction: t });
      await createMigrator(sequelize).up();
    });
  } finally {
    await sequelize.close();
  }
}
