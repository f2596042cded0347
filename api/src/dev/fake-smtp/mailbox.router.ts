/**
 * GET /api/dev/mailbox: what the local fake SMTP server received. Every sweep e-mail of every
 * person lands there, so it is for admins only (401 visitors, 403 other roles), and it is mounted
 * only in development mode (sweeps-feature.ts, dev/development-mode.ts); never in production.
 */
import { Router } from 'express';
import type { MailboxResponse } from '@shared/runs';
import { requireRole } from '../../auth/require-role';
import type { Mailbox } from './mailbox';

/** The mailbox route, newest message first, admins only. */
export function mailboxRouter(mailbox: Mailbox): Router {
  const r = Router();
  r.use(requireRole('admin'));
  r.get('/', (_req, res) => {
    const body: MailboxResponse = { messages: [...mailbox.list()].reverse() };
    res.json(body);
  });
  return r;
}
