/**
 * Batch submissions (issue 16, item 3): a batch is read and checked as a whole up front
 * (read-batch.ts), stored with one pending row per plan, answered 202, and then checked plan by
 * plan in the background through the same judge-and-store path as a single submission
 * (submissions.service.ts), one plan at a time per batch in the interactive pool under its owner's
 * turn (so a batch never holds more than one of the pool's threads). Each plan is stored and
 * marked accepted in one transaction, or marked refused with its first violation or reading
 * problem and nothing stored. A batch whose process ended resumes when the app starts again
 * (`resumeUnfinished`) or when its owner next looks at it, whichever comes first.
 */
import { gunzipSync, gzipSync } from 'node:zlib';
import { setTimeout as sleep } from 'node:timers/promises';
import { QueryTypes, type Sequelize } from 'sequelize';
import { ZodError } from 'zod';
import type { Logger } from 'pino';
import { SubmissionRequestSchema, type SubmissionRequest } from '@shared/plan-format';
import { BATCH_LIMITS, type BatchInstance, type BatchPlanRequest } from '@shared/submission-batch-format';
import {
  TOO_MANY_BATCHES, type BatchEntryRefusal, type BatchEntryView, type SubmissionBatchListResponse, type SubmissionBatchSummary,
  type SubmissionBatchView,
} from '@shared/submission-batches';
import { PLAN_REJECTED, type PlanFileProblem, type SubmissionViolation } from '@shared/submissions';
import { AppError } from '../errors/app-error';
import { visibleSetsCondition } from '../instance-sets/instance-set-access';
import { toAccount } from '../users/account';
import type { UsersService } from '../users/users.service';
import { isConnectionError } from '../workers/with-db-retry';
import { INTERACTIVE_ERROR_CODES } from '../workers/interactive-pool';
import type { ReadBatch } from './read-batch';
import { readPlanFile } from './read-plan-file';
import type { SubmissionsService } from './submissions.service';

/** The batch service. */
export interface SubmissionBatchesService {
  /** Stores a batch read up front and starts checking it; answers its summary (429 when the owner has too many running). */
  create(owner: Express.User, batch: ReadBatch): Promise<SubmissionBatchSummary>;
  /** The batch with its per-plan outcomes (404 BATCH_NOT_FOUND unless `viewer` owns it). */
  get(viewer: Express.User, id: number): Promise<SubmissionBatchView>;
  /** The viewer's batches, newest first (at most 50). */
  list(viewer: Express.User): Promise<SubmissionBatchListResponse>;
  /** Resolves when the batch's runner in this process has stopped (tests and shutdown). */
  settled(id: number): Promise<void>;
  /**
   * Starts a runner for every batch still marked running (the app's start: a stopped server left
   * them); answers how many. With several app processes each may start one: a plan is then judged
   * twice at worst, never stored twice (the entry is locked and re-checked before it is stored).
   */
  resumeUnfinished(): Promise<number>;
  /** Stops the runners after the plan each is checking; pending plans stay pending. */
  close(): Promise<void>;
}

/** What the service needs. */
export interface SubmissionBatchesDeps {
  readonly sequelize: Sequelize;
  readonly users: UsersService;
  readonly submissions: SubmissionsService;
  readonly logger: Logger;
  /** Wait before asking the pool again when it is busy or the database is away, ms. */
  readonly retryMs?: number;
}

interface BatchRow {
  id: number; owner_id: number; source: 'zip' | 'json'; file_name: string | null; status: 'running' | 'done';
  total: number; accepted: number; refused: number; created_at: Date; finished_at: Date | null;
}

interface EntryRow {
  id: number; position: number; file: string; line: number; request: BatchPlanRequest;
  status: 'pending' | 'accepted' | 'refused'; submission_id: number | null; refusal: BatchEntryRefusal | null;
}

const BATCH_COLUMNS = 'id, owner_id, source, file_name, status, total, accepted, refused, created_at, finished_at';

function summaryOf(b: BatchRow): SubmissionBatchSummary {
  return {
    id: b.id, status: b.status, source: b.source, fileName: b.file_name, total: b.total, done: b.accepted + b.refused,
    accepted: b.accepted, refused: b.refused, createdAt: new Date(b.created_at).toISOString(),
    finishedAt: b.finished_at ? new Date(b.finished_at).toISOString() : null,
  };
}

/** The instance reference as the manifest wrote it, for the outcome table. */
function instanceLabel(request: EntryRow['request']): string {
  if (request.format === 'json') return 'named in the plan document';
  const i: BatchInstance = request.instance;
  const scenario = i.scenarioId !== undefined ? `scenario ${i.scenarioId}` : [i.set ?? `set ${i.setId}`, i.map, i.scenario].filter(Boolean).join(' / ');
  return `${scenario} · ${i.agents} agent${i.agents === 1 ? '' : 's'}`;
}

/** A refusal from whatever stopped a plan (an AppError of the read, the lookup or the pool, or the schema). */
function refusalOf(err: unknown, file: string): BatchEntryRefusal | null {
  if (err instanceof ZodError) {
    return { code: 'VALIDATION_FAILED', message: err.issues[0]?.message ?? 'the plan entry is not valid', problems: err.issues.slice(0, 20).map((i) => ({ file, line: 0, column: 0, field: i.path.join('.') || 'document', message: i.message })) };
  }
  if (!(err instanceof AppError)) return null;
  const details = err.details as unknown;
  const problems = Array.isArray(details) && details.every((d) => typeof d === 'object' && d !== null && 'field' in d) ? (details as PlanFileProblem[]) : undefined;
  return { code: err.code, message: err.message, ...(problems ? { problems } : {}) };
}

/** Whether an error means "try again later" rather than "this plan is refused". */
function isTransient(err: unknown): boolean {
  return isConnectionError(err) || (err instanceof AppError && err.code === INTERACTIVE_ERROR_CODES.busy);
}

/** The batch service over one database, with its background runners. */
export function createSubmissionBatchesService(deps: SubmissionBatchesDeps): SubmissionBatchesService {
  const { sequelize, logger } = deps;
  const retryMs = deps.retryMs ?? 2_000;
  const running = new Map<number, Promise<void>>();
  const stop = new AbortController();
  const select = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
    sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

  /** The scenario id of a text plan's instance, found among the sets `owner` may see (404 SCENARIO_NOT_FOUND otherwise). */
  async function scenarioIdOf(owner: Express.User, i: BatchInstance): Promise<number> {
    if (i.scenarioId !== undefined) return i.scenarioId;
    const visible = visibleSetsCondition(owner);
    const rows = await select<{ id: number; set_id: number; map_name: string }>(
      `SELECT c.id, s.id AS set_id, m.name AS map_name FROM scenarios c JOIN maps m ON m.id = c.map_id JOIN instance_sets s ON s.id = c.instance_set_id
        WHERE c.name = :scenario AND ${i.setId !== undefined ? 's.id = :setId' : 's.name = :set'} AND ${visible.sql} ORDER BY s.id`,
      { scenario: i.scenario, setId: i.setId ?? null, set: i.set ?? null, ...visible.replacements },
    );
    const setName = i.setId !== undefined ? `set ${i.setId}` : `set '${i.set}'`;
    if (rows.length === 0) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario '${i.scenario}' in ${setName} among the sets you may see`);
    if (rows.length > 1) {
      throw new AppError('VALIDATION_FAILED', 400, `Several sets you may see are called '${i.set}' (ids ${rows.map((r) => r.set_id).join(', ')}); name the set by setId`);
    }
    if (i.map !== undefined && rows[0].map_name !== i.map) {
      throw new AppError('VALIDATION_FAILED', 400, `Scenario '${i.scenario}' in ${setName} is on map '${rows[0].map_name}', not '${i.map}'`);
    }
    return rows[0].id;
  }

  /** The single-submission request of a batch plan. */
  async function requestOf(owner: Express.User, entry: EntryRow, text: string): Promise<SubmissionRequest> {
    const r = entry.request;
    const common = { fileName: entry.file.slice(-255), text, ...(r.robotProfile ? { robotProfile: r.robotProfile } : {}) };
    if (r.format === 'json') return { format: 'json', ...common };
    const scenarioId = await scenarioIdOf(owner, r.instance);
    return {
      format: 'text', ...common, model: r.model, ...(r.k !== undefined ? { k: r.k } : {}), startHeading: r.startHeading,
      instance: { scenarioId, agents: r.instance.agents }, solver: r.solver,
    };
  }

  /** Counts a finished plan on its batch, closing the batch with its last one (inside the plan's transaction). */
  const countSql = (column: 'accepted' | 'refused') => `UPDATE submission_batches SET ${column} = ${column} + 1,
      status = CASE WHEN accepted + refused + 1 >= total THEN 'done' ELSE status END,
      finished_at = CASE WHEN accepted + refused + 1 >= total THEN now() ELSE finished_at END
    WHERE id = :batch`;

  async function refuse(batchId: number, entryId: number, refusal: BatchEntryRefusal): Promise<void> {
    await sequelize.transaction(async (transaction) => {
      const marked = await sequelize.query<{ id: number }>(
        `UPDATE submission_batch_entries SET status = 'refused', refusal = :refusal, plan_gz = NULL, finished_at = now()
          WHERE id = :id AND status = 'pending' RETURNING id`,
        { type: QueryTypes.SELECT, replacements: { id: entryId, refusal: JSON.stringify(refusal) }, transaction },
      );
      if (marked.length > 0) await sequelize.query(countSql('refused'), { replacements: { batch: batchId }, transaction });
    });
  }

  /** Checks one pending plan and records its outcome; returns false when it should be tried again later. */
  async function processEntry(batchId: number, ownerId: number, entry: EntryRow & { plan_gz: Buffer }): Promise<boolean> {
    // Roles are never cached: the account is loaded for every plan, so a demotion counts at once.
    const user = await deps.users.findById(ownerId);
    if (!user) {
      // The account is gone (its batches go with it by cascade); refuse rather than pick the entry again at once.
      await refuse(batchId, entry.id, { code: 'ACCOUNT_NOT_FOUND', message: 'The account that sent this batch no longer exists.' });
      return true;
    }
    const owner = toAccount(user);
    try {
      const sub = readPlanFile(SubmissionRequestSchema.parse(await requestOf(owner, entry, gunzipSync(entry.plan_gz).toString('utf8'))));
      const judged = await deps.submissions.judge(owner, sub, stop.signal);
      const verdict = judged.verdict;
      if (!verdict.ok) {
        const violation: SubmissionViolation = verdict.violation;
        await refuse(batchId, entry.id, { code: PLAN_REJECTED, message: `The ${sub.model} validator rejected the plan: ${violation.message}`, violation });
        return true;
      }
      await sequelize.transaction(async (transaction) => {
        // Locked and re-checked, so a plan is stored once even if two runners reached it.
        const [still] = await sequelize.query<{ id: number }>(
          "SELECT id FROM submission_batch_entries WHERE id = :id AND status = 'pending' FOR UPDATE",
          { type: QueryTypes.SELECT, replacements: { id: entry.id }, transaction },
        );
        if (!still) return;
        const submissionId = await deps.submissions.store(owner, sub, { loaded: judged.loaded, verdict }, transaction);
        await sequelize.query(
          "UPDATE submission_batch_entries SET status = 'accepted', submission_id = :sub, plan_gz = NULL, finished_at = now() WHERE id = :id",
          { replacements: { id: entry.id, sub: submissionId }, transaction },
        );
        await sequelize.query(countSql('accepted'), { replacements: { batch: batchId }, transaction });
      });
      return true;
    } catch (err) {
      if (stop.signal.aborted || isTransient(err)) return false;
      const refusal = refusalOf(err, entry.file);
      if (!refusal) logger.error({ err, batchId, entryId: entry.id }, 'a batch plan could not be checked');
      await refuse(batchId, entry.id, refusal ?? { code: 'INTERNAL', message: 'The plan could not be checked because of a fault on the server; submit it again.' });
      return true;
    }
  }

  /** Checks the batch's pending plans in order until none is left or the service closes. */
  async function runBatch(batchId: number, ownerId: number): Promise<void> {
    while (!stop.signal.aborted) {
      const [entry] = await select<EntryRow & { plan_gz: Buffer }>(
        `SELECT id, position, file, line, request, status, submission_id, refusal, plan_gz FROM submission_batch_entries
          WHERE batch_id = :batch AND status = 'pending' ORDER BY position LIMIT 1`,
        { batch: batchId },
      );
      if (!entry) return;
      const isDone = await processEntry(batchId, ownerId, entry);
      if (!isDone) await sleep(retryMs, undefined, { signal: stop.signal }).catch(() => undefined);
    }
  }

  /** Starts the batch's runner in this process unless one runs already. */
  function start(batchId: number, ownerId: number): void {
    if (running.has(batchId) || stop.signal.aborted) return;
    const run = runBatch(batchId, ownerId)
      .catch((err: unknown) => {
        // A lost database ends the run; the owner's next look at the batch starts it again.
        logger.warn({ err: err instanceof Error ? err.message : String(err), batchId }, 'batch runner stopped');
      })
      .finally(() => running.delete(batchId));
    running.set(batchId, run);
  }

  async function ownBatch(viewer: Express.User, id: number): Promise<BatchRow> {
    const [b] = await select<BatchRow>(`SELECT ${BATCH_COLUMNS} FROM submission_batches WHERE id = :id AND owner_id = :owner`, { id, owner: viewer.id });
    if (!b) throw new AppError('BATCH_NOT_FOUND', 404, `No batch ${id}`);
    if (b.status === 'running') start(b.id, b.owner_id);
    return b;
  }

  return {
    async create(owner, batch) {
      const id = await sequelize.transaction(async (transaction) => {
        const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
          sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction });
        // The owner's row is locked so two batches sent at once are counted one after the other.
        await q('SELECT id FROM users WHERE id = :owner FOR UPDATE', { owner: owner.id });
        const [{ n }] = await q<{ n: number }>("SELECT count(*)::int AS n FROM submission_batches WHERE owner_id = :owner AND status = 'running'", { owner: owner.id });
        if (n >= BATCH_LIMITS.maxRunningPerUser) {
          throw new AppError(TOO_MANY_BATCHES, 429, `You have ${n} batches still being checked; at most ${BATCH_LIMITS.maxRunningPerUser} at a time. Wait for one to finish, then send this one again.`, { limit: BATCH_LIMITS.maxRunningPerUser, running: n });
        }
        const [b] = await q<{ id: number }>(
          'INSERT INTO submission_batches (owner_id, source, file_name, total) VALUES (:owner, :source, :fileName, :total) RETURNING id',
          { owner: owner.id, source: batch.source, fileName: batch.fileName?.slice(0, 255) ?? null, total: batch.plans.length },
        );
        for (let from = 0; from < batch.plans.length; from += 50) {
          const replacements: Record<string, unknown> = { batch: b.id };
          const values = batch.plans.slice(from, from + 50).map((p, j) => {
            const i = from + j;
            Object.assign(replacements, {
              [`p${i}`]: i + 1, [`f${i}`]: p.file.slice(0, 300), [`l${i}`]: p.line, [`r${i}`]: JSON.stringify(p.request), [`g${i}`]: gzipSync(p.text),
            });
            return `(:batch, :p${i}, :f${i}, :l${i}, :r${i}, :g${i})`;
          });
          await sequelize.query(`INSERT INTO submission_batch_entries (batch_id, position, file, line, request, plan_gz) VALUES ${values.join(', ')}`, { replacements, transaction });
        }
        return b.id;
      });
      start(id, owner.id);
      const [b] = await select<BatchRow>(`SELECT ${BATCH_COLUMNS} FROM submission_batches WHERE id = :id`, { id });
      return summaryOf(b);
    },

    async get(viewer, id) {
      const b = await ownBatch(viewer, id);
      const rows = await select<EntryRow>(
        'SELECT id, position, file, line, request, status, submission_id, refusal FROM submission_batch_entries WHERE batch_id = :batch ORDER BY position',
        { batch: b.id },
      );
      const views = await deps.submissions.views(rows.flatMap((r) => (r.submission_id === null ? [] : [r.submission_id])));
      const entries: BatchEntryView[] = rows.map((r) => ({
        position: r.position, file: r.file, line: r.line, instance: instanceLabel(r.request), status: r.status,
        accepted: r.submission_id === null ? null : views.get(r.submission_id) ?? null, refusal: r.refusal,
      }));
      return { ...summaryOf(b), entries };
    },

    async list(viewer) {
      const rows = await select<BatchRow>(`SELECT ${BATCH_COLUMNS} FROM submission_batches WHERE owner_id = :owner ORDER BY created_at DESC, id DESC LIMIT 50`, { owner: viewer.id });
      for (const b of rows) if (b.status === 'running') start(b.id, b.owner_id);
      return { items: rows.map(summaryOf) };
    },

    async settled(id) {
      await running.get(id);
    },

    async resumeUnfinished() {
      const rows = await select<{ id: number; owner_id: number }>("SELECT id, owner_id FROM submission_batches WHERE status = 'running' ORDER BY id", {});
      for (const b of rows) start(b.id, b.owner_id);
      return rows.length;
    },

    async close() {
      stop.abort();
      await Promise.all(running.values());
    },
  };
}
