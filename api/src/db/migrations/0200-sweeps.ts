/**
 * Sweeps, their runs, the results they produce and the execution replays of each result.
 * Results keep their figures in typed columns (leaderboards sort and filter in SQL) and the plan
 * as gzip-compressed JSON. Exactly-once writing rests on two unique keys: a run is unique on
 * (sweep, scenario, agents, model, parameter hash, seed), and so is a sweep's result, so a job
 * retried after its worker died inserts with ON CONFLICT DO NOTHING and writes once.
 */
import type { Migration } from '../migration';

const RUN_STATUSES = "'pending','running','solved','infeasible','timeout','memory','error','cancelled'";
const OUTCOMES = "'solved','infeasible','timeout','memory','error'";

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE sweeps (
    id serial PRIMARY KEY,
    owner_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
    name varchar(120) NOT NULL,
    definition jsonb NOT NULL,
    status varchar(16) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued','running','finished','failed','cancelled')),
    run_count integer NOT NULL DEFAULT 0,
    -- Final counts by status, written when the sweep is over (live counts come from runs).
    counts jsonb,
    created_at timestamptz NOT NULL DEFAULT now(),
    started_at timestamptz,
    finished_at timestamptz,
    -- Set once the finish e-mail went out (or was skipped), so it is sent at most once.
    notified_at timestamptz,
    updated_at timestamptz NOT NULL DEFAULT now()
  )`);
  await q('CREATE INDEX sweeps_owner_created ON sweeps (owner_id, created_at DESC)');
  await q('CREATE INDEX sweeps_status ON sweeps (status)');

  await q(`CREATE TABLE runs (
    id serial PRIMARY KEY,
    sweep_id integer NOT NULL REFERENCES sweeps(id) ON DELETE CASCADE,
    instance_set_id integer NOT NULL REFERENCES instance_sets(id) ON DELETE CASCADE,
    map_id integer NOT NULL REFERENCES maps(id) ON DELETE CASCADE,
    scenario_id integer NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
    agents integer NOT NULL CHECK (agents > 0),
    model varchar(32) NOT NULL,
    model_index integer NOT NULL,
    params jsonb NOT NULL,
    param_hash char(16) NOT NULL,
    seed bigint NOT NULL,
    status varchar(16) NOT NULL DEFAULT 'pending' CHECK (status IN (${RUN_STATUSES})),
    reason text,
    attempts integer NOT NULL DEFAULT 0,
    worker varchar(200),
    -- The pg-boss job that carries this run (ids are chosen by us so a cancel can name them).
    job_id uuid,
    started_at timestamptz,
    finished_at timestamptz,
    -- Wall time of the whole task in the worker (solve + validation + replay), ms.
    elapsed_ms double precision,
    created_at timestamptz NOT NULL DEFAULT now()
  )`);
  await q('CREATE UNIQUE INDEX runs_identity ON runs (sweep_id, scenario_id, agents, model, param_hash, seed)');
  await q('CREATE INDEX runs_sweep_status ON runs (sweep_id, status)');

  await q(`CREATE TABLE results (
    id serial PRIMARY KEY,
    run_id integer REFERENCES runs(id) ON DELETE CASCADE,
    sweep_id integer REFERENCES sweeps(id) ON DELETE CASCADE,
    -- Set by plan submissions (a later feature) instead of run/sweep.
    submission_id integer,
    instance_set_id integer NOT NULL REFERENCES instance_sets(id) ON DELETE CASCADE,
    map_id integer NOT NULL REFERENCES maps(id) ON DELETE CASCADE,
    scenario_id integer NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
    agents integer NOT NULL,
    model varchar(32) NOT NULL,
    params jsonb NOT NULL,
    param_hash char(16) NOT NULL,
    seed bigint NOT NULL,
    status varchar(16) NOT NULL CHECK (status IN (${OUTCOMES})),
    reason text,
    soc double precision,
    makespan double precision,
    turn_inclusive_soc_ms double precision,
    turn_inclusive_makespan_ms double precision,
    lower_bound double precision,
    runtime_ms double precision,
    nodes integer,
    nodes_expanded integer,
    turns integer,
    robot_profile jsonb NOT NULL,
    robot_profile_hash char(16) NOT NULL,
    solver_version varchar(64) NOT NULL,
    solver_commit varchar(64) NOT NULL,
    node_version varchar(32) NOT NULL,
    cpu_model varchar(200) NOT NULL,
    thread_count integer NOT NULL,
    plan_gz bytea,
    created_at timestamptz NOT NULL DEFAULT now()
  )`);
  await q('CREATE UNIQUE INDEX results_sweep_identity ON results (sweep_id, scenario_id, agents, model, param_hash, seed) WHERE sweep_id IS NOT NULL');
  await q('CREATE UNIQUE INDEX results_run ON results (run_id) WHERE run_id IS NOT NULL');
  // Leaderboards: per instance and model, by status, sorted by SOC or runtime.
  await q('CREATE INDEX results_instance_model ON results (scenario_id, agents, model, status)');
  await q('CREATE INDEX results_model_status ON results (model, status, soc)');
  await q('CREATE INDEX results_map ON results (map_id)');

  await q(`CREATE TABLE executions (
    id serial PRIMARY KEY,
    result_id integer NOT NULL REFERENCES results(id) ON DELETE CASCADE,
    policy varchar(32) NOT NULL,
    noise jsonb NOT NULL,
    runs integer NOT NULL,
    success_rate double precision NOT NULL,
    collisions_mean double precision NOT NULL,
    realised_makespan_mean_ms double precision,
    realised_makespan_p95_ms double precision,
    finish_spread_mean_ms double precision,
    metrics jsonb NOT NULL,
    created_at timestamptz NOT NULL DEFAULT now()
  )`);
  await q('CREATE UNIQUE INDEX executions_result_policy ON executions (result_id, policy)');
  await q('CREATE INDEX executions_policy ON executions (policy, success_rate)');
};

export const down: Migration = async ({ context: qi }) => {
  for (const t of ['executions', 'results', 'runs', 'sweeps']) await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
};
