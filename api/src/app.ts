/**
 * The app factory: `createApp(config, deps?)` wires middleware, sessions, passport and every
 * router into an Express 5 app without listening; `startServer()` also listens (and runs the
 * fake OAuth provider when no GitHub app is configured), for main.ts, `npm start` and e2e tests.
 */
import { createServer } from 'node:http';
import express, { type Express, Router } from 'express';
import { pinoHttp } from 'pino-http';
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type session from 'express-session';
import { FAKE_OAUTH_CLIENT, type AppConfig } from './config';
import type { AppContext } from './app-context';
import { apiRouter } from './api-router';
import { bearerAuth, unlessToken } from './api-tokens/bearer-auth';
import { createApiTokensService } from './api-tokens/api-tokens.service';
import { authRouter } from './auth/auth.router';
import { callbackUrl } from './auth/github-strategy';
import { createPassport } from './auth/passport-setup';
import { createSessionStore, SESSION_COOKIE, sessionMiddleware } from './auth/session';
import { defineModels } from './db/models';
import { createSequelize } from './db/sequelize';
import { startFakeOAuth, type RunningFakeOAuth } from './dev/fake-oauth/start-fake-oauth';
import type { Mailbox } from './dev/fake-smtp/mailbox';
import { errorHandler, notFound } from './errors/error-handler';
import { authRateLimit } from './http/auth-rate-limit';
import { createCsrf } from './http/csrf';
import { closeServer, listen } from './http/listen';
import { createLogger } from './http/logger';
import { securityHeaders } from './http/security-headers';
import { createStatsService, type StatsService } from './stats/stats.service';
import { createUsersService } from './users/users.service';
import { APP_VERSION } from './version';
import { hasWebBuild, webAppRouter } from './web/web-app';
import { InteractivePool } from './workers/interactive-pool';

/** What createApp can be handed instead of building it from config (tests pass fakes or shared pools). */
export interface AppDeps {
  readonly sequelize: Sequelize;
  /** pg pool for the session store. */
  readonly pool: pg.Pool;
  readonly sessionStore: session.Store;
  readonly logger: Logger;
  readonly stats: StatsService;
  /** Base URL of the fake OAuth provider (fake mode); default http://127.0.0.1:FAKE_OAUTH_PORT. */
  readonly fakeOAuthUrl: string;
  /** Mailbox of a running local fake SMTP server; serves GET /api/dev/mailbox when given. */
  readonly mailbox: Mailbox;
  /** The interactive worker pool; default one of config.interactiveThreads threads, closed by dispose(). */
  readonly interactivePool: InteractivePool;
}

/** The Express app plus its context and a dispose() that closes what createApp opened. */
export type QuarterturnApp = Express & {
  readonly context: AppContext;
  /** Closes the pools and timers createApp created itself (not the ones passed in deps). */
  readonly dispose: () => Promise<void>;
};

/** Builds the app. Without deps.sequelize/pool, config.databaseUrl must be set. */
export function createApp(config: AppConfig, deps: Partial<AppDeps> = {}): QuarterturnApp {
  const owned: Array<() => Promise<void>> = [];
  const needUrl = (): string => {
    if (!config.databaseUrl) throw new Error('createApp: set config.databaseUrl or pass deps.sequelize and deps.pool');
    return config.databaseUrl;
  };
  const logger = deps.logger ?? createLogger(config.logLevel);
  let sequelize = deps.sequelize;
  if (!sequelize) {
    const created = createSequelize(needUrl());
    owned.push(() => created.close());
    sequelize = created;
  }
  let pool = deps.pool;
  if (!pool && !deps.sessionStore) {
    const created = new pg.Pool({ connectionString: needUrl(), max: 5 });
    // An idle client losing its server (e.g. a PostgreSQL restart) is reported here; unhandled it would end the process.
    created.on('error', (err) => logger.warn({ err: err.message }, 'session pool: idle connection lost'));
    owned.push(() => created.end());
    pool = created;
  }
  let store = deps.sessionStore;
  if (!store) {
    const created = createSessionStore(pool as pg.Pool);
    owned.unshift(async () => created.close());
    store = created;
  }

  const models = defineModels(sequelize);
  const users = createUsersService({ sequelize, User: models.User, adminLogins: config.adminLogins });
  const stats = deps.stats ?? createStatsService();
  const onDispose = (close: () => Promise<void>) => {
    owned.unshift(close);
  };
  let interactive = deps.interactivePool;
  if (!interactive) {
    // Threads load on the first job (most test apps never run one) and stay loaded from then on.
    const created = new InteractivePool({
      threads: config.interactiveThreads, timeLimitMs: config.interactiveTimeLimitMs,
      perRequesterRunning: config.interactivePerUserRunning, perRequesterQueued: config.interactivePerUserQueued,
    });
    owned.unshift(() => created.close());
    interactive = created;
  }
  const context: AppContext = { config, logger, sequelize, models, users, stats, version: APP_VERSION, onDispose, interactive, mailbox: deps.mailbox };
  const fakeOAuthUrl = deps.fakeOAuthUrl ?? (config.oauth.mode === 'fake' ? `http://127.0.0.1:${config.oauth.port}` : '');
  const passport = createPassport(config, users, fakeOAuthUrl);

  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);
  app.use(pinoHttp({
    logger,
    genReqId: (req, res) => {
      const id = randomUUID();
      res.setHeader('x-request-id', id);
      return id;
    },
    autoLogging: { ignore: (req) => req.url === '/api/health' },
    // One short line per request: headers are noise here and may carry secrets.
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
  }));
  app.use(securityHeaders(config.publicUrl));
  const csrf = createCsrf({ publicUrl: config.publicUrl, secret: config.sessionSecret, sessionCookie: SESSION_COOKIE });
  app.use(csrf.protect);

  const api = Router();
  api.use(express.json({ limit: '1mb' }));
  // A request with `Authorization: Bearer` is a token request: no session is read or written (api-tokens/bearer-auth.ts).
  api.use(unlessToken(sessionMiddleware(config, store)));
  api.use(passport.initialize());
  api.use(unlessToken(passport.session()));
  api.use(bearerAuth(createApiTokensService({ sequelize, users }), { limit: config.tokenRateLimit, windowMs: config.tokenRateWindowMs }));
  api.use('/auth', authRateLimit(config.authRateLimit, config.authRateWindowMs), authRouter(passport, csrf));
  api.use(apiRouter(context));
  api.use(notFound());
  app.use('/api', api);

  if (hasWebBuild(config.webDist)) app.use(webAppRouter(config.webDist));
  else logger.info({ webDist: config.webDist }, 'no web build found; serving the API only');
  app.use(notFound());
  app.use(errorHandler());

  let isDisposed = false;
  const dispose = async () => {
    if (isDisposed) return;
    isDisposed = true;
    for (const close of owned) await close();
  };
  return Object.assign(app, { context, dispose });
}

/** Options of startServer. */
export interface StartServerOptions {
  readonly config: AppConfig;
  /** Overrides config.databaseUrl. */
  readonly databaseUrl?: string;
  /** Port to listen on; 0 picks a free one. When given, the public URL becomes http://HOST:PORT. */
  readonly port?: number;
  /** Port of the fake OAuth provider in fake mode; 0 picks a free one. Default config.oauth.port. */
  readonly fakeOAuthPort?: number;
  readonly logger?: Logger;
  /** Mailbox of a running local fake SMTP server (see AppDeps.mailbox). */
  readonly mailbox?: Mailbox;
}

/** A listening app (and fake provider, in fake mode). */
export interface RunningServer {
  /** Base URL of the app, no trailing slash. */
  readonly url: string;
  /** Base URL of the fake OAuth provider, when one runs. */
  readonly fakeOAuthUrl: string | undefined;
  readonly app: QuarterturnApp;
  /** Stops the HTTP server, the fake provider and the app's pools. */
  close(): Promise<void>;
}

/** Listens with the full app on config.host; see StartServerOptions for ports and URLs. */
export async function startServer(options: StartServerOptions): Promise<RunningServer> {
  const server = createServer();
  // Listen first so a port-0 server knows its URL before the OAuth callback URL is fixed.
  const port = await listen(server, options.port ?? options.config.port, options.config.host);
  const urlHost = options.config.host === '0.0.0.0' || options.config.host === '::' ? '127.0.0.1' : options.config.host;
  const publicUrl = options.port !== undefined ? `http://${urlHost.includes(':') ? `[${urlHost}]` : urlHost}:${port}` : options.config.publicUrl;
  let config: AppConfig = { ...options.config, publicUrl, databaseUrl: options.databaseUrl ?? options.config.databaseUrl };

  let fake: RunningFakeOAuth | undefined;
  try {
    if (config.oauth.mode === 'fake') {
      fake = await startFakeOAuth(options.fakeOAuthPort ?? config.oauth.port, {
        clients: [{ ...FAKE_OAUTH_CLIENT, name: 'Quarterturn', redirectUris: [callbackUrl(config)] }],
      });
      config = { ...config, oauth: { mode: 'fake', port: fake.port } };
    }
    const app = createApp(config, { logger: options.logger, fakeOAuthUrl: fake?.url, mailbox: options.mailbox });
    server.on('request', app);
    return {
      url: publicUrl,
      fakeOAuthUrl: fake?.url,
      app,
      async close() {
        await closeServer(server);
        await fake?.close();
        await app.dispose();
      },
    };
  } catch (err) {
    await closeServer(server);
    await fake?.close();
    throw err;
  }
}
