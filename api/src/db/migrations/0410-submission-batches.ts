/**
 * Batch submissions (issue 16, item 3): a batch of plans submitted at once, and one row per plan
 * with its outcome. A plan's text waits in `plan_gz` until it is checked and is dropped then (an
 * accepted plan lives on in its result's plan_gz). An accepted row points at its submission; the
 * submission, its result and this row's outcome are written in one transaction, so a plan is
 * either stored and marked accepted or not stored at all.
 */
import type { Migration } from '../migration';

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`
    CREATE TABLE submission_batches (
      id serial PRIMARY KEY,
      owner_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      source varchar(8) NOT NULL CHECK (source IN ('zip', 'json')),
      file_name varchar(255),
      status varchar(8) NOT NULL DEFAULT 'running' CHECK (status IN ('running', 'done')),
      total integer NOT NULL CHECK (total > 0),
      accepted integer NOT NULL DEFAULT 0 CHECK (accepted >= 0),
      refused integer NOT NULL DEFAULT 0 CHECK (refused >= 0),
      created_at timestamptz NOT NULL DEFAULT now(),
      finished_at timestamptz,
      CHECK (accepted + refused <= total)
    )`);
  await q('CREATE INDEX submission_batches_owner_created ON submission_batches (owner_id, created_at DESC)');
  await q(`
    CREATE TABLE submission_batch_entries (
      id serial PRIMARY KEY,
      batch_id integer NOT NULL REFERENCES submission_batches(id) ON DELETE CASCADE,
      position integer NOT NULL CHECK (position > 0),
      file varchar(300) NOT NULL,
      line integer NOT NULL CHECK (line >= 0),
      request jsonb NOT NULL,
      plan_gz bytea,
      status varchar(8) NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'accepted', 'refused')),
      submission_id integer REFERENCES submissions(id) ON DELETE SET NULL,
      refusal jsonb,
      finished_at timestamptz,
      UNIQUE (batch_id, position),
      CHECK (status = 'pending' OR plan_gz IS NULL),
      CHECK (status <> 'refused' OR refusal IS NOT NULL)
    )`);
  // The runner looks for the next pending plan of a batch.
  await q("CREATE INDEX submission_batch_entries_pending ON submission_batch_entries (batch_id, position) WHERE status = 'pending'");
};

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE IF EXISTS submission_batch_entries');
  await qi.sequelize.query('DROP TABLE IF EXISTS submission_batches');
};
