/** The express-session store table, in the layout connect-pg-simple 10 expects (its table.sql). */
import type { Migration } from '../migration';

/** Creates the session table and its expiry index. */
export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE TABLE "session" (
      "sid" varchar NOT NULL COLLATE "default",
      "sess" json NOT NULL,
      "expire" timestamp(6) NOT NULL,
      CONSTRAINT "session_pkey" PRIMARY KEY ("sid")
    )`);
  await qi.sequelize.query('CREATE INDEX "IDX_session_expire" ON "session" ("expire")');
};

/** Drops the session table. */
export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('session');
};
