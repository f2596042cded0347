/** Serves the built Angular app with a fallback to index.html for client-side routes. */
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import express, { Router } from 'express';

/** Angular's output hashing gives names like main-AB12CD34.js; those never change content. */
const HASHED_FILE = /-[A-Z0-9]{8}\.(js|css|woff2?|ttf|svg|png|jpg)$/;

/** Whether `webDist` holds a built app (an index.html). */
export function hasWebBuild(webDist: string): boolean {
  return existsSync(join(resolve(webDist), 'index.html'));
}

/** Static files plus SPA fallback for every GET outside /api. */
export function webAppRouter(webDist: string): Router {
  const root = resolve(webDist);
  const r = Router();
  r.use(express.static(root, {
    index: false,
    setHeaders: (res, path) => {
      res.setHeader('Cache-Control', HASHED_FILE.test(path) ? 'public, max-age=31536000, immutable' : 'no-cache');
    },
  }));
  r.get('/{*splat}', (req, res, next) => {
    if (req.path === '/api' || req.path.startsWith('/api/')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(join(root, 'index.html'));
  });
  return r;
}
