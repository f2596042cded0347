/** The `plan_executions` table (created by migration 0300-plan-executions). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { StoredPlan } from './execution-task';
import type { StoredSummary } from './stored-summary';

/** One simulation asked for through POST /api/executions. */
export class PlanExecution extends Model<InferAttributes<PlanExecution>, InferCreationAttributes<PlanExecution>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  /** The validated request body. */
  declare request: unknown;
  declare plan: StoredPlan;
  /** As stored: rows written before issue 12 lack the intervals (read through currentSummary). */
  declare summary: StoredSummary;
  declare createdAt: CreationOptional<Date>;
}

/** The PlanExecution class bound to one Sequelize instance. */
export type PlanExecutionModel = typeof PlanExecution;

/** Binds a fresh subclass of PlanExecution to `sequelize`. */
export function definePlanExecution(sequelize: Sequelize): PlanExecutionModel {
  const Bound = class extends PlanExecution {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER, allowNull: false },
      request: { type: DataTypes.JSONB, allowNull: false },
      plan: { type: DataTypes.JSONB, allowNull: false },
      summary: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'plan_executions', modelName: 'PlanExecution', underscored: true, updatedAt: false },
  );
  return Bound;
}
