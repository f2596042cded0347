/** express-session backed by PostgreSQL (connect-pg-simple), so sessions survive restarts. */
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type { Pool } from 'pg';
import type { AppConfig } from '../config';

/** Name of the session cookie. */
export const SESSION_COOKIE = 'qt_sid';
const FOURTEEN_DAYS_MS = 14 * 24 * 60 * 60 * 1000;

/** A session store on `pool` using the `session` table from migration 0002. */
export function createSessionStore(pool: Pool, options: { readonly isPruning?: boolean } = {}): session.Store & { close(): void | Promise<void> } {
  const PgStore = connectPgSimple(session);
  return new PgStore({
    pool,
    tableName: 'session',
    createTableIfMissing: false,
    // Expired rows are deleted every 15 minutes (connect-pg-simple's default interval).
    pruneSessionInterval: options.isPruning === false ? false : 15 * 60,
  }) as session.Store & { close(): void | Promise<void> };
}

/** The session middleware: httpOnly, SameSite=Lax (the OAuth callback is a top-level cross-site GET), secure on https. */
export function sessionMiddleware(config: AppConfig, store: session.Store): RequestHandler {
  return session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.publicUrl.startsWith('https:'),
      maxAge: FOURTEEN_DAYS_MS,
      path: '/',
    },
  });
}
