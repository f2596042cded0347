/** Every Sequelize model of the app, bound to one connection. Add a feature's models here. */
import type { Sequelize } from 'sequelize';
import { defineUser, type UserModel } from '../users/user.model';

/** The models of one app instance. */
export interface Models {
  readonly User: UserModel;
}

/** Defines all models on `sequelize` (the schema itself comes from migrations). */
export function defineModels(sequelize: Sequelize): Models {
  return { User: defineUser(sequelize) };
}
