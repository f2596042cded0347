/** GET /api/dev/mailbox: what the local fake SMTP server received (mounted only while it runs; never in production). */
import { Router } from 'express';
import type { MailboxResponse } from '@shared/runs';
import type { Mailbox } from './mailbox';

/** The mailbox route, newest message first. */
export function mailboxRouter(mailbox: Mailbox): Router {
  const r = Router();
  r.get('/', (_req, res) => {
    const body: MailboxResponse = { messages: [...mailbox.list()].reverse() };
    res.json(body);
  });
  return r;
}
