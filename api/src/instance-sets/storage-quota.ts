/**
 * Storage quotas of the instance library (issue 13, item 10). A person's limits are the columns
 * quota_files / quota_cells / quota_bytes of their account, or the server defaults where NULL.
 * Usage is summed from the sets they own, inside the transaction that stores new files and after
 * locking the owner's account row, so two concurrent uploads of one owner are checked one after
 * the other and cannot both pass (READ COMMITTED: the second sum, taken after the lock is granted,
 * sees the first upload's committed rows).
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  ChangeQuotaRequest, QUOTA_KINDS, type QuotaAmounts, type QuotaExceededDetails, type QuotaKind, type StorageQuotaView,
} from '@shared/storage-quota';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';

/** The error code of a store that would pass a quota (413). */
export const QUOTA_EXCEEDED = 'QUOTA_EXCEEDED';

/** Quota operations: the check the store runs, and the admin's view and change. */
export interface StorageQuotas {
  /**
   * Locks the owner's account row in `transaction` and throws 413 QUOTA_EXCEEDED when `adding`
   * would take their sets past a limit (404 when the owner is gone).
   */
  assertRoom(ownerId: number, adding: QuotaAmounts, transaction: Transaction): Promise<void>;
  /** One person's limits and usage (404 NOT_FOUND for an unknown id). */
  view(userId: number): Promise<StorageQuotaView>;
  /** Sets or clears (null) a person's limits per kind; answers the new view. */
  change(userId: number, body: unknown): Promise<StorageQuotaView>;
}

interface LimitRow {
  quota_files: string | null;
  quota_cells: string | null;
  quota_bytes: string | null;
}

type UsageRow = { readonly [K in QuotaKind]: string };

const COLUMN: { readonly [K in QuotaKind]: keyof LimitRow } = { files: 'quota_files', cells: 'quota_cells', bytes: 'quota_bytes' };

/** Files, map cells and bytes of every set `:owner` owns. */
const USAGE_SQL = `
  WITH sets AS (SELECT id FROM instance_sets WHERE owner_id = :owner),
       m AS (SELECT count(*) AS n, coalesce(sum(width::bigint * height), 0) AS cells, coalesce(sum(byte_size::bigint), 0) AS bytes
             FROM maps WHERE instance_set_id IN (SELECT id FROM sets)),
       c AS (SELECT count(*) AS n, coalesce(sum(byte_size::bigint), 0) AS bytes
             FROM scenarios WHERE instance_set_id IN (SELECT id FROM sets))
  SELECT (m.n + c.n)::text AS files, m.cells::text AS cells, (m.bytes + c.bytes)::text AS bytes FROM m, c`;

const UNIT: { readonly [K in QuotaKind]: string } = { files: 'files', cells: 'map cells', bytes: 'bytes' };

const fmt = (n: number): string => n.toLocaleString('en-US');

/** Builds the quotas over `sequelize` with the server's default limits. */
export function createStorageQuotas(deps: { readonly sequelize: Sequelize; readonly defaults: QuotaAmounts }): StorageQuotas {
  const { sequelize, defaults } = deps;

  async function limitRow(userId: number, transaction?: Transaction, lock = false): Promise<LimitRow> {
    const [row] = await sequelize.query<LimitRow>(
      `SELECT quota_files::text, quota_cells::text, quota_bytes::text FROM users WHERE id = :id${lock ? ' FOR UPDATE' : ''}`,
      { type: QueryTypes.SELECT, replacements: { id: userId }, transaction },
    );
    if (!row) throw new AppError('NOT_FOUND', 404, `No user with id ${userId}`);
    return row;
  }

  const limitsOf = (row: LimitRow): QuotaAmounts => ({
    files: row.quota_files === null ? defaults.files : Number(row.quota_files),
    cells: row.quota_cells === null ? defaults.cells : Number(row.quota_cells),
    bytes: row.quota_bytes === null ? defaults.bytes : Number(row.quota_bytes),
  });

  async function usageOf(ownerId: number, transaction?: Transaction): Promise<QuotaAmounts> {
    const [row] = await sequelize.query<UsageRow>(USAGE_SQL, { type: QueryTypes.SELECT, replacements: { owner: ownerId }, transaction });
    return { files: Number(row.files), cells: Number(row.cells), bytes: Number(row.bytes) };
  }

  async function viewOf(userId: number): Promise<StorageQuotaView> {
    const row = await limitRow(userId);
    return {
      userId, limits: limitsOf(row), used: await usageOf(userId),
      isDefault: { files: row.quota_files === null, cells: row.quota_cells === null, bytes: row.quota_bytes === null },
    };
  }

  return {
    async assertRoom(ownerId, adding, transaction) {
      const limits = limitsOf(await limitRow(ownerId, transaction, true));
      const used = await usageOf(ownerId, transaction);
      const over = QUOTA_KINDS.find((k) => adding[k] > 0 && used[k] + adding[k] > limits[k]);
      if (!over) return;
      const details: QuotaExceededDetails = { quota: over, used: used[over], adding: adding[over], limit: limits[over], ownerId };
      throw new AppError(QUOTA_EXCEEDED, 413,
        `Nothing was stored: the ${over} quota of the set's owner would be passed. The owner's sets hold ${fmt(used[over])} ${UNIT[over]}, `
        + `this would add ${fmt(adding[over])}, and the limit is ${fmt(limits[over])}. Delete files or ask an admin for a larger quota.`,
        details);
    },

    view: viewOf,

    async change(userId, body) {
      const change = validate(ChangeQuotaRequest, body);
      const sets = QUOTA_KINDS.filter((k) => change[k] !== undefined);
      const [, affected] = await sequelize.query(
        `UPDATE users SET ${sets.map((k) => `${COLUMN[k]} = :${k}`).join(', ')} WHERE id = :id`,
        { type: QueryTypes.UPDATE, replacements: { id: userId, ...Object.fromEntries(sets.map((k) => [k, change[k]])) } },
      );
      if (affected === 0) throw new AppError('NOT_FOUND', 404, `No user with id ${userId}`);
      return viewOf(userId);
    },
  };
}

/** What a set of prepared files adds to a quota. */
export function quotaAmountsOf(files: {
  readonly maps: readonly { readonly width: number; readonly height: number; readonly original: Uint8Array }[];
  readonly scenarios: readonly { readonly original: Uint8Array }[];
}): QuotaAmounts {
  let cells = 0;
  let bytes = 0;
  for (const m of files.maps) {
    cells += m.width * m.height;
    bytes += m.original.byteLength;
  }
  for (const s of files.scenarios) bytes += s.original.byteLength;
  return { files: files.maps.length + files.scenarios.length, cells, bytes };
}
