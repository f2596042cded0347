/** The `maps` table (created by migration 0100-instance-library). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A map file of an instance set: its parsed size and cells plus the bytes as uploaded. */
export class MapFile extends Model<InferAttributes<MapFile>, InferCreationAttributes<MapFile>> {
  declare id: CreationOptional<number>;
  declare instanceSetId: number;
  declare name: string;
  declare type: string;
  declare width: number;
  declare height: number;
  declare passableCount: number;
  /** The map rows joined by '\n'. */
  declare cells: string;
  /** sha256 of `original`, lower-case hex. */
  declare checksum: string;
  declare byteSize: number;
  declare original: Buffer;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The MapFile class bound to one Sequelize instance. */
export type MapFileModel = typeof MapFile;

/** Binds a fresh subclass of MapFile to `sequelize`. */
export function defineMapFile(sequelize: Sequelize): MapFileModel {
  const Bound = class extends MapFile {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      instanceSetId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(255), allowNull: false },
      type: { type: DataTypes.STRING(32), allowNull: false },
      width: { type: DataTypes.INTEGER, allowNull: false },
      height: { type: DataTypes.INTEGER, allowNull: false },
      passableCount: { type: DataTypes.INTEGER, allowNull: false },
      cells: { type: DataTypes.TEXT, allowNull: false },
      checksum: { type: DataTypes.CHAR(64), allowNull: false },
      byteSize: { type: DataTypes.INTEGER, allowNull: false },
      original: { type: DataTypes.BLOB, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'maps', modelName: 'MapFile', underscored: true },
  );
  return Bound;
}
