/**
 * Per-person storage quotas of the instance library (issue 13, item 10): a limit per kind on the
 * account, NULL meaning the server default (QUOTA_FILES, QUOTA_CELLS, QUOTA_BYTES). Usage is not
 * stored: it is summed from the person's sets under a lock of the account row when files are stored.
 */
import type { Migration } from '../migration';

export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`
    ALTER TABLE users
      ADD COLUMN quota_files bigint CHECK (quota_files >= 0),
      ADD COLUMN quota_cells bigint CHECK (quota_cells >= 0),
      ADD COLUMN quota_bytes bigint CHECK (quota_bytes >= 0)`);
};

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query('ALTER TABLE users DROP COLUMN quota_files, DROP COLUMN quota_cells, DROP COLUMN quota_bytes');
};
