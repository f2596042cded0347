/** The `sweeps` table (created by migration 0200-sweeps). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { RunCounts, SweepStatus } from '@shared/runs';
import type { SweepDefinition } from '@shared/sweeps';

/** A launched sweep: who, what (the validated definition) and how far it got. */
export class Sweep extends Model<InferAttributes<Sweep>, InferCreationAttributes<Sweep>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare name: string;
  declare definition: SweepDefinition;
  declare status: CreationOptional<SweepStatus>;
  declare runCount: CreationOptional<number>;
  declare counts: CreationOptional<RunCounts | null>;
  declare createdAt: CreationOptional<Date>;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare notifiedAt: CreationOptional<Date | null>;
  declare updatedAt: CreationOptional<Date>;
}

/** The Sweep class bound to one Sequelize instance. */
export type SweepModel = typeof Sweep;

/** Binds a fresh subclass of Sweep to `sequelize`. */
export function defineSweep(sequelize: Sequelize): SweepModel {
  const Bound = class extends Sweep {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      definition: { type: DataTypes.JSONB, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
      runCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      counts: { type: DataTypes.JSONB, allowNull: true },
      createdAt: DataTypes.DATE,
      startedAt: { type: DataTypes.DATE, allowNull: true },
      finishedAt: { type: DataTypes.DATE, allowNull: true },
      notifiedAt: { type: DataTypes.DATE, allowNull: true },
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'sweeps', modelName: 'Sweep', underscored: true },
  );
  return Bound;
}
