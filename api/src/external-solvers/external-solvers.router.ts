/** Routes under /api/external-solvers: HTTP only. Reading needs a signed-in account, writing the maintainer role (session only). */
import { Router } from 'express';
import type { AppContext } from '../app-context';
import { requireRole, requireUser } from '../auth/require-role';
import { createExternalSolversService } from './external-solvers.service';

/** The external solver routes. */
export function externalSolversFeature(ctx: AppContext): Router {
  const svc = createExternalSolversService(ctx.sequelize);
  const r = Router();
  r.get('/', requireRole('researcher'), async (_req, res) => {
    res.json(await svc.list());
  });
  r.post('/', requireRole('maintainer'), async (req, res) => {
    res.status(201).json(await svc.register(requireUser(req), req.body));
  });
  r.delete('/:id', requireRole('maintainer'), async (req, res) => {
    await svc.remove(Number(req.params.id));
    res.status(204).end();
  });
  return r;
}
