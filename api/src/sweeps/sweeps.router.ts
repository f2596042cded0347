/** Routes under /api/sweeps: HTTP only (parse, call the service, send). */
import { Router } from 'express';
import { requireRole, requireUser } from '../auth/require-role';
import type { SweepEvents } from './sweep-events';
import type { SweepsService } from './sweeps.service';

/** The sweeps routes. */
export function sweepsRouter(svc: SweepsService, events: SweepEvents): Router {
  const r = Router();
  r.use(requireRole('researcher'));
  r.get('/', async (req, res) => {
    res.json(await svc.list(requireUser(req)));
  });
  r.post('/preview', async (req, res) => {
    res.json(await svc.preview(requireUser(req), req.body));
  });
  r.post('/', async (req, res) => {
    res.status(201).json(await svc.launch(requireUser(req), req.body));
  });
  r.get('/:id', async (req, res) => {
    res.json(await svc.get(requireUser(req), Number(req.params.id)));
  });
  r.get('/:id/results', async (req, res) => {
    res.json({ items: await svc.results(requireUser(req), Number(req.params.id)) });
  });
  r.post('/:id/cancel', async (req, res) => {
    res.json(await svc.cancel(requireUser(req), Number(req.params.id)));
  });
  r.get('/:id/events', async (req, res) => {
    const id = Number(req.params.id);
    const viewer = requireUser(req);
    await svc.assertVisible(viewer, id);
    await events.stream(id, res, viewer.id, req.apiToken?.id);
  });
  return r;
}
