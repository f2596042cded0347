/**
 * Public documentation routes: GET /api/help/guide (the user's guide as Markdown, rendered by the
 * web app's Help page) and GET /api/schemas/:name (the JSON Schemas of the plan and instance
 * formats at stable URLs, for other tools). No sign-in.
 */
import { Router } from 'express';
import { PUBLISHED_SCHEMAS, type PublishedSchema } from '@shared/help';
import { AppError } from '../errors/app-error';
import type { HelpFiles } from './help-files';

/** Routes under /api/help. */
export function helpRouter(files: HelpFiles): Router {
  const r = Router();
  r.get('/guide', (_req, res) => {
    // no-cache: the browser revalidates with the ETag Express sets, so a new README shows at once.
    res.set({ 'content-type': 'text/markdown; charset=utf-8', 'cache-control': 'no-cache' }).send(files.guide);
  });
  return r;
}

/** Routes under /api/schemas. */
export function schemasRouter(files: HelpFiles): Router {
  const r = Router();
  r.get('/:name', (req, res) => {
    const name = req.params.name as PublishedSchema;
    const bytes = files.schemas.get(name);
    if (!bytes) {
      throw new AppError('NOT_FOUND', 404, `No schema "${req.params.name}"; published: ${PUBLISHED_SCHEMAS.join(', ')}.`);
    }
    // The media type JSON Schema Core (draft 2020-12, section 14) registers for schema documents.
    res.set({ 'content-type': 'application/schema+json; charset=utf-8', 'cache-control': 'no-cache' }).send(bytes);
  });
  return r;
}
