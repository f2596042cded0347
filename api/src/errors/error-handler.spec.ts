import express from 'express';
import request from 'supertest';
import { ConnectionRefusedError, UniqueConstraintError } from 'sequelize';
import { z } from 'zod';
import { AppError } from './app-error';
import { errorHandler, notFound } from './error-handler';
import { validate } from './validate';

function appThrowing(): express.Express {
  const app = express();
  app.use(express.json({ limit: '1kb' }));
  app.get('/app-error', () => {
    throw new AppError('SWEEP_NOT_FOUND', 404, 'No sweep 42', [{ id: 42 }]);
  });
  app.post('/validated', (req, res) => {
    res.json(validate(z.object({ name: z.string().min(1), agents: z.number().int().positive() }).strict(), req.body));
  });
  app.get('/busy', () => {
    throw new AppError('COMPUTE_BUSY', 503, 'Busy', undefined, 7.2);
  });
  app.get('/unique', () => {
    throw new UniqueConstraintError({ message: 'Validation error' });
  });
  app.get('/db-refused', async () => {
    throw new ConnectionRefusedError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' }));
  });
  app.get('/db-shutdown', async () => {
    // What pg raises when PostgreSQL shuts down under a query (SQLSTATE 57P01 admin_shutdown).
    throw Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' });
  });
  app.get('/boom', async () => {
    throw new Error('secret connection string postgres://u:pw@db');
  });
  app.use(notFound());
  app.use(errorHandler());
  return app;
}

describe('errorHandler', () => {
  const app = appThrowing();

  it.each(['/db-refused', '/db-shutdown'])('answers a lost database connection (%s) with 503 DATABASE_UNAVAILABLE and Retry-After', async (path) => {
    const res = await request(app).get(path);
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('DATABASE_UNAVAILABLE');
    expect(res.body.error.message).not.toMatch(/ECONNREFUSED|5432|administrator/);
    expect(res.headers['retry-after']).toBe('5');
  });

  it('sends an AppError with its status, code, message and details', async () => {
    const res = await request(app).get('/app-error');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'SWEEP_NOT_FOUND', message: 'No sweep 42', details: [{ id: 42 }] } });
  });

  it('sends Retry-After (whole seconds, rounded up) when an AppError says when to retry, and not otherwise', async () => {
    const busy = await request(app).get('/busy');
    expect(busy.status).toBe(503);
    expect(busy.headers['retry-after']).toBe('8');
    expect((await request(app).get('/app-error')).headers['retry-after']).toBeUndefined();
  });

  it('turns a ZodError into 400 VALIDATION_FAILED listing each issue with its path', async () => {
    const res = await request(app).post('/validated').send({ name: '', agents: 1.5, extra: true });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('VALIDATION_FAILED');
    const paths = (res.body.error.details as Array<{ path: unknown[] }>).map((d) => d.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['name', 'agents']));
    expect(res.body.error.message).toMatch(/name/);
  });

  it('passes valid input through validate()', async () => {
    const res = await request(app).post('/validated').send({ name: 'warehouse', agents: 4 });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ name: 'warehouse', agents: 4 });
  });

  it('maps a Sequelize UniqueConstraintError to 409 CONFLICT', async () => {
    const res = await request(app).get('/unique');
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CONFLICT');
  });

  it('answers a body over the limit with 413 PAYLOAD_TOO_LARGE', async () => {
    const res = await request(app).post('/validated').send({ name: 'x'.repeat(2000), agents: 1 });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it('answers malformed JSON with 400 VALIDATION_FAILED', async () => {
    const res = await request(app).post('/validated').set('content-type', 'application/json').send('{"name": ');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({ error: { code: 'VALIDATION_FAILED', message: 'The request body is not valid JSON.' } });
  });

  it('hides unexpected errors behind a generic 500 without stack or message', async () => {
    const res = await request(app).get('/boom');
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('INTERNAL');
    const text = JSON.stringify(res.body);
    expect(text).not.toMatch(/secret|postgres|at .*\.ts/);
  });

  it('answers unknown routes with 404 NOT_FOUND in the error shape', async () => {
    const res = await request(app).delete('/nowhere');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'NOT_FOUND', message: 'No route for DELETE /nowhere' } });
  });
});
