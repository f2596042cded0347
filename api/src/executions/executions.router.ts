/**
 * Routes under /api/executions: simulate a plan on the robot fleet (POST), read one back (GET),
 * and the replays a sweep stored with a result, with their settings (GET /stored/:resultId).
 */
import { Router } from 'express';
import { z } from 'zod';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import type { Viewer } from '../instance-sets/instance-set-access';
import type { ExecutionsService } from './executions.service';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });
const ResultIdParam = z.object({ resultId: z.coerce.number().int().positive().max(2_147_483_647) });

/** Reads the stored replays of a result for a viewer (null: a visitor). */
export type StoredExecutionsReader = (viewer: Viewer, resultId: number) => Promise<StoredResultExecutionsView>;

/**
 * The executions routes over the service: the stored replays of a result for whoever may see the
 * result (visitors too, like the leaderboard that shows them); everything else researchers and above.
 */
export function executionsRouter(svc: ExecutionsService, stored: StoredExecutionsReader): Router {
  const r = Router();
  r.get('/stored/:resultId', async (req, res) => {
    const { resultId } = validate(ResultIdParam, req.params);
    res.json(await stored(req.user ?? null, resultId));
  });
  r.use(requireRole('researcher'));

  r.post('/', async (req, res) => {
    // A client that goes away (closed tab, new request from the viewer) cancels its computation.
    const gone = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) gone.abort();
    });
    res.status(201).json(await svc.create(requireUser(req), req.body, gone.signal));
  });

  r.get('/:id', async (req, res) => {
    const { id } = validate(IdParam, req.params);
    res.json(await svc.get(requireUser(req), id));
  });

  return r;
}
