/** Making and recognising token secrets. */
import { createHash, randomBytes } from 'node:crypto';
import { TOKEN_PREFIX } from '@shared/api-tokens';

/** Random bytes of a secret: 256 bits, beyond any guessing. */
const SECRET_BYTES = 32;

/** `qtk_` + 43 base64url characters. */
const SECRET_PATTERN = new RegExp(`^${TOKEN_PREFIX}[A-Za-z0-9_-]{43}$`);

/** A new random secret. */
export function newSecret(): string {
  return TOKEN_PREFIX + randomBytes(SECRET_BYTES).toString('base64url');
}

/** Whether `value` has the shape of a secret (checked before any database look-up). */
export function isSecretShaped(value: string): boolean {
  return SECRET_PATTERN.test(value);
}

/**
 * The SHA-256 of a secret, the only form stored. A plain (unsalted, fast) hash is enough here:
 * the secret is 256 random bits, not a password, so there is no dictionary to try against a
 * leaked table (common practice for high-entropy API keys).
 */
export function secretHash(secret: string): Buffer {
  return createHash('sha256').update(secret, 'utf8').digest();
}
