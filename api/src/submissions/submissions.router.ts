/** Routes under /api/submissions: submit a plan (researchers), list one's own accepted submissions, the profiles to score under. */
import { Router } from 'express';
import { requireRole, requireUser } from '../auth/require-role';
import type { SubmissionsService } from './submissions.service';

/** Submission routes over the service. */
export function submissionsRouter(svc: SubmissionsService): Router {
  const r = Router();
  r.post('/', requireRole('researcher'), async (req, res) => {
    res.status(201).json(await svc.submit(requireUser(req), req.body));
  });
  r.get('/profiles', requireRole('researcher'), async (req, res) => {
    res.json(await svc.profiles(requireUser(req), req.query));
  });
  r.get('/', requireRole('researcher'), async (req, res) => {
    res.json(await svc.list(requireUser(req)));
  });
  return r;
}
