/** Routes under /api/instance-sets: list, create, read, change, delete, upload files, generate. */
import { Router } from 'express';
import { z } from 'zod';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import type { InstanceSetsService } from './instance-sets.service';
import type { UploadGate } from './upload-gate';
import { uploadFiles } from './upload-middleware';

/** An id path parameter (a positive 32-bit integer). */
export const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** Instance set routes over the service; `uploads` limits each user's uploads in progress. */
export function instanceSetsRouter(svc: InstanceSetsService, uploads: UploadGate): Router {
  const r = Router();

  r.get('/', async (req, res) => {
    res.json(await svc.list(req.user ?? null, req.query));
  });

  r.post('/', requireRole('researcher'), async (req, res) => {
    res.status(201).json(await svc.create(requireUser(req), req.body));
  });

  r.post('/generate', requireRole('researcher'), async (req, res) => {
    res.status(201).json(await svc.generate(req.user ?? null, req.body));
  });

  r.get('/:id', async (req, res) => {
    const { id } = validate(IdParam, req.params);
    res.json(await svc.get(req.user ?? null, id));
  });

  r.delete('/:id', requireRole('researcher'), async (req, res) => {
    const { id } = validate(IdParam, req.params);
    await svc.remove(req.user ?? null, id);
    res.status(204).end();
  });

  r.get('/:id/deletion-preview', requireRole('researcher'), async (req, res) => {
    res.json(await svc.deletionPreview(req.user ?? null, 'set', validate(IdParam, req.params).id));
  });

  r.patch('/:id', requireRole('researcher'), async (req, res) => {
    const { id } = validate(IdParam, req.params);
    res.json(await svc.update(req.user ?? null, id, req.body));
  });

  r.post(
    '/:id/files',
    requireRole('researcher'),
    // Rights first, so a refused request is answered before its body is read into memory.
    async (req, _res, next) => {
      const { id } = validate(IdParam, req.params);
      await svc.assertCanManage(req.user ?? null, id);
      next();
    },
    // Counted before the body is read, so a refused upload never holds its bytes here.
    uploads.middleware(),
    ...uploadFiles(),
    async (req, res) => {
      const { id } = validate(IdParam, req.params);
      const files = (req.files as Express.Multer.File[] | undefined) ?? [];
      // A client that goes away cancels the checks of its upload.
      const gone = new AbortController();
      res.on('close', () => {
        if (!res.writableFinished) gone.abort();
      });
      res.status(201).json(await svc.upload(req.user ?? null, id, files, gone.signal));
    },
  );

  return r;
}
