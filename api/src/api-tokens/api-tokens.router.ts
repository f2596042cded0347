/**
 * Routes under /api/me/tokens, for the signed-in person's browser session only (a token cannot
 * list, mint or revoke tokens: api-tokens/token-scopes.ts):
 *   GET /            the tokens that are not revoked
 *   POST /           create one; the answer holds the secret, which is never shown again
 *   DELETE /:id      revoke one
 */
import { Router } from 'express';
import { z } from 'zod';
import type { ApiTokenListResponse } from '@shared/api-tokens';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import type { ApiTokensService } from './api-tokens.service';

/** A token id path parameter. */
export const TokenIdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** Token routes over the service. */
export function apiTokensRouter(tokens: ApiTokensService): Router {
  const r = Router();
  r.use(requireRole('researcher'));
  r.get('/', async (req, res) => {
    const body: ApiTokenListResponse = { tokens: await tokens.list(requireUser(req).id) };
    res.json(body);
  });
  r.post('/', async (req, res) => {
    // The secret must not stay in any cache between the server and the person.
    res.setHeader('cache-control', 'no-store');
    res.status(201).json(await tokens.create(requireUser(req), req.body));
  });
  r.delete('/:id', async (req, res) => {
    await tokens.revoke(requireUser(req).id, validate(TokenIdParam, req.params).id);
    res.status(204).end();
  });
  return r;
}
