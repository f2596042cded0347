/**
 * Field trials on stored results (issue 17, items 2–4): an upload (one or more runs attached
 * together, with the execution policy used, free-text notes and the simulation they are compared
 * with), its runs (one trial log each: the log as uploaded, gzipped, and the figures computed from
 * it), and named robot profiles (a profile fitted from trial logs, with the logs it came from).
 */
import type { Migration } from '../migration';

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`
    CREATE TABLE trial_uploads (
      id serial PRIMARY KEY,
      result_id integer NOT NULL REFERENCES results(id) ON DELETE CASCADE,
      owner_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      policy text NOT NULL CHECK (policy IN ('open-loop', 'lockstep', 'dependency-gated')),
      notes text NOT NULL DEFAULT '',
      simulation jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q('CREATE INDEX trial_uploads_result_idx ON trial_uploads (result_id, id)');
  await q(`
    CREATE TABLE trial_runs (
      id serial PRIMARY KEY,
      upload_id integer NOT NULL REFERENCES trial_uploads(id) ON DELETE CASCADE,
      result_id integer NOT NULL REFERENCES results(id) ON DELETE CASCADE,
      file_name text NOT NULL,
      format text NOT NULL CHECK (format IN ('csv', 'json')),
      row_count integer NOT NULL CHECK (row_count > 0),
      is_success boolean NOT NULL,
      collisions integer NOT NULL CHECK (collisions >= 0),
      realised_makespan_ms double precision,
      figures jsonb NOT NULL,
      log_gz bytea NOT NULL
    )`);
  await q('CREATE INDEX trial_runs_upload_idx ON trial_runs (upload_id, id)');
  await q('CREATE INDEX trial_runs_result_idx ON trial_runs (result_id)');
  await q(`
    CREATE TABLE robot_profiles (
      id serial PRIMARY KEY,
      owner_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      name varchar(100) NOT NULL,
      profile jsonb NOT NULL,
      provenance jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (owner_id, name)
    )`);
};

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE robot_profiles');
  await qi.sequelize.query('DROP TABLE trial_runs');
  await qi.sequelize.query('DROP TABLE trial_uploads');
};
