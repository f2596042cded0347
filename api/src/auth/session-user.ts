/** Types `req.user` as the signed-in Account (passport deserialises it on each request). */
import type { Account } from '@shared/auth';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends Account {}
  }
}

export {};
