/**
 * Personal API tokens (issue 16, item 1): create (the secret is returned once and only its
 * SHA-256 kept), list, revoke, and resolve a presented secret to its account. The account is
 * loaded on every request, like a session's (DEVELOPERS.md "Roles are never cached"), so a
 * demotion or deletion applies at once.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { hasRole } from '@shared/auth';
import { CreateApiTokenRequest, type ApiTokenView, type CreatedApiToken, type TokenScope } from '@shared/api-tokens';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import type { UsersService } from '../users/users.service';
import type { User } from '../users/user.model';
import { newSecret, secretHash } from './token-secret';

/** last_used_at is written at most this often per token, so a script's requests are not one write each. */
export const LAST_USED_INTERVAL_MS = 60_000;

/** A presented token that is valid now, with the account it acts for. */
export interface TokenPrincipal {
  readonly tokenId: number;
  readonly scopes: readonly TokenScope[];
  readonly user: User;
}

/** Token operations. */
export interface ApiTokensService {
  list(userId: number): Promise<ApiTokenView[]>;
  create(user: Express.User, body: unknown): Promise<CreatedApiToken>;
  /** Revokes one of `userId`'s tokens; 404 when it has no such token (or it is revoked already). */
  revoke(userId: number, tokenId: number): Promise<void>;
  /** The principal of `secret`, or null when it is unknown, revoked or expired, or its account is gone. */
  authenticate(secret: string): Promise<TokenPrincipal | null>;
}

interface TokenRow {
  readonly id: number;
  readonly user_id: number;
  readonly name: string;
  readonly scopes: TokenScope[];
  readonly created_at: Date;
  readonly expires_at: Date;
  readonly last_used_at: Date | null;
}

const COLUMNS = 'id, user_id, name, scopes, created_at, expires_at, last_used_at';

function viewOf(row: TokenRow): ApiTokenView {
  return {
    id: row.id,
    name: row.name,
    scopes: row.scopes,
    createdAt: row.created_at.toISOString(),
    expiresAt: row.expires_at.toISOString(),
    lastUsedAt: row.last_used_at?.toISOString() ?? null,
  };
}

/** The service over the api_tokens table; `now` is injectable for tests. */
export function createApiTokensService(deps: { sequelize: Sequelize; users: UsersService; now?: () => Date }): ApiTokensService {
  const { sequelize, users } = deps;
  const now = deps.now ?? (() => new Date());
  return {
    async list(userId) {
      const rows = await sequelize.query<TokenRow>(
        `SELECT ${COLUMNS} FROM api_tokens WHERE user_id = :userId AND revoked_at IS NULL ORDER BY created_at DESC, id DESC`,
        { type: QueryTypes.SELECT, replacements: { userId } },
      );
      return rows.map(viewOf);
    },

    async create(user, body) {
      const request = validate(CreateApiTokenRequest, body);
      if (request.scopes.includes('sweep') && !hasRole(user.role, 'maintainer')) {
        throw new AppError('FORBIDDEN', 403, `The sweep scope is for maintainers and admins; your account is ${user.role}.`, [{ field: 'scopes' }]);
      }
      const secret = newSecret();
      const expiresAt = new Date(now().getTime() + request.expiresInDays * 86_400_000);
      const [row] = await sequelize.query<TokenRow>(
        `INSERT INTO api_tokens (user_id, name, secret_sha256, scopes, created_at, expires_at)
         VALUES (:userId, :name, :hash, ARRAY[:scopes]::text[], :createdAt, :expiresAt) RETURNING ${COLUMNS}`,
        { type: QueryTypes.SELECT, replacements: { userId: user.id, name: request.name, hash: secretHash(secret), scopes: request.scopes, createdAt: now(), expiresAt } },
      );
      return { token: viewOf(row), secret };
    },

    async revoke(userId, tokenId) {
      const revoked = await sequelize.query<{ id: number }>(
        'UPDATE api_tokens SET revoked_at = :at WHERE id = :tokenId AND user_id = :userId AND revoked_at IS NULL RETURNING id',
        { type: QueryTypes.SELECT, replacements: { at: now(), tokenId, userId } },
      );
      if (revoked.length === 0) throw new AppError('NOT_FOUND', 404, `You have no token ${tokenId}.`);
    },

    async authenticate(secret) {
      // Looked up by the hash itself: timing can at most tell how much of a stored hash a
      // guess's hash shares, and since SHA-256 cannot be run backwards that never helps build
      // a secret, so no constant-time comparison is needed (common practice for hashed keys).
      const at = now();
      const [row] = await sequelize.query<TokenRow>(
        `SELECT ${COLUMNS} FROM api_tokens WHERE secret_sha256 = :hash AND revoked_at IS NULL AND expires_at > :at`,
        { type: QueryTypes.SELECT, replacements: { hash: secretHash(secret), at } },
      );
      if (!row) return null;
      const user = await users.findById(row.user_id);
      if (!user) return null;
      if (row.last_used_at === null || at.getTime() - row.last_used_at.getTime() >= LAST_USED_INTERVAL_MS) {
        // The condition repeats in SQL so parallel requests of one script write once.
        await sequelize.query(
          'UPDATE api_tokens SET last_used_at = :at WHERE id = :id AND (last_used_at IS NULL OR last_used_at <= :before)',
          { replacements: { at, id: row.id, before: new Date(at.getTime() - LAST_USED_INTERVAL_MS) } },
        );
      }
      return { tokenId: row.id, scopes: row.scopes, user };
    },
  };
}
