/** GET /api/openapi.json: the OpenAPI 3.1 document of this API, public. */
import { Router } from 'express';
import { openApiJson } from './openapi-document';

/** The route serving the document. */
export function openApiRouter(): Router {
  const r = Router();
  r.get('/', (_req, res) => {
    res.set({ 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-cache' }).send(openApiJson());
  });
  return r;
}
