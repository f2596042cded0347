/** Personal API tokens: the request schema (zod) of POST /api/me/tokens; see api-tokens-contract.ts. */
import { z } from 'zod';
import { MAX_TOKEN_DAYS, TOKEN_SCOPES } from './api-tokens-contract';
import { singleLineText } from './text-field';

export * from './api-tokens-contract';

/** POST /api/me/tokens: a name, one or more scopes and a lifetime in days (1 to MAX_TOKEN_DAYS). */
export const CreateApiTokenRequest = z.object({
  name: singleLineText().min(1, 'name must not be empty').max(100, 'name must be at most 100 characters'),
  scopes: z.array(z.enum(TOKEN_SCOPES)).min(1, 'choose at least one scope').refine((s) => new Set(s).size === s.length, 'each scope at most once'),
  expiresInDays: z.number().int().min(1).max(MAX_TOKEN_DAYS, `a token lives at most ${MAX_TOKEN_DAYS} days`),
}).strict();
export type CreateApiTokenRequest = z.infer<typeof CreateApiTokenRequest>;
