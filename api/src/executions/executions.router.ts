/**
 * Routes under /api/executions: simulate a plan on the robot fleet (POST), read one back (GET),
 * the replays a sweep stored with a result, with their settings (GET /stored/:resultId), and a
 * stored result's plan to draw and replay in the browser or to download (GET /results/:resultId,
 * /results/:resultId/plan.json, /results/:resultId/plan.txt).
 */
import { Router } from 'express';
import { z } from 'zod';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import { attachmentDisposition } from '../http/content-disposition';
import { PLAN_DOWNLOAD_FORMATS } from '@shared/result-plan-view';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import type { Viewer } from '../instance-sets/instance-set-access';
import type { ExecutionsService } from './executions.service';
import type { ResultPlans } from './result-plans';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });
const ResultIdParam = z.object({ resultId: z.coerce.number().int().positive().max(2_147_483_647) });

/** Reads the stored replays of a result for a viewer (null: a visitor). */
export type StoredExecutionsReader = (viewer: Viewer, resultId: number) => Promise<StoredResultExecutionsView>;

/**
 * The executions routes over the service: the stored replays of a result for whoever may see the
 * result and its plan, to replay in the browser and download, for whoever may see the result
 * (visitors too, like the leaderboard that shows them); running on the server researchers and above.
 */
export function executionsRouter(svc: ExecutionsService, stored: StoredExecutionsReader, results: ResultPlans): Router {
  const r = Router();
  r.get('/stored/:resultId', async (req, res) => {
    const { resultId } = validate(ResultIdParam, req.params);
    res.json(await stored(req.user ?? null, resultId));
  });
  r.get('/results/:resultId', async (req, res) => {
    const { resultId } = validate(ResultIdParam, req.params);
    res.json(await results.view(req.user ?? null, resultId));
  });
  for (const format of PLAN_DOWNLOAD_FORMATS) {
    r.get(`/results/:resultId/plan.${format}`, async (req, res) => {
      const { resultId } = validate(ResultIdParam, req.params);
      const file = await results.download(req.user ?? null, resultId, format);
      res.setHeader('content-type', file.contentType);
      res.setHeader('content-disposition', attachmentDisposition(file.fileName));
      res.send(file.body);
    });
  }
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
