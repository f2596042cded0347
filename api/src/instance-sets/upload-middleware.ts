/**
 * Multipart parsing for uploads: multer's memory storage with the per-file and file-count
 * limits of UPLOAD_LIMITS, behind a Content-Length check so a request can never make the
 * server buffer more than the upload allows in all. A body multer cannot read (empty, cut off,
 * no boundary, a malformed part header) is the client's mistake: 400 VALIDATION_FAILED, never 500.
 */
import type { RequestHandler } from 'express';
import multer from 'multer';
import { UPLOAD_FIELD, UPLOAD_LIMITS } from '@shared/instance-sets';
import { AppError } from '../errors/app-error';

/** Multipart framing allowance on top of the files themselves (boundaries and part headers). */
const FRAMING_BYTES = 1024 * 1024;

/** Refuses a request whose declared body is larger than `maxBytes`, or which declares none. */
export function limitRequestBytes(maxBytes: number): RequestHandler {
  return (req, _res, next) => {
    const declared = Number(req.get('content-length'));
    if (!req.get('content-length') || !Number.isFinite(declared)) {
      next(new AppError('VALIDATION_FAILED', 411, 'Uploads must declare their Content-Length.'));
      return;
    }
    if (declared > maxBytes) {
      next(new AppError('PAYLOAD_TOO_LARGE', 413, `The upload is ${declared} bytes; at most ${maxBytes} are accepted in one request.`));
      return;
    }
    next();
  };
}

/** The handlers that leave the uploaded files in `req.files`. */
export function uploadFiles(): RequestHandler[] {
  const parse = multer({
    storage: multer.memoryStorage(),
    // Keep client paths so '../x.map' is refused by name rather than silently shortened.
    preservePath: true,
    defParamCharset: 'utf8',
    limits: {
      fileSize: UPLOAD_LIMITS.maxFileBytes, files: UPLOAD_LIMITS.maxFilesPerUpload, fields: 0, parts: UPLOAD_LIMITS.maxFilesPerUpload,
      // Part headers are all that is buffered besides the files: keep them small too.
      fieldNameSize: 100, headerPairs: 20,
    },
  }).array(UPLOAD_FIELD, UPLOAD_LIMITS.maxFilesPerUpload);
  const parseOrRefuse: RequestHandler = (req, res, next) => {
    parse(req, res, (err?: unknown) => next(asClientError(err)));
  };
  return [limitRequestBytes(UPLOAD_LIMITS.maxTotalBytes + FRAMING_BYTES), parseOrRefuse];
}

/**
 * A parse error as the error middleware should answer it: multer's own limit errors and
 * AppErrors as they are, and every other error of the multipart parser (busboy's 'Unexpected end
 * of form', 'Multipart: Boundary not found', 'Malformed part header', a client that went away)
 * as 400, since it describes the body the client sent.
 */
export function asClientError(err: unknown): unknown {
  if (err === undefined || err === null) return undefined;
  if (err instanceof AppError || (err as { name?: string }).name === 'MulterError') return err;
  const reason = err instanceof Error ? err.message : String(err);
  return new AppError('VALIDATION_FAILED', 400, `The upload is not a complete multipart/form-data body (${reason}); send the files again.`);
}
