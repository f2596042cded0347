/** The `scenarios` table (created by migration 0100-instance-library). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One scenario row as stored: [bucket, startX, startY, goalX, goalY, optimalLength]. */
export type StoredScenarioRow = readonly [number, number, number, number, number, number];

/** A scenario file of an instance set, tied to one of its maps, with its rows and the bytes as uploaded. */
export class ScenarioFile extends Model<InferAttributes<ScenarioFile>, InferCreationAttributes<ScenarioFile>> {
  declare id: CreationOptional<number>;
  declare instanceSetId: number;
  declare mapId: number;
  declare name: string;
  declare rows: readonly StoredScenarioRow[];
  declare rowCount: number;
  declare maxAgents: number;
  declare checksum: string;
  declare byteSize: number;
  declare original: Buffer;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The ScenarioFile class bound to one Sequelize instance. */
export type ScenarioFileModel = typeof ScenarioFile;

/** Binds a fresh subclass of ScenarioFile to `sequelize`. */
export function defineScenarioFile(sequelize: Sequelize): ScenarioFileModel {
  const Bound = class extends ScenarioFile {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      instanceSetId: { type: DataTypes.INTEGER, allowNull: false },
      mapId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(255), allowNull: false },
      rows: { type: DataTypes.JSONB, allowNull: false },
      rowCount: { type: DataTypes.INTEGER, allowNull: false },
      maxAgents: { type: DataTypes.INTEGER, allowNull: false },
      checksum: { type: DataTypes.CHAR(64), allowNull: false },
      byteSize: { type: DataTypes.INTEGER, allowNull: false },
      original: { type: DataTypes.BLOB, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'scenarios', modelName: 'ScenarioFile', underscored: true },
  );
  return Bound;
}
