/**
 * zod schemas of the responses the OpenAPI document describes in full: the one error shape and
 * the account and token answers. Other JSON answers are typed in shared/ with TypeScript
 * interfaces (no zod schema validates them), so the document names that type and shows them as
 * open objects (`documented` below) instead of restating them by hand.
 */
import { z } from 'zod';
import { ROLES } from '@shared/auth';
import { TOKEN_SCOPES } from '@shared/api-tokens';

/** `{ error: { code, message, details? } }`, the body of every 4xx and 5xx answer. */
export const ErrorBodySchema = z.object({
  error: z.object({
    code: z.string().meta({ description: 'Stable SCREAMING_SNAKE code (shared/errors.ts).', example: 'VALIDATION_FAILED' }),
    message: z.string().meta({ description: 'For humans; may change.' }),
    details: z.unknown().optional().meta({ description: 'Field paths, the missing token scope, quota figures: depends on the code.' }),
  }),
}).meta({ id: 'ErrorBody' });

/** shared/auth-contract.ts Account. */
export const AccountSchema = z.object({
  id: z.number().int(),
  login: z.string(),
  displayName: z.string(),
  email: z.string().nullable(),
  role: z.enum(['researcher', 'maintainer', 'admin']),
  isEmailOn: z.boolean(),
  createdAt: z.iso.datetime(),
}).meta({ id: 'Account' });

/** GET /api/me. */
export const MeResponseSchema = z.object({ account: AccountSchema.nullable(), role: z.enum(ROLES) }).meta({ id: 'MeResponse' });

/** shared/api-tokens-contract.ts ApiTokenView. */
export const ApiTokenViewSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  scopes: z.array(z.enum(TOKEN_SCOPES)),
  createdAt: z.iso.datetime(),
  expiresAt: z.iso.datetime(),
  lastUsedAt: z.iso.datetime().nullable(),
}).meta({ id: 'ApiTokenView' });

/** GET /api/health. */
export const HealthResponseSchema = z.object({ status: z.enum(['ok', 'degraded']), db: z.enum(['up', 'down']), version: z.string() }).meta({ id: 'HealthResponse' });

/** A JSON answer typed by the TypeScript interface `typeName` in shared/ (no zod schema of its own). */
export function documented(typeName: string, where: string): z.ZodType {
  return z.looseObject({}).meta({ description: `The ${typeName} of ${where}.` });
}
