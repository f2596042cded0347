/** Routes under /api/executions: simulate a plan on the robot fleet (POST) and read one back (GET). */
import { Router } from 'express';
import { z } from 'zod';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import type { ExecutionsService } from './executions.service';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** The executions routes over the service; researchers and above only. */
export function executionsRouter(svc: ExecutionsService): Router {
  const r = Router();
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
