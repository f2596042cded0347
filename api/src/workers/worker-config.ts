/** Settings of a stand-alone worker process (`npm run worker`), from the environment, validated with zod. */
import { z } from 'zod';
import { parseWorkerSolverEntry, type WorkerSolver } from '@shared/external-solvers';
import { defaultThreadCount } from './machine-info';

/**
 * WORKER_SOLVERS: the registered external solvers this machine has installed, as a comma list of
 * name@version=sha256:<hex>, each pinning the SHA-256 of the command its operator approved
 * (issue 16, item 4; shared/external-solvers.ts WorkerSolver). Empty or unset = none. Each
 * solver appears once.
 */
export function parseWorkerSolvers(text: string | undefined): { readonly ok: true; readonly solvers: WorkerSolver[] } | { readonly ok: false; readonly message: string } {
  const entries = (text ?? '').split(',').map((e) => e.trim()).filter((e) => e !== '');
  const solvers: WorkerSolver[] = [];
  const seen = new Set<string>();
  for (const entry of entries) {
    const parsed = parseWorkerSolverEntry(entry);
    if (!parsed.ok) return { ok: false, message: parsed.message };
    const key = `${parsed.solver.name}@${parsed.solver.version}`;
    if (seen.has(key)) return { ok: false, message: `${key} is listed twice` };
    seen.add(key);
    solvers.push(parsed.solver);
  }
  return { ok: true, solvers };
}

/** A zod field for WORKER_SOLVERS (worker and server configuration alike). */
export const workerSolversField = (fallback: string) => z.string().optional().transform((v, ctx) => {
  const parsed = parseWorkerSolvers(v ?? fallback);
  if (!parsed.ok) {
    ctx.addIssue({ code: 'custom', message: `${parsed.message} (WORKER_SOLVERS is a comma list of name@version=sha256:<hex>)` });
    return z.NEVER;
  }
  return parsed.solvers;
});

const empty = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

const WorkerEnv = z.object({
  DATABASE_URL: z.preprocess(empty, z.url({ protocol: /^postgres(ql)?$/, error: 'DATABASE_URL must be a postgres:// URL of the app database' })),
  WORKER_THREADS: z.preprocess(empty, z.coerce.number().int().min(1).max(256).optional()),
  SMTP_URL: z.preprocess(empty, z.url({ protocol: /^smtps?$/ }).optional()),
  PUBLIC_URL: z.preprocess(empty, z.url({ protocol: /^https?$/ }).default('http://127.0.0.1:4300')),
  LOG_LEVEL: z.preprocess(empty, z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info')),
  WORKER_MAINTENANCE_SECONDS: z.preprocess(empty, z.coerce.number().int().min(1).max(3600).default(10)),
  WORKER_SOLVERS: workerSolversField(''),
});

/** The validated settings of a worker. */
export interface WorkerConfig {
  readonly databaseUrl: string;
  readonly threads: number;
  readonly smtpUrl: string | undefined;
  readonly publicUrl: string;
  readonly logLevel: z.output<typeof WorkerEnv>['LOG_LEVEL'];
  readonly maintenanceSeconds: number;
  /** External solvers this machine runs (WORKER_SOLVERS). */
  readonly solvers: readonly WorkerSolver[];
}

/** Reads the worker settings; throws an Error with one line per bad variable. */
export function loadWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  const parsed = WorkerEnv.safeParse(env);
  if (!parsed.success) throw new Error(`Invalid worker configuration:\n  ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('\n  ')}`);
  const e = parsed.data;
  return {
    databaseUrl: e.DATABASE_URL,
    threads: e.WORKER_THREADS ?? defaultThreadCount(),
    smtpUrl: e.SMTP_URL,
    publicUrl: e.PUBLIC_URL.replace(/\/+$/, ''),
    logLevel: e.LOG_LEVEL,
    maintenanceSeconds: e.WORKER_MAINTENANCE_SECONDS,
    solvers: e.WORKER_SOLVERS,
  };
}
