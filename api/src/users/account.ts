/** Converts a User row to the Account shape the client sees (shared/auth.ts). */
import type { Account } from '@shared/auth';
import type { User } from './user.model';

/** The client view of `user`. */
export function toAccount(user: User): Account {
  return {
    id: user.id,
    login: user.login,
    displayName: user.displayName,
    email: user.email,
    role: user.role,
    isEmailOn: user.isEmailOn,
    createdAt: user.createdAt.toISOString(),
  };
}
