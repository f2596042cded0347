/**
 * Fleet simulations asked for through POST /api/executions: the request as validated, the
 * instance and plan that ran (so GET can redraw and re-run it) and the Monte Carlo summary.
 */
import { DataTypes, literal } from 'sequelize';
import type { Migration } from '../migration';

/** Creates plan_executions. */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('plan_executions', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    owner_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    request: { type: DataTypes.JSONB, allowNull: false },
    // Source, instance, model, profile, schedule and plan figures: what the viewer draws.
    plan: { type: DataTypes.JSONB, allowNull: false },
    summary: { type: DataTypes.JSONB, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  });
  // "My recent executions" lists by owner, newest first.
  await qi.addIndex('plan_executions', ['owner_id', 'created_at'], { name: 'plan_executions_owner_created' });
};

/** Drops plan_executions. */
export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('plan_executions');
};
