/** GET /api/me and PATCH /api/me/settings. */
import { Router } from 'express';
import { AccountSettingsRequest, type MeResponse } from '@shared/auth';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import { toAccount } from './account';
import type { UsersService } from './users.service';

/** Routes under /api/me. */
export function meRouter(users: UsersService): Router {
  const r = Router();

  r.get('/', (req, res) => {
    const body: MeResponse = req.user ? { account: req.user, role: req.user.role } : { account: null, role: 'visitor' };
    res.json(body);
  });

  r.patch('/settings', requireRole('researcher'), async (req, res) => {
    const settings = validate(AccountSettingsRequest, req.body);
    const updated = toAccount(await users.updateSettings(requireUser(req).id, settings));
    const body: MeResponse = { account: updated, role: updated.role };
    res.json(body);
  });

  return r;
}
