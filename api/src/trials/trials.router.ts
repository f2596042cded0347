/**
 * Routes under /api/trials: a result's field trials (GET, whoever may see the result), attach runs
 * (POST multipart: `files` = trial logs or zips of them, `policy`, `notes`; researchers and up who
 * see the result), delete an upload (its owner, maintainers, admins).
 */
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { MAX_TRIAL_NOTES, TRIAL_UPLOAD_FIELD, TRIAL_UPLOAD_LIMITS } from '@shared/field-trials';
import { UPLOAD_LIMITS } from '@shared/instance-sets';
import { requireRole, requireUser } from '../auth/require-role';
import { validate } from '../errors/validate';
import { asClientError, limitRequestBytes } from '../instance-sets/upload-middleware';
import type { UploadGate } from '../instance-sets/upload-gate';
import type { RobotProfilesService } from './robot-profiles.service';
import type { TrialsService } from './trials.service';

const ResultIdParam = z.object({ resultId: z.coerce.number().int().positive().max(2_147_483_647) });
const IdParam = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647) });
/** POST /api/trials/results/:resultId/calibration: which runs to fit (default every run of the result). */
export const CalibrationRequest = z.strictObject({ runIds: z.array(z.number().int().positive()).min(1).max(2000).optional() });

/** Multer's memory storage for trial uploads: the files plus the two text fields. */
function trialFiles(): RequestHandler[] {
  const parse = multer({
    storage: multer.memoryStorage(),
    preservePath: true,
    defParamCharset: 'utf8',
    limits: {
      fileSize: UPLOAD_LIMITS.maxFileBytes, files: TRIAL_UPLOAD_LIMITS.maxFiles, fields: 2, fieldSize: MAX_TRIAL_NOTES * 4,
      parts: TRIAL_UPLOAD_LIMITS.maxFiles + 2, fieldNameSize: 100, headerPairs: 20,
    },
  }).array(TRIAL_UPLOAD_FIELD, TRIAL_UPLOAD_LIMITS.maxFiles);
  const parseOrRefuse: RequestHandler = (req, res, next) => {
    parse(req, res, (err?: unknown) => next(asClientError(err)));
  };
  return [limitRequestBytes(TRIAL_UPLOAD_LIMITS.maxTotalBytes + 1024 * 1024), parseOrRefuse];
}

/** The trials routes over the service. */
export function trialsRouter(svc: TrialsService, profiles: RobotProfilesService, uploads: UploadGate): Router {
  const r = Router();
  r.get('/results/:resultId', async (req, res) => {
    const { resultId } = validate(ResultIdParam, req.params);
    res.json(await svc.list(req.user ?? null, resultId));
  });
  r.post(
    '/results/:resultId',
    requireRole('researcher'),
    // Visibility first, so a refused request is answered before its body is read.
    async (req, _res, next) => {
      const { resultId } = validate(ResultIdParam, req.params);
      await svc.list(req.user ?? null, resultId);
      next();
    },
    uploads.middleware(),
    ...trialFiles(),
    async (req, res) => {
      const { resultId } = validate(ResultIdParam, req.params);
      const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ name: f.originalname, bytes: f.buffer }));
      const gone = new AbortController();
      res.on('close', () => {
        if (!res.writableFinished) gone.abort();
      });
      res.status(201).json(await svc.upload(requireUser(req), resultId, { ...req.body }, files, gone.signal));
    },
  );
  r.post('/results/:resultId/calibration', requireRole('researcher'), async (req, res) => {
    const { resultId } = validate(ResultIdParam, req.params);
    const { runIds } = validate(CalibrationRequest, req.body ?? {});
    res.json(await profiles.calibrate(requireUser(req), resultId, runIds ?? null));
  });
  r.delete('/uploads/:id', requireRole('researcher'), async (req, res) => {
    const { id } = validate(IdParam, req.params);
    await svc.remove(requireUser(req), id);
    res.status(204).end();
  });
  return r;
}

/** Routes under /api/robot-profiles: named profiles fitted from field runs (list; save a fit under a name). */
export function robotProfilesRouter(profiles: RobotProfilesService): Router {
  const r = Router();
  r.use(requireRole('researcher'));
  r.get('/', async (req, res) => {
    res.json(await profiles.list(requireUser(req)));
  });
  r.post('/', async (req, res) => {
    res.status(201).json(await profiles.save(requireUser(req), req.body));
  });
  return r;
}
