import { Client } from 'pg';
import { createTestDatabase, type TestDatabase } from '../../../test/support/test-database';
import { createMigrator, listMigrations, migrate } from './migrate';
import { createSequelize } from './sequelize';

describe('migrate', () => {
  let db: TestDatabase;
  beforeAll(async () => {
    db = await createTestDatabase({ migrate: false });
  });
  afterAll(() => db.drop());

  async function tables(): Promise<string[]> {
    const c = new Client({ connectionString: db.url });
    await c.connect();
    try {
      const r = await c.query<{ tablename: string }>("SELECT tablename FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename");
      return r.rows.map((x) => x.tablename);
    } finally {
      await c.end();
    }
  }

  it('lists the numbered migration files in order and skips specs', () => {
    const names = listMigrations().map((m) => m.name);
    expect(names.slice(0, 2)).toEqual(['0001-users', '0002-session']);
    expect([...names].sort()).toEqual(names);
  });

  it('creates users, session and the bookkeeping table, and is idempotent when run concurrently', async () => {
    await Promise.all([migrate(db.url), migrate(db.url)]);
    await migrate(db.url);
    expect(await tables()).toEqual(expect.arrayContaining(['schema_migrations', 'session', 'users']));
  });

  it('can step every migration down and up again', async () => {
    const sequelize = createSequelize(db.url, { poolMax: 2 });
    try {
      const migrator = createMigrator(sequelize);
      await migrator.down({ to: 0 });
      expect(await tables()).toEqual(['schema_migrations']);
      await migrator.up();
      expect(await tables()).toEqual(expect.arrayContaining(['session', 'users']));
    } finally {
      await sequelize.close();
    }
  });

  it('enforces unique logins and the role enum in the schema', async () => {
    const c = new Client({ connectionString: db.url });
    await c.connect();
    try {
      await c.query("INSERT INTO users (provider, provider_id, login, display_name) VALUES ('fake', '1', 'ann', 'Ann')");
      await expect(c.query("INSERT INTO users (provider, provider_id, login, display_name) VALUES ('fake', '2', 'ann', 'Ann B')")).rejects.toThrow(/unique/i);
      await expect(c.query("INSERT INTO users (provider, provider_id, login, display_name, role) VALUES ('fake', '3', 'bo', 'Bo', 'owner')")).rejects.toThrow(/enum/i);
      const row = await c.query("SELECT role, is_email_on FROM users WHERE login = 'ann'");
      expect(row.rows[0]).toEqual({ role: 'researcher', is_email_on: true });
    } finally {
      await c.end();
    }
  });
});
