/** GET /api/admin/users and PATCH /api/admin/users/:id (admin only). */
import { Router } from 'express';
import { z } from 'zod';
import { ChangeRoleRequest, type Account, type UserListResponse } from '@shared/auth';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import { toAccount } from './account';
import type { UsersService } from './users.service';

const UserIdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** Routes under /api/admin/users. */
export function adminUsersRouter(users: UsersService): Router {
  const r = Router();
  r.use(requireRole('admin'));

  r.get('/', async (_req, res) => {
    const body: UserListResponse = { users: (await users.list()).map(toAccount) };
    res.json(body);
  });

  r.patch('/:id', async (req, res) => {
    const { id } = validate(UserIdParam, req.params);
    const change = validate(ChangeRoleRequest, req.body);
    const body: Account = toAccount(await users.changeRole(requireUser(req).id, id, change));
    req.log?.info({ targetId: id, role: change.role, by: requireUser(req).id }, 'role changed');
    res.json(body);
  });

  return r;
}
