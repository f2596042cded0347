/**
 * The instance library's routes in one router, mounted once in api-router.ts:
 * /instance-sets, /maps and /scenarios, and the admin's storage quota routes
 * /admin/users/:id/quota. Also registers the library's home-page counters.
 */
import { Router } from 'express';
import type { AppContext } from '../app-context';
import { instanceSetArchiveRouter } from './instance-set-archive';
import { createInstanceSetsService } from './instance-sets.service';
import { instanceSetsRouter } from './instance-sets.router';
import { mapsRouter, scenariosRouter } from './library-files.router';
import { quotaAdminRouter } from './quota-admin.router';
import { createStorageQuotas } from './storage-quota';
import { UploadGate } from './upload-gate';

/** Builds the service from the app context and mounts its routes. */
export function instanceLibraryRouter(ctx: AppContext): Router {
  const quotas = createStorageQuotas({ sequelize: ctx.sequelize, defaults: ctx.config.storageQuota });
  const svc = createInstanceSetsService({
    sequelize: ctx.sequelize, models: ctx.models, quotas,
    generate: (request, requester) => ctx.interactive.generate(request, requester),
    prepare: (job, loadMaps, requester, signal) => ctx.interactive.prepareUpload(job, loadMaps, requester, signal),
  });
  ctx.stats.register('instanceSets', (viewer) => svc.count(viewer, 'instanceSets'));
  ctx.stats.register('maps', (viewer) => svc.count(viewer, 'maps'));
  ctx.stats.register('scenarios', (viewer) => svc.count(viewer, 'scenarios'));
  const r = Router();
  r.use('/instance-sets', instanceSetsRouter(svc, new UploadGate(ctx.config.uploadsPerUser)));
  r.use('/instance-sets', instanceSetArchiveRouter(ctx.models));
  r.use('/maps', mapsRouter(svc));
  r.use('/scenarios', scenariosRouter(svc));
  r.use('/admin/users', quotaAdminRouter(quotas));
  return r;
}
