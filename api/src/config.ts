/**
 * Every setting of the API process, read once from the environment and validated with zod,
 * so a typo fails at start-up with the variable's name instead of misbehaving later.
 * The defaults make `npm start` work on a fresh machine with nothing set.
 */
import { z } from 'zod';
import { EXAMPLE_SOLVER, solverKey, type WorkerSolver } from '@shared/external-solvers';
import { commandSha256 } from './external-solvers/command-hash';
import type { QuotaAmounts } from '@shared/storage-quota';
import { workerSolversField } from './workers/worker-config';

/** The session secret used when SESSION_SECRET is unset; fine on a laptop, refused on a public host. */
export const DEV_SESSION_SECRET = 'quarterturn-dev-session-secret-change-me';

/** Client credentials the API uses with the local fake OAuth provider (not secret: it only runs on loopback). */
export const FAKE_OAUTH_CLIENT = { clientId: 'quarterturn-local', clientSecret: 'quarterturn-local-secret' } as const;

const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;

/** Log verbosity accepted by LOG_LEVEL (pino level names). */
export type LogLevel = (typeof LOG_LEVELS)[number];

/** How users sign in: the hosted GitHub OAuth app, or the local fake provider on FAKE_OAUTH_PORT. */
export type OAuthSettings =
  | { readonly mode: 'github'; readonly clientId: string; readonly clientSecret: string }
  | { readonly mode: 'fake'; readonly port: number };

/** The validated settings of one API process. */
export interface AppConfig {
  readonly port: number;
  readonly host: string;
  /** Connection URL of the application database; undefined means `npm start` runs its private cluster. */
  readonly databaseUrl: string | undefined;
  readonly sessionSecret: string;
  /** Whether the session secret is the built-in development default. */
  readonly isDevSessionSecret: boolean;
  /** The URL browsers use to reach the app, without trailing slash (OAuth callback and CSRF origin). */
  readonly publicUrl: string;
  readonly oauth: OAuthSettings;
  /** Logins that become admin on their first sign-in, lower-cased. */
  readonly adminLogins: readonly string[];
  readonly smtpUrl: string | undefined;
  /** Folder of the built web app (absolute or relative to the working directory). */
  readonly webDist: string;
  readonly logLevel: LogLevel;
  /** Requests per client address per window on /api/auth routes. */
  readonly authRateLimit: number;
  /** Length of the rate-limit window in milliseconds. */
  readonly authRateWindowMs: number;
  /** Requests per API token per window (API_TOKEN_RATE_LIMIT, default 600). */
  readonly tokenRateLimit: number;
  /** Length of the API token rate-limit window in milliseconds (API_TOKEN_RATE_WINDOW_MS, default 60000). */
  readonly tokenRateWindowMs: number;
  /** Express `trust proxy` hop count: 0 when the app faces browsers directly. */
  readonly trustProxy: number;
  /** Whether the server process also runs a sweep worker (EMBEDDED_WORKER, default on). */
  readonly isEmbeddedWorker: boolean;
  /** Threads of the embedded worker's pool (WORKER_THREADS); undefined = cores − 1, at least 1. */
  readonly workerThreads: number | undefined;
  /** External solvers the embedded worker runs (WORKER_SOLVERS; default the shipped example pinned to its command's hash, empty = none). */
  readonly workerSolvers: readonly WorkerSolver[];
  /** Port of the local fake SMTP server `npm start` runs when SMTP_URL is unset (FAKE_SMTP_PORT). */
  readonly fakeSmtpPort: number;
  /** Seconds a run's job may outlive its time limit before the queue hands it to another worker (JOB_EXPIRY_MARGIN_SECONDS). */
  readonly jobExpiryMarginSeconds: number;
  /** Threads of the server's interactive pool: executions and generation (INTERACTIVE_THREADS, default 1). */
  readonly interactiveThreads: number;
  /** Hard limit of one interactive job once its thread began it, ms (INTERACTIVE_TIME_LIMIT_MS, default 30000). */
  readonly interactiveTimeLimitMs: number;
  /** Interactive threads one user may hold at once (INTERACTIVE_PER_USER_RUNNING, default 1). */
  readonly interactivePerUserRunning: number;
  /** Interactive jobs one user may have waiting; more are refused with 503 and Retry-After (INTERACTIVE_PER_USER_QUEUED, default 2). */
  readonly interactivePerUserQueued: number;
  /** Uploads one user may have in progress at once; more are refused with 429 (UPLOADS_PER_USER, default 2). */
  readonly uploadsPerUser: number;
  /** Default storage quota of a person's instance sets (QUOTA_FILES, QUOTA_CELLS, QUOTA_BYTES); admins set others per person. */
  readonly storageQuota: QuotaAmounts;
}

/** Thrown by loadConfig with one line per bad variable. */
export class ConfigError extends Error {
  constructor(readonly problems: readonly string[]) {
    super(`Invalid configuration:\n  ${problems.join('\n  ')}`);
    this.name = 'ConfigError';
  }
}

const emptyAsUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const optionalString = z.preprocess(emptyAsUndefined, z.string().trim().optional());
const port = (fallback: number) => z.preprocess(emptyAsUndefined, z.coerce.number().int().min(0).max(65535).default(fallback));

const quota = (fallback: number) => z.preprocess(emptyAsUndefined, z.coerce.number().int().min(0).max(Number.MAX_SAFE_INTEGER).default(fallback));

/** Uploads one user may have in progress at once unless UPLOADS_PER_USER says otherwise. */
export const DEFAULT_UPLOADS_PER_USER = 2;

/**
 * Storage quota of a person's instance sets unless QUOTA_* say otherwise: room for a full grid
 * benchmark collection (a few million map cells, under 2,000 files, under 100 MB), not for sixty
 * 1024 × 1024 maps.
 */
export const DEFAULT_STORAGE_QUOTA: QuotaAmounts = { files: 5_000, cells: 16 * 1024 * 1024, bytes: 256 * 1024 * 1024 };

const EnvSchema = z.object({
  PORT: port(4300),
  HOST: z.preprocess(emptyAsUndefined, z.string().default('127.0.0.1')),
  DATABASE_URL: z.preprocess(emptyAsUndefined, z.url({ protocol: /^postgres(ql)?$/ }).optional()),
  SESSION_SECRET: z.preprocess(emptyAsUndefined, z.string().min(16, 'must be at least 16 characters').optional()),
  PUBLIC_URL: z.preprocess(emptyAsUndefined, z.url({ protocol: /^https?$/ }).default('http://127.0.0.1:4300')),
  GITHUB_CLIENT_ID: optionalString,
  GITHUB_CLIENT_SECRET: optionalString,
  FAKE_OAUTH_PORT: port(4301),
  ADMIN_LOGINS: z.preprocess(emptyAsUndefined, z.string().default('')),
  SMTP_URL: z.preprocess(emptyAsUndefined, z.url({ protocol: /^smtps?$/ }).optional()),
  WEB_DIST: z.preprocess(emptyAsUndefined, z.string().default('dist/web/browser')),
  LOG_LEVEL: z.preprocess(emptyAsUndefined, z.enum(LOG_LEVELS).optional()),
  AUTH_RATE_LIMIT: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).default(60)),
  AUTH_RATE_WINDOW_MS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1000).default(15 * 60 * 1000)),
  API_TOKEN_RATE_LIMIT: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).default(600)),
  API_TOKEN_RATE_WINDOW_MS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1000).default(60_000)),
  TRUST_PROXY: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(0).default(0)),
  EMBEDDED_WORKER: z.preprocess(emptyAsUndefined, z.enum(['true', 'false', '1', '0']).default('true')),
  WORKER_THREADS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).max(256).optional()),
  // The embedded worker declares the shipped example solver unless told otherwise (empty = none).
  WORKER_SOLVERS: workerSolversField(`${solverKey(EXAMPLE_SOLVER)}=sha256:${commandSha256(EXAMPLE_SOLVER.command)}`),
  FAKE_SMTP_PORT: port(4302),
  JOB_EXPIRY_MARGIN_SECONDS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).max(86_400).default(60)),
  INTERACTIVE_THREADS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).max(64).default(1)),
  INTERACTIVE_TIME_LIMIT_MS: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1000).max(600_000).default(30_000)),
  INTERACTIVE_PER_USER_RUNNING: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).max(64).default(1)),
  INTERACTIVE_PER_USER_QUEUED: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(0).max(64).default(2)),
  UPLOADS_PER_USER: z.preprocess(emptyAsUndefined, z.coerce.number().int().min(1).max(64).default(DEFAULT_UPLOADS_PER_USER)),
  QUOTA_FILES: quota(DEFAULT_STORAGE_QUOTA.files),
  QUOTA_CELLS: quota(DEFAULT_STORAGE_QUOTA.cells),
  QUOTA_BYTES: quota(DEFAULT_STORAGE_QUOTA.bytes),
  NODE_ENV: optionalString,
});

/** Whether `hostname` is a loopback name, where the fake provider and dev secret are acceptable. */
export function isLoopbackHost(hostname: string): boolean {
  return hostname === 'localhost' || hostname === '[::1]' || hostname === '::1' || /^127\.\d+\.\d+\.\d+$/.test(hostname);
}

/**
 * Reads and validates the settings from `env` (default process.env). Returns the config and
 * warnings worth logging; throws ConfigError naming each bad variable.
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): { config: AppConfig; warnings: string[] } {
  const parsed = EnvSchema.safeParse(env);
  if (!parsed.success) {
    throw new ConfigError(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`));
  }
  const e = parsed.data;
  const problems: string[] = [];
  const warnings: string[] = [];
  const publicUrl = new URL(e.PUBLIC_URL);
  const isPublicLoopback = isLoopbackHost(publicUrl.hostname);
  // A wildcard (0.0.0.0, ::) or LAN HOST makes the app reachable from other machines whatever
  // PUBLIC_URL says, so it needs the same protection as a public URL.
  const isHostLoopback = isLoopbackHost(e.HOST);

  let oauth: OAuthSettings;
  if (e.GITHUB_CLIENT_ID && e.GITHUB_CLIENT_SECRET) {
    oauth = { mode: 'github', clientId: e.GITHUB_CLIENT_ID, clientSecret: e.GITHUB_CLIENT_SECRET };
  } else {
    if (e.GITHUB_CLIENT_ID || e.GITHUB_CLIENT_SECRET) {
      problems.push('GITHUB_CLIENT_ID / GITHUB_CLIENT_SECRET: set both or neither');
    }
    // The fake provider lets anyone pick an admin identity, so it must never face a network.
    if (!isPublicLoopback) {
      problems.push(`GITHUB_CLIENT_ID: required when PUBLIC_URL (${e.PUBLIC_URL}) is not a loopback address; the fake sign-in provider is for local use only`);
    }
    if (!isHostLoopback) {
      problems.push(`HOST: ${e.HOST} is not a loopback address; the fake sign-in provider is for local use only: bind to 127.0.0.1 or set GITHUB_CLIENT_ID and GITHUB_CLIENT_SECRET`);
    }
    oauth = { mode: 'fake', port: e.FAKE_OAUTH_PORT };
  }

  if (!e.SESSION_SECRET) {
    if (!isPublicLoopback) problems.push('SESSION_SECRET: required when PUBLIC_URL is not a loopback address');
    else if (!isHostLoopback) problems.push(`SESSION_SECRET: required when HOST (${e.HOST}) is not a loopback address; the development default is public`);
    else warnings.push('SESSION_SECRET is not set: using the development default (fine on this machine only).');
  }
  if (problems.length > 0) throw new ConfigError(problems);

  return {
    config: {
      port: e.PORT,
      host: e.HOST,
      databaseUrl: e.DATABASE_URL,
      sessionSecret: e.SESSION_SECRET ?? DEV_SESSION_SECRET,
      isDevSessionSecret: !e.SESSION_SECRET,
      publicUrl: publicUrl.origin + publicUrl.pathname.replace(/\/+$/, ''),
      oauth,
      adminLogins: e.ADMIN_LOGINS.split(',').map((s) => s.trim().toLowerCase()).filter((s) => s.length > 0),
      smtpUrl: e.SMTP_URL,
      webDist: e.WEB_DIST,
      logLevel: e.LOG_LEVEL ?? (e.NODE_ENV === 'test' ? 'silent' : 'info'),
      authRateLimit: e.AUTH_RATE_LIMIT,
      authRateWindowMs: e.AUTH_RATE_WINDOW_MS,
      tokenRateLimit: e.API_TOKEN_RATE_LIMIT,
      tokenRateWindowMs: e.API_TOKEN_RATE_WINDOW_MS,
      trustProxy: e.TRUST_PROXY,
      isEmbeddedWorker: e.EMBEDDED_WORKER === 'true' || e.EMBEDDED_WORKER === '1',
      workerThreads: e.WORKER_THREADS,
      workerSolvers: e.WORKER_SOLVERS,
      fakeSmtpPort: e.FAKE_SMTP_PORT,
      jobExpiryMarginSeconds: e.JOB_EXPIRY_MARGIN_SECONDS,
      interactiveThreads: e.INTERACTIVE_THREADS,
      interactiveTimeLimitMs: e.INTERACTIVE_TIME_LIMIT_MS,
      interactivePerUserRunning: e.INTERACTIVE_PER_USER_RUNNING,
      interactivePerUserQueued: e.INTERACTIVE_PER_USER_QUEUED,
      uploadsPerUser: e.UPLOADS_PER_USER,
      storageQuota: { files: e.QUOTA_FILES, cells: e.QUOTA_CELLS, bytes: e.QUOTA_BYTES },
    },
    warnings,
  };
}
