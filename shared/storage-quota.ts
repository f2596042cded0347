/**
 * Storage quotas of the instance library (issue 13, item 10): how many files, map cells and bytes
 * the instance sets a person owns may hold in all. Uploaded and generated files both count.
 * Admins read and change one person's limits under /api/admin/users/:id/quota.
 */
import { z } from 'zod';

/** What a quota counts. */
export const QUOTA_KINDS = ['files', 'cells', 'bytes'] as const;
export type QuotaKind = (typeof QUOTA_KINDS)[number];

/**
 * Amounts per kind: files = maps + scenarios; cells = width × height summed over maps; bytes =
 * the files as uploaded (byte_size of maps and scenarios).
 */
export type QuotaAmounts = { readonly [K in QuotaKind]: number };

/** GET/PATCH /api/admin/users/:id/quota: limits in force, what is used, and which limits are the server's defaults. */
export interface StorageQuotaView {
  readonly userId: number;
  readonly limits: QuotaAmounts;
  readonly used: QuotaAmounts;
  /** Per kind, whether the limit is the server default (no per-person value is set). */
  readonly isDefault: { readonly [K in QuotaKind]: boolean };
}

/** The largest limit accepted (PostgreSQL bigint holds more; JavaScript numbers are exact up to 2^53). */
export const MAX_QUOTA_LIMIT = Number.MAX_SAFE_INTEGER;

const limit = z.number().int().min(0).max(MAX_QUOTA_LIMIT).nullable().optional();

/**
 * PATCH /api/admin/users/:id/quota: a new limit per kind; null returns that kind to the server
 * default, an absent kind is left as it is. Answers the StorageQuotaView.
 */
export const ChangeQuotaRequest = z.object({ files: limit, cells: limit, bytes: limit }).strict()
  .refine((r) => QUOTA_KINDS.some((k) => r[k] !== undefined), { message: 'name at least one of files, cells, bytes' });
export type ChangeQuotaRequest = z.input<typeof ChangeQuotaRequest>;

/** `details` of a 413 QUOTA_EXCEEDED: the first quota the store would pass. */
export interface QuotaExceededDetails {
  readonly quota: QuotaKind;
  /** Amount the owner's sets hold now. */
  readonly used: number;
  /** Amount the refused upload or generation would add. */
  readonly adding: number;
  readonly limit: number;
  readonly ownerId: number;
}
