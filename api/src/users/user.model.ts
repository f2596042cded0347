/** The `users` table (created by migration 0001-users). */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role } from '@shared/auth';

/** A role stored on an account: every signed-in role, never `visitor`. */
export type AccountRole = Exclude<Role, 'visitor'>;

/** A signed-in person. */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare provider: string;
  declare providerId: string;
  declare login: string;
  declare displayName: string;
  declare email: string | null;
  declare role: CreationOptional<AccountRole>;
  declare isEmailOn: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The User class bound to one Sequelize instance. */
export type UserModel = typeof User;

/**
 * Binds a fresh subclass of User to `sequelize`, so two app instances in one process (tests
 * that restart the app) never share a model bound to a closed pool.
 */
export function defineUser(sequelize: Sequelize): UserModel {
  const Bound = class extends User {};
  Bound.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      provider: { type: DataTypes.STRING(32), allowNull: false },
      providerId: { type: DataTypes.STRING(64), allowNull: false },
      login: { type: DataTypes.STRING(100), allowNull: false, unique: true },
      displayName: { type: DataTypes.STRING(200), allowNull: false },
      email: { type: DataTypes.STRING(320), allowNull: true },
      role: { type: DataTypes.ENUM('researcher', 'maintainer', 'admin'), allowNull: false, defaultValue: 'researcher' },
      isEmailOn: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'users', modelName: 'User', underscored: true },
  );
  return Bound;
}
