/** The `instance_sets` table (created by migration 0100-instance-library). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Visibility } from '@shared/instance-sets';

/** A named group of maps and scenarios with an owner, a visibility and a source/licence note. */
export class InstanceSet extends Model<InferAttributes<InstanceSet>, InferCreationAttributes<InstanceSet>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare name: string;
  declare description: CreationOptional<string>;
  declare visibility: CreationOptional<Visibility>;
  declare source: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The InstanceSet class bound to one Sequelize instance. */
export type InstanceSetModel = typeof InstanceSet;

/** Binds a fresh subclass of InstanceSet to `sequelize` (one per app instance, like defineUser). */
export function defineInstanceSet(sequelize: Sequelize): InstanceSetModel {
  const Bound = class extends InstanceSet {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      visibility: { type: DataTypes.ENUM('public', 'private'), allowNull: false, defaultValue: 'private' },
      source: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'instance_sets', modelName: 'InstanceSet', underscored: true },
  );
  return Bound;
}
