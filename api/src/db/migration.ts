/** The type every file in db/migrations/ exports as `up` and `down`. */
import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

/** One direction of a migration; `context` is Sequelize's QueryInterface. */
export type Migration = MigrationFn<QueryInterface>;
