/** Account rules: first sign-in, profile refresh, settings and role changes (with the last-admin rule). */
import type { Sequelize } from 'sequelize';
import type { AccountSettingsRequest, ChangeRoleRequest } from '@shared/auth';
import { AppError } from '../errors/app-error';
import type { AccountRole, User, UserModel } from './user.model';

/** What a provider tells us about a person at sign-in. */
export interface ProviderIdentity {
  readonly provider: string;
  readonly providerId: string;
  readonly login: string;
  readonly displayName: string;
  readonly email: string | null;
}

/** Account operations used by the auth and user routes. */
export interface UsersService {
  /** Finds or creates the account of a provider identity, refreshing login, name and e-mail. */
  signIn(identity: ProviderIdentity): Promise<User>;
  findById(id: number): Promise<User | null>;
  list(): Promise<User[]>;
  updateSettings(id: number, settings: AccountSettingsRequest): Promise<User>;
  /**
   * Changes a role on behalf of admin `actorId`; refuses to demote the last admin (409
   * LAST_ADMIN) and re-checks inside the transaction that the actor is still an admin.
   */
  changeRole(actorId: number, targetId: number, change: ChangeRoleRequest): Promise<User>;
}

/** Builds the users service over the User model; `adminLogins` are lower-case logins that start as admin. */
export function createUsersService(deps: {
  readonly sequelize: Sequelize;
  readonly User: UserModel;
  readonly adminLogins: readonly string[];
}): UsersService {
  const { sequelize, User, adminLogins } = deps;
  const initialRole = (login: string): AccountRole => (adminLogins.includes(login.toLowerCase()) ? 'admin' : 'researcher');

  async function mustFind(id: number): Promise<User> {
    const user = await User.findByPk(id);
    if (!user) throw new AppError('NOT_FOUND', 404, `No user with id ${id}`);
    return user;
  }

  return {
    async signIn(identity) {
      const existing = await User.findOne({ where: { provider: identity.provider, providerId: identity.providerId } });
      if (existing) {
        // Providers let people rename themselves; keep our copy current but never touch the role.
        existing.set({ login: identity.login, displayName: identity.displayName, email: identity.email });
        return existing.changed() ? existing.save() : existing;
      }
      return User.create({ ...identity, role: initialRole(identity.login) });
    },

    findById: (id) => User.findByPk(id),

    list: () => User.findAll({ order: [['id', 'ASC']] }),

    async updateSettings(id, settings) {
      const user = await mustFind(id);
      return user.update({ isEmailOn: settings.isEmailOn });
    },

    changeRole(actorId, targetId, change) {
      return sequelize.transaction(async (transaction) => {
        // Lock every admin row so two admins demoting each other at once cannot both succeed.
        const admins = await User.findAll({ where: { role: 'admin' }, lock: transaction.LOCK.UPDATE, transaction });
        // The route checked the actor's role before this transaction; a concurrent change may have demoted them since.
        if (!admins.some((a) => a.id === actorId)) throw new AppError('FORBIDDEN', 403, 'Your account is no longer an admin.');
        const target = await User.findByPk(targetId, { transaction, lock: transaction.LOCK.UPDATE });
        if (!target) throw new AppError('NOT_FOUND', 404, `No user with id ${targetId}`);
        if (target.role === 'admin' && change.role !== 'admin' && admins.length <= 1) {
          throw new AppError('LAST_ADMIN', 409, `${target.login} is the last admin; make someone else admin first.`);
        }
        return target.update({ role: change.role }, { transaction });
      });
    },
  };
}
