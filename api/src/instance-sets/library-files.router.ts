/** Routes under /api/maps and /api/scenarios: read, download byte for byte, what a deletion takes with it, delete. */
import { Router, type Response } from 'express';
import { requireRole } from '../auth/require-role';
import { validate } from '../errors/validate';
import { attachmentDisposition } from '../http/content-disposition';
import { IdParam } from './instance-sets.router';
import type { InstanceSetsService, StoredFileBytes } from './instance-sets.service';

/** Sends stored bytes untouched as an attachment named like the uploaded file. */
function sendFile(res: Response, file: StoredFileBytes): void {
  res.set({
    'content-type': 'application/octet-stream',
    'content-disposition': attachmentDisposition(file.name),
    etag: `"${file.checksum}"`,
    'x-checksum-sha256': file.checksum,
  });
  res.send(file.bytes);
}

/** Map routes. */
export function mapsRouter(svc: InstanceSetsService): Router {
  const r = Router();
  r.get('/:id', async (req, res) => {
    res.json(await svc.getMap(req.user ?? null, validate(IdParam, req.params).id));
  });
  r.get('/:id/download', async (req, res) => {
    sendFile(res, await svc.mapBytes(req.user ?? null, validate(IdParam, req.params).id));
  });
  r.get('/:id/deletion-preview', requireRole('researcher'), async (req, res) => {
    res.json(await svc.deletionPreview(req.user ?? null, 'map', validate(IdParam, req.params).id));
  });
  r.delete('/:id', requireRole('researcher'), async (req, res) => {
    await svc.removeMap(req.user ?? null, validate(IdParam, req.params).id);
    res.status(204).end();
  });
  return r;
}

/** Scenario routes. */
export function scenariosRouter(svc: InstanceSetsService): Router {
  const r = Router();
  r.get('/:id', async (req, res) => {
    res.json(await svc.getScenario(req.user ?? null, validate(IdParam, req.params).id));
  });
  r.get('/:id/download', async (req, res) => {
    sendFile(res, await svc.scenarioBytes(req.user ?? null, validate(IdParam, req.params).id));
  });
  r.get('/:id/deletion-preview', requireRole('researcher'), async (req, res) => {
    res.json(await svc.deletionPreview(req.user ?? null, 'scenario', validate(IdParam, req.params).id));
  });
  r.delete('/:id', requireRole('researcher'), async (req, res) => {
    await svc.removeScenario(req.user ?? null, validate(IdParam, req.params).id);
    res.status(204).end();
  });
  return r;
}
