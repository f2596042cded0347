/**
 * Routes under /api/submissions/batches (researchers): send a batch (multipart with one zip in the
 * `archive` field, or a JSON body), list one's batches, and one batch's progress and outcomes.
 * Others' batches answer 404.
 */
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { BATCH_LIMITS, BATCH_UPLOAD_FIELD } from '@shared/submission-batch-format';
import { requireRole, requireUser } from '../auth/require-role';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { asClientError, limitRequestBytes } from '../instance-sets/upload-middleware';
import { unsafePathReason } from '../instance-sets/upload-entry';
import { readJsonBatch, readZipBatch } from './read-batch';
import type { SubmissionBatchesService } from './submission-batches.service';

const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });

/** Multer's memory storage for one zip; only for multipart requests (a JSON batch was read by express.json). */
function zipUpload(): RequestHandler[] {
  const parse = multer({
    storage: multer.memoryStorage(),
    preservePath: true,
    defParamCharset: 'utf8',
    limits: { fileSize: BATCH_LIMITS.maxZipBytes, files: 1, fields: 0, parts: 1, fieldNameSize: 100, headerPairs: 20 },
  }).single(BATCH_UPLOAD_FIELD);
  const parseOrRefuse: RequestHandler = (req, res, next) => {
    parse(req, res, (err?: unknown) => next(asClientError(err)));
  };
  const limit = limitRequestBytes(BATCH_LIMITS.maxZipBytes + 1024 * 1024);
  const onlyMultipart = (handler: RequestHandler): RequestHandler => (req, res, next) => (req.is('multipart/form-data') ? handler(req, res, next) : next());
  return [onlyMultipart(limit), onlyMultipart(parseOrRefuse)];
}

/** The batch routes over the service. */
export function submissionBatchesRouter(svc: SubmissionBatchesService): Router {
  const r = Router();
  r.use(requireRole('researcher'));
  r.post('/', ...zipUpload(), async (req, res) => {
    const owner = requireUser(req);
    let batch;
    if (req.is('multipart/form-data')) {
      const file = req.file;
      if (!file) throw new AppError('VALIDATION_FAILED', 400, `Send the batch zip in the multipart field '${BATCH_UPLOAD_FIELD}'.`, [{ file: '(upload)', line: 0, column: 0, field: BATCH_UPLOAD_FIELD, message: 'no file was sent' }]);
      const unsafe = unsafePathReason(file.originalname);
      if (unsafe || !file.originalname.toLowerCase().endsWith('.zip')) {
        throw new AppError('VALIDATION_FAILED', 400, `The batch must be one .zip file (${unsafe ?? `got ${file.originalname}`}).`, [{ file: file.originalname, line: 0, column: 0, field: BATCH_UPLOAD_FIELD, message: unsafe ?? 'not a .zip file' }]);
      }
      batch = await readZipBatch(file.originalname, file.buffer);
    } else if (req.is('application/json')) {
      batch = readJsonBatch(req.body);
    } else {
      throw new AppError('VALIDATION_FAILED', 415, 'Send a batch as multipart/form-data with one zip, or as application/json.');
    }
    const summary = await svc.create(owner, batch);
    res.status(202).location(`/api/submissions/batches/${summary.id}`).json(summary);
  });
  r.get('/', async (req, res) => {
    res.json(await svc.list(requireUser(req)));
  });
  r.get('/:id', async (req, res) => {
    const { id } = validate(IdParam, req.params);
    res.json(await svc.get(requireUser(req), id));
  });
  return r;
}
