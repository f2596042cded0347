/** express-session backed by PostgreSQL (connect-pg-simple), so sessions survive restarts. */
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type { Pool } from 'pg';
import type { AppConfig } from '../config';

/** Name of the session cookie. */
export const SESSION_COOKIE = 'qt_sid';
const FOURTEEN_DAYS_MS = 14 * 24 * 60 * 60 * 1000;

/**
 * How far the stored expiry may fall behind the rolling cookie's before a request writes it.
 * express-session touches the store at the end of every request with an unchanged session, and
 * connect-pg-simple's touch is an UPDATE (a commit) the response waits for: under load that
 * write, and the wait for one of the session pool's connections, was most of a signed-in page
 * (issue 13, item 12). So a session idle for 14 days less up to an hour may be pruned early.
 */
export const SESSION_TOUCH_INTERVAL_MS = 60 * 60 * 1000;
/** Stored expiries remembered between a request's get and its touch; more are dropped oldest first. */
const MAX_REMEMBERED = 10_000;

type SessionStore = session.Store & { close(): void | Promise<void> };

/** A session store on `pool` using the `session` table from migration 0002; touches are throttled (SESSION_TOUCH_INTERVAL_MS). */
export function createSessionStore(pool: Pool, options: { readonly isPruning?: boolean; readonly touchIntervalMs?: number } = {}): SessionStore {
  const PgStore = connectPgSimple(session);
  const touchIntervalMs = options.touchIntervalMs ?? SESSION_TOUCH_INTERVAL_MS;

  /** connect-pg-simple's store, whose get also reads the stored expiry so that touch can skip a write that changes little. */
  class ThrottledStore extends PgStore {
    /** Stored expiry (ms) of sessions read and not yet touched, saved or destroyed. */
    private readonly storedExpiry = new Map<string, number>();

    override get(sid: string, callback: (err: unknown, sess?: session.SessionData | null) => void): void {
      pool.query<{ sess: session.SessionData | string; expire: Date }>(
        'SELECT sess, expire FROM "session" WHERE sid = $1 AND expire >= now()', [sid],
      ).then(({ rows: [row] }) => {
        if (!row) return callback(null, null);
        let sess: session.SessionData;
        try {
          sess = typeof row.sess === 'string' ? JSON.parse(row.sess) as session.SessionData : row.sess;
        } catch {
          // As connect-pg-simple does: a row that is not JSON is no session.
          return this.destroy(sid, (err) => callback(err, null));
        }
        this.remember(sid, row.expire.getTime());
        callback(null, sess);
      }, (err: unknown) => callback(err));
    }

    override set(sid: string, sess: session.SessionData, callback?: (err?: unknown) => void): void {
      this.storedExpiry.delete(sid);
      super.set(sid, sess, callback);
    }

    override destroy(sid: string, callback?: (err?: unknown) => void): void {
      this.storedExpiry.delete(sid);
      super.destroy(sid, callback);
    }

    override touch(sid: string, sess: session.SessionData, callback?: (err?: unknown) => void): void {
      const stored = this.storedExpiry.get(sid);
      this.storedExpiry.delete(sid);
      const next = sess.cookie.expires ? new Date(sess.cookie.expires).getTime() : undefined;
      if (stored !== undefined && next !== undefined && next - stored < touchIntervalMs) {
        callback?.();
        return;
      }
      super.touch(sid, sess, callback as () => void);
    }

    private remember(sid: string, expiry: number): void {
      this.storedExpiry.delete(sid);
      this.storedExpiry.set(sid, expiry);
      // Requests that end without a touch (an error, a regenerated session) leave entries behind.
      if (this.storedExpiry.size > MAX_REMEMBERED) this.storedExpiry.delete(this.storedExpiry.keys().next().value as string);
    }
  }

  return new ThrottledStore({
    pool,
    tableName: 'session',
    createTableIfMissing: false,
    // Expired rows are deleted every 15 minutes (connect-pg-simple's default interval).
    pruneSessionInterval: options.isPruning === false ? false : 15 * 60,
  }) as SessionStore;
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
