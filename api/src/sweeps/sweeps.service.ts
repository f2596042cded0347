/**
 * Sweeps: preview (size before launch), launch (sweep, runs and their jobs in ONE transaction,
 * so a crash can leave neither runs without jobs nor jobs without runs), list, detail, results
 * and cancel. Throws AppError for the client's mistakes.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import { hasRole } from '@shared/auth';
import { solverKey, type SolverRef } from '@shared/external-solvers';
import { isSweepOver, type SweepDetail, type SweepListResponse, type SweepPreviewResponse, type SweepResultRow, type SweepStatus, type SweepSummary } from '@shared/runs';
import { checkSweepSize, expandSweep, runParameters, SweepDefinitionSchema, sweepSize, type ScenarioCapacity, type SweepDefinition } from '@shared/sweeps';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { isSetVisible } from '../instance-sets/instance-set-access';
import { SWEEP_CANCEL_CHANNEL } from '../workers/sweep-channels';
import { externalJobLimitMs, externalRunQueue, RUN_QUEUE, runJob, sendRunJobs } from '../workers/sweep-queue';
import { findExternalSolver } from '../external-solvers/external-solvers.service';
import { parameterHash } from './parameter-hash';
import { toAccount } from '../users/account';
import { canSeeSweep, visibleSweepsCondition } from './sweep-access';
import { readProgress, readResultRows } from './sweep-progress';

/** The service behind /api/sweeps. */
export interface SweepsService {
  preview(viewer: Express.User, body: unknown): Promise<SweepPreviewResponse>;
  launch(viewer: Express.User, body: unknown): Promise<SweepDetail>;
  list(viewer: Express.User): Promise<SweepListResponse>;
  get(viewer: Express.User, id: number): Promise<SweepDetail>;
  results(viewer: Express.User, id: number): Promise<SweepResultRow[]>;
  cancel(viewer: Express.User, id: number): Promise<SweepDetail>;
  /** Throws 404 unless `viewer` may see sweep `id`. */
  assertVisible(viewer: Express.User, id: number): Promise<void>;
  /** Which of the accounts `userIds` may see sweep `id` now (roles read afresh; for live streams). */
  allowedViewers(id: number, userIds: readonly number[]): Promise<Set<number>>;
  count(viewer: Express.User | null): Promise<number>;
}

/** Dependencies of the service. */
export interface SweepsDeps {
  readonly sequelize: Sequelize;
  readonly models: Models;
  /** The started job queue (lazily, on first launch or cancel). */
  readonly boss: () => Promise<PgBoss>;
  readonly jobExpiryMarginSeconds: number;
}

/** Builds the service. */
export function createSweepsService(deps: SweepsDeps): SweepsService {
  const { sequelize, models } = deps;

  async function scenariosOf(viewer: Express.User, def: SweepDefinition): Promise<(ScenarioCapacity & { mapId: number })[]> {
    const set = await models.InstanceSet.findByPk(def.instances.instanceSetId, { attributes: ['id', 'ownerId', 'visibility'] });
    if (!set || !isSetVisible(set, viewer)) throw new AppError('INSTANCE_SET_NOT_FOUND', 404, `No instance set ${def.instances.instanceSetId}`);
    const rows = await models.ScenarioFile.findAll({ where: { instanceSetId: set.id }, attributes: ['id', 'mapId', 'maxAgents'], order: [['id', 'ASC']] });
    const known = new Set(rows.map((r) => r.id));
    const unknown = (def.instances.scenarioIds ?? []).filter((id) => !known.has(id));
    if (unknown.length > 0) {
      throw new AppError('VALIDATION_FAILED', 400, `Scenario ${unknown.join(', ')} is not in instance set ${set.id}`, [{ path: ['instances', 'scenarioIds'], message: 'unknown scenario' }]);
    }
    return rows.map((r) => ({ id: r.id, mapId: r.mapId, maxAgents: r.maxAgents }));
  }

  /** Every external solver the definition names must be registered for its spec's plan model. */
  async function checkExternalSolvers(def: SweepDefinition): Promise<void> {
    for (const [index, m] of def.models.entries()) {
      if (!m.externalSolver) continue;
      const registration = await findExternalSolver(sequelize, m.externalSolver);
      const key = solverKey(m.externalSolver);
      if (!registration) {
        throw new AppError('VALIDATION_FAILED', 400, `models[${index}]: no external solver ${key} is registered`, [{ path: ['models', index, 'externalSolver'], message: `no external solver ${key} is registered` }]);
      }
      if (!registration.models.includes(m.model)) {
        const message = `${key} is registered for ${registration.models.join(', ')}, not ${m.model}`;
        throw new AppError('VALIDATION_FAILED', 400, `models[${index}]: ${message}`, [{ path: ['models', index, 'model'], message }]);
      }
    }
  }

  async function summaryRows(where: string, replacements: Record<string, unknown>): Promise<SweepSummary[]> {
    const rows = await sequelize.query<{ id: number; name: string; owner_id: number; login: string; status: SweepStatus; run_count: number; done: string; created_at: Date; finished_at: Date | null }>(
      `SELECT s.id, s.name, s.owner_id, u.login, s.status, s.run_count, s.created_at, s.finished_at,
         (SELECT count(*) FROM runs r WHERE r.sweep_id = s.id AND r.status NOT IN ('pending', 'running')) AS done
       FROM sweeps s JOIN users u ON u.id = s.owner_id WHERE ${where} ORDER BY s.created_at DESC, s.id DESC LIMIT 200`,
      { replacements, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({
      id: r.id, name: r.name, owner: { id: r.owner_id, login: r.login }, status: r.status, total: r.run_count, done: Number(r.done),
      createdAt: r.created_at.toISOString(), finishedAt: r.finished_at?.toISOString() ?? null,
    }));
  }

  /** The sweep's instance set as the access rule needs it; null when the set is gone. */
  const setOf = (sweep: { definition: SweepDefinition }) =>
    models.InstanceSet.findByPk(sweep.definition.instances.instanceSetId, { attributes: ['id', 'ownerId', 'visibility'] });

  async function visibleSweep(viewer: Express.User, id: number) {
    const sweep = Number.isInteger(id) ? await models.Sweep.findByPk(id) : null;
    if (!sweep || !canSeeSweep(sweep, await setOf(sweep), viewer)) throw new AppError('SWEEP_NOT_FOUND', 404, `No sweep ${id}`);
    return sweep;
  }

  async function detail(viewer: Express.User, id: number): Promise<SweepDetail> {
    const sweep = await visibleSweep(viewer, id);
    const [summary] = await summaryRows('s.id = :id', { id });
    const progress = await readProgress(sequelize, id);
    if (!summary || !progress) throw new AppError('SWEEP_NOT_FOUND', 404, `No sweep ${id}`);
    return { ...summary, definition: sweep.definition, progress, canCancel: !isSweepOver(summary.status) };
  }

  return {
    async preview(viewer, body) {
      const def = validate(SweepDefinitionSchema, body);
      const size = sweepSize(def, await scenariosOf(viewer, def));
      return { size, refusal: checkSweepSize(size) };
    },

    async launch(viewer, body) {
      if (!hasRole(viewer.role, 'maintainer')) throw new AppError('FORBIDDEN', 403, `Launching sweeps needs the maintainer role; your account is ${viewer.role}.`);
      const def = validate(SweepDefinitionSchema, body);
      const scenarios = await scenariosOf(viewer, def);
      const refusal = checkSweepSize(sweepSize(def, scenarios));
      if (refusal) throw new AppError('SWEEP_TOO_LARGE', 400, refusal);
      await checkExternalSolvers(def);
      const mapOf = new Map(scenarios.map((s) => [s.id, s.mapId]));
      const specs = expandSweep(def, scenarios);
      const boss = await deps.boss();
      // An external solver's runs go to its own queue (only workers declaring it take them); it must exist before jobs enter it.
      const queues = def.models.map((m) => (m.externalSolver ? externalRunQueue(m.externalSolver) : RUN_QUEUE));
      for (const q of new Set(queues)) if (q !== RUN_QUEUE) await boss.createQueue(q);
      const id = await sequelize.transaction(async (transaction) => {
        const sweep = await models.Sweep.create({ ownerId: viewer.id, name: def.name, definition: def, runCount: specs.length }, { transaction });
        const params = def.models.map((_, i) => runParameters(def, i));
        const hashes = params.map(parameterHash);
        const jobs = [];
        for (let i = 0; i < specs.length; i += 1000) {
          const chunk = specs.slice(i, i + 1000);
          const values = chunk.map((s) => ({
            sweepId: sweep.id, setId: def.instances.instanceSetId, mapId: mapOf.get(s.scenarioId), scenarioId: s.scenarioId, agents: s.agents,
            model: s.model, modelIndex: s.modelIndex, params: params[s.modelIndex], paramHash: hashes[s.modelIndex], seed: s.seed,
          }));
          const inserted = await sequelize.query<{ id: number }>(
            `INSERT INTO runs (sweep_id, instance_set_id, map_id, scenario_id, agents, model, model_index, params, param_hash, seed)
             SELECT * FROM json_to_recordset(:rows) AS x("sweepId" int, "setId" int, "mapId" int, "scenarioId" int, agents int, model varchar,
               "modelIndex" int, params jsonb, "paramHash" char(16), seed bigint)
             RETURNING id`,
            { replacements: { rows: JSON.stringify(values) }, transaction, type: QueryTypes.SELECT },
          );
          jobs.push(...inserted.map((r, j) => {
            const queue = queues[chunk[j].modelIndex];
            // An external run also reads, checks and replays the plan after its process (its own limit): its job expires that much later.
            const limitMs = queue === RUN_QUEUE ? def.timeLimitMs : externalJobLimitMs(def.timeLimitMs);
            return runJob({ runId: r.id, sweepId: sweep.id }, limitMs, deps.jobExpiryMarginSeconds, queue);
          }));
        }
        await sequelize.query(
          'UPDATE runs SET job_id = x.job::uuid FROM json_to_recordset(:rows) AS x(run int, job text) WHERE runs.id = x.run',
          { replacements: { rows: JSON.stringify(jobs.map((j) => ({ run: j.data.runId, job: j.id }))) }, transaction },
        );
        // pg-boss writes its jobs on this transaction's own connection, so they exist exactly when the runs do.
        // (Raw pg rather than Sequelize's bind, which refuses the undefined defaults pg-boss passes.)
        const connection = (transaction as unknown as { connection: pg.ClientBase }).connection;
        await sendRunJobs(boss, jobs, { executeSql: (text, values) => connection.query(text, values) });
        return sweep.id;
      });
      return detail(viewer, id);
    },

    async list(viewer) {
      const visible = visibleSweepsCondition(viewer);
      return { items: await summaryRows(visible.sql, visible.replacements) };
    },

    get: detail,

    async results(viewer, id) {
      await visibleSweep(viewer, id);
      return readResultRows(sequelize, id);
    },

    async cancel(viewer, id) {
      await visibleSweep(viewer, id);
      const jobIds = await sequelize.transaction(async (transaction) => {
        const locked = await sequelize.query<{ status: SweepStatus }>('SELECT status FROM sweeps WHERE id = :id FOR UPDATE', { replacements: { id }, transaction, type: QueryTypes.SELECT });
        if (!locked[0] || isSweepOver(locked[0].status)) throw new AppError('CONFLICT', 409, `Sweep ${id} is already over.`);
        const open = await sequelize.query<{ job_id: string | null; solver: SolverRef | null }>(
          `UPDATE runs SET status = 'cancelled', finished_at = now(), reason = 'sweep cancelled' WHERE sweep_id = :id AND status IN ('pending', 'running')
           RETURNING job_id, params->'model'->'externalSolver' AS solver`,
          { replacements: { id }, transaction, type: QueryTypes.SELECT },
        );
        const counts = await sequelize.query<{ status: string; n: string }>('SELECT status, count(*) AS n FROM runs WHERE sweep_id = :id GROUP BY status', { replacements: { id }, transaction, type: QueryTypes.SELECT });
        await sequelize.query(
          "UPDATE sweeps SET status = 'cancelled', finished_at = now(), updated_at = now(), counts = :counts WHERE id = :id",
          { replacements: { id, counts: JSON.stringify(Object.fromEntries(counts.map((c) => [c.status, Number(c.n)]))) }, transaction },
        );
        // Workers abort the sweep's running tasks; the SSE stream shows the final state (both on commit).
        await sequelize.query('SELECT pg_notify(:ch, :p)', { replacements: { ch: SWEEP_CANCEL_CHANNEL, p: JSON.stringify({ sweepId: id }) }, transaction });
        await sequelize.query("SELECT pg_notify('qt_sweep_events', :p)", { replacements: { p: JSON.stringify({ sweepId: id, isSweepOver: true }) }, transaction });
        // Job ids per queue: built-in runs' and each external solver's.
        const byQueue = new Map<string, string[]>();
        for (const r of open) {
          if (r.job_id === null) continue;
          const queue = r.solver ? externalRunQueue(r.solver) : RUN_QUEUE;
          byQueue.set(queue, [...(byQueue.get(queue) ?? []), r.job_id]);
        }
        return byQueue;
      });
      // Pending jobs leave the queue; a worker that already fetched one finds its run cancelled and
      // skips it; a running external process is killed by its worker on the cancel notice.
      const boss = await deps.boss();
      for (const [queue, ids] of jobIds) {
        for (let i = 0; i < ids.length; i += 500) await boss.cancel(queue, ids.slice(i, i + 500));
      }
      return detail(viewer, id);
    },

    async assertVisible(viewer, id) {
      await visibleSweep(viewer, id);
    },

    async allowedViewers(id, userIds) {
      const allowed = new Set<number>();
      const sweep = userIds.length > 0 ? await models.Sweep.findByPk(id, { attributes: ['id', 'ownerId', 'definition'] }) : null;
      if (!sweep) return allowed;
      const set = await setOf(sweep);
      for (const user of await models.User.findAll({ where: { id: [...userIds] } })) {
        if (canSeeSweep(sweep, set, toAccount(user))) allowed.add(user.id);
      }
      return allowed;
    },

    async count(viewer) {
      if (!viewer) return 0;
      const visible = visibleSweepsCondition(viewer);
      const [row] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM sweeps s WHERE ${visible.sql}`, { replacements: visible.replacements, type: QueryTypes.SELECT });
      return Number(row?.n ?? 0);
    },
  };
}
