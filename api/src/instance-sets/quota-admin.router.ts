/**
 * GET and PATCH /api/admin/users/:id/quota (admin only): one person's storage quota and usage,
 * and per-person limits (null returns a kind to the server default). Mounted by the instance
 * library beside the account routes of users/admin-users.router.ts, since usage is the library's.
 */
import { Router } from 'express';
import { z } from 'zod';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import type { StorageQuotas } from './storage-quota';

const UserIdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** Quota routes under /api/admin/users. */
export function quotaAdminRouter(quotas: StorageQuotas): Router {
  const r = Router();

  r.get('/:id/quota', requireRole('admin'), async (req, res) => {
    const { id } = validate(UserIdParam, req.params);
    res.json(await quotas.view(id));
  });

  r.patch('/:id/quota', requireRole('admin'), async (req, res) => {
    const { id } = validate(UserIdParam, req.params);
    const view = await quotas.change(id, req.body);
    req.log?.info({ targetId: id, limits: view.limits, by: requireUser(req).id }, 'storage quota changed');
    res.json(view);
  });

  return r;
}
