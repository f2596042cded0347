/**
 * Wires the sweeps feature into an app: the service, the SSE hub, a lazily started job queue
 * (pg-boss connects on the first launch or cancel, so apps that never launch open nothing) and
 * the home-page counter. Also mounts the dev mailbox (admins only) when a fake SMTP server runs
 * and the app is in development mode.
 */
import { Router } from 'express';
import type PgBoss from 'pg-boss';
import type { AppContext } from '../app-context';
import { isDevelopmentMode } from '../dev/development-mode';
import { mailboxRouter } from '../dev/fake-smtp/mailbox.router';
import { AppError } from '../errors/app-error';
import { createBoss } from '../workers/sweep-queue';
import { createSweepEvents } from './sweep-events';
import { sweepsRouter } from './sweeps.router';
import { createSweepsService } from './sweeps.service';

/** The routes of the feature: /sweeps (and /dev/mailbox in development). */
export function sweepsFeature(ctx: AppContext): Router {
  let boss: Promise<PgBoss> | undefined;
  const bossReady = (): Promise<PgBoss> => {
    if (!ctx.config.databaseUrl) return Promise.reject(new AppError('INTERNAL', 503, 'The job queue needs DATABASE_URL.'));
    boss ??= createBoss(ctx.config.databaseUrl, { logger: ctx.logger, isSupervisor: false, max: 2 }).catch((err: unknown) => {
      boss = undefined;
      throw err;
    });
    return boss;
  };
  const svc = createSweepsService({ sequelize: ctx.sequelize, models: ctx.models, boss: bossReady, jobExpiryMarginSeconds: ctx.config.jobExpiryMarginSeconds });
  const events = createSweepEvents(ctx.sequelize, ctx.config.databaseUrl, ctx.logger, (id, userIds) => svc.allowedViewers(id, userIds));
  ctx.stats.register('sweeps', (viewer) => svc.count(viewer));
  ctx.onDispose(async () => {
    await events.close();
    const b = boss;
    boss = undefined;
    if (b) await (await b.catch(() => undefined))?.stop({ graceful: false, wait: true }).catch(() => undefined);
  });
  const r = Router();
  r.use('/sweeps', sweepsRouter(svc, events));
  if (ctx.mailbox && isDevelopmentMode(ctx.config)) r.use('/dev/mailbox', mailboxRouter(ctx.mailbox));
  else if (ctx.mailbox) ctx.logger.warn('local mailbox not served: it needs development mode (fake sign-in, loopback PUBLIC_URL and HOST)');
  return r;
}
