/** Opens the Sequelize connection pool of one process. */
import { Sequelize } from 'sequelize';
import pg from 'pg';

/** A Sequelize instance on `databaseUrl` (PostgreSQL, snake_case columns, no query logging). */
export function createSequelize(databaseUrl: string, options: { readonly poolMax?: number } = {}): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    // Passing the module explicitly keeps Sequelize from resolving `pg` on its own, which fails under some bundlers.
    dialectModule: pg,
    logging: false,
    define: { underscored: true },
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000 },
  });
}
