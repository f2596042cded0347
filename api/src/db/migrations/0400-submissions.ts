/**
 * Plan submissions: a plan computed elsewhere, accepted by the model's independent validator.
 * Only accepted plans are stored (a rejected plan answers its first violation and leaves no row);
 * the figures live in a `results` row whose `submission_id` points here.
 */
import type { Migration } from '../migration';

export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`CREATE TABLE submissions (
    id serial PRIMARY KEY,
    uploader_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
    instance_set_id integer NOT NULL REFERENCES instance_sets(id) ON DELETE CASCADE,
    scenario_id integer NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
    agents integer NOT NULL CHECK (agents > 0),
    model varchar(32) NOT NULL,
    params jsonb NOT NULL,
    solver_name varchar(120) NOT NULL,
    solver_version varchar(64) NOT NULL,
    format varchar(8) NOT NULL CHECK (format IN ('json', 'text')),
    created_at timestamptz NOT NULL DEFAULT now()
  )`);
  await qi.sequelize.query('CREATE INDEX submissions_uploader_created ON submissions (uploader_id, created_at DESC)');
};

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE IF EXISTS submissions');
};
