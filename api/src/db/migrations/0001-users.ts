/** Accounts: one row per person signed in through an OAuth provider. */
import { DataTypes, literal } from 'sequelize';
import type { Migration } from '../migration';

/** Creates the users table, its identity and role indexes. */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    // 'github' for the hosted provider, 'fake' for the local one, so a fake identity can never
    // be mistaken for a GitHub account with the same numeric id.
    provider: { type: DataTypes.STRING(32), allowNull: false },
    provider_id: { type: DataTypes.STRING(64), allowNull: false },
    login: { type: DataTypes.STRING(100), allowNull: false, unique: true },
    display_name: { type: DataTypes.STRING(200), allowNull: false },
    email: { type: DataTypes.STRING(320), allowNull: true },
    role: { type: DataTypes.ENUM('researcher', 'maintainer', 'admin'), allowNull: false, defaultValue: 'researcher' },
    is_email_on: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  });
  await qi.addIndex('users', ['provider', 'provider_id'], { unique: true, name: 'users_provider_identity' });
  // The last-admin rule counts admins on every role change.
  await qi.addIndex('users', ['role'], { name: 'users_role' });
};

/** Drops the users table and its enum type. */
export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('users');
  await qi.sequelize.query('DROP TYPE IF EXISTS "enum_users_role"');
};
